// GET /api/billing/invoices/:id/invoice.xml — the invoice as UBL 2.1 (EN 16931), refused with the failed rules when it does not pass
import { invoiceUbl } from "@/lib/billing/exports-ubl";
import { parseId, withAuth } from "@/lib/http/route";

export const GET = withAuth<{ id: string }>("billing.view", async ({ db, user, params }) => {
  const { filename, xml } = await invoiceUbl(db, user, parseId(params.id, "That invoice"));
  return new Response(xml, {
    headers: {
      "content-type": "application/xml; charset=utf-8",
      "content-disposition": `attachment; filename="${filename}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
