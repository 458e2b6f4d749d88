// GET /api/organisations/:id — one organisation with its counts
import { parseId, withAuth } from "@/lib/http/route";
import { getOrganisation } from "@/lib/organisations/service";

export const GET = withAuth<{ id: string }>("organisations.view", async ({ db, user, params }) => {
  return getOrganisation(db, user, parseId(params.id, "That organisation"));
});
