// POST /api/stations/washing/batches/:id/scan — add a scanned set to a loading batch (or say why not)
import { parseId, withAuth } from "@/lib/http/route";
import { readBody } from "@/lib/washing/body";
import { scanIntoBatchSchema } from "@/lib/washing/schemas";
import { addToBatch } from "@/lib/washing/service";

export const POST = withAuth<{ id: string }>("stations.operate", async ({ req, db, user, params }) => {
  const batchId = parseId(params.id, "That washer batch");
  const { code } = await readBody(req, scanIntoBatchSchema);
  return addToBatch(db, user, batchId, code);
});
