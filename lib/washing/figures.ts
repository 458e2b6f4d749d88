import { z } from "zod";
import { holdAtOrAbove, disinfectionSamples } from "@/lib/cycles/a0";
import { formatBelow } from "@/lib/cycles/format";
import type { CycleRecord, CycleSample } from "@/lib/cycles/record";
import type { WasherBatchCheck, WasherFigures, WasherRequirement } from "@/lib/cycles/washer";
import { formatDuration } from "@/lib/machines/requirements";

// What a closed washer batch keeps of its check (washer_batches.figures, JSON): the computed
// figures, the requirement they were checked against, and the remarks; and the side-by-side
// comparison the station and the batch page show. Pure.

export interface StoredFigures extends WasherFigures {
  requirement: WasherRequirement;
  notes: string[];
  sampleCount: number;
  /** ISO time of the record's first sample, when the file carried timestamps. */
  recordStartedAt: string | null;
  /** The hold the figures describe, in seconds from the record's start; null when there is none. */
  holdStartS: number | null;
  holdEndS: number | null;
}

const requirementSchema = z.union([
  z.object({ kind: z.literal("a0"), minA0: z.number(), minTempC: z.number().optional() }),
  z.object({ kind: z.literal("time_temp"), minTempC: z.number(), minHoldSeconds: z.number() }),
]);

const storedSchema = z.object({
  a0: z.number(),
  holdThresholdC: z.number(),
  holdSeconds: z.number(),
  minTempC: z.number().nullable(),
  maxTempC: z.number().nullable(),
  peakTempC: z.number(),
  durationSeconds: z.number(),
  disinfectionEndS: z.number(),
  requirement: requirementSchema,
  notes: z.array(z.string()),
  sampleCount: z.number(),
  recordStartedAt: z.string().nullable(),
  holdStartS: z.number().nullable(),
  holdEndS: z.number().nullable(),
});

/** Where the hold of the check lies in the record (the longest run at or above its threshold). */
export function holdSpan(record: CycleRecord, thresholdC: number): { startS: number; endS: number } | null {
  const stage = disinfectionSamples(record.samples);
  if (stage.length < 2) return null;
  const run = holdAtOrAbove(stage, thresholdC);
  return run ? { startS: run.startS, endS: run.endS } : null;
}

/** The figures to keep for a checked record. */
export function toStoredFigures(record: CycleRecord, requirement: WasherRequirement, check: WasherBatchCheck, extraNotes: string[] = []): StoredFigures {
  const span = holdSpan(record, check.figures.holdThresholdC);
  return {
    ...check.figures,
    requirement,
    notes: [...check.notes, ...extraNotes],
    sampleCount: record.samples.length,
    recordStartedAt: record.startedAt ?? null,
    holdStartS: span?.startS ?? null,
    holdEndS: span?.endS ?? null,
  };
}

/** Reads stored figures; null when the column is empty or not in this shape. */
export function readStoredFigures(json: string | null): StoredFigures | null {
  if (!json) return null;
  try {
    const parsed = storedSchema.safeParse(JSON.parse(json));
    return parsed.success ? (parsed.data as StoredFigures) : null;
  } catch {
    return null;
  }
}

/** Reads the stored reasons (a JSON list of sentences). */
export function readReasons(json: string | null): string[] {
  if (!json) return [];
  try {
    const value: unknown = JSON.parse(json);
    return Array.isArray(value) ? value.filter((v): v is string => typeof v === "string") : [];
  } catch {
    return [];
  }
}

export interface ComparisonRow {
  label: string;
  computed: string;
  required: string;
  /** true: meets the requirement; false: does not; null: shown for information. */
  ok: boolean | null;
}

const deg = (n: number | null) => (n === null ? "—" : `${formatBelow(n, 1)} °C`);

/** The computed figures beside what the program requires, one row per measure. */
export function comparisonRows(figures: StoredFigures): ComparisonRow[] {
  const r = figures.requirement;
  const rows: ComparisonRow[] = [];
  const a0Text = formatBelow(figures.a0, 0);
  if (r.kind === "a0") {
    rows.push({ label: "A0 (s at 80 °C)", computed: a0Text, required: `at least ${r.minA0}`, ok: figures.a0 >= r.minA0 - r.minA0 * 1e-9 });
    if (r.minTempC !== undefined) {
      rows.push({
        label: `Reached ${r.minTempC} °C`,
        computed: figures.holdSeconds > 0 ? `yes, for ${formatDuration(figures.holdSeconds)}` : `no (highest ${deg(figures.peakTempC)})`,
        required: "yes",
        ok: figures.holdSeconds > 0,
      });
    }
  } else {
    rows.push({ label: "A0 (s at 80 °C)", computed: a0Text, required: "not set by this program", ok: null });
    rows.push({
      label: `Held at or above ${r.minTempC} °C`,
      computed: figures.holdSeconds > 0 ? formatDuration(figures.holdSeconds) : "never reached",
      required: `at least ${formatDuration(r.minHoldSeconds)}`,
      ok: figures.holdSeconds >= r.minHoldSeconds - r.minHoldSeconds * 1e-9,
    });
  }
  if (r.kind === "a0" && r.minTempC === undefined) {
    rows.push({
      label: `Time at or above ${figures.holdThresholdC} °C`,
      computed: figures.holdSeconds > 0 ? formatDuration(figures.holdSeconds) : "never reached",
      required: "—",
      ok: null,
    });
  }
  // The hold is the longest run at or above the threshold, ramp included, so its lowest value sits
  // near the threshold itself: say which range the figures are taken over.
  rows.push({ label: `Lowest temperature while at or above ${figures.holdThresholdC} °C`, computed: deg(figures.minTempC), required: "—", ok: null });
  rows.push({ label: `Highest temperature while at or above ${figures.holdThresholdC} °C`, computed: deg(figures.maxTempC), required: "—", ok: null });
  rows.push({ label: "Highest temperature of the disinfection stage", computed: deg(figures.peakTempC), required: "—", ok: null });
  rows.push({ label: "Length of the record", computed: formatDuration(figures.durationSeconds), required: "—", ok: null });
  return rows;
}

export interface ChartPoint {
  t: number;
  tempC: number;
}

/**
 * At most about `maxPoints` points for the temperature curve: each bucket of samples keeps its
 * lowest and highest point (in time order), so a short dip or peak is never smoothed away.
 */
export function chartPoints(samples: readonly CycleSample[], maxPoints = 600): ChartPoint[] {
  if (samples.length <= maxPoints) return samples.map((s) => ({ t: s.t, tempC: s.tempC }));
  const buckets = Math.max(1, Math.floor(maxPoints / 2));
  const size = Math.ceil(samples.length / buckets);
  const out: ChartPoint[] = [];
  for (let start = 0; start < samples.length; start += size) {
    const bucket = samples.slice(start, start + size);
    let lo = bucket[0]!;
    let hi = bucket[0]!;
    for (const s of bucket) {
      if (s.tempC < lo.tempC) lo = s;
      if (s.tempC > hi.tempC) hi = s;
    }
    const pair = lo.t <= hi.t ? [lo, hi] : [hi, lo];
    for (const s of pair) if (out.length === 0 || out[out.length - 1]!.t !== s.t) out.push({ t: s.t, tempC: s.tempC });
  }
  const last = samples[samples.length - 1]!;
  if (out[out.length - 1]!.t !== last.t) out.push({ t: last.t, tempC: last.tempC });
  return out;
}
