// GET /api/reports/stations — the unit's stations report (JSON, or one table as CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("stations", "reports.unit");
