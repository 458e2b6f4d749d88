// POST /api/stations/washing/batches/:id/start — start a loaded batch; its load list is fixed from now on
import { parseId, withAuth } from "@/lib/http/route";
import { startBatch } from "@/lib/washing/service";

export const POST = withAuth<{ id: string }>("stations.operate", async ({ db, user, params }) => ({
  batch: await startBatch(db, user, parseId(params.id, "That washer batch")),
}));
