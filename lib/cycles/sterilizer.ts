// Checks a steam steriliser load record against its cycle type: the plateau (time at or above the
// sterilisation temperature), the holding time inside the temperature band, the agreement of the
// measured temperature with saturated steam at the measured pressure, and F0.
// Times use the left-sample rectangle rule of ./intervals.ts.

import { computeF0 } from "./f0";
import { formatAbove, formatBelow, meetsMinimum, withinMaximum } from "./format";
import { onSaturationRange, saturationTemperatureC } from "./if97";
import { assertSamples, longestRun } from "./intervals";
import type { CycleRecord } from "./record";
import { temperatureRange } from "./a0";

/** Width of the sterilisation temperature band above the sterilisation temperature: 3 K (EN 285, from memory). */
export const DEFAULT_BAND_WIDTH_K = 3;
/**
 * Largest accepted difference between the measured temperature and the saturated-steam temperature
 * at the measured pressure during the plateau: 2 K (EN 285, from memory).
 */
export const DEFAULT_SATURATION_TOLERANCE_K = 2;

export interface SterilizerCycleType {
  name: string;
  /** Lower end of the sterilisation temperature band, °C. */
  sterilisationTempC: number;
  /** Width of the band above sterilisationTempC; defaults to DEFAULT_BAND_WIDTH_K. */
  bandWidthK?: number;
  /** Required continuous time inside the band. */
  minHoldSeconds: number;
  /** Accepted |T_measured − T_sat(p_measured)| during the plateau; defaults to DEFAULT_SATURATION_TOLERANCE_K. */
  saturationToleranceK?: number;
  /** Required F0 in minutes, when the cycle type sets one. */
  minF0?: number;
}

/** 134 °C held for at least 3 min (EN 285). */
export const CYCLE_134C_3MIN: SterilizerCycleType = {
  name: "134 °C, 3 min",
  sterilisationTempC: 134,
  bandWidthK: DEFAULT_BAND_WIDTH_K,
  minHoldSeconds: 180,
  saturationToleranceK: DEFAULT_SATURATION_TOLERANCE_K,
};

/** 121 °C held for at least 15 min (common practice). */
export const CYCLE_121C_15MIN: SterilizerCycleType = {
  name: "121 °C, 15 min",
  sterilisationTempC: 121,
  bandWidthK: DEFAULT_BAND_WIDTH_K,
  minHoldSeconds: 15 * 60,
  saturationToleranceK: DEFAULT_SATURATION_TOLERANCE_K,
};

/** Pre-vacuum (dynamic air removal), wrapped instruments: 132 °C for 4 min (CDC 2008 Guideline for Disinfection and Sterilization, Table 7). */
export const CYCLE_PREVACUUM_132C_4MIN: SterilizerCycleType = {
  name: "Pre-vacuum 132 °C, 4 min",
  sterilisationTempC: 132,
  bandWidthK: DEFAULT_BAND_WIDTH_K,
  minHoldSeconds: 4 * 60,
  saturationToleranceK: DEFAULT_SATURATION_TOLERANCE_K,
};

/** Gravity displacement, wrapped instruments: 121 °C for 30 min (CDC 2008 Guideline for Disinfection and Sterilization, Table 7). */
export const CYCLE_GRAVITY_121C_30MIN: SterilizerCycleType = {
  name: "Gravity 121 °C, 30 min",
  sterilisationTempC: 121,
  bandWidthK: DEFAULT_BAND_WIDTH_K,
  minHoldSeconds: 30 * 60,
  saturationToleranceK: DEFAULT_SATURATION_TOLERANCE_K,
};

export const STANDARD_CYCLE_TYPES: readonly SterilizerCycleType[] = [
  CYCLE_134C_3MIN,
  CYCLE_121C_15MIN,
  CYCLE_PREVACUUM_132C_4MIN,
  CYCLE_GRAVITY_121C_30MIN,
];

/** The sample of the plateau where measured temperature and saturated steam differ the most. */
export interface SaturationAgreement {
  /** T_measured − T_sat(p_measured) at that sample: negative hints at air, positive at superheat. */
  deviationK: number;
  atS: number;
  measuredTempC: number;
  saturationTempC: number;
  pressureKpaAbs: number;
}

export interface SterilizerFigures {
  f0: number;
  band: { lowC: number; highC: number };
  /** Longest continuous time at or above the sterilisation temperature; 0 when never reached. */
  plateauSeconds: number;
  plateauStartS: number | null;
  plateauEndS: number | null;
  plateauMinTempC: number | null;
  plateauMaxTempC: number | null;
  /** Longest continuous time with the temperature inside the band. */
  holdSeconds: number;
  /** Largest disagreement with saturated steam during the plateau; null without a plateau or pressure. */
  saturation: SaturationAgreement | null;
  peakTempC: number;
  durationSeconds: number;
}

/**
 * The outcome of checking a steriliser load record. Advisory only: it reports what the physical
 * record shows against the chosen cycle type. Release of a load also rests on indicators, the
 * daily air-removal test and the judgement of the unit's qualified staff under its validated
 * procedures and local regulations, which take precedence over this result.
 */
export interface SterilizerLoadCheck {
  passed: boolean;
  figures: SterilizerFigures;
  /** Why the load failed, as plain sentences; empty when it passed. */
  reasons: string[];
}

// Checks a steriliser load record against a cycle type.
export function checkSterilizerLoad(record: CycleRecord, cycleType: SterilizerCycleType): SterilizerLoadCheck {
  const samples = record.samples;
  assertSamples(samples);
  const { lowC, highC, toleranceK } = assertCycleType(cycleType);
  const reasons: string[] = [];

  const f0 = computeF0(samples);
  const peakTempC = temperatureRange(samples.slice(0, -1)).maxTempC;
  const plateauRun = longestRun(samples, (s) => meetsMinimum(s.tempC, lowC));
  const plateau = plateauRun && plateauRun.seconds > 0 ? plateauRun : undefined;
  const holdRun = longestRun(samples, (s) => meetsMinimum(s.tempC, lowC) && withinMaximum(s.tempC, highC));
  const holdSeconds = holdRun?.seconds ?? 0;

  const plateauSamples = plateau ? samples.slice(plateau.startIndex, plateau.endIndex) : [];
  const plateauRange = plateau ? temperatureRange(plateauSamples) : undefined;
  let saturation: SaturationAgreement | null = null;
  const range = `${fmt(lowC)}–${fmt(highC)} °C`;

  if (!plateau) {
    reasons.push(
      `The temperature never reached the sterilisation temperature of ${fmt(lowC)} °C (highest ${formatBelow(peakTempC, 1)} °C).`,
    );
  } else {
    if (!meetsMinimum(holdSeconds, cycleType.minHoldSeconds)) {
      reasons.push(
        `The temperature stayed inside the ${range} band for ${formatBelow(holdSeconds, 0)} s, less than the required ${fmt(cycleType.minHoldSeconds)} s.`,
      );
    }
    if (plateauRange && !withinMaximum(plateauRange.maxTempC, highC)) {
      reasons.push(
        `During the plateau the temperature rose to ${formatAbove(plateauRange.maxTempC, 1)} °C, above the band's upper limit of ${fmt(highC)} °C.`,
      );
    }

    const withoutPressure = plateauSamples.filter((s) => s.pressureKpaAbs === undefined).length;
    const offLine = plateauSamples.find((s) => s.pressureKpaAbs !== undefined && !onSaturationRange(s.pressureKpaAbs));
    if (withoutPressure > 0) {
      reasons.push(
        `${withoutPressure} of ${plateauSamples.length} plateau samples have no chamber pressure, so saturated steam cannot be confirmed.`,
      );
    } else if (offLine) {
      reasons.push(
        `At ${fmt(offLine.t)} s the chamber pressure of ${fmt(offLine.pressureKpaAbs ?? NaN)} kPa is outside the saturation line, so saturated steam cannot be confirmed.`,
      );
    } else {
      for (const s of plateauSamples) {
        const p = s.pressureKpaAbs as number;
        const tSat = saturationTemperatureC(p);
        const deviationK = s.tempC - tSat;
        if (!saturation || Math.abs(deviationK) > Math.abs(saturation.deviationK)) {
          saturation = { deviationK, atS: s.t, measuredTempC: s.tempC, saturationTempC: tSat, pressureKpaAbs: p };
        }
      }
      if (saturation && !withinMaximum(Math.abs(saturation.deviationK), toleranceK)) {
        const cause =
          saturation.deviationK < 0
            ? "colder than saturated steam at that pressure, which points to air or other non-condensable gas in the chamber"
            : "hotter than saturated steam at that pressure, which points to superheated steam";
        reasons.push(
          `During the plateau the measured temperature differed from saturated steam by up to ${formatAbove(Math.abs(saturation.deviationK), 1)} K (at ${fmt(saturation.atS)} s: ${saturation.measuredTempC.toFixed(1)} °C measured at ${saturation.pressureKpaAbs.toFixed(1)} kPa, where saturated steam is ${saturation.saturationTempC.toFixed(1)} °C), more than the ${fmt(toleranceK)} K allowed; the chamber was ${cause}.`,
        );
      }
    }
  }

  if (cycleType.minF0 !== undefined && !meetsMinimum(f0, cycleType.minF0)) {
    reasons.push(`F0 ${formatBelow(f0, 1)} min is below the required ${fmt(cycleType.minF0)} min.`);
  }

  return {
    passed: reasons.length === 0,
    figures: {
      f0,
      band: { lowC, highC },
      plateauSeconds: plateau?.seconds ?? 0,
      plateauStartS: plateau?.startS ?? null,
      plateauEndS: plateau?.endS ?? null,
      plateauMinTempC: plateauRange?.minTempC ?? null,
      plateauMaxTempC: plateauRange?.maxTempC ?? null,
      holdSeconds,
      saturation,
      peakTempC,
      durationSeconds: samples[samples.length - 1].t - samples[0].t,
    },
    reasons,
  };
}

function assertCycleType(c: SterilizerCycleType): { lowC: number; highC: number; toleranceK: number } {
  const band = c.bandWidthK ?? DEFAULT_BAND_WIDTH_K;
  const toleranceK = c.saturationToleranceK ?? DEFAULT_SATURATION_TOLERANCE_K;
  const problems: string[] = [];
  if (!Number.isFinite(c.sterilisationTempC)) problems.push(`sterilisationTempC must be a number, got ${c.sterilisationTempC}`);
  if (!(band > 0) || !Number.isFinite(band)) problems.push(`bandWidthK must be a positive number, got ${band}`);
  if (!(c.minHoldSeconds > 0) || !Number.isFinite(c.minHoldSeconds)) {
    problems.push(`minHoldSeconds must be a positive number, got ${c.minHoldSeconds}`);
  }
  if (!(toleranceK > 0) || !Number.isFinite(toleranceK)) {
    problems.push(`saturationToleranceK must be a positive number, got ${toleranceK}`);
  }
  if (c.minF0 !== undefined && (!(c.minF0 > 0) || !Number.isFinite(c.minF0))) {
    problems.push(`minF0 must be a positive number of minutes, got ${c.minF0}`);
  }
  if (problems.length > 0) throw new RangeError(`Cycle type "${c.name}": ${problems.join("; ")}`);
  return { lowC: c.sterilisationTempC, highC: c.sterilisationTempC + band, toleranceK };
}

// Up to 3 decimals, without trailing zeros: 134, 137.5, 0.125.
function fmt(n: number): string {
  return String(Math.round(n * 1000) / 1000);
}
