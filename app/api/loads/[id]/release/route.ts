// POST /api/loads/:id/release — the quality lead releases a load (refused while a check blocks it)
import { parseId, withAuth } from "@/lib/http/route";
import { releaseLoad } from "@/lib/sterilising/loads";
import { releaseLoadSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth<{ id: string }>("loads.release", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That steriliser load");
  return { load: await releaseLoad(db, user, id, await readBody(req, releaseLoadSchema)) };
});
