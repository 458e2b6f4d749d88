// GET /api/recalls/:id/report.pdf — the recall report as a PDF, in the caller's scope
import { parseId, withAuth } from "@/lib/http/route";
import { renderRecallPdf } from "@/lib/sterilising/recall-pdf";
import { getRecall } from "@/lib/sterilising/recalls";

export const GET = withAuth<{ id: string }>("recalls.view", async ({ db, user, params }) => {
  const recall = await getRecall(db, user, parseId(params.id, "That recall"));
  const pdf = await renderRecallPdf(recall);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-length": String(pdf.length),
      "content-disposition": `attachment; filename="${recall.number}.pdf"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
