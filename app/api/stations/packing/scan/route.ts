// POST /api/stations/packing/scan — what a scanned set is at the packing station: its contents list, packaging, and whether it may be packed now
import { withAuth } from "@/lib/http/route";
import { packingScanSchema } from "@/lib/packing/schemas";
import { identifyForPacking } from "@/lib/packing/service";
import { parseJsonBody } from "@/lib/stations/body";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => {
  const { code } = await parseJsonBody(req, packingScanSchema);
  return identifyForPacking(db, user, code);
});
