// POST /api/runs/:runId/stops/:stopId/scans — a set scanned or tapped at a stop, recorded once per client id
import { parseId, withAuth } from "@/lib/http/route";
import { scanAtStop } from "@/lib/runs/service";
import { stopScanSchema } from "@/lib/runs/shared";
import { parseJsonBody } from "@/lib/stations/body";

export const POST = withAuth<{ runId: string; stopId: string }>("runs.work", async ({ req, db, user, params }) => {
  const runId = parseId(params.runId, "That run");
  const stopId = parseId(params.stopId, "That stop");
  const input = await parseJsonBody(req, stopScanSchema);
  return scanAtStop(db, user, runId, stopId, input);
});
