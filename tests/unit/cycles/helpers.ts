// Small record builders for the cycle tests.

import type { CycleSample } from "@/lib/cycles";

// A constant temperature held for `seconds`, sampled every `step` seconds from t = 0 to t = seconds.
export function constantHold(tempC: number, seconds: number, step = 1, phase?: string): CycleSample[] {
  const samples: CycleSample[] = [];
  const n = Math.round(seconds / step);
  for (let k = 0; k <= n; k++) samples.push(phase === undefined ? { t: k * step, tempC } : { t: k * step, tempC, phase });
  return samples;
}

// Joins stages end to end: each stage's samples are shifted to start where the previous ended.
// The joining sample belongs to the later stage.
export function stages(...parts: CycleSample[][]): CycleSample[] {
  const out: CycleSample[] = [];
  for (const part of parts) {
    const offset = out.length === 0 ? 0 : out[out.length - 1].t;
    if (out.length > 0) out.pop();
    for (const s of part) out.push({ ...s, t: s.t + offset });
  }
  return out;
}
