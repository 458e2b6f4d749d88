// POST /api/stations/packing/pack — pack a washed set after its contents check, pack it with an irregularity, or hold it; once per clientEventId
import { withAuth } from "@/lib/http/route";
import { packSchema } from "@/lib/packing/schemas";
import { packCycle } from "@/lib/packing/service";
import { parseJsonBody } from "@/lib/stations/body";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => {
  const input = await parseJsonBody(req, packSchema);
  return packCycle(db, user, input);
});
