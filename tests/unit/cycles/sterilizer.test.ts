import { describe, expect, it } from "vitest";
import {
  CYCLE_121C_15MIN,
  CYCLE_134C_3MIN,
  CYCLE_GRAVITY_121C_30MIN,
  CYCLE_PREVACUUM_132C_4MIN,
  DEFAULT_BAND_WIDTH_K,
  DEFAULT_SATURATION_TOLERANCE_K,
  checkSterilizerLoad,
  saturationPressureKpa,
  synthSterilizerRecord,
  type CycleRecord,
} from "@/lib/cycles";

// A plateau that is reached cleanly: with 10 s steps the last heating sample (132.6 °C) is below 134 °C.
const load = (extra: Partial<Parameters<typeof synthSterilizerRecord>[0]> = {}): CycleRecord =>
  synthSterilizerRecord({ plateauTempC: 134.5, plateauSeconds: 240, stepSeconds: 10, ...extra });

describe("standard cycle types", () => {
  it("carry the published holds and the configurable defaults", () => {
    // 134 °C for 3 min (EN 285); 121 °C for 15 min (common practice);
    // pre-vacuum 132 °C for 4 min and gravity 121 °C for 30 min (CDC 2008 Guideline, Table 7).
    expect([CYCLE_134C_3MIN, CYCLE_121C_15MIN, CYCLE_PREVACUUM_132C_4MIN, CYCLE_GRAVITY_121C_30MIN].map((c) => [c.sterilisationTempC, c.minHoldSeconds])).toEqual([
      [134, 180],
      [121, 900],
      [132, 240],
      [121, 1800],
    ]);
    // Band 3 K above the sterilisation temperature (EN 285, from memory); saturation tolerance 2 K (EN 285, from memory).
    expect(DEFAULT_BAND_WIDTH_K).toBe(3);
    expect(DEFAULT_SATURATION_TOLERANCE_K).toBe(2);
  });
});

describe("checkSterilizerLoad", () => {
  it("passes a saturated 134.5 °C plateau of 4 min and reports its figures", () => {
    const check = checkSterilizerLoad(load(), CYCLE_134C_3MIN);
    expect(check.reasons).toEqual([]);
    expect(check.passed).toBe(true);
    const f = check.figures;
    expect(f.band).toEqual({ lowC: 134, highC: 137 });
    expect(f.plateauSeconds).toBe(240);
    expect(f.holdSeconds).toBe(240);
    expect(f.plateauMinTempC).toBe(134.5);
    expect(f.plateauMaxTempC).toBe(134.5);
    expect(Math.abs(f.saturation?.deviationK ?? NaN)).toBeLessThan(1e-9);
    // The plateau alone gives 4 · 10^((134.5 − 121.1)/10) = 87.50 min (computed); heating and exhaust add a little.
    expect(f.f0).toBeGreaterThan(4 * 10 ** 1.34);
    expect(f.f0).toBeLessThan(4 * 10 ** 1.34 + 15);
  });

  it("fails a plateau that is too short", () => {
    const check = checkSterilizerLoad(load({ plateauSeconds: 150 }), CYCLE_134C_3MIN);
    expect(check.passed).toBe(false);
    expect(check.reasons).toEqual(["The temperature stayed inside the 134–137 °C band for 150 s, less than the required 180 s."]);
  });

  it("fails a load whose temperature never reaches the band", () => {
    const check = checkSterilizerLoad(load({ plateauTempC: 132 }), CYCLE_134C_3MIN);
    expect(check.reasons).toEqual(["The temperature never reached the sterilisation temperature of 134 °C (highest 132.0 °C)."]);
    expect(check.figures.saturation).toBeNull();
  });

  it("fails a plateau above the band", () => {
    const check = checkSterilizerLoad(load({ plateauTempC: 137.6 }), CYCLE_134C_3MIN);
    expect(check.passed).toBe(false);
    expect(check.reasons).toContain("During the plateau the temperature rose to 137.6 °C, above the band's upper limit of 137 °C.");
    expect(check.figures.holdSeconds).toBeLessThan(180);
  });

  it("fails a brief excursion above the band that splits the hold", () => {
    const record = load();
    const start = record.samples.findIndex((s) => s.phase === "sterilisation");
    const samples = record.samples.map((s, i) =>
      i === start + 12 ? { ...s, tempC: 138.2, pressureKpaAbs: saturationPressureKpa(138.2) } : s,
    );
    const check = checkSterilizerLoad({ samples }, CYCLE_134C_3MIN);
    expect(check.figures.plateauSeconds).toBe(240);
    expect(check.figures.holdSeconds).toBe(120);
    expect(check.reasons).toEqual([
      "The temperature stayed inside the 134–137 °C band for 120 s, less than the required 180 s.",
      "During the plateau the temperature rose to 138.2 °C, above the band's upper limit of 137 °C.",
    ]);
  });

  it("fails non-saturated steam: air in the chamber raises the pressure above saturation", () => {
    const check = checkSterilizerLoad(load({ pressureOffsetKpa: 25 }), CYCLE_134C_3MIN);
    expect(check.passed).toBe(false);
    expect(check.figures.saturation?.deviationK).toBeLessThan(-2);
    expect(check.reasons).toHaveLength(1);
    expect(check.reasons[0]).toMatch(
      /^During the plateau the measured temperature differed from saturated steam by up to 2\.\d K .* more than the 2 K allowed; the chamber was colder than saturated steam at that pressure, which points to air/,
    );
  });

  it("fails superheated steam: pressure below saturation for the temperature", () => {
    const check = checkSterilizerLoad(load({ pressureOffsetKpa: -25 }), CYCLE_134C_3MIN);
    expect(check.figures.saturation?.deviationK).toBeGreaterThan(2);
    expect(check.reasons[0]).toMatch(/hotter than saturated steam at that pressure, which points to superheated steam/);
  });

  it("takes a configured saturation tolerance and band", () => {
    expect(checkSterilizerLoad(load({ pressureOffsetKpa: 25 }), { ...CYCLE_134C_3MIN, saturationToleranceK: 4 }).passed).toBe(true);
    expect(checkSterilizerLoad(load({ plateauTempC: 137.6 }), { ...CYCLE_134C_3MIN, bandWidthK: 4 }).passed).toBe(true);
  });

  it("fails an F0 below the cycle type's minimum", () => {
    const check = checkSterilizerLoad(load(), { ...CYCLE_134C_3MIN, minF0: 200 });
    expect(check.reasons).toEqual([expect.stringMatching(/^F0 \d+\.\d min is below the required 200 min\.$/)]);
  });

  it("cannot confirm saturated steam without pressure", () => {
    const samples = load().samples.map(({ t, tempC }) => ({ t, tempC }));
    const check = checkSterilizerLoad({ samples }, CYCLE_134C_3MIN);
    expect(check.passed).toBe(false);
    expect(check.reasons).toEqual(["24 of 24 plateau samples have no chamber pressure, so saturated steam cannot be confirmed."]);
  });

  it("refuses a malformed cycle type", () => {
    expect(() => checkSterilizerLoad(load(), { ...CYCLE_134C_3MIN, minHoldSeconds: 0, bandWidthK: -1 })).toThrow(
      /Cycle type "134 °C, 3 min": bandWidthK must be a positive number, got -1; minHoldSeconds must be a positive number/,
    );
  });

  it("passes the CDC gravity cycle and the 121 °C cycle on a long enough plateau", () => {
    const gravity = synthSterilizerRecord({ plateauTempC: 122, plateauSeconds: 1860, stepSeconds: 15, airRemovalPulses: 0 });
    expect(checkSterilizerLoad(gravity, CYCLE_GRAVITY_121C_30MIN).passed).toBe(true);
    expect(checkSterilizerLoad(gravity, CYCLE_121C_15MIN).passed).toBe(true);
    expect(checkSterilizerLoad(gravity, CYCLE_PREVACUUM_132C_4MIN).passed).toBe(false);
  });
});
