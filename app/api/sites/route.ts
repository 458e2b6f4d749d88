// GET /api/sites — sites in the caller's scope, paged, sorted and filtered
import { parseQuery, withAuth } from "@/lib/http/route";
import { listSitesPage } from "@/lib/sites/queries";
import { listSitesQuerySchema } from "@/lib/sites/schemas";

export const GET = withAuth("sites.view", async ({ req, db, user }) => {
  return listSitesPage(db, user, parseQuery(req, listSitesQuerySchema));
});
