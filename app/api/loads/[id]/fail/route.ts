// POST /api/loads/:id/fail — the quality lead fails a load; a released load is recalled
import { parseId, withAuth } from "@/lib/http/route";
import { failLoad } from "@/lib/sterilising/recalls";
import { failLoadSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth<{ id: string }>("loads.release", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That steriliser load");
  return failLoad(db, user, id, await readBody(req, failLoadSchema));
});
