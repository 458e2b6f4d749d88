// POST /api/stations/sterilising/loads/:id/start — start a load (needs the day's passed air-removal test)
import { parseId, withAuth } from "@/lib/http/route";
import { startLoad } from "@/lib/sterilising/loads";

export const POST = withAuth<{ id: string }>("loads.operate", async ({ db, user, params }) => ({ load: await startLoad(db, user, parseId(params.id, "That steriliser load")) }));
