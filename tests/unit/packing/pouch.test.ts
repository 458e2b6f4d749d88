import { describe, expect, it } from "vitest";
import { DEFAULT_POUCH_SIZES, innerSize, PouchInputError, pouchText, recommendPouch } from "@/lib/packing/pouch";

// Every example below is worked by hand from the rules in shared CHECKS.md:
// - fill at most 75 % of the inner length (ISO/TS 16775);
// - about 20 mm clear on each side and at each end (common practice);
// - seals at least 6 mm wide (EN 868-5), taken off both edges: inner = flat − 2 × seal;
// - double pouching: the inner pouch lies flat in the outer, 10 mm clear of its seals (common
//   practice, from memory; our choice of figure).
// The default pouch list is common practice, from memory. Sorted smallest first by area:
// 57×130 (7410), 75×250 (18750), 90×230 (20700), 100×300 (30000), 135×260 (35100),
// 150×300 (45000), 190×330 (62700), 200×400 (80000), 250×380 (95000), 300×450 (135000) mm².

const size = (widthMm: number, lengthMm: number) => ({ widthMm, lengthMm });

describe("the inner size of a pouch", () => {
  it("takes a seal off each edge", () => {
    // 100 − 2 × 6 = 88; 300 − 2 × 6 = 288.
    expect(innerSize(size(100, 300), 6)).toEqual({ widthMm: 88, lengthMm: 288 });
    expect(innerSize(size(75, 250), 10)).toEqual({ widthMm: 55, lengthMm: 230 });
  });
});

describe("one pouch for one instrument", () => {
  it("picks the smallest pouch that keeps 20 mm on each side and fills at most 75 % of the length", () => {
    // 145 × 40 mm scissors. 57×130: inner 45 wide, (45 − 40)/2 = 2.5 mm a side — too narrow.
    // 75×250: inner 63, 11.5 mm a side — too narrow. 90×230: inner 78, 19 mm a side — too narrow.
    // 100×300: inner 88 × 288: 24 mm a side; 145/288 = 50.3 % of the length; (288 − 145)/2 = 71.5 mm
    // at each end → this one.
    const advice = recommendPouch({ lengthMm: 145, widthMm: 40 });
    expect(advice.ok).toBe(true);
    expect(advice.pouch?.pouch).toEqual(size(100, 300));
    expect(advice.pouch?.innerWidthMm).toBe(88);
    expect(advice.pouch?.innerLengthMm).toBe(288);
    expect(advice.pouch?.sideClearanceMm).toBe(24);
    expect(advice.pouch?.endClearanceMm).toBe(71.5);
    expect(advice.pouch?.lengthFill).toBeCloseTo(145 / 288, 12);
    expect(advice.explanation[0]).toBe("Use 100 × 300 mm.");
    expect(advice.explanation[1]).toBe(
      "100 × 300 mm: 88 × 288 mm inside its 6 mm seals; the 145 × 40 mm item fills 50.3 % of the inner length " +
        "(at most 75 %, ISO/TS 16775) and leaves 24 mm on each side and 71.5 mm at each end (about 20 mm wanted, common practice).",
    );
    // The two nearest smaller pouches, and why they were passed over.
    expect(advice.explanation.slice(2)).toEqual([
      "90 × 230 mm is too narrow: 78 mm inside the seals leaves 19 mm on each side, less than 20 mm.",
      "75 × 250 mm is too narrow: 63 mm inside the seals leaves 11.5 mm on each side, less than 20 mm.",
    ]);
    // The least it needs: 40 + 2 × 20 + 2 × 6 = 92 wide; max(145 / 0.75 = 193.3, 145 + 40) + 12 = 205.3 → 206 long.
    expect(advice.needs).toEqual(size(92, 206));
  });

  it("reads the longer side as the length, whichever way round it is entered", () => {
    expect(recommendPouch({ lengthMm: 40, widthMm: 145 }).pouch?.pouch).toEqual(size(100, 300));
  });

  it("accepts exactly three quarters of the inner length and refuses a fraction more (ISO/TS 16775)", () => {
    const list = [size(75, 250), size(100, 300)];
    // 75×250: inner 63 × 238; 0.75 × 238 = 178.5 mm. Sides (63 − 20)/2 = 21.5 mm; ends (238 − 178.5)/2 = 29.75 mm.
    const atLimit = recommendPouch({ lengthMm: 178.5, widthMm: 20 }, { pouches: list });
    expect(atLimit.pouch?.pouch).toEqual(size(75, 250));
    expect(atLimit.pouch?.lengthFill).toBe(0.75);
    // 179 / 238 = 75.2 % > 75 % → 100×300: 179 / 288 = 62.2 %.
    const over = recommendPouch({ lengthMm: 179, widthMm: 20 }, { pouches: list });
    expect(over.pouch?.pouch).toEqual(size(100, 300));
    expect(over.explanation).toContain(
      "75 × 250 mm is too short: the item would fill 75.2 % of its 238 mm inner length, more than 75 %.",
    );
  });

  it("takes the sealer's seal width off the inner size and refuses seals narrower than 6 mm (EN 868-5)", () => {
    const list = [size(75, 250), size(100, 300)];
    // 175 × 15 mm. 6 mm seals: inner 63 × 238; 175 / 238 = 73.5 % and 24 mm a side → 75×250.
    expect(recommendPouch({ lengthMm: 175, widthMm: 15 }, { pouches: list }).pouch?.pouch).toEqual(size(75, 250));
    // 10 mm seals: inner 55 × 230; sides (55 − 15)/2 = 20 mm (just enough), but 175 / 230 = 76.1 % → 100×300 (inner 80 × 280).
    const wide = recommendPouch({ lengthMm: 175, widthMm: 15 }, { pouches: list, rules: { sealWidthMm: 10 } });
    expect(wide.pouch?.pouch).toEqual(size(100, 300));
    expect(wide.pouch?.innerWidthMm).toBe(80);
    expect(wide.pouch?.sideClearanceMm).toBe(32.5);
    expect(wide.explanation[1]).toContain("inside its 10 mm seals");
    expect(() => recommendPouch({ lengthMm: 175, widthMm: 15 }, { rules: { sealWidthMm: 5 } })).toThrow(
      "A seal must be at least 6 mm wide (EN 868-5); 5 mm is too narrow.",
    );
  });

  it("counts a thick instrument's height in the width and the length the pouch wraps round", () => {
    // 120 × 30 mm, flat: 90×230 inner 78 × 218: (78 − 30)/2 = 24 mm a side, 120 / 218 = 55 % → 90×230.
    expect(recommendPouch({ lengthMm: 120, widthMm: 30 }).pouch?.pouch).toEqual(size(90, 230));
    // 15 mm thick: it needs 30 + 15 = 45 across and 135 along. 90×230: (78 − 45)/2 = 16.5 mm — too
    // narrow. 100×300: (88 − 45)/2 = 21.5 mm a side, 135 / 288 = 46.9 % → 100×300.
    const thick = recommendPouch({ lengthMm: 120, widthMm: 30, thicknessMm: 15 });
    expect(thick.pouch?.pouch).toEqual(size(100, 300));
    expect(thick.pouch?.sideClearanceMm).toBe(21.5);
    expect(thick.explanation[1]).toContain("the 120 × 30 mm item, 15 mm thick, fills 46.9 %");
  });

  it("says when nothing in the list fits, and what size it would take", () => {
    // 420 × 30 mm: 300×450 is the longest, inner 438: 420 / 438 = 95.9 %. It needs 30 + 40 + 12 = 82
    // wide and max(420 / 0.75 = 560, 460) + 12 = 572 long.
    const advice = recommendPouch({ lengthMm: 420, widthMm: 30 });
    expect(advice.ok).toBe(false);
    expect(advice.pouch).toBeNull();
    expect(advice.needs).toEqual(size(82, 572));
    expect(advice.explanation[0]).toBe(
      "No pouch in the list fits: the 420 × 30 mm item needs a pouch of at least 82 × 572 mm (flat size, with 6 mm seals).",
    );
    expect(advice.explanation[1]).toMatch(/larger pouch .*wrap or a container/);
  });

  it("refuses sizes that are not sizes, saying which", () => {
    const error = (fn: () => unknown) => {
      try {
        fn();
      } catch (e) {
        return e as PouchInputError;
      }
      throw new Error("expected a PouchInputError");
    };
    expect(error(() => recommendPouch({ lengthMm: 0, widthMm: 20 })).field).toBe("lengthMm");
    expect(error(() => recommendPouch({ lengthMm: 100, widthMm: Number.NaN })).field).toBe("widthMm");
    expect(error(() => recommendPouch({ lengthMm: 100, widthMm: 20, thicknessMm: -1 })).field).toBe("thicknessMm");
    expect(error(() => recommendPouch({ lengthMm: 100, widthMm: 20 }, { pouches: [] })).field).toBe("pouches");
  });
});

describe("double pouching", () => {
  it("finds the smallest outer pouch, with an inner pouch that fits in it flat", () => {
    // 145 × 40 mm. The smallest single pouch is 100×300, but its outer would need 100 + 2 × 10 + 12 = 132
    // by 300 + 32 = 332: 190×330 is 2 mm short (inner 318: 9 mm at each end), so 200×400.
    // 135×260 also holds the item (inner 123 × 248: 41.5 mm a side, 145 / 248 = 58.5 %) and needs an
    // outer of 167 × 292: 190×330 (inner 178 × 318: 21.5 mm a side, 29 mm at each end). 62 700 mm² < 80 000 mm²,
    // so the pair 135×260 in 190×330 is the smaller package.
    const advice = recommendPouch({ lengthMm: 145, widthMm: 40 }, { double: true });
    expect(advice.ok).toBe(true);
    expect(advice.pouch?.pouch).toEqual(size(135, 260));
    expect(advice.outer?.pouch).toEqual(size(190, 330));
    expect(advice.outer?.sideClearanceMm).toBe(21.5);
    expect(advice.outer?.endClearanceMm).toBe(29);
    expect(advice.outerNeeds).toEqual(size(167, 292));
    expect(advice.explanation[0]).toBe("Use 135 × 260 mm inside 190 × 330 mm.");
    expect(advice.explanation[2]).toContain("holds the inner pouch flat, unfolded, with 21.5 mm on each side and 29 mm at each end");
  });

  it("refuses an outer pouch that leaves the inner one less than 10 mm clear of its seals", () => {
    // Only 100×300 for the item; outer candidates 190×330 (inner 318: (318 − 300)/2 = 9 mm) and 200×400 (44 mm).
    const list = [size(100, 300), size(190, 330), size(200, 400)];
    const advice = recommendPouch({ lengthMm: 145, widthMm: 40 }, { double: true, pouches: list });
    expect(advice.pouch?.pouch).toEqual(size(100, 300));
    expect(advice.outer?.pouch).toEqual(size(200, 400));
    const tight = recommendPouch({ lengthMm: 145, widthMm: 40 }, { double: true, pouches: [size(100, 300), size(190, 330)] });
    expect(tight.ok).toBe(false);
    expect(tight.pouch?.pouch).toEqual(size(100, 300));
    expect(tight.outerNeeds).toEqual(size(132, 332));
    expect(tight.explanation[1]).toBe(
      "The outer pouch must be at least 132 × 332 mm. Use a larger outer pouch (from a roll), a wrap or a container.",
    );
  });

  it("says when the item fits a pouch but no listed pouch holds that pouch", () => {
    // 300 × 40 mm: 200×400 inner 388: 77.3 % — too short; 250×380: 81.5 %; 300×450 inner 288 × 438:
    // 68.5 %, 124 mm a side → inner pouch 300×450, whose outer needs 332 × 482 mm: none in the list.
    const advice = recommendPouch({ lengthMm: 300, widthMm: 40 }, { double: true });
    expect(advice.ok).toBe(false);
    expect(advice.pouch?.pouch).toEqual(size(300, 450));
    expect(advice.outer).toBeNull();
    expect(advice.outerNeeds).toEqual(size(332, 482));
    expect(advice.explanation[0]).toBe(
      "No pair of pouches in the list fits: the item fits in 300 × 450 mm, but no listed pouch holds that one flat with 10 mm clear of its seals.",
    );
  });

  it("says when not even the inner pouch fits", () => {
    const advice = recommendPouch({ lengthMm: 420, widthMm: 30 }, { double: true });
    expect(advice.ok).toBe(false);
    expect(advice.pouch).toBeNull();
    expect(advice.explanation[0]).toMatch(/^No pouch in the list fits even the inner layer: the 420 × 30 mm item needs a pouch of at least 82 × 572 mm/);
  });
});

describe("the default list", () => {
  it("lists flat pouch sizes as width × length with room for the seals", () => {
    expect(DEFAULT_POUCH_SIZES.length).toBeGreaterThan(5);
    for (const p of DEFAULT_POUCH_SIZES) expect(p.lengthMm).toBeGreaterThan(p.widthMm);
    expect(pouchText(DEFAULT_POUCH_SIZES[0]!)).toBe("57 × 130 mm");
  });
});
