import "server-only";
import { toCsv } from "@/lib/csv";
import type { ReportTable } from "./types";

// One report table as CSV: the same header labels and cells the screen shows, each cell made safe
// for spreadsheets (a text beginning with =, +, -, @, tab or carriage return gets a leading
// apostrophe; lib/csv.ts).

export function tableCsv(table: ReportTable): string {
  return toCsv(
    table.columns.map((c) => c.label),
    table.rows.map((row) => table.columns.map((c) => row[c.key] ?? null)),
  );
}
