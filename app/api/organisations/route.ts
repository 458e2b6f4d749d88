// GET /api/organisations — the unit and its customers, paged, sorted and filtered
import { parseQuery, withAuth } from "@/lib/http/route";
import { listOrganisationsQuerySchema } from "@/lib/organisations/schemas";
import { listOrganisations } from "@/lib/organisations/service";

export const GET = withAuth("organisations.view", async ({ req, db, user }) => {
  return listOrganisations(db, user, parseQuery(req, listOrganisationsQuerySchema));
});
