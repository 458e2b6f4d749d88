import { describe, expect, it } from "vitest";
import { stuThatFit } from "@/lib/machines/chamber";

// EN 285: 1 StU = 300 × 300 × 600 mm (54 l); capacity is counted in whole modules that fit,
// not chamber volume ÷ 54 (/work/shared/CHECKS.md, "Sterilisation unit").
describe("sterilisation units that fit a chamber", () => {
  it("fits exactly one module in a chamber of one module's size", () => {
    expect(stuThatFit({ widthMm: 300, heightMm: 300, depthMm: 600 })).toBe(1);
    expect(stuThatFit({ widthMm: 299, heightMm: 300, depthMm: 600 })).toBe(0);
  });

  it("counts whole modules, not the volume divided by 54 l", () => {
    // 680 × 680 × 950 mm is 439 l, 8.1 × 54 l, yet only 2 layers of 3 modules (turned across) fit.
    const chamber = { widthMm: 680, heightMm: 680, depthMm: 950 };
    expect((chamber.widthMm * chamber.heightMm * chamber.depthMm) / 54e6).toBeGreaterThan(8);
    expect(stuThatFit(chamber)).toBe(6);
    expect(stuThatFit({ widthMm: 590, heightMm: 590, depthMm: 1190 })).toBe(1);
    expect(stuThatFit({ widthMm: 680, heightMm: 1000, depthMm: 700 })).toBe(6);
    expect(stuThatFit({ widthMm: 680, heightMm: 680, depthMm: 1270 })).toBe(8);
  });

  it("turns the modules across the chamber when that fits more", () => {
    // 1300 wide, 300 deep: only crosswise fits; 1250 × 620 fits 4 per layer either way.
    expect(stuThatFit({ widthMm: 1300, heightMm: 300, depthMm: 300 })).toBe(2);
    expect(stuThatFit({ widthMm: 1250, heightMm: 600, depthMm: 620 })).toBe(8);
  });
});
