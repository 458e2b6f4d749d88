import { compileCalendar, type CompiledCalendar, type ServiceCalendar } from "./calendar";
import { assertDuration, assertValidDate, TurnaroundError } from "./errors";
import { localDayOf, MINUTE_MS } from "./local-time";
import type { Span } from "./service-days";

// The service clock. Each working interval of each local day becomes a span of real time
// [opening, closing) between the instants the local wall clock first reads its start and its end
// (see wallClockInstant). Service time is real elapsed time inside those spans, so an interval
// crossing a daylight-saving change is as long as the clock on the wall says it was open: on the
// spring-forward day 00:30–03:00 Europe/London lasts 1 h 30 min, on the fall-back day 3 h 30 min,
// and a 24/7 calendar counts every real hour exactly once. Times are kept to the millisecond;
// minutes in and out may be fractional. A day's spans and midnight are worked out once per
// calendar content and remembered (service-days.ts).

// Non-empty working spans in time order, from the local day `fromDay` on. Spans of earlier days
// all close at or before midnight starting `fromDay`. Stops before a day starting at or after
// `untilMs` when given; without a bound, throws when the calendar stays closed for longer than
// its weekly hours and holidays allow.
function* spans(calendar: CompiledCalendar, fromDay: number, untilMs?: number): Generator<Span> {
  const { days, maxClosedRun } = calendar;
  let closedRun = 0;
  for (let day = fromDay; ; day++) {
    if (untilMs !== undefined && days.midnight(day) >= untilMs) return;
    const daySpans = days.spans(day);
    yield* daySpans;
    closedRun = daySpans.length > 0 ? 0 : closedRun + 1;
    if (untilMs === undefined && closedRun > maxClosedRun) {
      throw new TurnaroundError(
        "no_service_time",
        `The service calendar has no working time for ${closedRun} days in a row; check its hours and holidays.`,
      );
    }
  }
}

// The first span that closes after `at` (it contains `at` when it opens at or before it).
function firstSpanClosingAfter(calendar: CompiledCalendar, at: number): Span {
  for (const span of spans(calendar, localDayOf(calendar.timeZone, at))) {
    if (span.closing > at) return span;
  }
  throw new Error("unreachable: spans() ends only with an until bound");
}

/**
 * addServiceTime on a calendar already compiled and arguments already checked: the instant, in
 * epoch milliseconds, by which `minutes` of service time have run after `from`.
 */
export function addCompiledServiceTime(calendar: CompiledCalendar, from: number, minutes: number): number {
  let remaining = Math.round(minutes * MINUTE_MS);
  for (const span of spans(calendar, localDayOf(calendar.timeZone, from))) {
    if (span.closing <= from) continue;
    const opening = Math.max(span.opening, from);
    const length = span.closing - opening;
    if (remaining <= length) return opening + remaining;
    remaining -= length;
  }
  throw new Error("unreachable: spans() ends only with an until bound");
}

/** serviceMinutesBetween on a calendar already compiled, between two epoch-millisecond instants. */
export function compiledServiceMinutesBetween(calendar: CompiledCalendar, a: number, b: number): number {
  if (b <= a) return 0;
  let total = 0;
  for (const span of spans(calendar, localDayOf(calendar.timeZone, a), b)) {
    total += Math.max(0, Math.min(span.closing, b) - Math.max(span.opening, a));
  }
  return total / MINUTE_MS;
}

/** True when the service clock is running at `at`: inside a working interval, not on a holiday. */
export function isOpen(calendar: ServiceCalendar, at: Date): boolean {
  assertValidDate(at, "at");
  const compiled = compileCalendar(calendar);
  return firstSpanClosingAfter(compiled, at.getTime()).opening <= at.getTime();
}

/** `at` itself when the service clock is running then, otherwise the next instant it starts. */
export function nextOpening(calendar: ServiceCalendar, at: Date): Date {
  assertValidDate(at, "at");
  const compiled = compileCalendar(calendar);
  const span = firstSpanClosingAfter(compiled, at.getTime());
  return new Date(Math.max(span.opening, at.getTime()));
}

/**
 * The earliest instant by which `minutes` of service time have run after `start`. A start outside
 * working time counts from the next opening, so 0 minutes gives `nextOpening(start)`; a total
 * that is used up exactly at a closing time gives that closing time, not the next opening.
 */
export function addServiceTime(calendar: ServiceCalendar, start: Date, minutes: number): Date {
  assertValidDate(start, "start");
  assertDuration(minutes, "minutes", "minutes");
  return new Date(addCompiledServiceTime(compileCalendar(calendar), start.getTime(), minutes));
}

/** Service time in minutes that runs between two instants; 0 when `to` is not after `from`. */
export function serviceMinutesBetween(calendar: ServiceCalendar, from: Date, to: Date): number {
  assertValidDate(from, "from");
  assertValidDate(to, "to");
  return compiledServiceMinutesBetween(compileCalendar(calendar), from.getTime(), to.getTime());
}
