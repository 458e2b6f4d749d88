import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  A0_LOWER_LIMIT_C,
  computeA0,
  disinfectionWindow,
  holdingTimeAtOrAbove,
  temperatureRange,
} from "@/lib/cycles";
import { constantHold, stages } from "./helpers";

const REL = 1e-6;
const close = (actual: number, expected: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(REL * Math.max(1, Math.abs(expected)));

describe("computeA0 on constant holds", () => {
  // All five values: computed from the EN ISO 15883-1 Annex B formula (shared CHECKS.md), relative tolerance 1e-6.
  it.each([
    [80, 600, 600],
    [90, 60, 600],
    [90, 300, 3000],
    [70, 6000, 600],
    [60, 600, 0],
  ])("%d °C for %d s gives A0 %d", (tempC, seconds, expected) => {
    close(computeA0(constantHold(tempC, seconds)), expected);
  });

  it("does not depend on the sampling interval for a constant hold (left-sample rectangle rule)", () => {
    // 90 °C for 300 s → 3000, computed (EN ISO 15883-1 Annex B formula); any step dividing 300 s.
    fc.assert(
      fc.property(fc.constantFrom(0.5, 1, 2, 3, 5, 10, 15, 30, 60, 100, 150, 300), (step) => {
        close(computeA0(constantHold(90, 300, step)), 3000);
      }),
    );
  });

  it("counts each interval at the temperature of its left sample", () => {
    // Two intervals: [0,10) at 90 °C → 10·10 = 100, [10,20) at 80 °C → 10·1 = 10; the last sample adds nothing.
    // Computed from the Annex B formula with the rectangle rule.
    const samples = [
      { t: 0, tempC: 90 },
      { t: 10, tempC: 80 },
      { t: 20, tempC: 100 },
    ];
    close(computeA0(samples), 110);
  });

  it("ignores intervals below 65 °C and counts those exactly at it", () => {
    // 65 °C is the lower limit of EN ISO 15883-1 Annex B; 10^((65−80)/10)·100 s = 3.16227766 (computed).
    expect(A0_LOWER_LIMIT_C).toBe(65);
    close(computeA0(constantHold(65, 100)), 100 * 10 ** -1.5);
    expect(computeA0(constantHold(64.99, 100))).toBe(0);
  });

  it("stops at the end of the disinfection stage, so drying heat does not count", () => {
    // Annex B counts only up to the end of the disinfection stage (shared CHECKS.md).
    // 90 °C for 60 s in disinfection → 600; 95 °C for 600 s of drying adds nothing (computed).
    const samples = stages(
      constantHold(40, 120, 1, "wash"),
      constantHold(90, 60, 1, "disinfection"),
      constantHold(95, 600, 1, "drying"),
    );
    close(computeA0(samples), 600);
    // The same record without stage labels counts the drying heat too: 600 + 600·10^1.5 (computed).
    const unlabelled = samples.map(({ t, tempC }) => ({ t, tempC }));
    close(computeA0(unlabelled), 600 + 600 * 10 ** 1.5);
  });

  it("counts heat before the disinfection stage and accepts configured stage labels", () => {
    const samples = stages(constantHold(80, 100, 1, "rinse"), constantHold(90, 60, 1, "Thermal Disinfection"), constantHold(90, 60, 1, "dry"));
    close(computeA0(samples), 100 + 600);
    const custom = stages(constantHold(80, 100, 1, "rinse"), constantHold(90, 60, 1, "hold"), constantHold(90, 60, 1, "dry"));
    expect(computeA0(custom)).toBe(0);
    close(computeA0(custom, { disinfectionPhases: ["hold"] }), 700);
  });

  it("rejects records that are too short or out of order", () => {
    expect(() => computeA0([{ t: 0, tempC: 90 }])).toThrow(/at least 2 samples/);
    expect(() => computeA0([{ t: 0, tempC: 90 }, { t: 0, tempC: 90 }])).toThrow(/not later/);
    expect(() => computeA0(constantHold(90, 10), { zK: 0 })).toThrow(/z must be/);
  });
});

describe("disinfectionWindow", () => {
  it("ends at the sample after the last disinfection sample", () => {
    const samples = stages(constantHold(50, 10, 1, "wash"), constantHold(90, 5, 1, "disinfection"), constantHold(70, 10, 1, "drying"));
    expect(disinfectionWindow(samples)).toEqual({ labelled: true, endIndex: 15, endS: 15 });
  });

  it("is the whole record without labels and empty with labels but no disinfection", () => {
    expect(disinfectionWindow(constantHold(90, 10))).toEqual({ labelled: false, endIndex: 10, endS: 10 });
    expect(disinfectionWindow(constantHold(90, 10, 1, "drying"))).toEqual({ labelled: true, endIndex: 0, endS: 0 });
  });
});

describe("holdingTimeAtOrAbove and temperatureRange", () => {
  it("gives the longest continuous time at or above a temperature", () => {
    const samples = stages(
      constantHold(91, 30),
      constantHold(89, 10),
      constantHold(92, 50),
      constantHold(60, 10),
    );
    expect(holdingTimeAtOrAbove(samples, 90)).toBe(50);
    expect(holdingTimeAtOrAbove(samples, 88)).toBe(90);
    expect(holdingTimeAtOrAbove(samples, 95)).toBe(0);
  });

  it("does not count the last sample, which closes no interval", () => {
    const samples = [
      { t: 0, tempC: 20 },
      { t: 10, tempC: 20 },
      { t: 20, tempC: 95 },
    ];
    expect(holdingTimeAtOrAbove(samples, 90)).toBe(0);
  });

  it("finds min and max", () => {
    expect(temperatureRange([{ t: 0, tempC: 20 }, { t: 1, tempC: 93.5 }, { t: 2, tempC: -1 }])).toEqual({
      minTempC: -1,
      maxTempC: 93.5,
    });
  });
});
