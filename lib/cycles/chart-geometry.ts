import type { CycleSample } from "./record";

// The arithmetic behind the cycle record chart, shared by the SVG on screen and the curve in the
// one-page PDF: linear scales, round axis ticks, and thinning a long record to a drawable number
// of points without smoothing away a dip or a peak. Pure.

/** What a record chart draws over the curve; shared by the chart on screen and the one-page PDF. */
export interface ChartAnnotations {
  /** Steriliser: the band from lowC to highC; washer: the minimum temperature lowC alone (a line). */
  band?: { lowC: number; highC?: number };
  /** Words for the band in the legend, e.g. "134–137 °C sterilisation band" (defaults from the values). */
  bandLabel?: string;
  /** The holding period, seconds from the record's start. */
  hold?: { fromT: number; toT: number };
  /** Computed values to label the chart with, e.g. { label: "A0", value: "3412 s" }. */
  figures: { label: string; value: string }[];
  /** Vertical markers, e.g. { t: 1260, label: "end of disinfection" }. */
  markers?: { t: number; label: string }[];
}

/** A function from a domain value to a drawing coordinate, straight-line between the two ends. */
export function linearScale(d0: number, d1: number, r0: number, r1: number): (v: number) => number {
  const span = d1 - d0;
  if (!Number.isFinite(span) || span === 0) return () => (r0 + r1) / 2;
  return (v: number) => r0 + ((v - d0) / span) * (r1 - r0);
}

export interface Ticks {
  min: number;
  max: number;
  step: number;
  ticks: number[];
}

/** Round ticks (steps of 1, 2 or 5 times a power of ten) covering [lo, hi] with at most `maxTicks` intervals. */
export function niceTicks(lo: number, hi: number, maxTicks = 8): Ticks {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new RangeError("The axis needs finite ends.");
  if (hi < lo) [lo, hi] = [hi, lo];
  if (hi === lo) {
    lo -= 1;
    hi += 1;
  }
  const raw = (hi - lo) / Math.max(1, maxTicks);
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw - 1e-12) ?? 10 * power;
  const min = Math.floor(lo / step + 1e-9) * step;
  const max = Math.ceil(hi / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let v = min; v <= max + step * 1e-9; v += step) ticks.push(Number(v.toFixed(10)));
  return { min, max, step, ticks };
}

/** A tick step for a time axis, in seconds: whole minutes (1, 2, 5, 10, 15, 20, 30, 60, 120) giving at most 10 intervals. */
export function timeStepSeconds(spanSeconds: number): number {
  const minutes = spanSeconds / 60;
  for (const step of [1, 2, 5, 10, 15, 20, 30, 60, 120]) if (minutes / step <= 10) return step * 60;
  return 240 * 60;
}

/**
 * At most about `maxPoints` samples: each bucket keeps its coolest and hottest sample in time
 * order (with their pressures), so a short dip or peak stays visible. The first and last samples
 * are always kept.
 */
export function thinSamples(samples: readonly CycleSample[], maxPoints = 600): CycleSample[] {
  if (samples.length <= maxPoints) return [...samples];
  const buckets = Math.max(1, Math.floor(maxPoints / 2));
  const size = Math.ceil(samples.length / buckets);
  const out: CycleSample[] = [samples[0]!];
  for (let start = 0; start < samples.length; start += size) {
    const bucket = samples.slice(start, start + size);
    let lo = bucket[0]!;
    let hi = bucket[0]!;
    for (const s of bucket) {
      if (s.tempC < lo.tempC) lo = s;
      if (s.tempC > hi.tempC) hi = s;
    }
    for (const s of lo.t <= hi.t ? [lo, hi] : [hi, lo]) if (out[out.length - 1]!.t < s.t) out.push(s);
  }
  const last = samples[samples.length - 1]!;
  if (out[out.length - 1]!.t < last.t) out.push(last);
  return out;
}

export interface ChartDomains {
  t0: number;
  t1: number;
  temp: Ticks;
  /** Present when at least one sample carries a pressure. */
  pressure: Ticks | null;
}

/** The axes of a chart: time from the first to the last sample, temperature covering the samples and the band, pressure from 0. */
export function chartDomains(samples: readonly CycleSample[], band?: { lowC: number; highC?: number }): ChartDomains {
  if (samples.length === 0) throw new RangeError("A chart needs at least one sample.");
  const t0 = samples[0]!.t;
  const t1 = Math.max(samples[samples.length - 1]!.t, t0 + 1);
  let lo = Math.min(...samples.map((s) => s.tempC));
  let hi = Math.max(...samples.map((s) => s.tempC));
  if (band) {
    lo = Math.min(lo, band.lowC);
    hi = Math.max(hi, band.highC ?? band.lowC);
  }
  const temp = niceTicks(Math.min(0, Math.floor(lo / 10) * 10), hi + 2, 8);
  const pressures = samples.map((s) => s.pressureKpaAbs).filter((p): p is number => p !== undefined && Number.isFinite(p));
  const pressure = pressures.length > 0 ? niceTicks(0, Math.max(...pressures), 8) : null;
  return { t0, t1, temp, pressure };
}

/** The SVG "points" text of a polyline through the samples' values. */
export function polylinePoints(samples: readonly CycleSample[], x: (t: number) => number, y: (v: number) => number, value: (s: CycleSample) => number | undefined): string {
  const parts: string[] = [];
  for (const s of samples) {
    const v = value(s);
    if (v === undefined || !Number.isFinite(v)) continue;
    parts.push(`${x(s.t).toFixed(1)},${y(v).toFixed(1)}`);
  }
  return parts.join(" ");
}
