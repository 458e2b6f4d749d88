// POST /api/stations/receiving/scan — receive the scanned set (unbooked sets too), with the order it came with and where it goes next
import { withAuth } from "@/lib/http/route";
import { parseJsonBody } from "@/lib/stations/body";
import { receiveScan } from "@/lib/stations/receiving";
import { receivingScanSchema } from "@/lib/stations/receiving-shared";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => {
  const input = await parseJsonBody(req, receivingScanSchema);
  return receiveScan(db, user, input);
});
