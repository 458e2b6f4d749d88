// GET /api/batches/:id — one washer batch: machine, program, sets, figures and the decision
import { parseId, withAuth } from "@/lib/http/route";
import { getBatchView } from "@/lib/washing/service";

export const GET = withAuth<{ id: string }>("machines.view", async ({ db, params }) => getBatchView(db, parseId(params.id, "That washer batch")));
