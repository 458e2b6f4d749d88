// GET /api/users/:id — one person in the caller's scope (404 for anyone else's)
import { parseId, withAuth } from "@/lib/http/route";
import { getUser } from "@/lib/users/service";

export const GET = withAuth<{ id: string }>("users.view", async ({ db, user, params }) => {
  return getUser(db, user, parseId(params.id, "That user"));
});
