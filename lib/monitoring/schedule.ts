import { DAY_MS, localDayOf } from "@/lib/turnaround/local-time";

// When a recurring check is next due, on the calendar of the unit's time zone. A check done on
// local day D with an interval of N days is due again on day D + N: on that day it is "due", from
// the day after "overdue"; before it "done". A daily check done yesterday is therefore due today
// and overdue tomorrow, whatever the hour it was done. Pure.

export type DueStatus = "done" | "due" | "overdue";

export interface DueState {
  status: DueStatus;
  /** The local date (YYYY-MM-DD) the check is due on; null when it was never done and has no baseline. */
  dueOn: string | null;
  /** Whole local days past the due date (0 unless overdue). */
  daysLate: number;
}

const isoDay = (day: number) => new Date(day * DAY_MS).toISOString().slice(0, 10);

/**
 * The state of a check last done at `lastAt` (or, never done, counted from `since`, e.g. the day the
 * machine was added). Never done and no baseline: overdue.
 */
export function dueState(lastAt: Date | null, intervalDays: number, now: Date, timeZone: string, since: Date | null = null): DueState {
  if (!Number.isInteger(intervalDays) || intervalDays < 1) throw new RangeError("The interval is a whole number of days, at least 1.");
  const from = lastAt ?? since;
  if (!from) return { status: "overdue", dueOn: null, daysLate: 0 };
  const dueDay = localDayOf(timeZone, from.getTime()) + intervalDays;
  const today = localDayOf(timeZone, now.getTime());
  if (today < dueDay) return { status: "done", dueOn: isoDay(dueDay), daysLate: 0 };
  if (today === dueDay) return { status: "due", dueOn: isoDay(dueDay), daysLate: 0 };
  return { status: "overdue", dueOn: isoDay(dueDay), daysLate: today - dueDay };
}

/** The local date (YYYY-MM-DD) of an instant in the zone. */
export function localDate(at: Date, timeZone: string): string {
  return isoDay(localDayOf(timeZone, at.getTime()));
}
