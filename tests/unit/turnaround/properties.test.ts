import { tzScan } from "@date-fns/tz";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  addServiceTime,
  isOpen,
  nextOpening,
  serviceMinutesBetween,
  WEEKDAYS,
  type ServiceCalendar,
  type Weekday,
  type WorkingInterval,
} from "@/lib/turnaround";
import { allWeek } from "./fixtures";

// Zones with the awkward cases: one-hour changes at 01:00 UTC (London), at 02:00 local (New York),
// at local midnight (Santiago), half-hour changes (Lord Howe), 45-minute offsets (Chatham) and
// no changes at all (UTC, Kolkata).
const ZONES = [
  "Europe/London",
  "America/New_York",
  "America/Santiago",
  "Australia/Lord_Howe",
  "Pacific/Chatham",
  "Asia/Kolkata",
  "UTC",
];
const FROM = Date.UTC(2025, 0, 1);
const TO = Date.UTC(2028, 0, 1);
const MINUTE = 60_000;
const DAY = 86_400_000;

const hhmm = (minutes: number) =>
  `${String(Math.floor(minutes / 60)).padStart(2, "0")}:${String(minutes % 60).padStart(2, "0")}`;

// A day's intervals from an even number of distinct cut points between 00:00 and 24:00.
const dayHours = fc
  .uniqueArray(fc.oneof(fc.integer({ min: 0, max: 96 }).map((q) => q * 15), fc.integer({ min: 0, max: 1440 })), {
    maxLength: 6,
  })
  .map((cuts) => {
    const sorted = [...cuts].sort((a, b) => a - b);
    const intervals: WorkingInterval[] = [];
    for (let k = 0; k + 1 < sorted.length; k += 2) intervals.push({ start: hhmm(sorted[k]), end: hhmm(sorted[k + 1]) });
    return intervals;
  });

const isoDay = (day: number) => new Date(day * DAY).toISOString().slice(0, 10);

const calendarArb: fc.Arbitrary<ServiceCalendar> = fc
  .record({
    timeZone: fc.constantFrom(...ZONES),
    week: fc.array(dayHours, { minLength: 7, maxLength: 7 }),
    holidays: fc.uniqueArray(fc.integer({ min: FROM / DAY, max: TO / DAY }), { maxLength: 40 }),
  })
  .filter(({ week }) => week.some((intervals) => intervals.length > 0))
  .map(({ timeZone, week, holidays }) => ({
    timeZone,
    hours: Object.fromEntries(WEEKDAYS.map((day, k) => [day, week[k]])) as Record<Weekday, WorkingInterval[]>,
    holidays: holidays.map(isoDay),
  }));

// Instants anywhere in 2025–2027, or within a day of one of the zone's clock changes.
const changesByZone = new Map(
  ZONES.map((zone) => [zone, tzScan(zone, { start: new Date(FROM), end: new Date(TO) }).map((c) => c.date.getTime())]),
);
const instantNearChanges = (zone: string) => {
  const changes = changesByZone.get(zone) ?? [];
  const anywhere = fc.integer({ min: FROM, max: TO });
  if (changes.length === 0) return anywhere;
  return fc.oneof(
    anywhere,
    fc
      .tuple(fc.constantFrom(...changes), fc.integer({ min: -DAY, max: DAY }))
      .map(([change, shift]) => change + shift),
  );
};

const toMinutes = (text: string) => Number(text.slice(0, 2)) * 60 + Number(text.slice(3));
const weeklyMinutes = (calendar: ServiceCalendar) =>
  WEEKDAYS.flatMap((day) => calendar.hours[day]).reduce((sum, i) => sum + toMinutes(i.end) - toMinutes(i.start), 0);

const caseArb = calendarArb.chain((calendar) => {
  // Up to about four weeks of the calendar's working time, so sparse calendars stay quick.
  const most = Math.min(20_000, 4 * weeklyMinutes(calendar));
  return fc.record({
    calendar: fc.constant(calendar),
    start: instantNearChanges(calendar.timeZone).map((ms) => new Date(ms)),
    // Whole minutes, and sometimes a millisecond-precise amount.
    minutes: fc.oneof(
      fc.integer({ min: 0, max: most }),
      fc.integer({ min: 0, max: most * MINUTE }).map((ms) => ms / MINUTE),
    ),
    moreMinutes: fc.integer({ min: 0, max: most }),
  });
});

describe("turnaround clock properties", () => {
  it("measures back exactly the service time it added", () => {
    fc.assert(
      fc.property(caseArb, ({ calendar, start, minutes }) => {
        const end = addServiceTime(calendar, start, minutes);
        expect(end.getTime()).toBeGreaterThanOrEqual(start.getTime());
        expect(serviceMinutesBetween(calendar, start, end)).toBe(minutes);
      }),
    );
  });

  it("lands on working time: at an opening for 0 minutes, just after open time otherwise", () => {
    fc.assert(
      fc.property(caseArb, ({ calendar, start, minutes }) => {
        const end = addServiceTime(calendar, start, minutes);
        if (minutes === 0) {
          expect(end).toEqual(nextOpening(calendar, start));
          expect(isOpen(calendar, end)).toBe(true);
        } else {
          expect(isOpen(calendar, new Date(end.getTime() - 1))).toBe(true);
        }
      }),
    );
  });

  it("never moves the due time earlier for more minutes or a later start", () => {
    fc.assert(
      fc.property(
        caseArb,
        fc.integer({ min: 0, max: 3 * DAY }),
        ({ calendar, start, minutes, moreMinutes }, later) => {
          const due = addServiceTime(calendar, start, minutes).getTime();
          expect(addServiceTime(calendar, start, minutes + moreMinutes).getTime()).toBeGreaterThanOrEqual(due);
          expect(addServiceTime(calendar, new Date(start.getTime() + later), minutes).getTime()).toBeGreaterThanOrEqual(
            due,
          );
        },
      ),
    );
  });

  it("adds up over consecutive stretches and never exceeds real time", () => {
    fc.assert(
      fc.property(
        calendarArb,
        fc.integer({ min: FROM, max: TO }),
        fc.integer({ min: 0, max: 4 * DAY }),
        fc.integer({ min: 0, max: 4 * DAY }),
        (calendar, a, ab, bc) => {
          const [from, middle, to] = [a, a + ab, a + ab + bc].map((ms) => new Date(ms));
          const whole = serviceMinutesBetween(calendar, from, to);
          const parts = serviceMinutesBetween(calendar, from, middle) + serviceMinutesBetween(calendar, middle, to);
          expect(Math.round(parts * MINUTE)).toBe(Math.round(whole * MINUTE));
          expect(whole).toBeLessThanOrEqual((ab + bc) / MINUTE);
        },
      ),
    );
  });

  it("counts every real minute on a 24/7 calendar, across clock changes", () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...ZONES).chain((zone) =>
          fc.tuple(fc.constant(zone), instantNearChanges(zone), fc.integer({ min: 0, max: 3 * DAY })),
        ),
        ([zone, from, length]) => {
          const calendar = allWeek(zone);
          expect(serviceMinutesBetween(calendar, new Date(from), new Date(from + length))).toBe(length / MINUTE);
          expect(addServiceTime(calendar, new Date(from), length / MINUTE).getTime()).toBe(from + length);
        },
      ),
    );
  });

  // Oracle for zones without clock changes: sample each minute's wall-clock reading with a fixed
  // offset (UTC +0; Asia/Kolkata +05:30 all year, from memory) and test it against the calendar.
  it("agrees minute by minute with a direct reading of the calendar where offsets are fixed", () => {
    const fixedOffsetMinutes: Record<string, number> = { UTC: 0, "Asia/Kolkata": 330 };
    const sundayFirst: Weekday[] = ["sun", "mon", "tue", "wed", "thu", "fri", "sat"];
    fc.assert(
      fc.property(
        calendarArb.map((c) => ({ ...c, timeZone: c.timeZone === "UTC" ? "UTC" : "Asia/Kolkata" })),
        fc.integer({ min: FROM / MINUTE, max: TO / MINUTE }),
        fc.integer({ min: 0, max: 3 * 1440 }),
        (calendar, fromMinute, length) => {
          const offset = fixedOffsetMinutes[calendar.timeZone];
          const holidays = new Set(calendar.holidays);
          let open = 0;
          for (let m = fromMinute; m < fromMinute + length; m++) {
            const wall = new Date((m + offset) * MINUTE);
            if (holidays.has(wall.toISOString().slice(0, 10))) continue;
            const minuteOfDay = wall.getUTCHours() * 60 + wall.getUTCMinutes();
            const intervals = calendar.hours[sundayFirst[wall.getUTCDay()]];
            if (intervals.some((i) => toMinutes(i.start) <= minuteOfDay && minuteOfDay < toMinutes(i.end))) open++;
          }
          const from = new Date(fromMinute * MINUTE);
          const to = new Date((fromMinute + length) * MINUTE);
          expect(serviceMinutesBetween(calendar, from, to)).toBe(open);
        },
      ),
      { numRuns: 60 },
    );
  });
});
