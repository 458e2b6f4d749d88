// GET /api/reports/machines — the unit's machines report (JSON, or one table as CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("machines", "reports.unit");
