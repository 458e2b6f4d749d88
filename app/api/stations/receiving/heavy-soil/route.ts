// POST /api/stations/receiving/heavy-soil — mark a received set as heavily soiled or not pre-cleaned (a surcharge), or clear the mark
import { withAuth } from "@/lib/http/route";
import { parseJsonBody } from "@/lib/stations/body";
import { setHeavySoil } from "@/lib/stations/receiving";
import { heavySoilSchema } from "@/lib/stations/receiving-shared";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => {
  const input = await parseJsonBody(req, heavySoilSchema);
  return setHeavySoil(db, user, input);
});
