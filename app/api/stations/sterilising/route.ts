// GET /api/stations/sterilising — the active sterilisers with their programs, open loads and today's air-removal test
import { withAuth } from "@/lib/http/route";
import { listSterilisersForStation } from "@/lib/sterilising/loads";

export const GET = withAuth("loads.operate", async ({ db }) => ({ sterilisers: await listSterilisersForStation(db) }));
