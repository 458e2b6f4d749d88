// GET /api/billing/preview?period=2026-11 — what an invoice run for the month would bill, per customer; writes nothing
import { assertUnitStaff, previewRun } from "@/lib/billing/run";
import { previewQuerySchema } from "@/lib/billing/run-schemas";
import { parseQuery, withAuth } from "@/lib/http/route";

export const GET = withAuth("billing.manage", async ({ req, db, user }) => {
  assertUnitStaff(user);
  const { period } = parseQuery(req, previewQuerySchema);
  return previewRun(db, period);
});
