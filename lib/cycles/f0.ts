// F0 of a steam sterilisation record: the equivalent time at 121.1 °C with z = 10 K, in minutes.
// F0 = Σ 10^((T − 121.1)/10) · Δt, with the left-sample rectangle rule of ./intervals.ts.

import { assertSamples, sumOverIntervals } from "./intervals";
import type { CycleSample } from "./record";

/** Reference temperature of F0. */
export const F0_REFERENCE_TEMP_C = 121.1;
/** z-value of F0. */
export const F0_Z_K = 10;

export interface F0Options {
  /** Only intervals at or above this temperature count; by default every interval counts. */
  lowerLimitC?: number;
  /** Sample indices of the intervals to sum, [from, to); defaults to the whole record. */
  fromIndex?: number;
  toIndex?: number;
}

// F0 in minutes.
export function computeF0(samples: readonly CycleSample[], opts: F0Options = {}): number {
  assertSamples(samples);
  const lower = opts.lowerLimitC ?? -Infinity;
  const seconds = sumOverIntervals(
    samples,
    (s) => (s.tempC >= lower ? Math.pow(10, (s.tempC - F0_REFERENCE_TEMP_C) / F0_Z_K) : 0),
    opts.fromIndex,
    opts.toIndex,
  );
  return seconds / 60;
}
