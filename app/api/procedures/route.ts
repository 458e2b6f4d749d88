// GET /api/procedures — the sets the caller's sites recorded as used for procedures, paged
import { parseQuery, withAuth } from "@/lib/http/route";
import { listUsesQuerySchema } from "@/lib/procedures/schemas";
import { listProcedureUses } from "@/lib/procedures/service";

export const GET = withAuth("procedures.record", async ({ req, db, user }) => {
  return listProcedureUses(db, user, parseQuery(req, listUsesQuerySchema));
});
