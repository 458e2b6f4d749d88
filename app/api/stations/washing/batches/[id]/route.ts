// GET /api/stations/washing/batches/:id — a batch as the washing station shows it
import { parseId, withAuth } from "@/lib/http/route";
import { getBatchView } from "@/lib/washing/service";

export const GET = withAuth<{ id: string }>("stations.operate", async ({ db, params }) => ({
  batch: await getBatchView(db, parseId(params.id, "That washer batch")),
}));
