// GET /api/procedures/check?code=… — the set a scan found and whether it may be recorded as used
import { parseQuery, withAuth } from "@/lib/http/route";
import { checkScanQuerySchema } from "@/lib/procedures/schemas";
import { checkScannedSet } from "@/lib/procedures/service";

export const GET = withAuth("procedures.record", async ({ req, db, user }) => {
  const { code } = parseQuery(req, checkScanQuerySchema);
  return checkScannedSet(db, user, code);
});
