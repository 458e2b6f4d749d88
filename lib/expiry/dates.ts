import { tz } from "@date-fns/tz";
import { format } from "date-fns";

// Calendar dates of sterile packs. An expiry date ("use by", as printed on the label) is a local
// date of the unit's time zone; the pack may be used up to and including that date and is expired
// from the next day on (common practice for a use-by date; the unit's validated procedures and
// local regulations decide).

const DATE = /^\d{4}-\d{2}-\d{2}$/;

/** The local calendar date "YYYY-MM-DD" of an instant in the zone. */
export function localDateOf(at: Date, timeZone: string): string {
  return format(at, "yyyy-MM-dd", { in: tz(timeZone) });
}

/** A date `days` after (or before, when negative) the given "YYYY-MM-DD" date. */
export function addDays(date: string, days: number): string {
  if (!DATE.test(date)) throw new RangeError(`Not a date: ${date}`);
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** Whole days from `from` to `to` (negative when `to` is earlier). */
export function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000);
}

export type ExpiryStatus = "expired" | "today" | "soon" | "later";

/** Where a pack expiring on `expiresOn` stands on `today`, and how many days it has left. */
export function expiryStatus(expiresOn: string, today: string, soonDays: number): { status: ExpiryStatus; daysLeft: number } {
  const daysLeft = daysBetween(today, expiresOn);
  if (daysLeft < 0) return { status: "expired", daysLeft };
  if (daysLeft === 0) return { status: "today", daysLeft };
  return { status: daysLeft <= soonDays ? "soon" : "later", daysLeft };
}

/** "Expired 3 days ago", "Expires today", "Expires in 1 day". */
export function expiryPhrase(daysLeft: number): string {
  if (daysLeft < 0) return `Expired ${-daysLeft === 1 ? "yesterday" : `${-daysLeft} days ago`}`;
  if (daysLeft === 0) return "Expires today";
  return `Expires in ${daysLeft} ${daysLeft === 1 ? "day" : "days"}`;
}

/** "10 Dec 2026" for a "YYYY-MM-DD" date. */
export function formatLocalDate(date: string): string {
  return format(new Date(`${date}T12:00:00Z`), "d MMM yyyy", { in: tz("UTC") });
}
