// POST /api/stations/washing/batches/:id/remove — take a set out of a batch that is still loading
import { parseId, withAuth } from "@/lib/http/route";
import { readBody } from "@/lib/washing/body";
import { removeFromBatchSchema } from "@/lib/washing/schemas";
import { removeFromBatch } from "@/lib/washing/service";

export const POST = withAuth<{ id: string }>("stations.operate", async ({ req, db, user, params }) => {
  const batchId = parseId(params.id, "That washer batch");
  const { cycleId } = await readBody(req, removeFromBatchSchema);
  return { batch: await removeFromBatch(db, user, batchId, cycleId) };
});
