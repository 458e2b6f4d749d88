import { tzScan } from "@date-fns/tz";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  addServiceTime,
  cycleClock,
  cycleTurnaround,
  serviceMinutesBetween,
  turnaroundOutcome,
  TurnaroundError,
  WEEKDAYS,
  type ServiceCalendar,
  type TurnaroundOutcome,
  type Weekday,
  type WorkingInterval,
} from "@/lib/turnaround";
import { compileCalendar } from "@/lib/turnaround/calendar";
import { localDayOf, MINUTE_MS, wallClockInstant, weekdayOf } from "@/lib/turnaround/local-time";
import { MAX_DAYS_PER_CALENDAR } from "@/lib/turnaround/service-days";
import { allWeek, weekdaysEightToSix } from "./fixtures";

// The clock remembers each calendar's working spans per local day. These checks compare it with a
// plain computation that works every day out afresh from the calendar's text, over random
// calendars with holidays, random instants and the days around clock changes.

const DAY = 86_400_000;
const FROM = Date.UTC(2025, 0, 1);
const TO = Date.UTC(2028, 0, 1);
// London and New York change by an hour (at 01:00 UTC, at 02:00 local), Santiago at local
// midnight, Lord Howe by half an hour.
const ZONES = ["Europe/London", "America/New_York", "America/Santiago", "Australia/Lord_Howe"];
const SUNDAY_FIRST: Weekday[] = ["sun", "mon", "tue", "wed", "thu", "fri", "sat"];

const minutesOf = (text: string) => Number(text.slice(0, 2)) * 60 + Number(text.slice(3, 5));
const isoDay = (day: number) => new Date(day * DAY).toISOString().slice(0, 10);

// The reference: every day's spans from the calendar's text, nothing kept between calls. The
// calendar's own rule: each interval runs from the first instant the wall clock reads its start to
// the first instant it reads its end; holidays are closed; service time is real time inside.
function* referenceSpans(calendar: ServiceCalendar, fromDay: number, untilMs?: number) {
  const holidays = new Set(calendar.holidays);
  for (let day = fromDay; day < fromDay + 3660; day++) {
    if (untilMs !== undefined && wallClockInstant(calendar.timeZone, day, 0) >= untilMs) return;
    if (holidays.has(isoDay(day))) continue;
    const intervals = [...calendar.hours[SUNDAY_FIRST[weekdayOf(day)]]].sort((a, b) => minutesOf(a.start) - minutesOf(b.start));
    for (const { start, end } of intervals) {
      const opening = wallClockInstant(calendar.timeZone, day, minutesOf(start));
      const closing = wallClockInstant(calendar.timeZone, day, minutesOf(end));
      if (closing > opening) yield { opening, closing };
    }
  }
  throw new Error("reference: no working time within ten years");
}

function referenceAdd(calendar: ServiceCalendar, from: number, minutes: number): number {
  let remaining = Math.round(minutes * MINUTE_MS);
  for (const span of referenceSpans(calendar, localDayOf(calendar.timeZone, from))) {
    if (span.closing <= from) continue;
    const opening = Math.max(span.opening, from);
    if (remaining <= span.closing - opening) return opening + remaining;
    remaining -= span.closing - opening;
  }
  throw new Error("unreachable");
}

function referenceBetween(calendar: ServiceCalendar, a: number, b: number): number {
  if (b <= a) return 0;
  let total = 0;
  for (const span of referenceSpans(calendar, localDayOf(calendar.timeZone, a), b)) {
    total += Math.max(0, Math.min(span.closing, b) - Math.max(span.opening, a));
  }
  return total / MINUTE_MS;
}

function referenceOutcome(calendar: ServiceCalendar, started: number, finished: number, hours: number): TurnaroundOutcome {
  const due = referenceAdd(calendar, started, hours * 60);
  const late = finished > due;
  return {
    dueAt: new Date(due),
    late,
    lateByMinutes: late ? Math.ceil((finished - due) / MINUTE_MS) : 0,
    lateByServiceMinutes: late ? Math.ceil(referenceBetween(calendar, due, finished)) : 0,
  };
}

const hhmm = (minutes: number) => `${String(Math.floor(minutes / 60)).padStart(2, "0")}:${String(minutes % 60).padStart(2, "0")}`;

// A day's intervals from an even number of distinct cut points; often cut near 01:00–03:00, where
// the clocks change.
const dayHours = fc
  .uniqueArray(
    fc.oneof(
      fc.integer({ min: 0, max: 96 }).map((q) => q * 15),
      fc.integer({ min: 0, max: 1440 }),
      fc.integer({ min: 0, max: 240 }),
    ),
    { maxLength: 6 },
  )
  .map((cuts) => {
    const sorted = [...cuts].sort((a, b) => a - b);
    const intervals: WorkingInterval[] = [];
    for (let k = 0; k + 1 < sorted.length; k += 2) intervals.push({ start: hhmm(sorted[k]), end: hhmm(sorted[k + 1]) });
    return intervals;
  });

const changesByZone = new Map(
  ZONES.map((zone) => [zone, tzScan(zone, { start: new Date(FROM), end: new Date(TO) }).map((c) => c.date.getTime())]),
);

// Instants anywhere in 2025–2027 or within two days of one of the zone's clock changes.
const instantIn = (zone: string) =>
  fc.oneof(
    fc.integer({ min: FROM, max: TO }),
    fc.tuple(fc.constantFrom(...changesByZone.get(zone)!), fc.integer({ min: -2 * DAY, max: 2 * DAY })).map(([c, shift]) => c + shift),
  );

const caseArb = fc.constantFrom(...ZONES).chain((timeZone) =>
  fc
    .record({
      week: fc.array(dayHours, { minLength: 7, maxLength: 7 }),
      start: instantIn(timeZone),
      // Holidays anywhere, and on the days of the zone's clock changes.
      holidays: fc.uniqueArray(
        fc.oneof(
          fc.integer({ min: FROM / DAY, max: TO / DAY }),
          fc.constantFrom(...changesByZone.get(timeZone)!).map((c) => localDayOf(timeZone, c)),
        ),
        { maxLength: 30 },
      ),
      hours: fc.oneof(fc.integer({ min: 1, max: 120 }), fc.double({ min: 0.01, max: 72, noNaN: true })),
      finishAfter: fc.integer({ min: 0, max: 10 * DAY }),
    })
    .filter(({ week }) => week.some((intervals) => intervals.length > 0))
    .map(({ week, holidays, ...rest }) => ({
      ...rest,
      calendar: {
        timeZone,
        hours: Object.fromEntries(WEEKDAYS.map((day, k) => [day, week[k]])) as Record<Weekday, WorkingInterval[]>,
        holidays: holidays.map(isoDay),
      } satisfies ServiceCalendar,
    })),
);

describe("the clock's remembered days agree with a computation afresh", () => {
  it("gives the same due time, verdict and lateness as the reference", () => {
    fc.assert(
      fc.property(caseArb, ({ calendar, start, hours, finishAfter }) => {
        const finish = start + finishAfter;
        const expected = referenceOutcome(calendar, start, finish, hours);
        expect(turnaroundOutcome({ calendar, startedAt: new Date(start), finishedAt: new Date(finish), turnaroundHours: hours })).toEqual(expected);
        expect(addServiceTime(calendar, new Date(start), hours * 60).getTime()).toBe(expected.dueAt.getTime());
        expect(serviceMinutesBetween(calendar, new Date(start), new Date(finish))).toBe(referenceBetween(calendar, start, finish));
      }),
      { numRuns: 300 },
    );
  });

  it("gives the same verdicts through one clock for many cycles as cycle by cycle", () => {
    fc.assert(
      fc.property(
        caseArb,
        fc.array(fc.tuple(fc.integer({ min: -30 * DAY, max: 30 * DAY }), fc.integer({ min: 0, max: 6 * DAY }), fc.boolean()), {
          minLength: 1,
          maxLength: 20,
        }),
        ({ calendar, start }, cycles) => {
          const terms = { serviceCalendar: calendar, turnaroundHours: { standard: 24, express: 5 }, clockStopsAt: "delivered" as const };
          const clock = cycleClock(terms);
          for (const [shift, length, express] of cycles) {
            const received = start + shift;
            const times = {
              serviceLevel: express ? ("express" as const) : ("standard" as const),
              receivedAt: new Date(received).toISOString(),
              releasedAt: null,
              deliveredAt: new Date(received + length).toISOString(),
            };
            const expected = referenceOutcome(calendar, received, received + length, express ? 5 : 24);
            expect(clock(times)).toEqual(expected);
            expect(cycleTurnaround(times, terms)).toEqual(expected);
          }
        },
      ),
      { numRuns: 100 },
    );
  });
});

describe("what the clock remembers", () => {
  // Sunday 29 March 2026, the spring-forward day in London (01:00 UTC; UK clocks go forward on the
  // last Sunday of March, from memory): received 08:00 BST. Due times below worked by hand.
  const received = Date.parse("2026-03-29T07:00:00Z");

  it("never answers from the days of a calendar whose content changed in place", () => {
    const calendar = allWeek();
    const before = addServiceTime(calendar, new Date(received), 60).getTime();
    expect(before).toBe(referenceAdd(calendar, received, 60));
    calendar.holidays.push("2026-03-29");
    const after = addServiceTime(calendar, new Date(received), 60).getTime();
    expect(after).toBe(referenceAdd(calendar, received, 60));
    // The day is a holiday now: the hour runs from Monday 00:00 BST (Sunday 23:00 UTC).
    expect(new Date(after).toISOString()).toBe("2026-03-30T00:00:00.000Z");
  });

  it("keeps calendars that differ only in a holiday or an interval apart", () => {
    const plain = weekdaysEightToSix();
    const withHoliday = weekdaysEightToSix(["2026-03-30"]);
    const later = { ...weekdaysEightToSix(), hours: { ...weekdaysEightToSix().hours, mon: [{ start: "09:00", end: "18:00" }] } };
    for (const calendar of [plain, withHoliday, later, plain, withHoliday, later]) {
      expect(addServiceTime(calendar, new Date(received), 120).getTime()).toBe(referenceAdd(calendar, received, 120));
    }
    // Monday 30 March 2026 10:00 BST; 10:00 BST on Tuesday after the Monday holiday; 11:00 BST when
    // Monday opens at 09:00.
    expect(addServiceTime(plain, new Date(received), 120).toISOString()).toBe("2026-03-30T09:00:00.000Z");
    expect(addServiceTime(withHoliday, new Date(received), 120).toISOString()).toBe("2026-03-31T09:00:00.000Z");
    expect(addServiceTime(later, new Date(received), 120).toISOString()).toBe("2026-03-30T10:00:00.000Z");
  });

  it(`holds at most ${MAX_DAYS_PER_CALENDAR} days per calendar and still answers right beyond them`, () => {
    const calendar: ServiceCalendar = { ...weekdaysEightToSix(["2025-12-25", "2031-12-25"]), timeZone: "America/New_York" };
    const from = Date.UTC(2025, 0, 1);
    const to = Date.UTC(2032, 0, 1); // about 2,550 days
    expect(serviceMinutesBetween(calendar, new Date(from), new Date(to))).toBe(referenceBetween(calendar, from, to));
    expect(compileCalendar(calendar).days.size).toBeLessThanOrEqual(MAX_DAYS_PER_CALENDAR);
    // The first days were let go; asking again works them out afresh.
    expect(serviceMinutesBetween(calendar, new Date(from), new Date(from + 30 * DAY))).toBe(referenceBetween(calendar, from, from + 30 * DAY));
  });

  it("checks the calendar of a shared clock on each cycle it measures, and not for a clock still running", () => {
    const broken = { ...weekdaysEightToSix(), timeZone: "Europe/Nowhere" };
    const clock = cycleClock({ serviceCalendar: broken, turnaroundHours: { standard: 24, express: 5 }, clockStopsAt: "released" });
    const running = { serviceLevel: "standard" as const, receivedAt: "2026-03-30T08:00:00.000Z", releasedAt: null, deliveredAt: null };
    const stopped = { ...running, releasedAt: "2026-03-31T08:00:00.000Z" };
    expect(clock(running)).toBeNull();
    for (let k = 0; k < 2; k++) {
      expect(() => clock(stopped)).toThrow(TurnaroundError);
      expect(() => clock(stopped)).toThrow(/timeZone "Europe\/Nowhere" is not a time zone this system knows/);
    }
  });
});
