// The saturation line of water (IAPWS-IF97, region 4): saturation pressure from temperature
// (the release's saturation-pressure equation) and saturation temperature from pressure (its
// backward saturation-temperature equation).
//
// The coefficients n1…n10 are written here from memory of the IAPWS-IF97 release (Revised
// Release on the IAPWS Industrial Formulation 1997, equations 30 and 31, Table 34); the unit tests
// verify them against the release's own check values (Tables 35 and 36).

const N = [
  0.11670521452767e4, // n1
  -0.72421316703206e6, // n2
  -0.17073846940092e2, // n3
  0.12020824702470e5, // n4
  -0.32325550322333e7, // n5
  0.14915108613530e2, // n6
  -0.48232657361591e4, // n7
  0.40511340542057e6, // n8
  -0.23855557567849, // n9
  0.65017534844798e3, // n10
] as const;

const [n1, n2, n3, n4, n5, n6, n7, n8, n9, n10] = N;

/** Range of the saturation line in IAPWS-IF97: from the triple point to the critical point. */
export const IF97_SATURATION_RANGE = {
  minTempK: 273.15,
  maxTempK: 647.096,
  minPressureMpa: 611.213e-6,
  maxPressureMpa: 22.064,
} as const;

// Saturation pressure in MPa at temperature T in kelvin (IAPWS-IF97 eq. 30).
export function saturationPressureMpaAtK(tempK: number): number {
  const { minTempK, maxTempK } = IF97_SATURATION_RANGE;
  if (!(tempK >= minTempK && tempK <= maxTempK)) {
    throw new RangeError(`saturation pressure is defined from ${minTempK} K to ${maxTempK} K, got ${tempK} K`);
  }
  const theta = tempK + n9 / (tempK - n10);
  const A = theta * theta + n1 * theta + n2;
  const B = n3 * theta * theta + n4 * theta + n5;
  const C = n6 * theta * theta + n7 * theta + n8;
  return Math.pow((2 * C) / (-B + Math.sqrt(B * B - 4 * A * C)), 4);
}

// Saturation temperature in kelvin at pressure p in MPa (IAPWS-IF97 eq. 31).
export function saturationTemperatureKAtMpa(pressureMpa: number): number {
  const { minPressureMpa, maxPressureMpa } = IF97_SATURATION_RANGE;
  if (!(pressureMpa >= minPressureMpa && pressureMpa <= maxPressureMpa)) {
    throw new RangeError(
      `saturation temperature is defined from ${minPressureMpa} MPa to ${maxPressureMpa} MPa, got ${pressureMpa} MPa`,
    );
  }
  const beta = Math.pow(pressureMpa, 0.25);
  const E = beta * beta + n3 * beta + n6;
  const F = n1 * beta * beta + n4 * beta + n7;
  const G = n2 * beta * beta + n5 * beta + n8;
  const D = (2 * G) / (-F - Math.sqrt(F * F - 4 * E * G));
  return (n10 + D - Math.sqrt((n10 + D) * (n10 + D) - 4 * (n9 + n10 * D))) / 2;
}

// Saturated-steam pressure in kPa absolute at a temperature in °C.
export function saturationPressureKpa(tempC: number): number {
  return saturationPressureMpaAtK(tempC + 273.15) * 1000;
}

// Saturated-steam temperature in °C at a pressure in kPa absolute.
export function saturationTemperatureC(pressureKpa: number): number {
  return saturationTemperatureKAtMpa(pressureKpa / 1000) - 273.15;
}

/** True when the pressure (kPa absolute) lies on the IF97 saturation line's range. */
export function onSaturationRange(pressureKpa: number): boolean {
  const mpa = pressureKpa / 1000;
  return mpa >= IF97_SATURATION_RANGE.minPressureMpa && mpa <= IF97_SATURATION_RANGE.maxPressureMpa;
}
