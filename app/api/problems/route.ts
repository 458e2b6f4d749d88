// GET /api/problems — the caller's reported problems, paged and filtered (status, kind, customer, order, search)
import { parseQuery, withAuth } from "@/lib/http/route";
import { listProblemsQuerySchema } from "@/lib/problems/schemas";
import { listProblems } from "@/lib/problems/service";

export const GET = withAuth("orders.view", async ({ req, db, user }) => {
  return listProblems(db, user, parseQuery(req, listProblemsQuerySchema));
});
