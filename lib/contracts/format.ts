import type { SurchargeKind } from "@/lib/pricing/types";
import type { ContractStatus } from "./dates";

// The words and number formats of contracts, shared by the unit's and the clinics' screens.

export const SURCHARGE_KIND_LABELS: Record<SurchargeKind, string> = {
  express: "Express turnaround",
  out_of_hours: "Out-of-hours collection",
  heavy_soil: "Heavy soil or no pre-clean",
  missing_instrument_investigation: "Missing-instrument investigation",
  low_temperature: "Low-temperature sterilisation",
  loaner: "Loaner set handling",
};

export const CONTRACT_STATUS_LABELS: Record<ContractStatus, string> = {
  current: "In force",
  upcoming: "Starts later",
  ended: "Ended",
};

export const CLOCK_STOP_LABELS: Record<"released" | "delivered", string> = {
  released: "release at the unit",
  delivered: "delivery to the clinic",
};

export const VAT_CATEGORY_LABELS: Record<"S" | "Z", string> = {
  S: "Standard rate",
  Z: "Zero rate",
};

/** An amount in minor units in the contract's currency, e.g. 125000 GBP → "£1,250.00". */
export function formatMoney(minor: number, currency: string): string {
  return new Intl.NumberFormat("en-GB", { style: "currency", currency }).format(minor / 100);
}

/** Minor units as the decimal text the form edits: 125000 → "1250.00". */
export function minorToDecimalText(minor: number): string {
  const whole = Math.trunc(minor / 100);
  const cents = String(Math.abs(minor % 100)).padStart(2, "0");
  return `${whole}.${cents}`;
}

/** Basis points as the percentage text the form edits: 2000 → "20", 550 → "5.5", 1275 → "12.75". */
export function basisPointsToPercentText(basisPoints: number): string {
  const whole = Math.trunc(basisPoints / 100);
  const fraction = basisPoints % 100;
  if (fraction === 0) return String(whole);
  return `${whole}.${String(fraction).padStart(2, "0").replace(/0$/, "")}`;
}

/** Basis points for people: 2000 → "20 %", 550 → "5.5 %". */
export function formatPercent(basisPoints: number): string {
  return `${basisPointsToPercentText(basisPoints)} %`;
}

/** "Standard: back within 24 service hours of receipt, clock stops at delivery to the clinic." */
export function turnaroundSentence(level: "standard" | "express", hours: number, clockStopsAt: "released" | "delivered"): string {
  const name = level === "standard" ? "Standard" : "Express";
  const unit = hours === 1 ? "service hour" : "service hours";
  return `${name}: back within ${hours} ${unit} of receipt, clock stops at ${CLOCK_STOP_LABELS[clockStopsAt]}.`;
}

/** The sets a band covers, in words: "Sets 1–500 in a month", "Sets 501 and over", "Every set". */
export function describeBand(bands: readonly { upToQuantity: number | null }[], index: number): string {
  if (bands.length === 1) return "Every set";
  const from = index === 0 ? 1 : (bands[index - 1]!.upToQuantity ?? 0) + 1;
  const to = bands[index]!.upToQuantity;
  return to === null ? `Sets ${from} and over in a month` : `Sets ${from}–${to} in a month`;
}

/** A surcharge rule in words: "£15.00 per set" or "50 % of the set's processing fee". */
export function describeSurcharge(
  rule: { basis: "per_set"; amountMinor: number } | { basis: "percent_of_fee"; basisPoints: number },
  currency: string,
): string {
  return rule.basis === "per_set"
    ? `${formatMoney(rule.amountMinor, currency)} per set`
    : `${formatPercent(rule.basisPoints)} of the set's processing fee`;
}

const DATE_FORMAT = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" });
const DATE_WITH_WEEKDAY = new Intl.DateTimeFormat("en-GB", {
  weekday: "long",
  day: "numeric",
  month: "long",
  year: "numeric",
  timeZone: "UTC",
});
const SHORT_DATE = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

function utcDateOf(date: string): Date {
  const [y, m, d] = date.split("-").map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d));
}

/** A local calendar date for people: "2026-07-01" → "1 July 2026" (with `weekday`: "Wednesday 1 July 2026"). */
export function formatLocalDate(date: string, options: { weekday?: boolean; short?: boolean } = {}): string {
  const format = options.weekday ? DATE_WITH_WEEKDAY : options.short ? SHORT_DATE : DATE_FORMAT;
  return format.format(utcDateOf(date)).replace(",", "");
}

/** "1 July 2026 to 30 June 2027" or "from 1 July 2026, open-ended". */
export function formatValidity(validFrom: string, validUntil: string | null): string {
  return validUntil === null
    ? `from ${formatLocalDate(validFrom)}, open-ended`
    : `${formatLocalDate(validFrom)} to ${formatLocalDate(validUntil)}`;
}

/** The next reference in a series: "QMH-2026-02" → "QMH-2026-03"; "K7" → "K8"; "ALPHA" → "ALPHA-2". */
export function suggestNextReference(reference: string): string {
  const match = /^(.*?)(\d+)$/.exec(reference);
  if (!match) return `${reference}-2`;
  const [, prefix, digits] = match as unknown as [string, string, string];
  return `${prefix}${String(Number(digits) + 1).padStart(digits.length, "0")}`;
}
