// GET /api/runs/:runId — the driver's run sheet: stops in order with the sets to collect and deliver (another driver's run is 404)
import { parseId, withAuth } from "@/lib/http/route";
import { getRunSheet } from "@/lib/runs/service";

export const GET = withAuth<{ runId: string }>("runs.work", async ({ db, user, params }) => getRunSheet(db, user, parseId(params.runId, "That run")));
