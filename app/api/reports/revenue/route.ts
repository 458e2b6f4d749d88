// GET /api/reports/revenue — the unit's revenue report (JSON, or one table as CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("revenue", "reports.unit");
