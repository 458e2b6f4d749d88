import { describe, expect, it } from "vitest";
import {
  checkReadings,
  DEFAULT_LIMITS,
  DEFAULT_SETTINGS,
  describeRange,
  dhToMmolL,
  mergeSettings,
  mmolLToDh,
  rangeFinding,
  settingsProblems,
} from "@/lib/monitoring/limits";

describe("monitoring limits", () => {
  it("defaults the sterile store to 18–20 °C and 40–60 % RH", () => {
    // Common practice, /work/shared/CHECKS.md "Sterile storage".
    expect(DEFAULT_LIMITS.store_temperature).toEqual({ low: 18, high: 20 });
    expect(DEFAULT_LIMITS.store_humidity).toEqual({ low: 40, high: 60 });
  });

  it("counts the ends of a range as inside and says which limit a reading misses", () => {
    const range = DEFAULT_LIMITS.store_humidity;
    expect(rangeFinding("store_humidity", 40, range)).toBeNull();
    expect(rangeFinding("store_humidity", 60, range)).toBeNull();
    expect(rangeFinding("store_humidity", 60.1, range)).toBe("Sterile store relative humidity 60.1 % is above the upper limit of 60 %.");
    expect(rangeFinding("store_humidity", 39.5, range)).toBe("Sterile store relative humidity 39.5 % is below the lower limit of 40 %.");
    expect(rangeFinding("rinse_conductivity", 1e6, { low: null, high: null })).toBeNull();
  });

  it("checks each kind of entry against its own readings only", () => {
    const limits = DEFAULT_LIMITS;
    expect(checkReadings({ temperatureC: 19, humidityPct: 68 }, limits, "store_climate")).toEqual([
      "Sterile store relative humidity 68 % is above the upper limit of 60 %.",
    ]);
    expect(checkReadings({ temperatureC: 17.5, humidityPct: 50 }, limits, "store_climate")).toHaveLength(1);
    expect(checkReadings({ conductivityUsCm: 42, hardnessMmolL: 0.1 }, limits, "water_reading")).toEqual([
      "Final-rinse water conductivity 42 µS/cm is above the upper limit of 30 µS/cm.",
    ]);
    expect(checkReadings({ conductivityUsCm: 5 }, limits, "water_reading")).toEqual([]);
    expect(checkReadings({ outcome: "fail" }, limits, "seal_test")).toEqual(["The seal test failed."]);
    expect(checkReadings({ outcome: "pass" }, limits, "seal_test")).toEqual([]);
    // A store climate value on another kind is not checked.
    expect(checkReadings({ humidityPct: 99 }, limits, "salt_refill")).toEqual([]);
  });

  it("converts German degrees of hardness: 1 mmol/l = 5.6077 °dH", () => {
    // Computed from the definition 1 °dH = 10 mg CaO/l and M(CaO) = 56.077 g/mol (IUPAC atomic weights).
    expect(dhToMmolL(5.6077)).toBeCloseTo(1, 6);
    expect(dhToMmolL(1)).toBeCloseTo(0.17833, 5);
    expect(mmolLToDh(0.5)).toBeCloseTo(2.80385, 4);
  });

  it("describes ranges in words", () => {
    expect(describeRange({ low: 18, high: 20 }, "°C")).toBe("18–20 °C");
    expect(describeRange({ low: null, high: 30 }, "µS/cm")).toBe("at most 30 µS/cm");
    expect(describeRange({ low: 40, high: null }, "%")).toBe("at least 40 %");
    expect(describeRange({ low: null, high: null }, "%")).toBe("no limit");
  });

  it("refuses a low end above the high end, values out of bounds and fractional intervals", () => {
    expect(settingsProblems(DEFAULT_SETTINGS)).toEqual({});
    const bad = {
      limits: { ...DEFAULT_LIMITS, store_humidity: { low: 70, high: 60 }, store_temperature: { low: -40, high: 20 } },
      intervals: { ...DEFAULT_SETTINGS.intervals, washer_cleaning: 1.5 },
    };
    expect(settingsProblems(bad)).toEqual({
      "store_humidity.low": "The lower limit is above the upper limit.",
      "store_temperature.low": "Enter a value from -10 to 50 °C.",
      "intervals.washer_cleaning": "Enter whole days from 1 to 366.",
    });
  });

  it("merges stored overrides over the defaults and ignores what it cannot read", () => {
    const merged = mergeSettings([
      { key: "limit:store_temperature", value: JSON.stringify({ low: 18, high: 24 }) },
      { key: "limit:unknown", value: "{}" },
      { key: "interval:washer_cleaning", value: "14" },
      { key: "interval:seal_test", value: "not json" },
      { key: "interval:store_climate", value: "0" },
    ]);
    expect(merged.limits.store_temperature).toEqual({ low: 18, high: 24 });
    expect(merged.limits.store_humidity).toEqual(DEFAULT_LIMITS.store_humidity);
    expect(merged.intervals).toEqual({ ...DEFAULT_SETTINGS.intervals, washer_cleaning: 14 });
  });
});
