import { dayNumberOf } from "@/lib/turnaround/calendar";
import { DAY_MS, localDayOf, offsetMs, wallClockInstant, weekdayOf } from "@/lib/turnaround/local-time";

// The calendar of the reports (pure): local dates, weeks and months of the unit's time zone.
//
// Decisions:
// - A week runs Monday 00:00 to the next Monday 00:00 local time (ISO 8601) and is named by the
//   local date of its Monday; a month is a calendar month of the local calendar. A week or month
//   that holds a change of clock is 1 hour shorter or longer in real time, never split.
// - A report period is given as local dates from–to, both inclusive: from 00:00 local on the
//   first day to 00:00 local on the day after the last.

export type Grain = "day" | "week" | "month";

export interface Instants {
  /** ISO-8601 instant, inclusive. */
  start: string;
  /** ISO-8601 instant, exclusive. */
  end: string;
}

const DATE = /^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;

/** True for a real calendar date written YYYY-MM-DD. */
export function isLocalDate(text: string): boolean {
  if (!DATE.test(text)) return false;
  return new Date(`${text}T00:00:00Z`).toISOString().slice(0, 10) === text;
}

/** The local date of a day number (days since 1970-01-01). */
export function dateOfDay(day: number): string {
  return new Date(day * DAY_MS).toISOString().slice(0, 10);
}

/** The local date (YYYY-MM-DD) the wall clock of the zone shows at an instant. */
export function localDateAt(at: string | Date | number, timeZone: string): string {
  const ms = typeof at === "number" ? at : new Date(at).getTime();
  return dateOfDay(localDayOf(timeZone, ms));
}

/** The date `days` after a local date (negative for before). */
export function addLocalDays(date: string, days: number): string {
  return dateOfDay(dayNumberOf(date) + days);
}

/** The Monday (local date) of the week a local date lies in. */
export function weekStartOf(date: string): string {
  const day = dayNumberOf(date);
  return dateOfDay(day - ((weekdayOf(day) + 6) % 7));
}

/** The bucket of an instant: its local date, the Monday of its week, or its month "YYYY-MM". */
export function bucketOf(at: string | Date | number, grain: Grain, timeZone: string): string {
  const date = localDateAt(at, timeZone);
  if (grain === "day") return date;
  if (grain === "week") return weekStartOf(date);
  return date.slice(0, 7);
}

/** The local hour of day (0–23) at an instant. */
export function localHourAt(at: string | Date | number, timeZone: string): number {
  const ms = typeof at === "number" ? at : new Date(at).getTime();
  const local = ms + offsetMs(timeZone, ms);
  return Math.floor((((local % DAY_MS) + DAY_MS) % DAY_MS) / 3_600_000);
}

/** The instants of local dates from–to, both inclusive. */
export function localDateRange(from: string, to: string, timeZone: string): Instants {
  return {
    start: new Date(wallClockInstant(timeZone, dayNumberOf(from), 0)).toISOString(),
    end: new Date(wallClockInstant(timeZone, dayNumberOf(to) + 1, 0)).toISOString(),
  };
}

/** Every bucket key from the bucket of `from` to the bucket of `to`, in order (empty buckets too). */
export function bucketsBetween(from: string, to: string, grain: Grain): string[] {
  const keys: string[] = [];
  if (grain === "month") {
    let [y, m] = from.slice(0, 7).split("-").map(Number) as [number, number];
    const last = to.slice(0, 7);
    for (;;) {
      const key = `${y}-${String(m).padStart(2, "0")}`;
      keys.push(key);
      if (key >= last) break;
      m += 1;
      if (m > 12) {
        m = 1;
        y += 1;
      }
    }
    return keys;
  }
  const step = grain === "week" ? 7 : 1;
  const first = grain === "week" ? weekStartOf(from) : from;
  for (let day = dayNumberOf(first); day <= dayNumberOf(to); day += step) keys.push(dateOfDay(day));
  return keys;
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** A short label of a bucket key: "26 Oct 2026", "wk 26 Oct 2026", "Oct 2026". */
export function bucketLabel(key: string, grain: Grain): string {
  const year = key.slice(0, 4);
  const month = MONTHS[Number(key.slice(5, 7)) - 1];
  if (grain === "month") return `${month} ${year}`;
  const day = String(Number(key.slice(8, 10)));
  return grain === "week" ? `wk ${day} ${month} ${year}` : `${day} ${month} ${year}`;
}
