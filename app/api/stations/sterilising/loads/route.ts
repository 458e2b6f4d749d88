// POST /api/stations/sterilising/loads — open a load on a steriliser with one of its programs
import { withAuth } from "@/lib/http/route";
import { openLoad } from "@/lib/sterilising/loads";
import { openLoadSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth("loads.operate", async ({ req, db, user }) => ({ load: await openLoad(db, user, await readBody(req, openLoadSchema)) }));
