// GET /api/batches — washer batches, paged, sorted and filtered by washer and status
import { parseQuery, withAuth } from "@/lib/http/route";
import { listBatchesQuerySchema } from "@/lib/washing/schemas";
import { listBatches } from "@/lib/washing/service";

export const GET = withAuth("machines.view", async ({ req, db }) => listBatches(db, parseQuery(req, listBatchesQuerySchema)));
