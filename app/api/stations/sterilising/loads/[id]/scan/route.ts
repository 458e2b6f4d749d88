// POST /api/stations/sterilising/loads/:id/scan — add a scanned set to a loading load
import { parseId, withAuth } from "@/lib/http/route";
import { addToLoad } from "@/lib/sterilising/loads";
import { scanIntoLoadSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth<{ id: string }>("loads.operate", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That steriliser load");
  const { code } = await readBody(req, scanIntoLoadSchema);
  return addToLoad(db, user, id, code);
});
