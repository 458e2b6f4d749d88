// GET /api/reports/clinic/revenue — the caller's own organisation's revenue report (JSON, or CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("revenue", "reports.customer");
