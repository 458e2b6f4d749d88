// GET /api/problems/:id — one problem with its set, order, photo and answer (404 outside the caller's scope)
import { parseId, withAuth } from "@/lib/http/route";
import { getProblemDetail } from "@/lib/problems/service";

export const GET = withAuth<{ id: string }>("orders.view", async ({ db, user, params }) => {
  return getProblemDetail(db, user, parseId(params.id, "That problem"));
});
