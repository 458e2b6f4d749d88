// GET /api/billing/invoices/headers.csv — the filtered invoices as CSV, one row per invoice
import { invoiceHeadersCsv } from "@/lib/billing/exports-csv";
import { billingToday, listInvoicesQuerySchema } from "@/lib/billing/invoices";
import { parseQuery, withAuth } from "@/lib/http/route";

export const GET = withAuth("billing.view", async ({ req, db, user }) => {
  const { q, status, age, organisationId } = parseQuery(req, listInvoicesQuerySchema);
  const csv = await invoiceHeadersCsv(db, user, { q, status, age, organisationId });
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="invoice-headers-${billingToday()}.csv"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
