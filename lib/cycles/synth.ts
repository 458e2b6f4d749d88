// Synthetic but physically consistent cycle records, for the demo scenario and for tests.
//
// Samples fall every `stepSeconds` from the start of each stage, each stage starts with a sample,
// and one final sample closes the record. With the left-sample rule of ./intervals.ts a hold of
// holdSeconds at holdTempC therefore contributes exactly holdSeconds at that temperature.

import { saturationPressureKpa, saturationTemperatureC } from "./if97";
import { STANDARD_ATMOSPHERE_KPA, type CycleRecord, type CycleSample } from "./record";

/** More samples than this are refused, so a mistyped step cannot exhaust memory. */
export const MAX_SYNTH_SAMPLES = 200_000;

interface Noise {
  /** Uniform temperature noise of ±noiseK added to every sample; 0 by default. */
  noiseK?: number;
  /** Seed of the deterministic noise generator; 1 by default. */
  seed?: number;
}

export interface SynthWasherOptions extends Noise {
  holdTempC: number;
  holdSeconds: number;
  /** Linear heating from startTempC to holdTempC before the hold. */
  rampSeconds: number;
  dryingSeconds: number;
  stepSeconds: number;
  /** Defaults to 20 °C. */
  startTempC?: number;
  /** Load temperature during drying; defaults to 85 °C, warm enough to show that drying is not counted. */
  dryingTempC?: number;
}

export interface SynthSterilizerOptions extends Noise {
  plateauTempC: number;
  plateauSeconds: number;
  stepSeconds: number;
  /** Vacuum pulses for air removal before heating; defaults to 3. */
  airRemovalPulses?: number;
  /** Length of one pulse (down to vacuumKpa and back to atmosphere); defaults to 120 s. */
  pulseSeconds?: number;
  /** Defaults to 8 kPa absolute. */
  vacuumKpa?: number;
  /** Linear heating from 100 °C to the plateau; defaults to 180 s. */
  heatingSeconds?: number;
  /** Linear fall from the plateau back to atmospheric steam; defaults to 60 s. */
  exhaustSeconds?: number;
  /** Vacuum drying; defaults to 300 s. */
  dryingSeconds?: number;
  /**
   * Added to the saturated-steam pressure during heating, plateau and exhaust, in kPa: positive
   * values act like air in the chamber (pressure above saturation for the temperature), negative
   * like superheated steam. 0 by default.
   */
  pressureOffsetKpa?: number;
}

interface Segment {
  phase: string;
  seconds: number;
  /** Values at fraction u ∈ [0, 1] of the segment. */
  at: (u: number) => { tempC: number; pressureKpaAbs?: number };
  /** Falling stages start one step in, so the sample at their start is no longer at the hold. */
  startsAfterStep?: boolean;
}

// A washer-disinfector record: heating, a disinfection hold, drying — labelled by stage.
export function synthWasherRecord(opts: SynthWasherOptions): CycleRecord {
  const startTempC = opts.startTempC ?? 20;
  const dryingTempC = opts.dryingTempC ?? 85;
  requireFinite({ holdTempC: opts.holdTempC, startTempC, dryingTempC });
  requireNonNegative({ rampSeconds: opts.rampSeconds, dryingSeconds: opts.dryingSeconds });
  requirePositive({ holdSeconds: opts.holdSeconds, stepSeconds: opts.stepSeconds });
  const segments: Segment[] = [
    {
      phase: "heating",
      seconds: opts.rampSeconds,
      at: (u) => ({ tempC: startTempC + (opts.holdTempC - startTempC) * u }),
    },
    { phase: "disinfection", seconds: opts.holdSeconds, at: () => ({ tempC: opts.holdTempC }) },
    { phase: "drying", seconds: opts.dryingSeconds, at: () => ({ tempC: dryingTempC }) },
  ];
  return { samples: build(segments, opts.stepSeconds, opts) };
}

// A pre-vacuum steam steriliser record: air removal, heating, plateau, exhaust, drying; the
// pressure follows saturated steam (IAPWS-IF97) plus the optional offset.
export function synthSterilizerRecord(opts: SynthSterilizerOptions): CycleRecord {
  const pulses = opts.airRemovalPulses ?? 3;
  const pulseSeconds = opts.pulseSeconds ?? 120;
  const vacuumKpa = opts.vacuumKpa ?? 8;
  const heatingSeconds = opts.heatingSeconds ?? 180;
  const exhaustSeconds = opts.exhaustSeconds ?? 60;
  const dryingSeconds = opts.dryingSeconds ?? 300;
  const offset = opts.pressureOffsetKpa ?? 0;
  requireFinite({ plateauTempC: opts.plateauTempC, pressureOffsetKpa: offset });
  requirePositive({ plateauSeconds: opts.plateauSeconds, stepSeconds: opts.stepSeconds, pulseSeconds, vacuumKpa });
  requireNonNegative({ airRemovalPulses: pulses, heatingSeconds, exhaustSeconds, dryingSeconds });
  if (!Number.isInteger(pulses)) throw new RangeError(`airRemovalPulses must be a whole number, got ${pulses}`);
  if (!(opts.plateauTempC > 100 && opts.plateauTempC < 200)) {
    throw new RangeError(`plateauTempC must be between 100 and 200 °C for a steam cycle, got ${opts.plateauTempC}`);
  }

  const atm = STANDARD_ATMOSPHERE_KPA;
  const atmTempC = saturationTemperatureC(atm);
  const steam = (tempC: number, extra = 0) => ({ tempC, pressureKpaAbs: Math.max(1, saturationPressureKpa(tempC) + extra) });
  const segments: Segment[] = [];
  for (let i = 0; i < pulses; i++) {
    segments.push({
      phase: "air removal",
      seconds: pulseSeconds,
      at: (u) => {
        const p = u < 0.5 ? atm + (vacuumKpa - atm) * 2 * u : vacuumKpa + (atm - vacuumKpa) * (2 * u - 1);
        return { tempC: saturationTemperatureC(p), pressureKpaAbs: p };
      },
    });
  }
  segments.push(
    { phase: "heating", seconds: heatingSeconds, at: (u) => steam(atmTempC + (opts.plateauTempC - atmTempC) * u, offset) },
    { phase: "sterilisation", seconds: opts.plateauSeconds, at: () => steam(opts.plateauTempC, offset) },
    {
      phase: "exhaust",
      seconds: exhaustSeconds,
      startsAfterStep: true,
      at: (u) => steam(opts.plateauTempC + (atmTempC - opts.plateauTempC) * u, offset),
    },
    {
      phase: "drying",
      seconds: dryingSeconds,
      startsAfterStep: true,
      at: (u) => ({ tempC: atmTempC + (80 - atmTempC) * u, pressureKpaAbs: atm + (vacuumKpa - atm) * u }),
    },
  );
  return { samples: build(segments, opts.stepSeconds, opts) };
}

function build(segments: Segment[], step: number, noise: Noise): CycleSample[] {
  const total = segments.reduce((n, s) => n + Math.ceil(s.seconds / step), 1);
  if (total > MAX_SYNTH_SAMPLES) {
    throw new RangeError(`that would make ${total} samples (at most ${MAX_SYNTH_SAMPLES}); use a larger stepSeconds`);
  }
  const noiseK = noise.noiseK ?? 0;
  requireNonNegative({ noiseK });
  const random = mulberry32(noise.seed ?? 1);
  const samples: CycleSample[] = [];
  const push = (t: number, phase: string, v: { tempC: number; pressureKpaAbs?: number }) => {
    const s: CycleSample = { t, tempC: noiseK > 0 ? v.tempC + (random() * 2 - 1) * noiseK : v.tempC, phase };
    if (v.pressureKpaAbs !== undefined) s.pressureKpaAbs = v.pressureKpaAbs;
    samples.push(s);
  };

  let start = 0;
  let last: Segment | undefined;
  for (const seg of segments) {
    if (seg.seconds <= 0) continue;
    for (let k = 0; k * step < seg.seconds; k++) {
      const offset = k * step;
      const u = Math.min(1, (seg.startsAfterStep ? offset + step : offset) / seg.seconds);
      push(start + offset, seg.phase, seg.at(u));
    }
    start += seg.seconds;
    last = seg;
  }
  if (last) push(start, last.phase, last.at(1));
  return samples;
}

// A small deterministic generator (mulberry32), so synthetic records repeat exactly.
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function requireFinite(values: Record<string, number>): void {
  for (const [k, v] of Object.entries(values)) if (!Number.isFinite(v)) throw new RangeError(`${k} must be a number, got ${v}`);
}

function requirePositive(values: Record<string, number>): void {
  for (const [k, v] of Object.entries(values)) {
    if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${k} must be a positive number, got ${v}`);
  }
}

function requireNonNegative(values: Record<string, number>): void {
  for (const [k, v] of Object.entries(values)) {
    if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`${k} must be zero or a positive number, got ${v}`);
  }
}
