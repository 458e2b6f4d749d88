// GET /api/billing/runs/:id — one invoice run with its invoices, lines, evidence and issuing progress
import { getRunDetail } from "@/lib/billing/run";
import { parseId, withAuth } from "@/lib/http/route";

export const GET = withAuth<{ id: string }>("billing.view", async ({ db, user, params }) =>
  getRunDetail(db, user, parseId(params.id, "That invoice run")),
);
