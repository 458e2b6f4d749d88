import { describe, expect, it } from "vitest";

import {
  aiAssociationProblems,
  encodeElementString,
  formatHumanReadable,
  getAiDefinition,
  GS,
  GS1_AIS,
  Gs1Error,
  gs1Year,
  parseElementString,
  type Gs1ErrorCode,
} from "@/lib/labels/gs1";

// A fixed reference date so that two-digit years resolve the same way on every run.
const now = new Date("2026-06-15T00:00:00Z");

// "0109521234543213" "17250101" "10ABC123" GS "21SN42" — GS1 General Specifications example as
// quoted in CHECKS.md.
const SPEC_EXAMPLE = "0109521234543213" + "17250101" + "10ABC123" + GS + "21SN42";

function gs1ErrorOf(run: () => unknown): Gs1Error {
  try {
    run();
  } catch (error) {
    if (error instanceof Gs1Error) return error;
    throw error;
  }
  throw new Error("expected a Gs1Error, nothing was thrown");
}

function expectParseError(raw: string, code: Gs1ErrorCode, position: number, message: RegExp) {
  const error = gs1ErrorOf(() => parseElementString(raw, { now }));
  expect(error.code).toBe(code);
  expect(error.position).toBe(position);
  expect(error.message).toMatch(message);
}

describe("the AI table", () => {
  it("has the formats of the GS1 Barcode Syntax Dictionary for the core AIs", () => {
    // GS1 Barcode Syntax Dictionary / GS1 General Specifications: (00) N18, (01) N14, (10) X..20,
    // (11) N6, (17) N6, (21) X..20, (8004) X..30, (240) X..30, (7003) N10 (N6 date + N4 time).
    const shape = (ai: string) => {
      const d = getAiDefinition(ai)!;
      return [d.charset, d.fixedLength, d.length, d.checkDigit, d.date ?? null, d.predefinedLength];
    };
    expect(shape("00")).toEqual(["numeric", true, 18, true, null, true]);
    expect(shape("01")).toEqual(["numeric", true, 14, true, null, true]);
    expect(shape("10")).toEqual(["cset82", false, 20, false, null, false]);
    expect(shape("11")).toEqual(["numeric", true, 6, false, "yymmd0", true]);
    expect(shape("17")).toEqual(["numeric", true, 6, false, "yymmd0", true]);
    expect(shape("21")).toEqual(["cset82", false, 20, false, null, false]);
    expect(shape("240")).toEqual(["cset82", false, 30, false, null, false]);
    expect(shape("7003")).toEqual(["numeric", true, 10, false, "yymmddhhmm", false]);
    expect(shape("8004")).toEqual(["cset82", false, 30, false, null, false]);
  });

  it("marks as predefined length exactly the AIs whose first two digits are in GS1's table", () => {
    // GS1 General Specifications, predefined-length table (from memory; the same AIs carry the
    // "*" flag in the GS1 Barcode Syntax Dictionary): 00–04, 11–20, 31–36, 41.
    const predefinedPrefixes = new Set(["00", "01", "02", "03", "04", "11", "12", "13", "14", "15", "16", "17", "18", "19", "20", "31", "32", "33", "34", "35", "36", "41"]);
    for (const definition of GS1_AIS) {
      expect([definition.ai, definition.predefinedLength]).toEqual([definition.ai, predefinedPrefixes.has(definition.ai.slice(0, 2))]);
    }
  });

  it("has no AI that is a prefix of another, so a parser can split without separators", () => {
    // GS1 Application Identifiers are prefix-free (GS1 General Specifications, section 3).
    for (const a of GS1_AIS) {
      for (const b of GS1_AIS) {
        if (a !== b) expect(b.ai.startsWith(a.ai)).toBe(false);
      }
    }
  });
});

describe("parseElementString", () => {
  it("parses the GS1 General Specifications example", () => {
    expect(parseElementString(SPEC_EXAMPLE, { now })).toEqual([
      { ai: "01", value: "09521234543213" },
      { ai: "17", value: "250101", date: "2025-01-01" },
      { ai: "10", value: "ABC123" },
      { ai: "21", value: "SN42" },
    ]);
  });

  it("accepts the GS1 symbology identifiers in front", () => {
    // Symbology identifiers ]C1 GS1-128, ]d2 GS1 DataMatrix, ]Q3 GS1 QR Code, ]e0 GS1 DataBar
    // (ISO/IEC 15424 via the GS1 General Specifications, from memory).
    const expected = parseElementString(SPEC_EXAMPLE, { now });
    for (const prefix of ["]C1", "]d2", "]Q3", "]e0"]) {
      expect(parseElementString(prefix + SPEC_EXAMPLE, { now })).toEqual(expected);
    }
  });

  it("accepts the separator substitutes when the scan holds no real GS", () => {
    const expected = parseElementString(SPEC_EXAMPLE, { now });
    for (const substitute of ["<GS>", "{GS}", "\u241d"]) {
      expect(parseElementString(SPEC_EXAMPLE.replace(GS, substitute), { now })).toEqual(expected);
    }
    // A station can configure its own substitute, e.g. a scanner set to send "|".
    expect(parseElementString(SPEC_EXAMPLE.replace(GS, "|"), { now, separatorSubstitutes: ["|"] })).toEqual(expected);
    // With a real GS present, "<GS>" is data (all four characters are in character set 82).
    expect(parseElementString("0109521234543213" + "10A<GS>B" + GS + "21SN42", { now })).toEqual([
      { ai: "01", value: "09521234543213" },
      { ai: "10", value: "A<GS>B" },
      { ai: "21", value: "SN42" },
    ]);
  });

  it("ignores a scanner's Enter suffix, a leading GS and a GS after a fixed-length field", () => {
    const expected = parseElementString(SPEC_EXAMPLE, { now });
    expect(parseElementString(`]d2${SPEC_EXAMPLE}\r\n`, { now })).toEqual(expected);
    expect(parseElementString(GS + SPEC_EXAMPLE, { now })).toEqual(expected);
    expect(parseElementString("0109521234543213" + GS + "17250101" + GS + "10ABC123" + GS + "21SN42" + GS, { now })).toEqual(expected);
  });

  it("parses the bracketed human-readable form", () => {
    expect(parseElementString("(8004)9521234000017", { now })).toEqual([{ ai: "8004", value: "9521234000017" }]);
    expect(parseElementString("(01)09521234543213(17)250101(10)ABC123(21)SN42", { now })).toEqual(
      parseElementString(SPEC_EXAMPLE, { now }),
    );
    // Spaces between groups are not data (a space is outside character set 82).
    expect(parseElementString(" (01) 09521234543213 (10) AB(C)D ", { now })).toEqual([
      { ai: "01", value: "09521234543213" },
      { ai: "10", value: "AB(C)D" },
    ]);
  });

  it("reads (7003) as a fixed-length field that still ends with a separator", () => {
    // GS1 Barcode Syntax Dictionary: 7003 is N6 (yymmdd) + N4 (hhmm), without the predefined-
    // length flag, so an encoder puts FNC1 after it; a parser can stop after 10 digits anyway.
    const withSeparator = "0109521234543213" + "70032501011530" + GS + "10L1";
    const expected = [
      { ai: "01", value: "09521234543213" },
      { ai: "7003", value: "2501011530", date: "2025-01-01", dateTime: "2025-01-01T15:30" },
      { ai: "10", value: "L1" },
    ];
    expect(parseElementString(withSeparator, { now })).toEqual(expected);
    expect(parseElementString(withSeparator.replace(GS, ""), { now })).toEqual(expected);
  });

  it("drops an identical repeat and rejects a repeat with different data", () => {
    expect(parseElementString("0109521234543213" + "10A" + GS + "10A", { now })).toEqual([
      { ai: "01", value: "09521234543213" },
      { ai: "10", value: "A" },
    ]);
    expectParseError("0109521234543213" + "10A" + GS + "10B", "duplicate-ai", 20, /AI \(10\) at character 21 appears twice/);
  });

  describe("errors say where and what", () => {
    it("bad check digit", () => {
      expectParseError("0109521234543214", "check-digit", 15, /AI \(01\) at character 16: check digit is 4, but 0952123454321 needs 3/);
    });

    it("variable-length field too long", () => {
      // (10) is X..20 (GS1 General Specifications).
      expectParseError("0109521234543213" + "10" + "A".repeat(21), "length", 38, /AI \(10\).*at most 20 characters, got 21/);
      expectParseError("8004" + "9".repeat(31), "length", 34, /AI \(8004\).*at most 30 characters, got 31/);
    });

    it("bad date: month 13, day 32, 29 February of a common year", () => {
      // Test vectors of the GS1 Barcode Syntax Dictionary's yymmd0 test: 201310 bad month,
      // 200132 bad day, 210229 bad day, 200229 and 240229 good (leap years), 200600 good.
      expectParseError("0109521234543213" + "17251301", "date", 20, /AI \(17\) at character 21: month 13 is not valid/);
      expectParseError("0109521234543213" + "17200132", "date", 22, /day 32 is not valid in 2020-01/);
      expectParseError("0109521234543213" + "17210229", "date", 22, /day 29 is not valid in 2021-02/);
      expect(parseElementString("0109521234543213" + "17200229", { now })[1].date).toBe("2020-02-29");
      expect(parseElementString("0109521234543213" + "17240229", { now })[1].date).toBe("2024-02-29");
    });

    it("unknown AI", () => {
      expectParseError("0109521234543213" + "8005123456", "unknown-ai", 16, /unsupported Application Identifier starting "8005" at character 17/);
      expectParseError("(01)09521234543213(99)X", "unknown-ai", 18, /AI \(99\) at character 19/);
    });

    it("illegal character", () => {
      // Not in GS1 character set 82: space, # $ @ [ \ ] ^ ` { | } ~ (GS1 Barcode Syntax
      // Dictionary cset82 test vectors).
      for (const bad of [" ", "#", "$", "@", "[", "\\", "]", "^", "`", "{", "|", "}", "~"]) {
        expectParseError("0109521234543213" + "10AB" + bad + "C", "charset", 20, /AI \(10\) at character 21: data character 3 is .* not in GS1 character set 82/);
      }
      expectParseError("01095212345432X3", "charset", 14, /AI \(01\) at character 15: digits only, but data character 13 is "X"/);
      expectParseError("80049A21234", "company-prefix", 4, /AI \(8004\).*GS1 Company Prefix/);
    });

    it("truncated fixed field", () => {
      expectParseError("01095212345432", "length", 14, /AI \(01\) at character 1 is cut short: it needs 14 characters, found 12 before the end of the scan/);
      expectParseError("0109521234543213" + "172501" + GS + "10A", "length", 22, /AI \(17\) at character 17 is cut short: it needs 6 characters, found 4 before a separator/);
      expectParseError("(01)09521234543213(17)2501", "length", 26, /AI \(17\) at character 27: needs exactly 6 characters, got 4/);
    });

    it("empty data, empty input, non-GS1 symbology identifier, bad bracketed syntax", () => {
      expectParseError("0109521234543213" + "10" + GS + "21X", "length", 18, /AI \(10\) at character 19: has no data/);
      expect(gs1ErrorOf(() => parseElementString("  \r\n")).code).toBe("empty");
      expect(gs1ErrorOf(() => parseElementString("]d2")).code).toBe("empty");
      expect(gs1ErrorOf(() => parseElementString(GS + GS)).code).toBe("empty");
      expectParseError("]d1ABC", "not-gs1", 0, /]d1 does not announce GS1 data/);
      expectParseError("(1)234", "syntax", 0, /Expected "\(" and an Application Identifier/);
      expectParseError("AB", "syntax", 0, /Expected an Application Identifier \(digits\) at character 1, found "A"/);
    });
  });
});

describe("dates", () => {
  it("resolves the century with GS1's window around the current year", () => {
    // GS1 General Specifications 7.12 (from memory), same horizon as the GS1 Barcode Syntax
    // Dictionary yymmd0 test: D = YY − current YY; 51..99 → previous century, −99..−50 → next.
    const in2026 = new Date("2026-01-01T00:00:00Z");
    expect(gs1Year(76, in2026)).toBe(2076); // D = 50
    expect(gs1Year(77, in2026)).toBe(1977); // D = 51
    expect(gs1Year(0, in2026)).toBe(2000);
    const in2080 = new Date("2080-01-01T00:00:00Z");
    expect(gs1Year(30, in2080)).toBe(2130); // D = −50
    expect(gs1Year(31, in2080)).toBe(2031); // D = −49
    expect(parseElementString("0109521234543213" + "17770101", { now })[1].date).toBe("1977-01-01");
  });

  it("reads day 00 as the last day of the month and says so", () => {
    // GS1 General Specifications, AIs (11)–(17): day 00 when only year and month are known
    // (from memory); read as the month's last day.
    const date = (yymmdd: string) => parseElementString("0109521234543213" + "17" + yymmdd, { now })[1];
    expect(date("250200")).toEqual({ ai: "17", value: "250200", date: "2025-02-28", dayOmitted: true });
    expect(date("240200").date).toBe("2024-02-29");
    expect(date("251200").date).toBe("2025-12-31");
    expect(date("250400").date).toBe("2025-04-30");
    // Not for (7003), whose date comes with a time.
    expectParseError("0109521234543213" + "70032501001200", "date", 24, /day 00 is not allowed/);
    expectParseError("0109521234543213" + "70032501012400", "date", 26, /hour 24 is not valid/);
    expectParseError("0109521234543213" + "70032501011260", "date", 28, /minute 60 is not valid/);
  });
});

describe("encodeElementString", () => {
  it("puts a GS after variable-length fields that are not last, and none after the last", () => {
    const elements = [
      { ai: "01", value: "09521234543213" },
      { ai: "17", value: "250101" },
      { ai: "10", value: "ABC123" },
      { ai: "21", value: "SN42" },
    ];
    expect(encodeElementString(elements, { now })).toBe(SPEC_EXAMPLE);
    expect(encodeElementString([{ ai: "8004", value: "9521234000017" }])).toBe("80049521234000017");
    expect(
      encodeElementString([
        { ai: "01", value: "09521234543213" },
        { ai: "10", value: "L1" },
        { ai: "7003", value: "2501011530" },
        { ai: "21", value: "S" },
      ]),
    ).toBe("0109521234543213" + "10L1" + GS + "70032501011530" + GS + "21S");
  });

  it("throws a Gs1Error naming the AI and the problem", () => {
    const error = (elements: { ai: string; value: string }[]) => gs1ErrorOf(() => encodeElementString(elements, { now }));
    const gtin = { ai: "01", value: "09521234543213" };
    expect(error([{ ai: "01", value: "09521234543214" }])).toMatchObject({ code: "check-digit", ai: "01" });
    expect(error([gtin, { ai: "10", value: "X".repeat(21) }]).message).toBe("AI (10) allows at most 20 characters, got 21");
    expect(error([gtin, { ai: "17", value: "251301" }]).message).toBe("AI (17) month 13 is not valid (the date is YYMMDD)");
    expect(error([gtin, { ai: "17", value: "2501" }]).message).toBe("AI (17) needs exactly 6 characters, got 4");
    expect(error([gtin, { ai: "21", value: "A B" }])).toMatchObject({ code: "charset", ai: "21" });
    expect(error([gtin, { ai: "21", value: "" }]).message).toBe("AI (21) has no data");
    expect(error([{ ai: "8005", value: "123456" }])).toMatchObject({ code: "unknown-ai", ai: "8005" });
    expect(error([{ ai: "1A", value: "x" }]).message).toMatch(/not an Application Identifier/);
    expect(error([gtin, gtin])).toMatchObject({ code: "duplicate-ai", ai: "01" });
    expect(error([])).toMatchObject({ code: "empty" });
  });

  it("checks mandatory associations and invalid pairs unless told not to", () => {
    // GS1 Barcode Syntax Dictionary: (10) req=01,02,8006,8026; (01) ex=02,255,37;
    // (250) req=01,8006 and req=21.
    expect(gs1ErrorOf(() => encodeElementString([{ ai: "10", value: "L1" }])).message).toBe(
      "AI (10) must appear together with one of (01), (02), (8006), (8026)",
    );
    expect(encodeElementString([{ ai: "10", value: "L1" }], { checkAssociations: false })).toBe("10L1");
    expect(aiAssociationProblems([{ ai: "01" }, { ai: "250" }])).toEqual(["AI (250) must appear together with AI (21)"]);
    expect(aiAssociationProblems([{ ai: "01" }, { ai: "02" }, { ai: "37" }, { ai: "00" }])).toEqual([
      "AI (01) cannot appear together with AI (02)",
      "AI (01) cannot appear together with AI (37)",
    ]);
    expect(aiAssociationProblems([{ ai: "00" }, { ai: "02" }, { ai: "37" }])).toEqual([]);
  });
});

describe("formatHumanReadable", () => {
  it("writes each AI in parentheses before its data", () => {
    expect(
      formatHumanReadable([
        { ai: "01", value: "09521234543213" },
        { ai: "17", value: "250101" },
        { ai: "10", value: "ABC123" },
      ]),
    ).toBe("(01)09521234543213(17)250101(10)ABC123");
  });
});
