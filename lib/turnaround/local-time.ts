import { tzOffset } from "@date-fns/tz";

// Converting between instants (epoch milliseconds) and local wall-clock times of a time zone.
// Local dates are day numbers: days since 1970-01-01, the day the local calendar shows.

export const MINUTE_MS = 60_000;
export const DAY_MS = 86_400_000;

// True when the runtime knows the IANA time zone name.
export function isKnownTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone });
    return true;
  } catch {
    return false;
  }
}

// UTC offset in milliseconds of the time zone at an instant (positive east of Greenwich).
export function offsetMs(timeZone: string, epochMs: number): number {
  return Math.round(tzOffset(timeZone, new Date(epochMs)) * MINUTE_MS);
}

// The local day number the wall clock shows at an instant.
export function localDayOf(timeZone: string, epochMs: number): number {
  return Math.floor((epochMs + offsetMs(timeZone, epochMs)) / DAY_MS);
}

// Weekday of a day number, 0 = Sunday as Date.getUTCDay (1970-01-01 was a Thursday).
export function weekdayOf(day: number): number {
  return (((day + 4) % 7) + 7) % 7;
}

/**
 * The first instant at which the local wall clock reads `minuteOfDay` (0–1440) of local day `day`
 * or later. On an ordinary day that is the instant the clock shows that time. When the time is
 * skipped by a spring-forward change, it is the instant of the change (the clock jumps past it);
 * when it occurs twice after a fall-back change, it is the first occurrence. Minute 1440 is
 * midnight at the start of the next day. The result never decreases as (day, minuteOfDay) grows.
 */
export function wallClockInstant(timeZone: string, day: number, minuteOfDay: number): number {
  // The instant whose UTC reading equals the wall-clock reading we want.
  const asIfUtc = day * DAY_MS + minuteOfDay * MINUTE_MS;
  // No zone changes its offset twice within two days, so the offsets one day either side are the
  // only candidates.
  const before = offsetMs(timeZone, asIfUtc - DAY_MS);
  const after = offsetMs(timeZone, asIfUtc + DAY_MS);
  let found = Number.POSITIVE_INFINITY;
  for (const offset of before === after ? [before] : [before, after]) {
    const candidate = asIfUtc - offset;
    if (offsetMs(timeZone, candidate) === offset) found = Math.min(found, candidate);
  }
  if (found !== Number.POSITIVE_INFINITY) return found;
  if (after <= before) {
    throw new RangeError(`No offset of ${timeZone} places local minute ${minuteOfDay} of day ${day}.`);
  }
  // The time falls into a spring-forward gap: find the change, the first instant with the new
  // offset, between the two readings (still on the old offset at `low`, on the new one at `high`).
  let low = asIfUtc - after;
  let high = asIfUtc - before;
  while (high - low > 1) {
    const middle = Math.floor((low + high) / 2);
    if (offsetMs(timeZone, middle) === after) high = middle;
    else low = middle;
  }
  return high;
}
