// GET /api/stations/washing — the active washers with their programs and open batches
import { withAuth } from "@/lib/http/route";
import { listWashersForStation } from "@/lib/washing/service";

export const GET = withAuth("stations.operate", async ({ db }) => ({ washers: await listWashersForStation(db) }));
