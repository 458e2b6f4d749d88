import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  A0_CLASSES,
  CYCLE_134C_3MIN,
  THERMAL_90C_1MIN,
  checkSterilizerLoad,
  checkWasherBatch,
  computeA0,
  parseSterilizerRecord,
  parseWasherRecord,
  recordToCsv,
  saturationTemperatureC,
  synthSterilizerRecord,
  synthWasherRecord,
} from "@/lib/cycles";

describe("synthetic records", () => {
  it("give a washer hold whose A0 is the hold's plus the heating ramp's", () => {
    // Hold 90 °C for 300 s → 3000 (computed, EN ISO 15883-1 Annex B); drying at 85 °C is not counted.
    const withRamp = synthWasherRecord({ holdTempC: 90, holdSeconds: 300, rampSeconds: 600, dryingSeconds: 300, stepSeconds: 5 });
    const noRamp = synthWasherRecord({ holdTempC: 90, holdSeconds: 300, rampSeconds: 0, dryingSeconds: 300, stepSeconds: 5 });
    expect(computeA0(noRamp.samples)).toBeCloseTo(3000, 9);
    expect(computeA0(withRamp.samples)).toBeGreaterThan(3000);
    expect(withRamp.samples.map((s) => s.phase)).toContain("drying");
    expect(withRamp.samples.at(-1)?.t).toBe(1200);
  });

  it("give steriliser pressure on the saturation line, offset only while steam is under pressure", () => {
    const record = synthSterilizerRecord({ plateauTempC: 134, plateauSeconds: 180, stepSeconds: 5, pressureOffsetKpa: 10 });
    const phases = new Set(record.samples.map((s) => s.phase));
    expect([...phases]).toEqual(["air removal", "heating", "sterilisation", "exhaust", "drying"]);
    for (const s of record.samples.filter((x) => x.phase === "air removal")) {
      expect(saturationTemperatureC(s.pressureKpaAbs as number)).toBeCloseTo(s.tempC, 9);
    }
    for (const s of record.samples.filter((x) => x.phase === "sterilisation")) {
      expect(s.tempC).toBe(134);
      // p_sat(134 °C) = 304.199 kPa (shared CHECKS.md, IAPWS-IF97) plus the 10 kPa offset.
      expect(Math.abs((s.pressureKpaAbs as number) - 314.199)).toBeLessThan(0.01);
    }
  });

  it("repeat exactly for a seed and stay within the noise bound", () => {
    const opts = { holdTempC: 93, holdSeconds: 120, rampSeconds: 60, dryingSeconds: 60, stepSeconds: 1, noiseK: 0.3, seed: 7 };
    const a = synthWasherRecord(opts);
    expect(synthWasherRecord(opts)).toEqual(a);
    expect(synthWasherRecord({ ...opts, seed: 8 })).not.toEqual(a);
    for (const s of a.samples.filter((x) => x.phase === "disinfection")) expect(Math.abs(s.tempC - 93)).toBeLessThanOrEqual(0.3);
  });

  it("refuse impossible settings", () => {
    expect(() => synthWasherRecord({ holdTempC: 90, holdSeconds: 60, rampSeconds: 0, dryingSeconds: 0, stepSeconds: 0 })).toThrow(/stepSeconds/);
    expect(() => synthWasherRecord({ holdTempC: 90, holdSeconds: 1e9, rampSeconds: 0, dryingSeconds: 0, stepSeconds: 1 })).toThrow(/larger stepSeconds/);
    expect(() => synthSterilizerRecord({ plateauTempC: 90, plateauSeconds: 60, stepSeconds: 1 })).toThrow(/plateauTempC/);
  });
});

describe("synth → CSV → parse → check", () => {
  it("keeps a washer record exactly at full precision and gives the same check", () => {
    const record = synthWasherRecord({ holdTempC: 91.3, holdSeconds: 90, rampSeconds: 420, dryingSeconds: 240, stepSeconds: 3, noiseK: 0.2 });
    const parsed = parseWasherRecord(recordToCsv(record));
    expect(parsed.samples).toEqual(record.samples);
    expect(checkWasherBatch(parsed, THERMAL_90C_1MIN)).toEqual(checkWasherBatch(record, THERMAL_90C_1MIN));
    expect(checkWasherBatch(parsed, THERMAL_90C_1MIN).passed).toBe(true);
  });

  it("survives °F, timestamps and rounding to 2 decimals", () => {
    const record = synthWasherRecord({ holdTempC: 90, holdSeconds: 300, rampSeconds: 300, dryingSeconds: 300, stepSeconds: 10 });
    const csv = recordToCsv(record, { temperatureUnit: "F", startedAt: "2026-03-02T07:15:00+01:00", decimals: 2 });
    expect(csv.split("\r\n")[0]).toBe("timestamp,temp_f,phase");
    const parsed = parseWasherRecord(csv);
    expect(parsed.startedAt).toBe("2026-03-02T06:15:00.000Z");
    expect(parsed.samples.map((s) => s.t)).toEqual(record.samples.map((s) => s.t));
    parsed.samples.forEach((s, i) => expect(Math.abs(s.tempC - record.samples[i].tempC)).toBeLessThan(0.003));
    const check = checkWasherBatch(parsed, A0_CLASSES.notSterilisedAfterwards);
    expect(check.passed).toBe(true);
    expect(check.figures.a0).toBeCloseTo(checkWasherBatch(record, A0_CLASSES.notSterilisedAfterwards).figures.a0, 0);
  });

  it("passes a steriliser load written in bar gauge and fails one with air", () => {
    const good = synthSterilizerRecord({ plateauTempC: 135, plateauSeconds: 200, stepSeconds: 2, noiseK: 0.1, seed: 3 });
    const csv = recordToCsv(good, { pressure: { unit: "bar", reference: "gauge" }, decimals: 4 });
    expect(csv.split("\r\n")[0]).toBe("t_s,temp_c,pressure_bar_g,phase");
    const check = checkSterilizerLoad(parseSterilizerRecord(csv), CYCLE_134C_3MIN);
    expect(check.reasons).toEqual([]);
    expect(check.figures.holdSeconds).toBeGreaterThanOrEqual(200);

    const airy = synthSterilizerRecord({ plateauTempC: 135, plateauSeconds: 200, stepSeconds: 2, pressureOffsetKpa: 40 });
    const airyCsv = recordToCsv(airy, { pressure: { unit: "kPa", reference: "gauge" } });
    const failed = checkSterilizerLoad(parseSterilizerRecord(airyCsv), CYCLE_134C_3MIN);
    expect(failed.passed).toBe(false);
    expect(failed.reasons[0]).toMatch(/points to air/);
  });

  it("round-trips any synthetic steriliser record in kPa absolute exactly", () => {
    fc.assert(
      fc.property(
        fc.record({
          plateauTempC: fc.double({ min: 115, max: 140, noNaN: true }),
          plateauSeconds: fc.integer({ min: 10, max: 900 }),
          stepSeconds: fc.integer({ min: 1, max: 30 }),
          pressureOffsetKpa: fc.double({ min: -20, max: 40, noNaN: true }),
          noiseK: fc.double({ min: 0, max: 1, noNaN: true }),
          seed: fc.integer(),
        }),
        (opts) => {
          const record = synthSterilizerRecord(opts);
          expect(parseSterilizerRecord(recordToCsv(record)).samples).toEqual(record.samples);
        },
      ),
      { numRuns: 40 },
    );
  });
});
