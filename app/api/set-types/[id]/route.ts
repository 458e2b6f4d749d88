// GET /api/set-types/:id — one set type with its contents list and IFU (404 for another tenant's)
import { getSetType } from "@/lib/catalogue/set-types";
import { parseId, withAuth } from "@/lib/http/route";

export const GET = withAuth<{ id: string }>("catalogue.view", async ({ db, user, params }) => {
  return getSetType(db, user, parseId(params.id, "That set type"));
});
