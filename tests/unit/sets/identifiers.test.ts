import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { encodeElementString, GS, Gs1Error, parseScan } from "@/lib/labels/gs1";
import {
  assetReference,
  formatSetSerial,
  normaliseTypedCode,
  parseSetSerial,
  SET_COMPANY_PREFIX,
  setGiai,
  setHumanReadable,
  setLabelElements,
  shortCodeProblem,
} from "@/lib/sets/identifiers";

// GS1 character set 82 (GS1 General Specifications, figure 7.11-1, as quoted in lib/labels/gs1.ts).
const CSET82 = /^[!"%&'()*+,\-./0-9:;<=>?A-Z_a-z]+$/;

describe("set serials", () => {
  it("are the short code, a hyphen and a six-digit zero-padded number", () => {
    expect(formatSetSerial("QMH", 123)).toBe("QMH-000123");
    expect(formatSetSerial("QMH", 1)).toBe("QMH-000001");
    expect(formatSetSerial("ODS", 999_999)).toBe("ODS-999999");
    // Past a million the number simply grows a digit; it is never cut.
    expect(formatSetSerial("ODS", 1_000_000)).toBe("ODS-1000000");
  });

  it("refuse short codes that could not go into a GIAI readably, and numbers below 1", () => {
    for (const bad of ["", "Q", "qmh", "Q-H", "Q H", "1QM", "ABCDEFGHI", "ÄBC"]) {
      expect(shortCodeProblem(bad), bad).not.toBeNull();
      expect(() => formatSetSerial(bad, 1)).toThrow(RangeError);
    }
    expect(() => formatSetSerial("QMH", 0)).toThrow(RangeError);
    expect(() => formatSetSerial("QMH", 1.5)).toThrow(RangeError);
  });

  it("parse back to their parts, and nothing else parses", () => {
    expect(parseSetSerial("QMH-000123")).toEqual({ shortCode: "QMH", sequence: 123 });
    expect(parseSetSerial("P2C-1000000")).toEqual({ shortCode: "P2C", sequence: 1_000_000 });
    for (const other of ["QMH000123", "qmh-000123", "QMH-123", "QMH-000000", "-000123", "QMH-00012A"]) {
      expect(parseSetSerial(other), other).toBeNull();
    }
  });
});

describe("set GIAIs, AI (8004)", () => {
  it("are the company prefix followed by the serial without its hyphen", () => {
    expect(SET_COMPANY_PREFIX).toBe("9521234"); // GS1 Prefix 952: reserved for demonstrations (CHECKS.md)
    expect(assetReference("QMH-000123")).toBe("QMH000123");
    expect(setGiai("QMH-000123")).toBe("9521234QMH000123");
    expect(setHumanReadable("9521234QMH000123")).toBe("(8004)9521234QMH000123");
  });

  it("stay within GS1's limits for (8004): at most 30 characters of character set 82", () => {
    // (8004) GIAI is X..30 (GS1 General Specifications; CHECKS.md).
    const longest = setGiai(formatSetSerial("ABCDEFGH", 999_999));
    expect(longest.length).toBeLessThanOrEqual(30);
    expect(longest).toMatch(CSET82);
    // A 12-digit prefix, an 8-character code and a 10-digit number make exactly 30 characters…
    expect(setGiai(formatSetSerial("ABCDEFGH", 1_000_000_000), "952123456789")).toHaveLength(30);
    // …and one more digit is refused with the GS1 module's error instead of a symbol nobody can read.
    expect(() => setGiai(formatSetSerial("ABCDEFGH", 10_000_000_000), "952123456789")).toThrow(Gs1Error);
    expect(() => setGiai(formatSetSerial("ABCDEFGH", 10_000_000_000), "952123456789")).toThrow(/at most 18/);
  });

  it("come back unchanged from a scan of the label, in every form a scanner or a person sends", () => {
    const giai = setGiai("QMH-000123");
    const transmitted = encodeElementString(setLabelElements(giai));
    expect(transmitted).toBe("80049521234QMH000123");
    const forms = [
      `]d2${transmitted}`, // GS1 DataMatrix symbology identifier (ISO/IEC 15424)
      transmitted, // a scanner set to send no identifier
      `(8004)${giai}`, // the human-readable form typed in
      `  ]d2${transmitted}\r\n`, // with the scanner's Enter suffix
    ];
    for (const raw of forms) {
      const scan = parseScan(raw);
      expect(scan.kind, raw).toBe("set");
      if (scan.kind === "set") expect(scan.giai).toBe(giai);
    }
  });

  it("round-trip for any valid short code and number (property)", () => {
    const shortCode = fc.stringMatching(/^[A-Z][A-Z0-9]{1,7}$/);
    fc.assert(
      fc.property(shortCode, fc.integer({ min: 1, max: 99_999_999 }), (code, sequence) => {
        const serial = formatSetSerial(code, sequence);
        expect(parseSetSerial(serial)).toEqual({ shortCode: code, sequence });
        const giai = setGiai(serial);
        expect(giai.length).toBeLessThanOrEqual(30);
        expect(giai).toMatch(CSET82);
        const scan = parseScan(`]d2${encodeElementString(setLabelElements(giai))}`);
        expect(scan).toMatchObject({ kind: "set", giai });
        // A GIAI is the last element here, so no GS separator follows it.
        expect(encodeElementString(setLabelElements(giai))).not.toContain(GS);
      }),
      { numRuns: 300 },
    );
  });

  it("are distinct for distinct serials, across customers too", () => {
    const giais = new Set<string>();
    for (const code of ["QMH", "ODS", "MDP", "QM", "QMH1"]) {
      for (let n = 1; n <= 50; n++) giais.add(setGiai(formatSetSerial(code, n)));
    }
    expect(giais.size).toBe(250);
  });
});

describe("typed codes", () => {
  it("are trimmed and put in capitals, as serials and our GIAIs are stored", () => {
    expect(normaliseTypedCode("  qmh-000123 \n")).toBe("QMH-000123");
    // A typed serial is plain text to the scan parser, not GS1 data.
    expect(parseScan("QMH-000123")).toEqual({ kind: "typed", code: "QMH-000123" });
  });
});
