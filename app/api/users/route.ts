// GET /api/users — people in the caller's scope, paged, sorted and filtered
import { parseQuery, withAuth } from "@/lib/http/route";
import { listUsersQuerySchema } from "@/lib/users/schemas";
import { listUsers } from "@/lib/users/service";

export const GET = withAuth("users.view", async ({ req, db, user }) => {
  const query = parseQuery(req, listUsersQuerySchema);
  return listUsers(db, user, query);
});
