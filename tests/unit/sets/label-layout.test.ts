import { describe, expect, it } from "vitest";
import { CONTENTS_CAPACITY, contentsSummary, LABEL_BLANK_FIELDS, labelDate, labelFieldLines, layoutContents, moreLinesNote } from "@/lib/sets/label-layout";

const lines = (n: number) => Array.from({ length: n }, (_, i) => ({ name: `Instrument ${i + 1}`, quantity: (i % 3) + 1 }));

describe("the contents list on a label", () => {
  it("prints every line when they fit", () => {
    const layout = layoutContents(lines(CONTENTS_CAPACITY));
    expect(layout.shown).toHaveLength(CONTENTS_CAPACITY);
    expect(layout.hidden).toBe(0);
  });

  it("says how many lines are left out instead of cutting the list silently", () => {
    const layout = layoutContents(lines(CONTENTS_CAPACITY + 5));
    // One place goes to the "and N more lines" note.
    expect(layout.shown).toHaveLength(CONTENTS_CAPACITY - 1);
    expect(layout.hidden).toBe(6);
    expect(layout.shown.length + layout.hidden).toBe(CONTENTS_CAPACITY + 5);
  });

  it("counts the instruments of the whole set, shown or not", () => {
    // 1 + 2 + 3 + 1 + 2 = 9
    expect(layoutContents(lines(5)).instruments).toBe(9);
    expect(layoutContents(lines(5), 3).instruments).toBe(9);
    expect(contentsSummary(9, 5)).toBe("9 instruments on 5 lines");
    expect(contentsSummary(1, 1)).toBe("1 instrument on 1 line");
  });
});

describe("the note for lines left out", () => {
  it("gives the count and says where the rest is", () => {
    expect(moreLinesNote(6)).toEqual({ count: "+6", text: "more lines: see the catalogue" });
    expect(moreLinesNote(1).text).toBe("more line: see the catalogue");
  });
});

describe("the columns of the contents list", () => {
  it("uses one full-width column up to 30 lines, two beyond", () => {
    expect(layoutContents(lines(30)).columns).toBe(1);
    expect(layoutContents(lines(31)).columns).toBe(2);
    expect(layoutContents(lines(200)).columns).toBe(2);
  });
});

describe("the boxes filled from a cycle", () => {
  const fields = {
    cycleId: 7,
    packedBy: "Sol Brackenbury",
    packedAt: "2 Dec 2026 10:15",
    packaging: "Wrapped tray",
    load: null,
    sterilisedOn: null,
    useBy: "3 Jun 2027",
    irregularity: null,
    lineNotes: {},
  };

  it("puts the packer and the time in 'Packed by', and leaves boxes without a value blank", () => {
    expect(labelFieldLines(fields)).toEqual({
      "Packed by": ["Sol Brackenbury", "2 Dec 2026 10:15"],
      Load: [],
      "Sterilised on": [],
      "Use by": ["3 Jun 2027"],
    });
    expect(Object.values(labelFieldLines(null)).every((lines) => lines.length === 0)).toBe(true);
    // Every caption has its box, in the printed order.
    expect(Object.keys(labelFieldLines(null))).toEqual([...LABEL_BLANK_FIELDS]);
  });

  it("prints a local calendar date as written, without a time zone shift", () => {
    expect(labelDate("2027-06-03")).toBe("3 Jun 2027");
    expect(labelDate("2026-12-31")).toBe("31 Dec 2026");
    expect(labelDate("2026-13-01")).toBeNull();
    expect(labelDate("3 June")).toBeNull();
    expect(labelDate(null)).toBeNull();
  });
});
