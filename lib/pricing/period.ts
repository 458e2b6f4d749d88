// Instants, billing months in the unit's time zone, and calendar dates for invoices.

import { TZDate } from "@date-fns/tz";
import { addDays, format, isValid, parseISO } from "date-fns";
import { PricingError, type PricingErrorCode } from "./errors";

const INSTANT_PATTERN = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(?::\d{2}(?:\.\d{1,9})?)?(?:Z|[+-]\d{2}:\d{2})$/;
const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;
const MONTH_PATTERN = /^(\d{4})-(\d{2})$/;

// An ISO-8601 instant with a zone (or a valid Date) as a Date; anything else throws `code`.
export function parseInstant(value: unknown, what: string, code: PricingErrorCode = "invalid_period"): Date {
  if (value instanceof Date) {
    if (isValid(value)) return value;
  } else if (typeof value === "string" && INSTANT_PATTERN.test(value)) {
    const parsed = parseISO(value);
    if (isValid(parsed)) return parsed;
  }
  throw new PricingError(
    code,
    `${what} must be an ISO-8601 instant with a time zone, e.g. 2026-03-01T00:00:00Z, got ${JSON.stringify(value)}`,
    { field: what },
  );
}

// True for a real calendar date written YYYY-MM-DD.
export function isCalendarDate(value: unknown): value is string {
  if (typeof value !== "string") return false;
  const match = DATE_PATTERN.exec(value);
  if (!match) return false;
  const [, y, m, d] = match;
  const date = new TZDate(Number(y), Number(m) - 1, Number(d), "UTC");
  return date.getFullYear() === Number(y) && date.getMonth() === Number(m) - 1 && date.getDate() === Number(d);
}

function assertTimeZone(timeZone: string): void {
  try {
    new Intl.DateTimeFormat("en", { timeZone });
  } catch {
    throw new PricingError("invalid_period", `unknown time zone ${JSON.stringify(timeZone)}; use an IANA name such as Europe/London`);
  }
}

/**
 * The calendar month `yearMonth` ("2026-03") in `timeZone` as a half-open billing period of UTC
 * instants: local midnight on the 1st to local midnight on the 1st of the next month.
 */
export function calendarMonthPeriod(yearMonth: string, timeZone: string): { start: string; end: string } {
  const match = MONTH_PATTERN.exec(yearMonth);
  const month = match ? Number(match[2]) : 0;
  if (!match || month < 1 || month > 12) {
    throw new PricingError("invalid_period", `billing month must be written YYYY-MM, got ${JSON.stringify(yearMonth)}`);
  }
  assertTimeZone(timeZone);
  const year = Number(match[1]);
  const start = new TZDate(year, month - 1, 1, timeZone);
  const end = new TZDate(year, month, 1, timeZone);
  return { start: new Date(start.getTime()).toISOString(), end: new Date(end.getTime()).toISOString() };
}

// The calendar date `days` after `date` (both YYYY-MM-DD), e.g. a due date from payment terms.
export function addCalendarDays(date: string, days: number): string {
  if (!isCalendarDate(date)) {
    throw new PricingError("invalid_document", `date must be written YYYY-MM-DD, got ${JSON.stringify(date)}`);
  }
  if (!Number.isSafeInteger(days)) {
    throw new PricingError("invalid_document", `days must be a whole number, got ${days}`);
  }
  const [y, m, d] = date.split("-").map(Number);
  return format(addDays(new TZDate(y, m - 1, d, "UTC"), days), "yyyy-MM-dd");
}
