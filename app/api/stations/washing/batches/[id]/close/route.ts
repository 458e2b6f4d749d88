// POST /api/stations/washing/batches/:id/close — close a running batch with its record (file text or typed values)
import { parseId, withAuth } from "@/lib/http/route";
import { readBody } from "@/lib/washing/body";
import { closeBatchSchema } from "@/lib/washing/schemas";
import { closeBatch } from "@/lib/washing/service";

export const POST = withAuth<{ id: string }>("stations.operate", async ({ req, db, user, params }) => {
  const batchId = parseId(params.id, "That washer batch");
  return closeBatch(db, user, batchId, await readBody(req, closeBatchSchema));
});
