// GET /api/reports/capacity — the unit's capacity report (JSON, or one table as CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("capacity", "reports.unit");
