import { describe, expect, it } from "vitest";
import {
  A0_CLASSES,
  THERMAL_90C_1MIN,
  checkWasherBatch,
  synthWasherRecord,
  type CycleRecord,
} from "@/lib/cycles";
import { constantHold, stages } from "./helpers";

const record = (...parts: Parameters<typeof stages>): CycleRecord => ({ samples: stages(...parts) });

describe("requirement constants", () => {
  it("carry the A0 classes and the 90 °C / 1 min hold", () => {
    // A0 60 for human-waste containers (EN ISO 15883-3); A0 600 and A0 3000 (EN ISO 15883-1) — shared CHECKS.md.
    expect(A0_CLASSES.humanWasteContainers.minA0).toBe(60);
    expect(A0_CLASSES.sterilisedAfterwards.minA0).toBe(600);
    expect(A0_CLASSES.notSterilisedAfterwards.minA0).toBe(3000);
    // 90 °C for at least 1 minute (common practice, shared CHECKS.md).
    expect(THERMAL_90C_1MIN).toEqual({ kind: "time_temp", minTempC: 90, minHoldSeconds: 60 });
  });
});

describe("checkWasherBatch", () => {
  it("passes a 90 °C hold of 5 min against A0 3000 and reports its figures", () => {
    // 90 °C for 300 s → A0 3000 (computed, EN ISO 15883-1 Annex B); the 40 °C wash adds nothing.
    const batch = record(
      constantHold(40, 300, 5, "wash"),
      constantHold(90, 300, 5, "disinfection"),
      constantHold(95, 600, 5, "drying"),
    );
    const check = checkWasherBatch(batch, A0_CLASSES.notSterilisedAfterwards);
    expect(check.passed).toBe(true);
    expect(check.reasons).toEqual([]);
    expect(check.figures.a0).toBeCloseTo(3000, 6);
    expect(check.figures).toMatchObject({
      holdThresholdC: 65,
      holdSeconds: 300,
      minTempC: 90,
      maxTempC: 90,
      peakTempC: 90,
      durationSeconds: 1200,
      disinfectionEndS: 600,
    });
  });

  it("fails an A0 that falls short, in a plain sentence", () => {
    // 80 °C for 412 s → A0 412 (computed, EN ISO 15883-1 Annex B).
    const check = checkWasherBatch(record(constantHold(80, 412, 1, "disinfection")), A0_CLASSES.sterilisedAfterwards);
    expect(check.passed).toBe(false);
    expect(check.reasons).toEqual(["A0 412 is below the required 600."]);
  });

  it("never rounds a shortfall up to the limit", () => {
    // 599.9 s at 80 °C → A0 599.9: shown as 599, not 600.
    const check = checkWasherBatch({ samples: [{ t: 0, tempC: 80 }, { t: 599.9, tempC: 80 }] }, A0_CLASSES.sterilisedAfterwards);
    expect(check.reasons).toEqual(["A0 599 is below the required 600."]);
  });

  it("fails a hold that is too short", () => {
    const check = checkWasherBatch(
      record(constantHold(50, 120, 1, "wash"), constantHold(90, 45, 1, "disinfection"), constantHold(70, 120, 1, "drying")),
      THERMAL_90C_1MIN,
    );
    expect(check.passed).toBe(false);
    expect(check.figures.holdSeconds).toBe(45);
    expect(check.reasons).toEqual(["The temperature stayed at or above 90 °C for 45 s, less than the required 60 s."]);
  });

  it("fails a batch that is too cold, naming the highest temperature", () => {
    // 85 °C for 600 s: A0 = 600·10^0.5 = 1897.4 (computed), enough for A0 600 but not for 90 °C / 1 min.
    const cold = record(constantHold(85, 600, 10, "disinfection"), constantHold(60, 60, 10, "drying"));
    const timeTemp = checkWasherBatch(cold, THERMAL_90C_1MIN);
    expect(timeTemp.passed).toBe(false);
    expect(timeTemp.reasons).toEqual(["The disinfection stage never reached 90 °C (highest 85.0 °C)."]);
    expect(timeTemp.figures.minTempC).toBeNull();
    expect(checkWasherBatch(cold, A0_CLASSES.sterilisedAfterwards).passed).toBe(true);
    const withTemp = checkWasherBatch(cold, { kind: "a0", minA0: 600, minTempC: 90 });
    expect(withTemp.reasons).toEqual(["The disinfection stage never reached 90 °C (highest 85.0 °C)."]);
    expect(checkWasherBatch(cold, A0_CLASSES.notSterilisedAfterwards).reasons).toEqual(["A0 1897 is below the required 3000."]);
  });

  it("does not count drying heat towards A0 or the hold", () => {
    // 90 °C for 30 s in disinfection → A0 300 (computed); 95 °C during drying must not lift it to a pass.
    const batch = record(constantHold(90, 30, 1, "disinfection"), constantHold(95, 600, 1, "drying"));
    const a0 = checkWasherBatch(batch, A0_CLASSES.sterilisedAfterwards);
    expect(a0.figures.a0).toBeCloseTo(300, 9);
    expect(a0.passed).toBe(false);
    const hold = checkWasherBatch(batch, THERMAL_90C_1MIN);
    expect(hold.figures.holdSeconds).toBe(30);
    expect(hold.passed).toBe(false);
  });

  it("notes when the record has no stage labels", () => {
    const check = checkWasherBatch({ samples: constantHold(90, 120) }, THERMAL_90C_1MIN);
    expect(check.passed).toBe(true);
    expect(check.notes[0]).toMatch(/no stage labels, so the whole record counts as the disinfection stage/);
  });

  it("fails a labelled record without a disinfection stage", () => {
    const check = checkWasherBatch(record(constantHold(90, 120, 1, "rinse"), constantHold(90, 10, 1, "drying")), THERMAL_90C_1MIN);
    expect(check.passed).toBe(false);
    expect(check.reasons[0]).toMatch(/none marks the disinfection stage; label its samples "disinfection"/);
  });

  it("checks a synthetic batch and refuses malformed requirements", () => {
    const batch = synthWasherRecord({ holdTempC: 90, holdSeconds: 60, rampSeconds: 300, dryingSeconds: 300, stepSeconds: 2 });
    const check = checkWasherBatch(batch, THERMAL_90C_1MIN);
    expect(check.passed).toBe(true);
    expect(check.figures.holdSeconds).toBe(60);
    expect(() => checkWasherBatch(batch, { kind: "a0", minA0: -1 })).toThrow(/minA0 must be a positive number/);
    expect(() => checkWasherBatch(batch, { kind: "time_temp", minTempC: 90, minHoldSeconds: 0 })).toThrow(/minHoldSeconds/);
  });
});
