// GET /api/recalls/:id/report.csv — the recall report as CSV, in the caller's scope
import { parseId, withAuth } from "@/lib/http/route";
import { getRecall, recallCsv } from "@/lib/sterilising/recalls";

export const GET = withAuth<{ id: string }>("recalls.view", async ({ db, user, params }) => {
  const recall = await getRecall(db, user, parseId(params.id, "That recall"));
  return new Response(recallCsv(recall), {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${recall.number}.csv"` },
  });
});
