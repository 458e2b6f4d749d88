import { describe, expect, it } from "vitest";
import { synthWasherRecord } from "@/lib/cycles/synth";
import { checkWasherBatch, type WasherRequirement } from "@/lib/cycles/washer";
import { chartPoints, comparisonRows, holdSpan, readStoredFigures, toStoredFigures } from "@/lib/washing/figures";

const A0_3000: WasherRequirement = { kind: "a0", minA0: 3000 };
const HOLD_90_5MIN: WasherRequirement = { kind: "time_temp", minTempC: 90, minHoldSeconds: 300 };

function figuresFor(holdTempC: number, holdSeconds: number, requirement: WasherRequirement) {
  const record = synthWasherRecord({ holdTempC, holdSeconds, rampSeconds: 300, dryingSeconds: 300, stepSeconds: 10 });
  return { record, figures: toStoredFigures(record, requirement, checkWasherBatch(record, requirement)) };
}

describe("stored figures of a washer batch", () => {
  it("keep the requirement, the hold's place in the record and survive a round trip through JSON", () => {
    const { figures } = figuresFor(93, 300, A0_3000);
    // The ramp from 20 °C reaches 65 °C after 300·45/73 s, the first sample at or above it is at 190 s;
    // the hold at or above 65 °C then lasts until the end of the disinfection stage at 600 s.
    expect(figures).toMatchObject({ holdThresholdC: 65, holdStartS: 190, holdEndS: 600, disinfectionEndS: 600, requirement: A0_3000 });
    expect(readStoredFigures(JSON.stringify(figures))).toEqual(figures);
    expect(readStoredFigures("{\"a0\":1}")).toBeNull();
    expect(readStoredFigures(null)).toBeNull();
  });

  it("find no hold when the record never reaches the threshold", () => {
    const { record } = figuresFor(80, 300, A0_3000);
    expect(holdSpan(record, 90)).toBeNull();
  });
});

describe("the side-by-side comparison", () => {
  it("shows A0 against an A0 requirement", () => {
    // 90 °C for 300 s gives A0 3000 (CHECKS.md, computed); the ramp adds a little, drying nothing.
    const { figures } = figuresFor(90, 300, A0_3000);
    const rows = comparisonRows(figures);
    expect(rows[0]).toMatchObject({ label: "A0 (s at 80 °C)", required: "at least 3000", ok: true });
    expect(Number(rows[0]!.computed)).toBeGreaterThanOrEqual(3000);
    expect(rows.filter((r) => r.ok !== null)).toHaveLength(1);
  });

  it("shows the hold time against a time-and-temperature requirement, and A0 for information", () => {
    const { figures } = figuresFor(91, 240, HOLD_90_5MIN);
    const rows = comparisonRows(figures);
    expect(rows[0]).toMatchObject({ label: "A0 (s at 80 °C)", ok: null });
    expect(rows[1]).toEqual({ label: "Held at or above 90 °C", computed: "4 min", required: "at least 5 min", ok: false });
    expect(rows.find((r) => r.label === "Lowest temperature while at or above 90 °C")!.computed).toBe("91.0 °C");
  });
});

describe("chart points", () => {
  it("keep every sample of a short record", () => {
    const { record } = figuresFor(90, 60, A0_3000);
    expect(chartPoints(record.samples)).toHaveLength(record.samples.length);
  });

  it("thin a long record but keep a one-sample dip, the first and the last sample", () => {
    const samples = Array.from({ length: 5000 }, (_, i) => ({ t: i, tempC: i === 2345 ? 40 : 90 }));
    const points = chartPoints(samples, 200);
    expect(points.length).toBeLessThanOrEqual(202);
    expect(points[0]).toEqual({ t: 0, tempC: 90 });
    expect(points.at(-1)).toEqual({ t: 4999, tempC: 90 });
    expect(points).toContainEqual({ t: 2345, tempC: 40 });
    expect(points.every((p, i) => i === 0 || p.t > points[i - 1]!.t)).toBe(true);
  });
});
