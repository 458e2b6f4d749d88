import { wallClockInstant, weekdayOf } from "./local-time";

// Each local day's working spans and its midnight, remembered per calendar content. They are pure
// functions of the time zone, the weekly hours, the holidays and the day, so a remembered value is
// the value computed afresh; calendars with the same content share one store, and a calendar whose
// content changes gets another (the key is the content, never the object). Both levels are
// bounded: the oldest entry goes when a store is full.

/** A stretch of real time [opening, closing), in epoch milliseconds, when the clock runs. */
export interface Span {
  readonly opening: number;
  readonly closing: number;
}

/** What the clock needs of a calendar to work out its days (CompiledCalendar has this shape). */
export interface DayRules {
  readonly timeZone: string;
  /** Working intervals in minutes after local midnight, sorted; index 0 is Sunday. */
  readonly week: ReadonlyArray<ReadonlyArray<readonly [number, number]>>;
  /** Holidays as local day numbers. */
  readonly holidays: ReadonlySet<number>;
}

/** About five and a half years of days per calendar, and this many calendars at once. */
export const MAX_DAYS_PER_CALENDAR = 2048;
export const MAX_CALENDARS = 64;

const NO_SPANS: readonly Span[] = Object.freeze([]);

interface DayEntry {
  midnight?: number;
  spans?: readonly Span[];
}

/** The remembered days of one calendar content. */
export class ServiceDays {
  private readonly days = new Map<number, DayEntry>();
  private readonly rules: DayRules;

  constructor(rules: DayRules) {
    // A copy of its own, so that nothing done to the caller's object reaches the remembered days.
    this.rules = {
      timeZone: rules.timeZone,
      week: rules.week.map((day) => day.map(([start, end]) => [start, end] as const)),
      holidays: new Set(rules.holidays),
    };
  }

  private entry(day: number): DayEntry {
    let entry = this.days.get(day);
    if (entry === undefined) {
      if (this.days.size >= MAX_DAYS_PER_CALENDAR) this.days.delete(this.days.keys().next().value!);
      entry = {};
      this.days.set(day, entry);
    }
    return entry;
  }

  /** The instant the local day starts: wallClockInstant(timeZone, day, 0). */
  midnight(day: number): number {
    const entry = this.entry(day);
    if (entry.midnight === undefined) entry.midnight = wallClockInstant(this.rules.timeZone, day, 0);
    return entry.midnight;
  }

  /**
   * The day's non-empty working spans in time order (none on a holiday): each interval from the
   * first instant the wall clock reads its start to the first instant it reads its end.
   */
  spans(day: number): readonly Span[] {
    const entry = this.entry(day);
    if (entry.spans === undefined) entry.spans = daySpans(this.rules, day);
    return entry.spans;
  }

  /** Days held now (for tests of the bound). */
  get size(): number {
    return this.days.size;
  }
}

// The day's spans worked out afresh.
function daySpans(rules: DayRules, day: number): readonly Span[] {
  if (rules.holidays.has(day)) return NO_SPANS;
  const spans: Span[] = [];
  for (const [start, end] of rules.week[weekdayOf(day)]) {
    const opening = wallClockInstant(rules.timeZone, day, start);
    const closing = wallClockInstant(rules.timeZone, day, end);
    if (closing > opening) spans.push({ opening, closing });
  }
  return spans.length === 0 ? NO_SPANS : spans;
}

const stores = new Map<string, ServiceDays>();

// A key that is equal exactly when the rules are: zone, each weekday's intervals, sorted holidays.
function contentKey(rules: DayRules): string {
  const holidays = [...rules.holidays].sort((a, b) => a - b).join(",");
  return `${rules.timeZone}|${rules.week.map((day) => day.map(([s, e]) => `${s}-${e}`).join(" ")).join("/")}|${holidays}`;
}

/** The store of remembered days for calendars with these rules. */
export function serviceDaysFor(rules: DayRules): ServiceDays {
  const key = contentKey(rules);
  let store = stores.get(key);
  if (store === undefined) {
    if (stores.size >= MAX_CALENDARS) stores.delete(stores.keys().next().value!);
    store = new ServiceDays(rules);
    stores.set(key, store);
  } else {
    // Most recently used last, so a calendar in steady use is not the one that goes.
    stores.delete(key);
    stores.set(key, store);
  }
  return store;
}
