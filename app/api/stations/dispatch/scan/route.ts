// POST /api/stations/dispatch/scan — load a released set onto the van of its delivery run (→ out for delivery)
import { withAuth } from "@/lib/http/route";
import { parseJsonBody } from "@/lib/stations/body";
import { dispatchScan } from "@/lib/stations/dispatch";
import { dispatchScanSchema } from "@/lib/stations/dispatch-shared";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => {
  const input = await parseJsonBody(req, dispatchScanSchema);
  return dispatchScan(db, user, input);
});
