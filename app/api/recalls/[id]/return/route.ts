// POST /api/recalls/:id/return — a recalled set is back at the unit
import { parseId, withAuth } from "@/lib/http/route";
import { returnRecalledSet } from "@/lib/sterilising/recalls";
import { returnRecalledSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth<{ id: string }>("recalls.manage", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That recall");
  const { cycleId } = await readBody(req, returnRecalledSchema);
  await returnRecalledSet(db, user, id, cycleId);
  return { ok: true };
});
