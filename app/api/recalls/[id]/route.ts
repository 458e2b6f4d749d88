// GET /api/recalls/:id — a recall in the caller's scope (a clinic sees only its own sets)
import { parseId, withAuth } from "@/lib/http/route";
import { getRecall } from "@/lib/sterilising/recalls";

export const GET = withAuth<{ id: string }>("recalls.view", async ({ db, user, params }) => ({ recall: await getRecall(db, user, parseId(params.id, "That recall")) }));
