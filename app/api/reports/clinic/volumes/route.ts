// GET /api/reports/clinic/volumes — the caller's own organisation's volumes report (JSON, or CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("volumes", "reports.customer");
