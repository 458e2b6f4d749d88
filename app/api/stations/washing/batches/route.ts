// POST /api/stations/washing/batches — open a batch on a washer with one of its programs
import { withAuth } from "@/lib/http/route";
import { readBody } from "@/lib/washing/body";
import { openBatchSchema } from "@/lib/washing/schemas";
import { openBatch } from "@/lib/washing/service";

export const POST = withAuth("stations.operate", async ({ req, db, user }) => ({ batch: await openBatch(db, user, await readBody(req, openBatchSchema)) }));
