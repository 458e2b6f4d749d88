// Unit conversions for cycle records: temperature to °C, pressure to kPa absolute.

import type { PressureReference, PressureUnit, TemperatureUnit } from "./record";
import { STANDARD_ATMOSPHERE_KPA } from "./record";

// 1 psi = 0.45359237 kg × 9.80665 m/s² per (0.0254 m)², exactly 6.894757293168 kPa.
const KPA_PER: Record<PressureUnit, number> = { kPa: 1, bar: 100, mbar: 0.1, MPa: 1000, psi: 6.894757293168 };

export function toCelsius(value: number, unit: TemperatureUnit): number {
  switch (unit) {
    case "C":
      return value;
    case "F":
      return ((value - 32) * 5) / 9;
    case "K":
      return value - 273.15;
  }
}

export function fromCelsius(tempC: number, unit: TemperatureUnit): number {
  switch (unit) {
    case "C":
      return tempC;
    case "F":
      return (tempC * 9) / 5 + 32;
    case "K":
      return tempC + 273.15;
  }
}

/**
 * Converts a pressure reading to kPa absolute. Gauge readings are relative to the surrounding air;
 * `atmosphereKpa` is that air's pressure and defaults to the standard atmosphere (101.325 kPa),
 * which is an assumption: pass the unit's measured barometric pressure where it matters.
 */
export function toKpaAbsolute(
  value: number,
  unit: PressureUnit,
  reference: PressureReference,
  atmosphereKpa: number = STANDARD_ATMOSPHERE_KPA,
): number {
  const kpa = value * KPA_PER[unit];
  return reference === "gauge" ? kpa + atmosphereKpa : kpa;
}

// The inverse of toKpaAbsolute, for writing records in a chosen unit.
export function fromKpaAbsolute(
  kpaAbs: number,
  unit: PressureUnit,
  reference: PressureReference,
  atmosphereKpa: number = STANDARD_ATMOSPHERE_KPA,
): number {
  const kpa = reference === "gauge" ? kpaAbs - atmosphereKpa : kpaAbs;
  return kpa / KPA_PER[unit];
}
