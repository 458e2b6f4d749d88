// POST /api/stations/manual-washing/scan — what a scanned set is and the manual wash steps to confirm (or why not now)
import { withAuth } from "@/lib/http/route";
import { readBody } from "@/lib/washing/body";
import { identifyForManualWash } from "@/lib/washing/manual";
import { manualWashScanSchema } from "@/lib/washing/schemas";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => {
  const { code } = await readBody(req, manualWashScanSchema);
  return { set: await identifyForManualWash(db, user, code) };
});
