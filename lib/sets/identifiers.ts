// How a set is named: its human serial ("QMH-000123": the customer's short code and a
// zero-padded number counted per customer) and its GS1 identifier, a GIAI, AI (8004): the unit's
// GS1 Company Prefix followed by the serial without its hyphen ("9521234QMH000123").
//
// Pure module: no I/O. The allocator that picks the next numbers inside a transaction is
// lib/sets/allocator.ts.

import { DEMO_COMPANY_PREFIX, formatHumanReadable, type Gs1ElementInput, makeSetGiai } from "@/lib/labels/gs1";

/**
 * The GS1 Company Prefix of the demo's set GIAIs: GS1's demonstration range (GS1 Prefix 952 is
 * reserved for demonstrations and examples). The running app gives new sets the prefix in the
 * GS1_COMPANY_PREFIX setting (lib/env.ts, the same number by default); a unit going live sets
 * it to the prefix its GS1 member organisation allocated to it.
 */
export const SET_COMPANY_PREFIX = DEMO_COMPANY_PREFIX;

/** The number part of a serial has at least this many digits ("000123"). */
export const SERIAL_DIGITS = 6;

/** The AI of a set's identifier: (8004) GIAI, Global Individual Asset Identifier. */
export const GIAI_AI = "8004";

// Short codes go into the GIAI, whose data is GS1 character set 82; letters and digits keep it
// readable and unambiguous on a label. A leading letter keeps "code + digits" readable.
const SHORT_CODE = /^[A-Z][A-Z0-9]{1,7}$/;

/** Why a short code cannot prefix set serials, or null when it can. */
export function shortCodeProblem(shortCode: string): string | null {
  if (SHORT_CODE.test(shortCode)) return null;
  return `The customer's short code "${shortCode}" cannot start set serials: use 2 to 8 capital letters or digits, starting with a letter.`;
}

/** "QMH", 123 → "QMH-000123". Throws a RangeError for a bad short code or number. */
export function formatSetSerial(shortCode: string, sequence: number): string {
  const problem = shortCodeProblem(shortCode);
  if (problem) throw new RangeError(problem);
  if (!Number.isSafeInteger(sequence) || sequence < 1) {
    throw new RangeError(`A set number is a whole number from 1, got ${sequence}`);
  }
  return `${shortCode}-${String(sequence).padStart(SERIAL_DIGITS, "0")}`;
}

const SERIAL = /^([A-Z][A-Z0-9]{1,7})-(\d{6,})$/;

/** The parts of a serial made by formatSetSerial, or null for any other text. */
export function parseSetSerial(serial: string): { shortCode: string; sequence: number } | null {
  const match = SERIAL.exec(serial);
  if (!match) return null;
  const sequence = Number(match[2]);
  if (!Number.isSafeInteger(sequence) || sequence < 1) return null;
  return { shortCode: match[1], sequence };
}

/** The GIAI's individual asset reference: the serial without its hyphen ("QMH000123"). */
export function assetReference(serial: string): string {
  return serial.replace("-", "");
}

/**
 * The GIAI of the set with this serial. makeSetGiai checks the company prefix, the character
 * set and the 30-character limit of AI (8004), and throws a Gs1Error when one is broken.
 */
export function setGiai(serial: string, companyPrefix: string = SET_COMPANY_PREFIX): string {
  return makeSetGiai(companyPrefix, assetReference(serial));
}

/** The element string of a set's label: the GIAI alone. */
export function setLabelElements(giai: string): Gs1ElementInput[] {
  return [{ ai: GIAI_AI, value: giai }];
}

/** The human-readable text printed under the symbol: "(8004)9521234QMH000123". */
export function setHumanReadable(giai: string): string {
  return formatHumanReadable(setLabelElements(giai));
}

/**
 * What a person may type to find a set, normalised: trimmed, upper case (serials and our GIAIs
 * hold capitals only). Matches the serial ("QMH-000123"), the asset reference ("QMH000123") or
 * the whole GIAI ("9521234QMH000123").
 */
export function normaliseTypedCode(text: string): string {
  return text.trim().toUpperCase();
}
