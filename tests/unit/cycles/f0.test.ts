import { describe, expect, it } from "vitest";
import { computeF0 } from "@/lib/cycles";
import { constantHold, stages } from "./helpers";

describe("computeF0", () => {
  it("121.1 °C for 15 min gives F0 15.000", () => {
    // Computed from F0 = Σ 10^((T − 121.1)/10)·Δt (shared CHECKS.md).
    expect(computeF0(constantHold(121.1, 15 * 60))).toBeCloseTo(15, 9);
  });

  it("134 °C for 3 min gives F0 58.495", () => {
    // Computed (shared CHECKS.md): 3 · 10^1.29 = 58.495.
    expect(computeF0(constantHold(134, 3 * 60, 2))).toBeCloseTo(58.495, 3);
  });

  it("uses the left-sample rectangle rule and an optional lower limit", () => {
    // [0,60) at 121.1 °C → 1 min; [60,120) at 111.1 °C → 0.1 min (computed).
    const samples = stages(constantHold(121.1, 60, 60), constantHold(111.1, 60, 60));
    expect(computeF0(samples)).toBeCloseTo(1.1, 12);
    expect(computeF0(samples, { lowerLimitC: 120 })).toBeCloseTo(1, 12);
    expect(computeF0(samples, { fromIndex: 1 })).toBeCloseTo(0.1, 12);
  });
});
