// GET /api/stations/dispatch — today's published runs and, per run, the sets still to load
import { withAuth } from "@/lib/http/route";
import { getDispatchBoard } from "@/lib/stations/dispatch";

export const GET = withAuth("stations.operate", async ({ db }) => getDispatchBoard(db));
