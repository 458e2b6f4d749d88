// POST /api/stations/sterilising/loads/:id/finish — finish a running load with its record and indicator results
import { parseId, withAuth } from "@/lib/http/route";
import { finishLoad } from "@/lib/sterilising/loads";
import { finishLoadSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth<{ id: string }>("loads.operate", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That steriliser load");
  return finishLoad(db, user, id, await readBody(req, finishLoadSchema));
});
