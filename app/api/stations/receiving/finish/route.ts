// POST /api/stations/receiving/finish — finish receiving a pickup: its booked sets that did not arrive are reported missing to the clinic
import { withAuth } from "@/lib/http/route";
import { parseJsonBody } from "@/lib/stations/body";
import { finishReceiving } from "@/lib/stations/receiving";
import { finishReceivingSchema } from "@/lib/stations/receiving-shared";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => {
  const input = await parseJsonBody(req, finishReceivingSchema);
  return finishReceiving(db, user, input);
});
