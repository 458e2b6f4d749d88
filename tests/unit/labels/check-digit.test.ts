import { describe, expect, it } from "vitest";

import { gs1CheckDigit, Gs1Error, isValidGs1CheckDigit } from "@/lib/labels/gs1";

describe("gs1CheckDigit", () => {
  it("matches the published worked example", () => {
    // gs1.org check digit calculator worked example (quoted in CHECKS.md): 629104150021 → 3.
    expect(gs1CheckDigit("629104150021")).toBe(3);
    expect(isValidGs1CheckDigit("6291041500213")).toBe(true);
  });

  it("accepts the GTIN of the GS1 General Specifications element string example", () => {
    // GS1 General Specifications example quoted in CHECKS.md: GTIN 09521234543213 is valid.
    expect(gs1CheckDigit("0952123454321")).toBe(3);
    expect(isValidGs1CheckDigit("09521234543213")).toBe(true);
  });

  it("weights digits 3, 1, 3, … from the right, whatever the length", () => {
    // Weights 3 and 1 from the right (GS1 General Specifications, check digit calculation).
    // Hand computation: "1" → 1·3 = 3 → check 7; "10" → 0·3 + 1·1 = 1 → check 9;
    // "9" → 27 → check 3; "0000000" → 0 → check 0.
    expect(gs1CheckDigit("1")).toBe(7);
    expect(gs1CheckDigit("10")).toBe(9);
    expect(gs1CheckDigit("9")).toBe(3);
    expect(gs1CheckDigit("0000000")).toBe(0);
    // Leading zeros do not change the check digit, so GTIN-8/12/13 padded to 14 keep theirs.
    expect(gs1CheckDigit("00629104150021")).toBe(3);
  });

  it("catches every single-digit change of a valid number", () => {
    // Property of the mod-10 scheme with weights 3 and 1: any single substitution is detected.
    const valid = "6291041500213";
    for (let i = 0; i < valid.length; i++) {
      for (let d = 0; d <= 9; d++) {
        if (String(d) === valid[i]) continue;
        const changed = valid.slice(0, i) + d + valid.slice(i + 1);
        expect(isValidGs1CheckDigit(changed)).toBe(false);
      }
    }
  });

  it("rejects non-digits with a typed error, and isValid answers false", () => {
    expect(() => gs1CheckDigit("12A4")).toThrow(Gs1Error);
    expect(() => gs1CheckDigit("")).toThrow(/digits only/);
    expect(isValidGs1CheckDigit("629104150021X")).toBe(false);
    expect(isValidGs1CheckDigit("3")).toBe(false);
    expect(isValidGs1CheckDigit("")).toBe(false);
  });
});
