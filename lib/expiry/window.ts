import { parseLocalDateTime } from "@/lib/local-time";
import type { OpeningHours, Weekday } from "@/lib/sites/opening-hours";
import type { ServiceCalendar } from "@/lib/turnaround";
import { addDays, localDateOf } from "./dates";

// The collection window offered when a clinic sends a set back with one click: the site's next
// opening hours, at least an hour from now, preferably while the unit's service clock runs too
// (no out-of-hours collection), three hours long or what is left of the opening.

export interface DefaultWindowInput {
  siteHours: OpeningHours;
  /** The contract's service calendar; windows inside it are preferred. */
  serviceCalendar?: ServiceCalendar | null;
  timeZone: string;
  now: Date;
}

export interface WindowOptions {
  /** Minutes from now before the van can be asked to come (rounded up to the half hour). */
  leadMinutes?: number;
  lengthMinutes?: number;
  /** A window shorter than this is not offered. */
  minimumMinutes?: number;
  /** How many days ahead to look. */
  searchDays?: number;
}

const WEEKDAY_BY_UTC_DAY: Weekday[] = ["sun", "mon", "tue", "wed", "thu", "fri", "sat"];
const MINUTE = 60_000;

interface Span {
  start: number;
  end: number;
}

function weekdayOfDate(date: string): Weekday {
  return WEEKDAY_BY_UTC_DAY[new Date(`${date}T00:00:00Z`).getUTCDay()]!;
}

// The real-time span of "HH:MM"–"HH:MM" on a local date ("24:00" is the next midnight).
function spanOf(date: string, start: string, end: string, timeZone: string): Span | null {
  const from = parseLocalDateTime(`${date}T${start}`, timeZone);
  const until = end === "24:00" ? parseLocalDateTime(`${addDays(date, 1)}T00:00`, timeZone) : parseLocalDateTime(`${date}T${end}`, timeZone);
  return from && until && until > from ? { start: from.getTime(), end: until.getTime() } : null;
}

function siteSpans(hours: OpeningHours, date: string, timeZone: string): Span[] {
  return (hours[weekdayOfDate(date)] ?? [])
    .map((i) => spanOf(date, i.start, i.end, timeZone))
    .filter((s): s is Span => s !== null)
    .sort((a, b) => a.start - b.start);
}

function calendarSpans(calendar: ServiceCalendar, date: string): Span[] {
  if (calendar.holidays.includes(date)) return [];
  return (calendar.hours[weekdayOfDate(date)] ?? [])
    .map((i) => spanOf(date, i.start, i.end, calendar.timeZone))
    .filter((s): s is Span => s !== null);
}

function intersect(a: Span[], b: Span[]): Span[] {
  const out: Span[] = [];
  for (const x of a) {
    for (const y of b) {
      const start = Math.max(x.start, y.start);
      const end = Math.min(x.end, y.end);
      if (end > start) out.push({ start, end });
    }
  }
  return out.sort((p, q) => p.start - q.start);
}

/** The default collection window, or null when the site is closed for the whole search period. */
export function defaultPickupWindow(input: DefaultWindowInput, options: WindowOptions = {}): { from: Date; until: Date } | null {
  const lead = options.leadMinutes ?? 60;
  const length = options.lengthMinutes ?? 180;
  const minimum = options.minimumMinutes ?? 60;
  const searchDays = options.searchDays ?? 14;
  const halfHour = 30 * MINUTE;
  const earliest = Math.ceil((input.now.getTime() + lead * MINUTE) / halfHour) * halfHour;
  const today = localDateOf(input.now, input.timeZone);

  const firstFit = (spansOfDay: (date: string) => Span[]) => {
    for (let day = 0; day <= searchDays; day++) {
      for (const span of spansOfDay(addDays(today, day))) {
        const start = Math.max(span.start, earliest);
        if (span.end - start >= minimum * MINUTE) return { from: new Date(start), until: new Date(Math.min(span.end, start + length * MINUTE)) };
      }
    }
    return null;
  };

  const calendar = input.serviceCalendar;
  const inServiceHours = calendar ? firstFit((date) => intersect(siteSpans(input.siteHours, date, input.timeZone), calendarSpans(calendar, date))) : null;
  return inServiceHours ?? firstFit((date) => siteSpans(input.siteHours, date, input.timeZone));
}
