// GET /api/reports/volumes — the unit's volumes report (JSON, or one table as CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("volumes", "reports.unit");
