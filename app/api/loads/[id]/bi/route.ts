// POST /api/loads/:id/bi — record the biological indicator's reading
import { parseId, withAuth } from "@/lib/http/route";
import { recordBiResult } from "@/lib/sterilising/loads";
import { biResultSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth<{ id: string }>("loads.operate", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That steriliser load");
  const { result } = await readBody(req, biResultSchema);
  return { load: await recordBiResult(db, user, id, result) };
});
