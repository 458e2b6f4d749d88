import { dayNumberOf } from "@/lib/turnaround/calendar";
import { DAY_MS, localDayOf, wallClockInstant } from "@/lib/turnaround/local-time";

// Contract validity is written as local calendar dates in the unit's time zone, both ends
// inclusive (`valid_until` null = open-ended). The pricing engine wants instants: the start is
// local midnight at the beginning of `valid_from`, the end (exclusive) local midnight at the
// beginning of the day after `valid_until`. Local midnight comes from the turnaround clock's
// wall-clock conversion, so both modules agree on daylight-saving days.

const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;

/** True for a real calendar date written YYYY-MM-DD. */
export function isLocalDate(value: unknown): value is string {
  if (typeof value !== "string") return false;
  const match = DATE_PATTERN.exec(value);
  if (!match) return false;
  const [, y, m, d] = match.map(Number) as [number, number, number, number];
  const date = new Date(Date.UTC(y, m - 1, d));
  return date.getUTCFullYear() === y && date.getUTCMonth() === m - 1 && date.getUTCDate() === d;
}

function dateOfDayNumber(day: number): string {
  return new Date(day * DAY_MS).toISOString().slice(0, 10);
}

/** The local date ("YYYY-MM-DD") the wall clock of `timeZone` shows at an instant. */
export function localDateOf(at: Date, timeZone: string): string {
  return dateOfDayNumber(localDayOf(timeZone, at.getTime()));
}

/** The calendar date `days` after `date` (negative for before). */
export function addDaysToDate(date: string, days: number): string {
  return dateOfDayNumber(dayNumberOf(date) + days);
}

/** The first instant of a local date in `timeZone` (local midnight, or the first instant after a gap). */
export function startOfLocalDate(date: string, timeZone: string): Date {
  return new Date(wallClockInstant(timeZone, dayNumberOf(date), 0));
}

/** Validity dates as the half-open interval of instants the pricing engine uses. */
export function validityInstants(
  validFrom: string,
  validUntil: string | null,
  timeZone: string,
): { validFrom: string; validTo: string | null } {
  return {
    validFrom: startOfLocalDate(validFrom, timeZone).toISOString(),
    validTo: validUntil === null ? null : startOfLocalDate(addDaysToDate(validUntil, 1), timeZone).toISOString(),
  };
}

export interface DatePeriod {
  validFrom: string;
  validUntil: string | null;
}

/**
 * True when two inclusive date periods share at least one day. An open end runs forever, so an
 * open-ended version overlaps every version that ends on or after its start.
 */
export function periodsOverlap(a: DatePeriod, b: DatePeriod): boolean {
  const aStartsBeforeBEnds = b.validUntil === null || a.validFrom <= b.validUntil;
  const bStartsBeforeAEnds = a.validUntil === null || b.validFrom <= a.validUntil;
  return aStartsBeforeBEnds && bStartsBeforeAEnds;
}

export const CONTRACT_STATUSES = ["current", "upcoming", "ended"] as const;
export type ContractStatus = (typeof CONTRACT_STATUSES)[number];

/** Whether a version is in force on `today` (a local date), starts later, or has ended. */
export function contractStatus(period: DatePeriod, today: string): ContractStatus {
  if (period.validFrom > today) return "upcoming";
  if (period.validUntil !== null && period.validUntil < today) return "ended";
  return "current";
}

/** The last day of the month `date` falls in. */
export function lastDayOfMonth(date: string): string {
  const [y, m] = date.split("-").map(Number) as [number, number];
  return new Date(Date.UTC(y, m, 0)).toISOString().slice(0, 10);
}
