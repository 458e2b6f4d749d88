// GET /api/billing/runs — every invoice run, newest month first, with its totals and status
import { listRuns } from "@/lib/billing/run";
import { withAuth } from "@/lib/http/route";

export const GET = withAuth("billing.view", async ({ db, user }) => listRuns(db, user));
