import Papa from "papaparse";

// The one writer of CSV files that people open in a spreadsheet (finance's exports, the recall
// report). Every cell goes through safeCell.
//
// Spreadsheet formula injection (OWASP, "CSV Injection"): a text cell that begins with =, +, -,
// @, a tab or a carriage return is prefixed with a single quote, so a spreadsheet shows it as
// text instead of evaluating it. Plain decimal numbers we write ourselves ("-12.50") are left as
// numbers, which no spreadsheet evaluates as a formula, so that they still add up.
//
// Machine formats that only our own parsers read back (a washer's time/temperature record in
// lib/cycles/csv.ts and lib/washing/entered.ts) are numbers and fixed words, not exports, and
// are written with papaparse directly.

const FORMULA_START = /^[=+\-@\t\r]/;
const PLAIN_NUMBER = /^-?\d+(\.\d+)?$/;

export type CsvValue = string | number | null | undefined;

/** A cell made safe to open in a spreadsheet. */
export function safeCell(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  const text = String(value);
  if (typeof value === "number" || PLAIN_NUMBER.test(text)) return text;
  return FORMULA_START.test(text) ? `'${text}` : text;
}

/**
 * A whole CSV file: a byte-order mark (so spreadsheet programs read it as UTF-8), the header,
 * one line per row, CRLF line ends (RFC 4180), every cell made safe; cells holding the
 * delimiter, a quote or a line break are quoted.
 */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  const data = rows.map((r) => r.map(safeCell));
  return `\uFEFF${Papa.unparse({ fields: header.map(safeCell), data }, { newline: "\r\n", quotes: false })}\r\n`;
}
