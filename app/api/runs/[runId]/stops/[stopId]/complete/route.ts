// POST /api/runs/:runId/stops/:stopId/complete — sign off a stop (receiver's name and signature) or record why it was not served
import { parseId, withAuth } from "@/lib/http/route";
import { completeStop } from "@/lib/runs/service";
import { completeStopSchema } from "@/lib/runs/shared";
import { parseJsonBody } from "@/lib/stations/body";

export const POST = withAuth<{ runId: string; stopId: string }>("runs.work", async ({ req, db, user, params }) => {
  const runId = parseId(params.runId, "That run");
  const stopId = parseId(params.stopId, "That stop");
  const input = await parseJsonBody(req, completeStopSchema);
  return completeStop(db, user, runId, stopId, input);
});
