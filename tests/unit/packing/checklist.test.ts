import { describe, expect, it } from "vitest";
import {
  checkCounts,
  holdReasonFor,
  irregularityText,
  labelIrregularityText,
  missingCount,
  parseCountedLines,
  parseIrregularities,
} from "@/lib/packing/checklist";

const ITEMS = [
  { position: 1, name: "Scalpel handle No. 3", quantity: 1 },
  { position: 2, name: "Needle holder, Mayo-Hegar 160 mm", quantity: 1 },
  { position: 3, name: "Towel clip, Backhaus 110 mm", quantity: 4 },
];
const all = (changes: Record<number, { counted?: number | null; damaged?: number }> = {}) =>
  ITEMS.map((i) => ({ position: i.position, counted: changes[i.position]?.counted === undefined ? i.quantity : changes[i.position]!.counted!, damaged: changes[i.position]?.damaged ?? 0 }));

describe("checking the counts against the contents list", () => {
  it("passes a complete count with no irregularity", () => {
    const check = checkCounts(ITEMS, all());
    expect(check).toEqual({
      ok: true,
      irregularities: [],
      lines: ITEMS.map((i) => ({ position: i.position, name: i.name, expected: i.quantity, counted: i.quantity, damaged: 0 })),
    });
  });

  it("turns a short count and damaged instruments into irregularities, missing first", () => {
    const check = checkCounts(ITEMS, all({ 2: { counted: 0 }, 3: { counted: 3, damaged: 1 } }));
    expect(check.ok && check.irregularities).toEqual([
      { name: "Needle holder, Mayo-Hegar 160 mm", kind: "missing", quantity: 1 },
      { name: "Towel clip, Backhaus 110 mm", kind: "missing", quantity: 1 },
      { name: "Towel clip, Backhaus 110 mm", kind: "damaged", quantity: 1 },
    ]);
  });

  it("lists the lines not counted: a blank is not a zero, and a line left out is not counted", () => {
    const check = checkCounts(ITEMS, all({ 1: { counted: null } }).filter((c) => c.position !== 3));
    expect(check.ok).toBe(false);
    expect(!check.ok && check.uncounted.map((i) => i.position)).toEqual([1, 3]);
  });

  it("refuses more than the list holds, more damaged than counted, unknown and repeated lines", () => {
    const over = checkCounts(ITEMS, all({ 3: { counted: 5 } }));
    expect(!over.ok && over.problems).toEqual([
      {
        position: 3,
        message: "5 counted of Towel clip, Backhaus 110 mm, but the set holds 4: take out the extra instrument (it belongs to another set) and count again.",
      },
    ]);
    const damaged = checkCounts(ITEMS, all({ 2: { counted: 0, damaged: 1 } }));
    expect(!damaged.ok && damaged.problems[0]!.message).toBe("1 damaged of Needle holder, Mayo-Hegar 160 mm, but only 0 counted: the damaged ones are counted too.");
    const unknown = checkCounts(ITEMS, [...all(), { position: 9, counted: 1, damaged: 0 }]);
    expect(!unknown.ok && unknown.problems[0]!.position).toBe(9);
    const twice = checkCounts(ITEMS, [...all(), { position: 1, counted: 1, damaged: 0 }]);
    expect(!twice.ok && twice.problems[0]!.message).toMatch(/Line 1 is counted twice/);
  });
});

describe("the words of an irregularity", () => {
  const found = [
    { name: "Needle holder, Mayo-Hegar 160 mm", kind: "missing" as const, quantity: 1 },
    { name: "Towel clip, Backhaus 110 mm", kind: "missing" as const, quantity: 2 },
    { name: "Scalpel handle No. 3", kind: "damaged" as const, quantity: 1 },
  ];

  it("says what is held and why", () => {
    expect(holdReasonFor(found.slice(0, 1))).toBe("Missing: 1 × Needle holder, Mayo-Hegar 160 mm");
    expect(holdReasonFor(found)).toBe("Missing: 1 × Needle holder, Mayo-Hegar 160 mm; 2 × Towel clip, Backhaus 110 mm. Damaged: 1 × Scalpel handle No. 3");
    expect(holdReasonFor([])).toBe("");
  });

  it("prints one line on the label, singular or plural", () => {
    expect(irregularityText(found[0]!)).toBe("1 × Needle holder, Mayo-Hegar 160 mm missing");
    expect(labelIrregularityText(found.slice(0, 1))).toBe("IRREGULARITY: 1 × Needle holder, Mayo-Hegar 160 mm missing");
    expect(labelIrregularityText(found.slice(1))).toBe("IRREGULARITIES: 2 × Towel clip, Backhaus 110 mm missing; 1 × Scalpel handle No. 3 damaged");
    expect(labelIrregularityText([])).toBeNull();
    expect(missingCount(found)).toBe(3);
  });
});

describe("reading the stored record back", () => {
  it("reads what was written and refuses anything else rather than guess", () => {
    const lines = [{ position: 2, name: "Needle holder, Mayo-Hegar 160 mm", expected: 1, counted: 0, damaged: 0 }];
    expect(parseCountedLines(JSON.stringify(lines))).toEqual(lines);
    expect(parseIrregularities('[{"name":"A","kind":"missing","quantity":1}]')).toEqual([{ name: "A", kind: "missing", quantity: 1 }]);
    expect(() => parseIrregularities("not json")).toThrow(/cannot be read/);
    expect(() => parseIrregularities('[{"name":"A","kind":"lost","quantity":1}]')).toThrow(/cannot be read/);
    expect(() => parseCountedLines("{}")).toThrow(/cannot be read/);
  });
});
