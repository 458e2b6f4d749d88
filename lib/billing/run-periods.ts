// Billing months and the parts a change of contract version splits them into (pure).
//
// Decisions:
// - A billing month is a calendar month in the unit's time zone, as a half-open interval of
//   instants [start, end) (lib/pricing's calendarMonthPeriod).
// - A month during which one contract version ends and the next starts is priced per part: each
//   version prices the cycles delivered while it was in force, under its own rate card, and its
//   volume bands count from zero within its part (two rate cards' bands cannot be added up).
// - The minimum monthly fee of a version that covers only part of the month is pro-rated by the
//   local days it covers (days covered / days in the month, rounded half away from zero to a
//   minor unit); a version that covers the whole month keeps its full minimum fee.

import { TZDate } from "@date-fns/tz";
import { format } from "date-fns";
import { roundHalfAwayFromZero, toSafeNumber } from "@/lib/pricing/money";
import { calendarMonthPeriod } from "@/lib/pricing/period";
import type { VolumeBand } from "@/lib/pricing/types";

const MONTH_PATTERN = /^(\d{4})-(0[1-9]|1[0-2])$/;

export interface Interval {
  /** ISO-8601 instant, inclusive. */
  start: string;
  /** ISO-8601 instant, exclusive. */
  end: string;
}

/** True for a month written YYYY-MM. */
export function isBillingMonth(value: unknown): value is string {
  return typeof value === "string" && MONTH_PATTERN.test(value);
}

/** The local month ("2026-11") an instant falls in. */
export function monthOf(at: Date, timeZone: string): string {
  return format(new TZDate(at.getTime(), timeZone), "yyyy-MM");
}

/** The month `months` after `month` (negative for before). */
export function addMonths(month: string, months: number): string {
  const [y, m] = month.split("-").map(Number) as [number, number];
  const index = y * 12 + (m - 1) + months;
  return `${Math.floor(index / 12)}-${String((index % 12) + 1).padStart(2, "0")}`;
}

/** "2026-11" → "November 2026". */
export function monthLabel(month: string): string {
  const [y, m] = month.split("-").map(Number) as [number, number];
  return new Intl.DateTimeFormat("en-GB", { month: "long", year: "numeric", timeZone: "UTC" }).format(new Date(Date.UTC(y, m - 1, 1)));
}

/** The month as instants in the unit's zone. */
export function billingPeriod(month: string, timeZone: string): Interval {
  return calendarMonthPeriod(month, timeZone);
}

/** The local date (YYYY-MM-DD) of an instant. */
export function localDate(at: string | Date, timeZone: string): string {
  return format(new TZDate(new Date(at).getTime(), timeZone), "yyyy-MM-dd");
}

/** Local days from the first to the last day of an interval, both inclusive. */
export function localDaysIn(interval: Interval, timeZone: string): number {
  const first = localDate(interval.start, timeZone);
  const last = localDate(new Date(new Date(interval.end).getTime() - 1), timeZone);
  return Math.round((Date.parse(`${last}T00:00:00Z`) - Date.parse(`${first}T00:00:00Z`)) / 86_400_000) + 1;
}

/** "1–14 Nov 2026" for a part of a month, in local dates. */
export function partLabel(interval: Interval, timeZone: string): string {
  const first = new TZDate(new Date(interval.start).getTime(), timeZone);
  const last = new TZDate(new Date(interval.end).getTime() - 1, timeZone);
  return `${format(first, "d")}–${format(last, "d MMM yyyy")}`;
}

export interface VersionValidity {
  /** ISO-8601 instant, inclusive. */
  validFrom: string;
  /** ISO-8601 instant, exclusive; null while open-ended. */
  validTo: string | null;
}

export interface PeriodPart<T> extends Interval {
  terms: T;
  /** True when the version covers the whole billing period. */
  wholePeriod: boolean;
}

/**
 * The parts of `period` each version covers (the intersection of the period and the version's
 * validity), in time order. Versions that do not touch the period give no part.
 */
export function splitPeriod<T extends VersionValidity>(period: Interval, versions: readonly T[]): PeriodPart<T>[] {
  const periodStart = Date.parse(period.start);
  const periodEnd = Date.parse(period.end);
  const parts: PeriodPart<T>[] = [];
  for (const terms of versions) {
    const start = Math.max(periodStart, Date.parse(terms.validFrom));
    const end = Math.min(periodEnd, terms.validTo === null ? Number.POSITIVE_INFINITY : Date.parse(terms.validTo));
    if (end <= start) continue;
    parts.push({
      terms,
      start: new Date(start).toISOString(),
      end: new Date(end).toISOString(),
      wholePeriod: start === periodStart && end === periodEnd,
    });
  }
  return parts.sort((a, b) => Date.parse(a.start) - Date.parse(b.start));
}

/** The part an instant falls in, or undefined when no version was in force then. */
export function partAt<T>(parts: readonly PeriodPart<T>[], at: string): PeriodPart<T> | undefined {
  const t = Date.parse(at);
  return parts.find((part) => Date.parse(part.start) <= t && t < Date.parse(part.end));
}

/** The minimum monthly fee for a part of the month: pro-rated by local days covered. */
export function proratedMinimumFee(minimumMinor: number, part: Interval, period: Interval, timeZone: string): number {
  const covered = localDaysIn(part, timeZone);
  const days = localDaysIn(period, timeZone);
  if (covered >= days) return minimumMinor;
  return toSafeNumber(roundHalfAwayFromZero(BigInt(minimumMinor) * BigInt(covered), BigInt(days)), "pro-rated minimum fee");
}

/**
 * The bands of a graduated price for sets counted after `alreadyCounted` sets of the class were
 * billed in the same part: exhausted bands drop out and the limits move down, so the next set is
 * priced at the band its position in the month falls in.
 */
export function continueBands(bands: readonly VolumeBand[], alreadyCounted: number): VolumeBand[] {
  if (alreadyCounted <= 0) return bands.map((band) => ({ ...band }));
  const rest: VolumeBand[] = [];
  for (const band of bands) {
    if (band.upToQuantity === null) {
      rest.push({ upToQuantity: null, unitPriceMinor: band.unitPriceMinor });
    } else if (band.upToQuantity > alreadyCounted) {
      rest.push({ upToQuantity: band.upToQuantity - alreadyCounted, unitPriceMinor: band.unitPriceMinor });
    }
  }
  return rest;
}
