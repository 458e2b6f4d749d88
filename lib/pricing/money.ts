// Integer money arithmetic: rounding, percentages in basis points, decimal text for UBL.
// No floating point touches an amount; products go through BigInt so they cannot overflow.

import { PricingError } from "./errors";

const BASIS_POINTS_PER_UNIT = 10_000n;

// Throws unless `value` is a safe integer (an amount in minor units, a count, basis points).
export function assertInteger(value: unknown, what: string, options: { min?: number; max?: number } = {}): number {
  if (typeof value !== "number" || !Number.isSafeInteger(value)) {
    throw new PricingError("invalid_amount", `${what} must be a whole number (minor units), got ${String(value)}`, {
      field: what,
    });
  }
  if (options.min !== undefined && value < options.min) {
    throw new PricingError("invalid_amount", `${what} must be at least ${options.min}, got ${value}`, { field: what });
  }
  if (options.max !== undefined && value > options.max) {
    throw new PricingError("invalid_amount", `${what} must be at most ${options.max}, got ${value}`, { field: what });
  }
  return value;
}

// Converts back from BigInt, refusing results outside the safe integer range.
export function toSafeNumber(value: bigint, what: string): number {
  if (value > BigInt(Number.MAX_SAFE_INTEGER) || value < BigInt(Number.MIN_SAFE_INTEGER)) {
    throw new PricingError("invalid_amount", `${what} is too large to represent exactly`, { field: what });
  }
  return Number(value);
}

/**
 * numerator / denominator rounded to the nearest integer, ties away from zero ("commercial
 * rounding": 0.5 → 1, −0.5 → −1). EN 16931 asks for rounding to two decimals without fixing the
 * tie rule; commercial rounding is the common practice in invoicing.
 */
export function roundHalfAwayFromZero(numerator: bigint, denominator: bigint): bigint {
  if (denominator <= 0n) throw new RangeError("denominator must be positive");
  const negative = numerator < 0n;
  const magnitude = negative ? -numerator : numerator;
  const quotient = (magnitude * 2n + denominator) / (denominator * 2n);
  return negative ? -quotient : quotient;
}

// amountMinor × basisPoints / 10 000, rounded half away from zero to a minor unit.
export function applyBasisPoints(amountMinor: number, basisPoints: number): number {
  const product = BigInt(amountMinor) * BigInt(basisPoints);
  return toSafeNumber(roundHalfAwayFromZero(product, BASIS_POINTS_PER_UNIT), "percentage amount");
}

// a × b for integers, exactly, refusing results beyond the safe range.
export function multiplyExact(a: number, b: number, what: string): number {
  return toSafeNumber(BigInt(a) * BigInt(b), what);
}

// Sum of integers, exactly, refusing results beyond the safe range.
export function sumExact(values: readonly number[], what: string): number {
  let total = 0n;
  for (const value of values) total += BigInt(value);
  return toSafeNumber(total, what);
}

// 165625 → "1656.25", -150000 → "-1500.00" (two decimals, as EN 16931 amounts).
export function formatMinor(minor: number): string {
  const negative = minor < 0;
  const magnitude = BigInt(negative ? -minor : minor);
  const units = magnitude / 100n;
  const cents = (magnitude % 100n).toString().padStart(2, "0");
  return `${negative ? "-" : ""}${units}.${cents}`;
}

// 2500 → "25", 550 → "5.5", 775 → "7.75": a VAT rate in basis points as a UBL percent.
export function formatBasisPoints(basisPoints: number): string {
  const whole = Math.trunc(basisPoints / 100);
  const fraction = Math.abs(basisPoints % 100);
  if (fraction === 0) return String(whole);
  return `${whole}.${String(fraction).padStart(2, "0").replace(/0$/, "")}`;
}

/** An exact decimal: value = units × 10^−scale. */
export interface ExactDecimal {
  units: bigint;
  scale: number;
}

const DECIMAL_PATTERN = /^([+-]?)(\d+)(?:\.(\d+))?$/;

// Parses "1656.25", "-3", "25.0" exactly; returns null for anything else (no exponents, no spaces).
export function parseDecimal(text: string): ExactDecimal | null {
  const match = DECIMAL_PATTERN.exec(text);
  if (!match) return null;
  const [, sign, whole, fraction = ""] = match;
  const units = BigInt(whole + fraction);
  return { units: sign === "-" ? -units : units, scale: fraction.length };
}

// The decimal's value as an integer number of 10^−scale units (scale must not lose digits).
export function rescale(value: ExactDecimal, scale: number): bigint {
  if (scale < value.scale) {
    const factor = 10n ** BigInt(value.scale - scale);
    if (value.units % factor !== 0n) throw new RangeError("rescaling would lose digits");
    return value.units / factor;
  }
  return value.units * 10n ** BigInt(scale - value.scale);
}

/** Number of significant decimals: "12.50" has 2 written, 1 significant. */
export function significantDecimals(value: ExactDecimal): number {
  let scale = value.scale;
  let units = value.units;
  while (scale > 0 && units % 10n === 0n) {
    units /= 10n;
    scale -= 1;
  }
  return scale;
}

let knownCurrencies: Set<string> | null = null;

function isKnownCurrency(code: string): boolean {
  if (knownCurrencies === null) {
    const supported = typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("currency") : [];
    knownCurrencies = new Set(supported);
  }
  return knownCurrencies.size === 0 || knownCurrencies.has(code);
}

/**
 * Throws unless `code` is an ISO 4217 code whose minor unit is a hundredth, which is what
 * "integer minor units" and EN 16931's two-decimal amounts both assume.
 */
export function assertCurrency(code: unknown, what: string): string {
  if (typeof code !== "string" || !/^[A-Z]{3}$/.test(code) || !isKnownCurrency(code)) {
    throw new PricingError("currency_mismatch", `${what} must be an ISO 4217 currency code such as EUR, got ${JSON.stringify(code)}`, {
      field: what,
    });
  }
  const digits = new Intl.NumberFormat("en", { style: "currency", currency: code }).resolvedOptions().maximumFractionDigits;
  if (digits !== 2) {
    throw new PricingError(
      "currency_mismatch",
      `${what} ${code} has ${digits} minor digits; only currencies with two (cents, pence) are supported`,
      { field: what, currency: code },
    );
  }
  return code;
}
