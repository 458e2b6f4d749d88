import { describe, expect, it } from "vitest";
import { chartDomains, linearScale, niceTicks, polylinePoints, thinSamples, timeStepSeconds } from "@/lib/cycles/chart-geometry";
import type { CycleSample } from "@/lib/cycles/record";

describe("chart geometry", () => {
  it("maps a domain linearly onto drawing coordinates, flipped for a y axis", () => {
    const x = linearScale(0, 600, 50, 650);
    expect(x(0)).toBe(50);
    expect(x(300)).toBe(350);
    expect(x(600)).toBe(650);
    const y = linearScale(0, 140, 300, 20);
    expect(y(0)).toBe(300);
    expect(y(140)).toBe(20);
    expect(y(70)).toBe(160);
    // A domain of no width draws in the middle instead of dividing by zero.
    expect(linearScale(5, 5, 0, 100)(5)).toBe(50);
  });

  it("picks round ticks of 1, 2 or 5 times a power of ten", () => {
    expect(niceTicks(0, 137, 8)).toEqual({ min: 0, max: 140, step: 20, ticks: [0, 20, 40, 60, 80, 100, 120, 140] });
    expect(niceTicks(0, 310, 8).step).toBe(50);
    expect(niceTicks(18.2, 19.7, 8)).toMatchObject({ min: 18.2, step: 0.2 });
    expect(niceTicks(5, 5).ticks.length).toBeGreaterThan(1);
    expect(() => niceTicks(0, Number.NaN)).toThrow(RangeError);
  });

  it("steps a time axis in whole minutes, at most ten intervals", () => {
    expect(timeStepSeconds(600)).toBe(60);
    expect(timeStepSeconds(40 * 60)).toBe(300);
    expect(timeStepSeconds(3 * 3600)).toBe(1200);
  });

  it("thins a long record keeping its first, last, coolest and hottest samples", () => {
    const samples: CycleSample[] = Array.from({ length: 5000 }, (_, i) => ({ t: i, tempC: 90 + Math.sin(i / 50), pressureKpaAbs: 200 }));
    samples[2345] = { t: 2345, tempC: 60, pressureKpaAbs: 150 };
    samples[4000] = { t: 4000, tempC: 99, pressureKpaAbs: 300 };
    const thin = thinSamples(samples, 600);
    expect(thin.length).toBeLessThanOrEqual(602);
    expect(thin[0]!.t).toBe(0);
    expect(thin[thin.length - 1]!.t).toBe(4999);
    expect(thin.find((s) => s.t === 2345)).toEqual({ t: 2345, tempC: 60, pressureKpaAbs: 150 });
    expect(thin.some((s) => s.t === 4000)).toBe(true);
    for (let i = 1; i < thin.length; i++) expect(thin[i]!.t).toBeGreaterThan(thin[i - 1]!.t);
    expect(thinSamples(samples.slice(0, 10), 600)).toHaveLength(10);
  });

  it("covers the band in the temperature axis and starts pressure at zero", () => {
    const samples: CycleSample[] = [
      { t: 0, tempC: 20, pressureKpaAbs: 101 },
      { t: 600, tempC: 135, pressureKpaAbs: 312 },
    ];
    const d = chartDomains(samples, { lowC: 134, highC: 137 });
    expect(d.temp.min).toBe(0);
    expect(d.temp.max).toBeGreaterThanOrEqual(137);
    expect(d.pressure).toMatchObject({ min: 0 });
    expect(d.pressure!.max).toBeGreaterThanOrEqual(312);
    expect(chartDomains([{ t: 0, tempC: 90 }]).pressure).toBeNull();
  });

  it("writes polyline points, skipping samples without the value", () => {
    const samples: CycleSample[] = [{ t: 0, tempC: 10, pressureKpaAbs: 100 }, { t: 1, tempC: 20 }, { t: 2, tempC: 30, pressureKpaAbs: 200 }];
    expect(polylinePoints(samples, (t) => t * 10, (v) => v, (s) => s.pressureKpaAbs)).toBe("0.0,100.0 20.0,200.0");
  });
});
