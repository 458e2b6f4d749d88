// GET /api/contracts/:id — one contract version with its rate card (404 for another customer's)
import { getContract } from "@/lib/contracts/service";
import { parseId, withAuth } from "@/lib/http/route";

export const GET = withAuth<{ id: string }>("contracts.view", async ({ db, user, params }) => {
  return getContract(db, user, parseId(params.id, "That contract"));
});
