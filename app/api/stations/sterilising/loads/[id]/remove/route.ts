// POST /api/stations/sterilising/loads/:id/remove — take a set out of a loading load
import { parseId, withAuth } from "@/lib/http/route";
import { removeFromLoad } from "@/lib/sterilising/loads";
import { removeFromLoadSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth<{ id: string }>("loads.operate", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That steriliser load");
  const { cycleId } = await readBody(req, removeFromLoadSchema);
  return { load: await removeFromLoad(db, user, id, cycleId) };
});
