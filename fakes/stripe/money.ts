// Amounts are integers in the currency's minor unit, as in Stripe's API.

// Currencies Stripe treats as having no minor unit, and those with three decimals
// (Stripe's currencies documentation, from memory).
const ZERO_DECIMAL = new Set(["bif", "clp", "djf", "gnf", "jpy", "kmf", "krw", "mga", "pyg", "rwf", "ugx", "vnd", "vuv", "xaf", "xof", "xpf"]);
const THREE_DECIMAL = new Set(["bhd", "jod", "kwd", "omr", "tnd"]);

export function minorUnitDigits(currency: string): number {
  const c = currency.toLowerCase();
  if (ZERO_DECIMAL.has(c)) return 0;
  if (THREE_DECIMAL.has(c)) return 3;
  return 2;
}

// "EUR 1,234.50"-style display of a minor-unit amount, for the fake's own pages.
export function formatAmount(amount: number, currency: string): string {
  const digits = minorUnitDigits(currency);
  const major = amount / 10 ** digits;
  try {
    return new Intl.NumberFormat("en-GB", {
      style: "currency",
      currency: currency.toUpperCase(),
      minimumFractionDigits: digits,
      maximumFractionDigits: digits,
    }).format(major);
  } catch {
    return `${major.toFixed(digits)} ${currency.toUpperCase()}`;
  }
}

/**
 * unit × quantity for a decimal unit amount ("1250.5" minor units), rounded half away from zero
 * to a whole minor unit. Exact: the decimal is scaled to an integer, never a float.
 * Rounding to the nearest minor unit is common practice; Stripe documents no other rule here.
 */
export function amountFromDecimal(unitDecimal: string, quantity: number): number {
  const negative = unitDecimal.startsWith("-");
  const [i, f = ""] = (negative ? unitDecimal.slice(1) : unitDecimal).split(".");
  const scale = 10n ** BigInt(f.length);
  const product = BigInt(i + f) * BigInt(quantity);
  let whole = product / scale;
  const rest = product % scale;
  if (rest * 2n >= scale) whole += 1n;
  const n = Number(whole);
  return negative ? -n : n;
}
