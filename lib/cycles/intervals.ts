// The integration rule shared by every figure computed from a record.
//
// A record of n samples is read as n − 1 intervals [t_i, t_{i+1}), each taking the values of its
// left sample i (rectangle rule, left point). A constant hold sampled at any rate therefore
// integrates exactly, and the last sample only closes the last interval. Times, holds and
// lethality sums all use this rule so they agree with each other.

import type { CycleSample } from "./record";

export interface SampleRun {
  /** Index of the first sample of the run. */
  startIndex: number;
  /** Index of the sample that closes the run (its time is the run's end). */
  endIndex: number;
  startS: number;
  endS: number;
  seconds: number;
}

// Throws a RangeError unless the samples are at least two, finite and strictly increasing in time.
export function assertSamples(samples: readonly CycleSample[]): void {
  if (samples.length < 2) throw new RangeError(`a record needs at least 2 samples, got ${samples.length}`);
  for (let i = 0; i < samples.length; i++) {
    const s = samples[i];
    if (!Number.isFinite(s.t) || !Number.isFinite(s.tempC)) {
      throw new RangeError(`sample ${i} has a time or temperature that is not a finite number`);
    }
    if (i > 0 && s.t <= samples[i - 1].t) {
      throw new RangeError(`sample ${i} (t = ${s.t} s) is not later than sample ${i - 1} (t = ${samples[i - 1].t} s)`);
    }
  }
}

// The longest continuous run of intervals whose left sample satisfies `holds` (the first on a tie).
export function longestRun(
  samples: readonly CycleSample[],
  holds: (sample: CycleSample, index: number) => boolean,
): SampleRun | undefined {
  let best: SampleRun | undefined;
  let start = -1;
  for (let i = 0; i < samples.length; i++) {
    const inside = i < samples.length - 1 && holds(samples[i], i);
    if (inside && start < 0) start = i;
    if (!inside && start >= 0) {
      const seconds = samples[i].t - samples[start].t;
      if (!best || seconds > best.seconds) {
        best = { startIndex: start, endIndex: i, startS: samples[start].t, endS: samples[i].t, seconds };
      }
      start = -1;
    }
  }
  return best;
}

// Σ f(sample_i)·(t_{i+1} − t_i) over intervals i in [from, to) (sample indices).
export function sumOverIntervals(
  samples: readonly CycleSample[],
  f: (sample: CycleSample, index: number) => number,
  from = 0,
  to = samples.length - 1,
): number {
  let sum = 0;
  for (let i = Math.max(0, from); i < Math.min(to, samples.length - 1); i++) {
    sum += f(samples[i], i) * (samples[i + 1].t - samples[i].t);
  }
  return sum;
}
