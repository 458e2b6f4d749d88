import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatStu, formatWeight, gramsToKgText, readDecimal, stuText } from "@/lib/catalogue/measures";
import { describeChanges, describeItemChanges, type SetTypeValues } from "@/lib/catalogue/compare";

describe("reading decimals exactly", () => {
  it.each([
    ["4.25", 425],
    ["4.5", 450],
    ["4", 400],
    [".5", 50],
    ["0.05", 5],
    [" 12 ", 1200],
  ])("%s → %i hundredths", (text, hundredths) => {
    expect(readDecimal(text)).toEqual({ ok: true, hundredths });
  });

  it.each([
    ["", "empty"],
    ["-1", "negative"],
    ["−0.5", "negative"],
    ["4,25", "decimal_comma"],
    ["1.234", "too_many_decimals"],
    ["1e3", "not_a_number"],
    ["four", "not_a_number"],
    [".", "not_a_number"],
    ["1.2.3", "not_a_number"],
  ])("%s is refused as %s", (text, reason) => {
    expect(readDecimal(text)).toEqual({ ok: false, reason });
  });

  it("has no floating-point drift: every two-decimal text reads back to itself", () => {
    // 0.29 × 100 is 28.999999999999996 in binary floating point; the reading must still be 29.
    expect(readDecimal("0.29")).toEqual({ ok: true, hundredths: 29 });
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 99_999_999 }), (n) => {
        const text = `${Math.floor(n / 100)}.${String(n % 100).padStart(2, "0")}`;
        expect(readDecimal(text)).toEqual({ ok: true, hundredths: n });
      }),
    );
  });
});

describe("showing weights and sizes", () => {
  it("writes kilograms and StU without trailing zeros", () => {
    expect(formatWeight(4250)).toBe("4.25 kg");
    expect(formatWeight(800)).toBe("0.8 kg");
    expect(formatWeight(12000)).toBe("12 kg");
    expect(gramsToKgText(10)).toBe("0.01");
    expect(formatStu(0.25)).toBe("0.25 StU");
    expect(formatStu(1)).toBe("1 StU");
    expect(stuText(2.5)).toBe("2.5");
  });
});

const base: SetTypeValues = {
  code: "GEN-01",
  name: "General set",
  setClass: "basic_tray",
  packaging: "wrap",
  sterilisationMethod: "steam_134",
  flags: ["ultrasonic"],
  processingNotes: null,
  weightG: 2500,
  sizeStu: 0.5,
  items: [
    { name: "Towel clip", quantity: 4 },
    { name: "Gallipot", quantity: 1 },
    { name: "Mayo scissors", quantity: 1 },
  ],
};

describe("describing what changed", () => {
  it("says nothing for identical values", () => {
    expect(describeChanges(base, { ...base, items: [...base.items] })).toEqual([]);
  });

  it("names each changed field with its old and new value", () => {
    const changes = describeChanges(base, {
      ...base,
      name: "General set, large",
      setClass: "major_tray",
      flags: ["dismantle"],
      weightG: 2750,
      sizeStu: 1,
      processingNotes: "Open box joints.",
    });
    expect(changes).toEqual([
      "name: General set → General set, large",
      "set class: Basic tray (up to 25 instruments) → Major tray (over 25 instruments)",
      "processing: + dismantle before washing, − ultrasonic clean",
      "weight: 2.5 kg → 2.75 kg",
      "size: 0.5 StU → 1 StU",
      "notes added",
    ]);
  });

  it("counts contents lines added, removed, recounted and reordered", () => {
    expect(
      describeItemChanges(base.items, [
        { name: "Gallipot", quantity: 2 },
        { name: "Towel clip", quantity: 4 },
        { name: "Kidney dish", quantity: 1 },
      ]),
    ).toBe("contents: 1 line added, 1 line removed, 1 count changed, order changed");
    expect(describeItemChanges(base.items, base.items.slice(0, 1))).toBe("contents: 2 lines removed");
    // Removing a line does not by itself count as reordering the others.
    expect(describeItemChanges(base.items, [base.items[0]!, base.items[2]!])).toBe("contents: 1 line removed");
  });
});
