// GET /api/sites/:id — one site in the caller's scope (404 for another tenant's)
import { parseId, withAuth } from "@/lib/http/route";
import { getSite } from "@/lib/sites/queries";

export const GET = withAuth<{ id: string }>("sites.view", async ({ db, user, params }) => {
  return getSite(db, user, parseId(params.id, "That site"));
});
