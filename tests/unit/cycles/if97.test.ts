import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  saturationPressureKpa,
  saturationPressureMpaAtK,
  saturationTemperatureC,
  saturationTemperatureKAtMpa,
} from "@/lib/cycles";

const relClose = (actual: number, expected: number, rel: number) =>
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThanOrEqual(rel);

describe("IAPWS-IF97 region 4, the release's own check values", () => {
  // IAPWS-IF97 release, Table 35 (saturation-pressure equation), relative 1e-8.
  it.each([
    [300, 0.353658941e-2],
    [500, 0.263889776e1],
    // 600 K → 12.3443146 MPa: the same table, value from memory.
    [600, 0.123443146e2],
  ])("p_sat(%s K) = %s MPa (Table 35)", (tempK, expectedMpa) => {
    relClose(saturationPressureMpaAtK(tempK), expectedMpa, 1e-8);
  });

  // IAPWS-IF97 release, Table 36 (backward saturation-temperature equation), relative 1e-8.
  it.each([
    [0.1, 0.372755919e3],
    // 1 MPa → 453.035632 K and 10 MPa → 584.149488 K: the same table, values from memory.
    [1, 0.453035632e3],
    [10, 0.584149488e3],
  ])("T_sat(%s MPa) = %s K (Table 36)", (pressureMpa, expectedK) => {
    relClose(saturationTemperatureKAtMpa(pressureMpa), expectedK, 1e-8);
  });
});

describe("saturated steam at steriliser conditions", () => {
  // Shared CHECKS.md, IAPWS-IF97 region 4 values; tolerance ±0.01 kPa.
  it.each([
    [121, 205.039],
    [134, 304.199],
    [100, 101.418],
  ])("p_sat(%s °C) = %s kPa abs", (tempC, kpa) => {
    expect(Math.abs(saturationPressureKpa(tempC) - kpa)).toBeLessThanOrEqual(0.01);
  });

  it("T_sat(300 kPa) = 133.525 °C", () => {
    // Shared CHECKS.md, IAPWS-IF97 region 4; value given to 3 decimals, so ±0.001 K.
    expect(Math.abs(saturationTemperatureC(300) - 133.525)).toBeLessThanOrEqual(0.001);
  });

  it("the backward equation inverts the forward one across the steriliser range", () => {
    // IF97 eq. 31 is the algebraic solution of eq. 30, so the round trip is exact up to rounding.
    fc.assert(
      fc.property(fc.double({ min: 1, max: 370, noNaN: true }), (tempC) => {
        expect(Math.abs(saturationTemperatureC(saturationPressureKpa(tempC)) - tempC)).toBeLessThan(1e-7);
      }),
    );
  });

  it("refuses values off the saturation line", () => {
    expect(() => saturationPressureMpaAtK(700)).toThrow(RangeError);
    expect(() => saturationTemperatureKAtMpa(30)).toThrow(/22.064 MPa/);
    expect(() => saturationTemperatureC(0.5)).toThrow(RangeError);
    expect(() => saturationPressureKpa(Number.NaN)).toThrow(RangeError);
  });
});
