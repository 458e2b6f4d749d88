// POST /api/stations/manual-washing/confirm — record a set's manual wash once its steps are confirmed
import { withAuth } from "@/lib/http/route";
import { readBody } from "@/lib/washing/body";
import { confirmManualWash } from "@/lib/washing/manual";
import { manualWashConfirmSchema } from "@/lib/washing/schemas";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => confirmManualWash(db, user, await readBody(req, manualWashConfirmSchema)));
