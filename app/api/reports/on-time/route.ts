// GET /api/reports/on-time — the unit's on-time report (JSON, or one table as CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("on-time", "reports.unit");
