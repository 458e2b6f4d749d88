// GET /api/expiring?days=14 — the caller's delivered sets expiring within that many days, or expired
import { listExpiringSets } from "@/lib/expiry/service";
import { expiringQuerySchema } from "@/lib/expiry/schemas";
import { parseQuery, withAuth } from "@/lib/http/route";

export const GET = withAuth("sets.view", async ({ req, db, user }) => {
  const { days } = parseQuery(req, expiringQuerySchema);
  return listExpiringSets(db, user, { days });
});
