import { format } from "date-fns";
import { tz } from "@date-fns/tz";

// Washer batch numbers: <machine code>-<YYMM>-<sequence>, e.g. W3-2612-0042 is the 42nd batch
// opened on washer W3 in December 2026 (the month in the unit's time zone). The sequence starts
// again at 0001 each month and has at least four digits; the number is unique (a database
// constraint), printed on the batch record and later on the set's history.

/** The part of the number shared by one washer's batches of one month. */
export function batchNumberPrefix(machineCode: string, at: Date, timeZone: string): string {
  return `${machineCode}-${format(at, "yyMM", { in: tz(timeZone) })}`;
}

/** The next number after the existing ones that share the prefix (any others are ignored). */
export function nextBatchNumber(prefix: string, existing: readonly string[]): string {
  let highest = 0;
  for (const number of existing) {
    if (!number.startsWith(`${prefix}-`)) continue;
    const tail = number.slice(prefix.length + 1);
    if (/^\d+$/.test(tail)) highest = Math.max(highest, Number(tail));
  }
  return `${prefix}-${String(highest + 1).padStart(4, "0")}`;
}
