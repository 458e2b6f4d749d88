import { dictionary } from "@zxcvbn-ts/language-common";
import { COMMON_PASSWORDS } from "./common-passwords";

// The server's check against published leaked-password frequency lists: the ~49,000 most common
// passwords of the zxcvbn-ts common dictionary, plus the short list the forms also check. Kept
// out of password-rules.ts so that the list never ships in a browser bundle.

let leaked: ReadonlySet<string> | null = null;

function leakedPasswords(): ReadonlySet<string> {
  leaked ??= new Set([...dictionary["passwords-common"].map((p) => p.toLowerCase()), ...COMMON_PASSWORDS]);
  return leaked;
}

/**
 * True for a password on the list, or one that is a listed password followed only by digits and
 * punctuation ("dragon2026!!!!"): padding a common word does not make it unguessable.
 */
export function isCommonPassword(password: string): boolean {
  const lower = password.toLowerCase();
  const list = leakedPasswords();
  if (list.has(lower)) return true;
  const base = lower.replace(/[\d\p{P}\p{S}\s]+$/u, "");
  return base.length >= 4 && base !== lower && list.has(base);
}
