import { format } from "date-fns";
import { tz } from "@date-fns/tz";
import { dayNumberOf } from "@/lib/turnaround/calendar";
import { wallClockInstant } from "@/lib/turnaround/local-time";

// The wall-clock text of forms ("2026-12-02T09:30", as a datetime-local field gives it) to and
// from instants, in a named time zone.

const LOCAL_DATE_TIME = /^(\d{4}-\d{2}-\d{2})T([01]\d|2[0-3]):([0-5]\d)$/;

/** The instant a local date and time names, or null when the text is not one. */
export function parseLocalDateTime(text: string, timeZone: string): Date | null {
  const match = LOCAL_DATE_TIME.exec(text.trim());
  if (!match) return null;
  const date = match[1]!;
  const check = new Date(`${date}T00:00:00Z`);
  if (Number.isNaN(check.getTime()) || check.toISOString().slice(0, 10) !== date) return null;
  return new Date(wallClockInstant(timeZone, dayNumberOf(date), Number(match[2]) * 60 + Number(match[3])));
}

/** An instant as the text of a datetime-local field in the zone. */
export function toLocalDateTimeText(at: Date, timeZone: string): string {
  return format(at, "yyyy-MM-dd'T'HH:mm", { in: tz(timeZone) });
}
