// POST /api/stations/sterilising/loads/:id/abort — abort a running load after a fault
import { parseId, withAuth } from "@/lib/http/route";
import { abortLoad } from "@/lib/sterilising/loads";
import { abortLoadSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth<{ id: string }>("loads.operate", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That steriliser load");
  return { load: await abortLoad(db, user, id, await readBody(req, abortLoadSchema)) };
});
