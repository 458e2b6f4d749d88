// GET /api/sets/:id — one set in the caller's scope (404 for anyone else's)
import { parseId, withAuth } from "@/lib/http/route";
import { getSet } from "@/lib/sets/service";

export const GET = withAuth<{ id: string }>("sets.view", async ({ db, user, params }) => {
  return getSet(db, user, parseId(params.id, "That set"));
});
