// Thermal disinfection figures of a washer-disinfector record (EN ISO 15883-1, Annex B).
//
// A0 = Σ 10^((T − 80)/z) · Δt with z = 10 K, T in °C and Δt in seconds, counting only time at or
// above 65 °C and only up to the end of the disinfection stage, so drying heat does not count.
// Integration: each interval [t_i, t_{i+1}) takes the temperature of its left sample (see
// ./intervals.ts), which makes constant holds exact.

import { assertSamples, longestRun, sumOverIntervals, type SampleRun } from "./intervals";
import { meetsMinimum } from "./format";
import type { CycleSample } from "./record";

/** Reference temperature of A0 (EN ISO 15883-1, Annex B). */
export const A0_REFERENCE_TEMP_C = 80;
/** z-value of A0 (EN ISO 15883-1, Annex B). */
export const A0_Z_K = 10;
/** Below this temperature no time counts towards A0 (EN ISO 15883-1, Annex B). */
export const A0_LOWER_LIMIT_C = 65;
/** Stage labels (compared case-insensitively, trimmed) that mark the disinfection stage. */
export const DISINFECTION_PHASES: readonly string[] = ["disinfection", "thermal disinfection", "disinfect"];

export interface DisinfectionWindowOptions {
  /** Stage labels that mark the disinfection stage; defaults to DISINFECTION_PHASES. */
  disinfectionPhases?: readonly string[];
}

export interface A0Options extends DisinfectionWindowOptions {
  /** Defaults to 10 K. */
  zK?: number;
  /** Defaults to 65 °C; intervals whose temperature is below it add nothing. */
  lowerLimitC?: number;
}

/**
 * The part of a record that counts for disinfection: from the first sample up to the end of the
 * disinfection stage. With no stage labels in the record it is the whole record (`labelled` false);
 * with labels but no disinfection stage it is empty (`endIndex` 0).
 */
export interface DisinfectionWindow {
  labelled: boolean;
  /** Index of the sample that closes the window; intervals 0 … endIndex − 1 are inside. */
  endIndex: number;
  endS: number;
}

// Where the disinfection stage ends: the sample after the last one labelled as disinfection.
export function disinfectionWindow(
  samples: readonly CycleSample[],
  opts: DisinfectionWindowOptions = {},
): DisinfectionWindow {
  assertSamples(samples);
  const labels = new Set((opts.disinfectionPhases ?? DISINFECTION_PHASES).map(normaliseLabel));
  const labelled = samples.some((s) => s.phase !== undefined && s.phase.trim() !== "");
  if (!labelled) return { labelled, endIndex: samples.length - 1, endS: samples[samples.length - 1].t };
  let last = -1;
  samples.forEach((s, i) => {
    if (s.phase !== undefined && labels.has(normaliseLabel(s.phase))) last = i;
  });
  if (last < 0) return { labelled, endIndex: 0, endS: samples[0].t };
  const endIndex = Math.min(last + 1, samples.length - 1);
  return { labelled, endIndex, endS: samples[endIndex].t };
}

// The samples of the disinfection window, ending with the sample that closes it.
export function disinfectionSamples(samples: readonly CycleSample[], opts: DisinfectionWindowOptions = {}): CycleSample[] {
  const w = disinfectionWindow(samples, opts);
  return samples.slice(0, w.endIndex + 1);
}

// A0 in seconds at 80 °C, over the disinfection window of the record.
export function computeA0(samples: readonly CycleSample[], opts: A0Options = {}): number {
  const z = opts.zK ?? A0_Z_K;
  const lower = opts.lowerLimitC ?? A0_LOWER_LIMIT_C;
  if (!(z > 0)) throw new RangeError(`z must be a positive number of kelvin, got ${z}`);
  const window = disinfectionWindow(samples, opts);
  return sumOverIntervals(
    samples,
    (s) => (meetsMinimum(s.tempC, lower) ? Math.pow(10, (s.tempC - A0_REFERENCE_TEMP_C) / z) : 0),
    0,
    window.endIndex,
  );
}

// The longest continuous time at or above `tempC`, in seconds (0 when never reached).
export function holdingTimeAtOrAbove(samples: readonly CycleSample[], tempC: number): number {
  return holdAtOrAbove(samples, tempC)?.seconds ?? 0;
}

// The longest continuous run at or above `tempC`, with where it starts and ends.
export function holdAtOrAbove(samples: readonly CycleSample[], tempC: number): SampleRun | undefined {
  assertSamples(samples);
  const run = longestRun(samples, (s) => meetsMinimum(s.tempC, tempC));
  return run && run.seconds > 0 ? run : undefined;
}

// Lowest and highest temperature of the given samples.
export function temperatureRange(samples: readonly CycleSample[]): { minTempC: number; maxTempC: number } {
  if (samples.length === 0) throw new RangeError("no samples to take a temperature range of");
  let minTempC = Infinity;
  let maxTempC = -Infinity;
  for (const s of samples) {
    if (s.tempC < minTempC) minTempC = s.tempC;
    if (s.tempC > maxTempC) maxTempC = s.tempC;
  }
  return { minTempC, maxTempC };
}

function normaliseLabel(label: string): string {
  return label.trim().toLowerCase().replace(/\s+/g, " ");
}
