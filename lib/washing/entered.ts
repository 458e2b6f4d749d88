import Papa from "papaparse";
import { CycleRecordError, type CycleRecordIssue } from "@/lib/cycles/errors";

// Values typed in at the station (time and temperature samples read off the washer's display or
// printout), turned into the same CSV a washer exports so they go through the same parser and
// checks. Semicolons separate the columns, so a decimal comma ("90,5") is read as a decimal.

/** Stage labels offered for typed samples; the check counts only "disinfection" towards A0. */
export const ENTERED_PHASES = ["", "heating", "disinfection", "drying"] as const;
export type EnteredPhase = (typeof ENTERED_PHASES)[number];

export interface EnteredSample {
  /** Seconds from the start of the record, as typed. */
  t: string;
  /** °C, as typed. */
  tempC: string;
  phase: EnteredPhase;
}

/** The CSV text of the typed samples (header t_s;temp_c;phase). */
export function enteredSamplesToCsv(rows: readonly EnteredSample[]): string {
  const withPhase = rows.some((r) => r.phase !== "");
  const fields = withPhase ? ["t_s", "temp_c", "phase"] : ["t_s", "temp_c"];
  const data = rows.map((r) => (withPhase ? [r.t.trim(), r.tempC.trim(), r.phase] : [r.t.trim(), r.tempC.trim()]));
  return Papa.unparse({ fields, data }, { delimiter: ";", newline: "\n" });
}

const COLUMN_WORDS: Record<string, string> = { t_s: "time (s)", temp_c: "temperature (°C)", phase: "stage" };

/**
 * The parser's problems, placed by table row instead of file line: line 1 of the CSV is its
 * header, so line n is row n − 1 of the table.
 */
export function enteredIssues(error: CycleRecordError): string[] {
  return error.issues.map((issue: CycleRecordIssue) => {
    if (issue.line === undefined || issue.line < 2) return issue.message.replace(/^Line \d+(, column \d+ \([^)]*\))?: /, "");
    const prefix = /^Line \d+(?:, column \d+ \([^)]*\))?: /.exec(issue.message)?.[0] ?? "";
    const fix = issue.message.slice(prefix.length).replace(/line (\d+)/g, (_, n: string) => `row ${Number(n) - 1}`);
    const column = issue.columnName ? `, ${COLUMN_WORDS[issue.columnName] ?? issue.columnName}` : "";
    return `Row ${issue.line - 1}${column}: ${fix}`;
  });
}
