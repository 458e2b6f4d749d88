import { describe, expect, it } from "vitest";

import { DEMO_COMPANY_PREFIX, GS, Gs1Error, makeSetGiai, parseScan } from "@/lib/labels/gs1";

const now = new Date("2026-06-15T00:00:00Z");

describe("makeSetGiai", () => {
  it("joins the company prefix and the asset reference", () => {
    // GS1 Prefix 952 is reserved for demonstrations and examples (CHECKS.md, GS1).
    expect(DEMO_COMPANY_PREFIX.startsWith("952")).toBe(true);
    expect(makeSetGiai("9521234", "000017")).toBe("9521234000017");
    expect(makeSetGiai("9521234", "TRAY-ortho_07")).toBe("9521234TRAY-ortho_07");
    // A GIAI is at most 30 characters (GS1 General Specifications, AI 8004 X..30).
    expect(makeSetGiai("9521234", "A".repeat(23))).toHaveLength(30);
  });

  it("rejects what is not a GIAI, saying what to fix", () => {
    expect(() => makeSetGiai("9521234", "A".repeat(24))).toThrow(
      "GIAI 9521234AAAAAAAAAAAAAAAAAAAAAAAA is 31 characters; with company prefix 9521234 the asset reference may have at most 23",
    );
    expect(() => makeSetGiai("952", "1")).toThrow(/4 to 12 digits/);
    expect(() => makeSetGiai("95212345678901", "1")).toThrow(/4 to 12 digits/);
    expect(() => makeSetGiai("95A1234", "1")).toThrow(Gs1Error);
    expect(() => makeSetGiai("9521234", "")).toThrow(/empty/);
    expect(() => makeSetGiai("9521234", "SET 7")).toThrow(/asset reference "SET 7": data character 4 is a space/);
    expect(() => makeSetGiai("9521234", "SET#7")).toThrow(/not in GS1 character set 82/);
  });
});

describe("parseScan", () => {
  it("recognises a set's GIAI from a DataMatrix scan, with or without identifier or separators", () => {
    const set = { kind: "set", giai: "9521234000017", elements: [{ ai: "8004", value: "9521234000017" }] };
    expect(parseScan("]d280049521234000017\r\n", { now })).toEqual(set);
    expect(parseScan("80049521234000017", { now })).toEqual(set);
    expect(parseScan("(8004)9521234000017", { now })).toEqual(set);
  });

  it("recognises a product GTIN with lot, serial and expiry", () => {
    // GS1 General Specifications example (CHECKS.md).
    const raw = "]d2" + "0109521234543213" + "17250101" + "10ABC123" + GS + "21SN42";
    expect(parseScan(raw, { now })).toMatchObject({
      kind: "gtin",
      gtin: "09521234543213",
      lot: "ABC123",
      serial: "SN42",
      expiry: "2025-01-01",
    });
    const bare = parseScan("0109521234543213", { now });
    expect(bare).toEqual({ kind: "gtin", gtin: "09521234543213", elements: [{ ai: "01", value: "09521234543213" }] });
  });

  it("turns an EAN-13 or EAN-8 scan into a GTIN-14", () => {
    // ]E0 EAN-13/UPC-A, ]E4 EAN-8 (ISO/IEC 15424, from memory). 952123454321 → check digit 3
    // and 9521234 → 9·3+5+2·3+1+2·3+3+4·3 = 60 → check digit 0 (computed by hand).
    expect(parseScan("]E09521234543213")).toMatchObject({ kind: "gtin", gtin: "09521234543213" });
    expect(parseScan("]E495212340")).toMatchObject({ kind: "gtin", gtin: "00000095212340" });
    expect(() => parseScan("]E09521234543214")).toThrow(/wrong check digit \(expected 3\)/);
    expect(() => parseScan("]E0952123454321")).toThrow(/13 digits/);
  });

  it("recognises an SSCC and other GS1 data", () => {
    // Extension 0, company prefix 9521234, serial reference 000000001; check digit by hand:
    // from the right 1·3 + 4·1 + 3·3 + 2·1 + 1·3 + 2·1 + 5·3 + 9·1 = 47 → 3.
    const sscc = "095212340000000013";
    expect(parseScan("00" + sscc)).toMatchObject({ kind: "sscc", sscc });
    expect(parseScan("(400)PO-2291")).toEqual({ kind: "gs1", elements: [{ ai: "400", value: "PO-2291" }] });
  });

  it("treats plain text as a typed code", () => {
    expect(parseScan("  SET-0042 \n")).toEqual({ kind: "typed", code: "SET-0042" });
    expect(parseScan("9521234000017")).toEqual({ kind: "typed", code: "9521234000017" });
    expect(parseScan("0123")).toEqual({ kind: "typed", code: "0123" });
    expect(parseScan("(spare) tray")).toEqual({ kind: "typed", code: "(spare) tray" });
    // A plain Code 128 or DataMatrix (not GS1 mode) carries the code after its identifier.
    expect(parseScan("]C0SET-0042")).toEqual({ kind: "typed", code: "SET-0042" });
    expect(parseScan("]d1SET-0042")).toEqual({ kind: "typed", code: "SET-0042" });
  });

  it("throws for malformed GS1 data and empty input", () => {
    expect(() => parseScan("]d20109521234543214")).toThrow(Gs1Error);
    expect(() => parseScan("(17)251301")).toThrow(/month 13/);
    expect(() => parseScan("0109521234543213" + "10A B")).toThrow(/character set 82/);
    expect(() => parseScan("   ")).toThrow(/empty/);
    expect(() => parseScan("]C0 ")).toThrow(/Nothing follows/);
  });
});
