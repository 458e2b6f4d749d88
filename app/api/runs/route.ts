// GET /api/runs — the signed-in driver's runs of today's published plan
import { withAuth } from "@/lib/http/route";
import { todaysRunsFor } from "@/lib/runs/service";

export const GET = withAuth("runs.work", async ({ db, user }) => ({ runs: await todaysRunsFor(db, user) }));
