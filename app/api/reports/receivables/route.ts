// GET /api/reports/receivables — the unit's receivables report (JSON, or one table as CSV with ?format=csv)
import { reportRoute } from "@/lib/reports/route";

export const GET = reportRoute("receivables", "reports.unit");
