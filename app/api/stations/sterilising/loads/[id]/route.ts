// GET /api/stations/sterilising/loads/:id — a load as the sterilising station shows it
import { parseId, withAuth } from "@/lib/http/route";
import { getLoadView } from "@/lib/sterilising/loads";

export const GET = withAuth<{ id: string }>("loads.operate", async ({ db, params }) => ({ load: await getLoadView(db, parseId(params.id, "That steriliser load")) }));
