// POST /api/stations/washing/batches/:id/abort — a fault mid-cycle: abort the batch, its sets go back to washing
import { parseId, withAuth } from "@/lib/http/route";
import { readBody } from "@/lib/washing/body";
import { abortBatchSchema } from "@/lib/washing/schemas";
import { abortBatch } from "@/lib/washing/service";

export const POST = withAuth<{ id: string }>("stations.operate", async ({ req, db, user, params }) => {
  const batchId = parseId(params.id, "That washer batch");
  return abortBatch(db, user, batchId, await readBody(req, abortBatchSchema));
});
