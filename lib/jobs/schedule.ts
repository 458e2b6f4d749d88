import { tz } from "@date-fns/tz";
import { format, getISOWeek, getISOWeekYear } from "date-fns";
import { parseLocalDateTime } from "@/lib/local-time";

// When periodic jobs fall due, in the unit's wall-clock time. Pure: no I/O.
//
// A period is named by a key that sorts in time order ("2026-W49" for a week), so the scheduler
// can tell a period already done from a newer one by comparing keys.

export interface Period {
  /** Sortable name of the period, e.g. "2026-W49". */
  key: string;
  /** The instant the period's run was scheduled for. */
  scheduledAt: Date;
}

/** The ISO 8601 week of a calendar date "YYYY-MM-DD", as "YYYY-Www" (week-numbering year). */
export function isoWeekKey(date: string): string {
  const noon = new Date(`${date}T12:00:00Z`);
  const utc = { in: tz("UTC") };
  return `${getISOWeekYear(noon, utc)}-W${String(getISOWeek(noon, utc)).padStart(2, "0")}`;
}

function addDays(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/**
 * The latest weekly slot at or before `now`: ISO weekday `isoWeekday` (1 = Monday … 7 = Sunday)
 * at the local time `time` ("HH:MM") in `timeZone`, named by the ISO week it falls in.
 */
export function weeklyPeriod(now: Date, timeZone: string, isoWeekday = 1, time = "07:00"): Period {
  if (!Number.isInteger(isoWeekday) || isoWeekday < 1 || isoWeekday > 7) throw new RangeError(`isoWeekday must be 1 to 7, got ${isoWeekday}`);
  if (!/^([01]\d|2[0-3]):[0-5]\d$/.test(time)) throw new RangeError(`time must be HH:MM, got ${time}`);
  const today = format(now, "yyyy-MM-dd", { in: tz(timeZone) });
  const todayIso = Number(format(now, "i", { in: tz(timeZone) }));
  let day = addDays(today, isoWeekday - todayIso);
  let at = parseLocalDateTime(`${day}T${time}`, timeZone)!;
  if (at.getTime() > now.getTime()) {
    day = addDays(day, -7);
    at = parseLocalDateTime(`${day}T${time}`, timeZone)!;
  }
  return { key: isoWeekKey(day), scheduledAt: at };
}
