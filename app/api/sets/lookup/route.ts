// GET /api/sets/lookup?code=… — the set a scanner read or someone typed, in the caller's scope
import { parseQuery, withAuth } from "@/lib/http/route";
import { lookupQuerySchema } from "@/lib/sets/schemas";
import { findSetByScan } from "@/lib/sets/service";

export const GET = withAuth("sets.view", async ({ req, db, user }) => {
  const { code } = parseQuery(req, lookupQuerySchema);
  return findSetByScan(db, user, code);
});
