// GET /api/reports/clinic/on-time — the caller's own organisation's on-time report (JSON, or CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("on-time", "reports.customer");
