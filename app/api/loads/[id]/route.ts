// GET /api/loads/:id — a load with its release checks
import { parseId, withAuth } from "@/lib/http/route";
import { getLoadDetail } from "@/lib/sterilising/loads";

export const GET = withAuth<{ id: string }>("loads.view", async ({ db, params }) => ({ load: await getLoadDetail(db, parseId(params.id, "That steriliser load")) }));
