// GET /api/billing/invoices/:id/invoice.pdf — the invoice as a PDF
import { invoicePdf } from "@/lib/billing/exports-pdf";
import { parseId, withAuth } from "@/lib/http/route";

export const GET = withAuth<{ id: string }>("billing.view", async ({ db, user, params }) => {
  const { filename, pdf } = await invoicePdf(db, user, parseId(params.id, "That invoice"));
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-length": String(pdf.length),
      "content-disposition": `attachment; filename="${filename}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
