import "server-only";
import type { Action } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { parseQuery, withAuth } from "@/lib/http/route";
import { tableCsv } from "./csv";
import { buildReport, type ReportName, reportQuerySchema } from "./service";

// The route handler of one report: JSON for the page's charts and tables, or one of its tables as
// CSV (?format=csv&table=<key>) from the very same figures.

export function reportRoute(name: ReportName, action: Extract<Action, "reports.unit" | "reports.customer">) {
  return withAuth(action, async ({ req, db, user }) => {
    const query = parseQuery(req, reportQuerySchema);
    const { report, filters } = await buildReport(db, user, name, query);
    if (query.format === "json") return { report, filters: { from: filters.from, to: filters.to, organisationId: filters.organisationId, siteId: filters.siteId, grain: filters.grain } };
    const table = query.table ? report.tables.find((t) => t.key === query.table) : report.tables[0];
    if (!table) {
      throw new AppError("validation", `This report has no table "${query.table}"; choose one of ${report.tables.map((t) => t.key).join(", ")}.`, { table: ["Unknown table."] });
    }
    const file = `${name}-${table.key}-${filters.from}-to-${filters.to}.csv`;
    return new Response(tableCsv(table), {
      headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${file}"`, "cache-control": "no-store" },
    });
  });
}
