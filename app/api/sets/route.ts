// GET /api/sets — the caller's sets, paged, sorted and filtered
import { parseQuery, withAuth } from "@/lib/http/route";
import { listSetsQuerySchema } from "@/lib/sets/schemas";
import { listSets } from "@/lib/sets/service";

export const GET = withAuth("sets.view", async ({ req, db, user }) => {
  return listSets(db, user, parseQuery(req, listSetsQuerySchema));
});
