// Checks a washer-disinfector batch record against its program's disinfection requirement.

import {
  A0_LOWER_LIMIT_C,
  computeA0,
  disinfectionWindow,
  holdAtOrAbove,
  temperatureRange,
  type DisinfectionWindowOptions,
} from "./a0";
import { assertSamples } from "./intervals";
import { formatBelow, meetsMinimum } from "./format";
import type { CycleRecord } from "./record";

/**
 * What a washer program must achieve in its disinfection stage: an A0 value (optionally with a
 * temperature the stage must reach), or a temperature held for a time.
 */
export type WasherRequirement =
  | { kind: "a0"; minA0: number; minTempC?: number }
  | { kind: "time_temp"; minTempC: number; minHoldSeconds: number };

/** A0 requirement classes (EN ISO 15883-1 and -3 as summarised in the project's reference values). */
export const A0_CLASSES = {
  /** A0 60: containers for human waste (EN ISO 15883-3). */
  humanWasteContainers: { kind: "a0", minA0: 60 },
  /** A0 600: the usual minimum for non-critical items and for instruments sterilised afterwards (EN ISO 15883-1). */
  sterilisedAfterwards: { kind: "a0", minA0: 600 },
  /** A0 3000: where heat-resistant viruses must be inactivated or items are not sterilised afterwards (EN ISO 15883-1). */
  notSterilisedAfterwards: { kind: "a0", minA0: 3000 },
} as const satisfies Record<string, WasherRequirement>;

/** 90 °C held for at least 1 minute (common practice; equals A0 600). */
export const THERMAL_90C_1MIN = { kind: "time_temp", minTempC: 90, minHoldSeconds: 60 } as const satisfies WasherRequirement;

export interface WasherFigures {
  /** A0 in seconds, over the disinfection stage. */
  a0: number;
  /** The temperature the hold is measured against: the requirement's minTempC, else 65 °C. */
  holdThresholdC: number;
  /** Longest continuous time at or above holdThresholdC within the disinfection stage. */
  holdSeconds: number;
  /** Lowest and highest temperature during that hold; null when there is no hold. */
  minTempC: number | null;
  maxTempC: number | null;
  /** Highest temperature of the disinfection stage. */
  peakTempC: number;
  /** Time from the first to the last sample of the whole record. */
  durationSeconds: number;
  /** Time from the first sample to the end of the disinfection stage. */
  disinfectionEndS: number;
}

/**
 * The outcome of checking a washer batch record. Advisory only: it reports what the record shows
 * against the entered requirement; whether a batch is released is decided by the unit's qualified
 * staff under its validated procedures and local regulations, which take precedence.
 */
export interface WasherBatchCheck {
  passed: boolean;
  figures: WasherFigures;
  /** Why the batch failed, as plain sentences; empty when it passed. */
  reasons: string[];
  /** Remarks that do not decide the outcome (e.g. how the disinfection stage was found). */
  notes: string[];
}

// Checks a washer batch: A0 or time at temperature within the disinfection stage.
export function checkWasherBatch(
  record: CycleRecord,
  requirement: WasherRequirement,
  opts: DisinfectionWindowOptions = {},
): WasherBatchCheck {
  assertRequirement(requirement);
  const samples = record.samples;
  assertSamples(samples);
  const reasons: string[] = [];
  const notes: string[] = [];

  const window = disinfectionWindow(samples, opts);
  const durationSeconds = samples[samples.length - 1].t - samples[0].t;
  const threshold = requirement.minTempC ?? A0_LOWER_LIMIT_C;

  if (!window.labelled) {
    notes.push(
      "The record has no stage labels, so the whole record counts as the disinfection stage; heat during drying, if any, is included.",
    );
  }
  if (window.endIndex === 0) {
    reasons.push("The record has stage labels but none marks the disinfection stage; label its samples \"disinfection\".");
    return {
      passed: false,
      figures: {
        a0: 0,
        holdThresholdC: threshold,
        holdSeconds: 0,
        minTempC: null,
        maxTempC: null,
        peakTempC: samples[0].tempC,
        durationSeconds,
        disinfectionEndS: window.endS,
      },
      reasons,
      notes,
    };
  }

  const stage = samples.slice(0, window.endIndex + 1);
  const a0 = computeA0(samples, opts);
  const hold = holdAtOrAbove(stage, threshold);
  const holdRange = hold ? temperatureRange(stage.slice(hold.startIndex, hold.endIndex)) : undefined;
  // The closing sample of the window belongs to the next stage, so the peak is over the intervals.
  const peakTempC = temperatureRange(stage.slice(0, -1)).maxTempC;

  if (requirement.kind === "a0") {
    if (!meetsMinimum(a0, requirement.minA0)) {
      reasons.push(`A0 ${formatBelow(a0, 0)} is below the required ${requirement.minA0}.`);
    }
    if (requirement.minTempC !== undefined && !hold) {
      reasons.push(
        `The disinfection stage never reached ${requirement.minTempC} °C (highest ${formatBelow(peakTempC, 1)} °C).`,
      );
    }
  } else {
    if (!hold) {
      reasons.push(
        `The disinfection stage never reached ${requirement.minTempC} °C (highest ${formatBelow(peakTempC, 1)} °C).`,
      );
    } else if (!meetsMinimum(hold.seconds, requirement.minHoldSeconds)) {
      reasons.push(
        `The temperature stayed at or above ${requirement.minTempC} °C for ${formatBelow(hold.seconds, 0)} s, less than the required ${requirement.minHoldSeconds} s.`,
      );
    }
  }

  return {
    passed: reasons.length === 0,
    figures: {
      a0,
      holdThresholdC: threshold,
      holdSeconds: hold?.seconds ?? 0,
      minTempC: holdRange?.minTempC ?? null,
      maxTempC: holdRange?.maxTempC ?? null,
      peakTempC,
      durationSeconds,
      disinfectionEndS: window.endS,
    },
    reasons,
    notes,
  };
}

function assertRequirement(r: WasherRequirement): void {
  if (r.kind === "a0") {
    if (!(r.minA0 > 0) || !Number.isFinite(r.minA0)) throw new RangeError(`minA0 must be a positive number, got ${r.minA0}`);
    if (r.minTempC !== undefined && !Number.isFinite(r.minTempC)) throw new RangeError(`minTempC must be a number, got ${r.minTempC}`);
  } else {
    if (!Number.isFinite(r.minTempC)) throw new RangeError(`minTempC must be a number, got ${r.minTempC}`);
    if (!(r.minHoldSeconds > 0) || !Number.isFinite(r.minHoldSeconds)) {
      throw new RangeError(`minHoldSeconds must be a positive number of seconds, got ${r.minHoldSeconds}`);
    }
  }
}
