// Weights and sizes of set types as people type them (kilograms, sterilisation units) and as the
// database keeps them (whole grams, StU as a number with at most two decimals). Pure.

/** 1 StU = 300 × 300 × 600 mm (EN 285); a set type occupies a fraction or a multiple of one. */
export const MAX_SIZE_STU = 12;
/** The heaviest set type the catalogue takes; anything heavier is a typing mistake. */
export const MAX_WEIGHT_KG = 50;

export type DecimalReading =
  | { ok: true; hundredths: number }
  | { ok: false; reason: "empty" | "negative" | "decimal_comma" | "too_many_decimals" | "not_a_number" };

/**
 * Reads a plain decimal with at most two decimals ("4", "4.5", "0.25", ".5") as a whole number
 * of hundredths, exactly (no floating-point rounding). Says why anything else is refused.
 */
export function readDecimal(text: string): DecimalReading {
  const value = text.trim();
  if (value === "") return { ok: false, reason: "empty" };
  if (/^[-\u2212]/.test(value)) return { ok: false, reason: "negative" };
  if (/^\d+,\d+$/.test(value)) return { ok: false, reason: "decimal_comma" };
  if (/^\d*\.\d{3,}$/.test(value)) return { ok: false, reason: "too_many_decimals" };
  const match = /^(\d{0,6})(?:\.(\d{1,2}))?$/.exec(value);
  if (!match || (match[1] === "" && match[2] === undefined)) return { ok: false, reason: "not_a_number" };
  return { ok: true, hundredths: Number(match[1] || "0") * 100 + Number((match[2] ?? "").padEnd(2, "0")) };
}

/** Why a reading failed, as the end of a sentence ("… is not a weight: …"). */
export function decimalProblem(reason: Exclude<DecimalReading, { ok: true }>["reason"]): string {
  switch (reason) {
    case "empty":
      return "it is empty";
    case "negative":
      return "it must be more than 0";
    case "decimal_comma":
      return "use a point as the decimal mark, e.g. 4.25";
    case "too_many_decimals":
      return "use at most 2 decimals";
    case "not_a_number":
      return "it is not a number";
  }
}

/** Kilograms with at most two decimals → whole grams (4.25 kg → 4250 g). */
export function hundredthsOfKgToGrams(hundredths: number): number {
  return hundredths * 10;
}

/** Grams → the kilogram text a form field shows ("4.25", "0.8", "12"). */
export function gramsToKgText(grams: number): string {
  return trimDecimals((Math.round(grams / 10) / 100).toFixed(2));
}

/** A StU size read from the database → its form text ("0.25", "1", "2.5"). */
export function stuText(size: number): string {
  return trimDecimals((Math.round(size * 100) / 100).toFixed(2));
}

export function formatWeight(grams: number): string {
  return `${gramsToKgText(grams)} kg`;
}

export function formatStu(size: number): string {
  return `${stuText(size)} StU`;
}

function trimDecimals(fixed: string): string {
  return fixed.replace(/\.?0+$/, "") || "0";
}
