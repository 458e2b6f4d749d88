// GET /api/billing/invoices/:id/credit-notes/:creditNoteId/credit-note.xml — a credit note as UBL 2.1 (EN 16931)
import { creditNoteUbl } from "@/lib/billing/exports-ubl";
import { parseId, withAuth } from "@/lib/http/route";

export const GET = withAuth<{ id: string; creditNoteId: string }>("billing.view", async ({ db, user, params }) => {
  const { filename, xml } = await creditNoteUbl(db, user, parseId(params.id, "That invoice"), parseId(params.creditNoteId, "That credit note"));
  return new Response(xml, {
    headers: {
      "content-type": "application/xml; charset=utf-8",
      "content-disposition": `attachment; filename="${filename}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
