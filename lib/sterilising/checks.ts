import type { SteamCycleRequirement } from "@/lib/machines/requirements";
import { formatDuration } from "@/lib/machines/requirements";

// The release checks of a steriliser load side by side with their limits: the record's holding
// time, band and F0, the agreement with saturated steam, the steriliser's air-removal test of the
// day, the chemical indicator and the biological indicator. Which of them stop a release is
// decided here, in one place. Advisory: the decision rests with the unit's qualified staff under
// its validated procedures and local regulations. Pure.

export type CheckStatus = "pass" | "fail" | "missing" | "pending" | "waived" | "not_required";

export interface ReleaseCheck {
  key: "hold" | "band" | "f0" | "saturation" | "air_removal" | "ci" | "bi";
  label: string;
  measured: string;
  limit: string;
  status: CheckStatus;
}

/** The figures a finished load keeps from checkSterilizerLoad. */
export interface LoadFigures {
  f0: number;
  band: { lowC: number; highC: number };
  holdSeconds: number;
  /** The plateau (time at or above the sterilisation temperature), seconds from the record's start. */
  plateauStartS?: number | null;
  plateauEndS?: number | null;
  plateauMinTempC: number | null;
  plateauMaxTempC: number | null;
  saturation: { deviationK: number; measuredTempC: number; saturationTempC: number; pressureKpaAbs: number } | null;
  peakTempC: number;
  durationSeconds: number;
}

export interface ReleaseCheckInput {
  requirement: SteamCycleRequirement | null;
  figures: LoadFigures | null;
  recordPassed: boolean | null;
  recordReasons: string[];
  airRemoval: { result: "pass" | "fail"; day: string } | null;
  unitDay: string;
  ci: { type: number | null; result: "pass" | "fail" | null };
  bi: { result: "pending" | "pass" | "fail" | "not_used" | null; required: boolean };
  containsImplant: boolean;
  earlyRelease: { reason: string } | null;
}

export interface ReleaseAssessment {
  checks: ReleaseCheck[];
  /** Why the load cannot be released as things stand; empty when it can. */
  blockers: string[];
}

const c1 = (n: number) => n.toFixed(1);

export function assessRelease(input: ReleaseCheckInput): ReleaseAssessment {
  const r = input.requirement;
  const f = input.figures;
  const checks: ReleaseCheck[] = [];
  const blockers: string[] = [];

  const minHold = r?.minHoldSeconds ?? null;
  checks.push({
    key: "hold",
    label: "Holding time in the band",
    measured: f ? formatDuration(Math.floor(f.holdSeconds)) : "—",
    limit: minHold !== null ? `at least ${formatDuration(minHold)}` : "—",
    status: !f ? "missing" : minHold !== null && f.holdSeconds + 1e-9 >= minHold ? "pass" : "fail",
  });
  const inBand =
    f && f.plateauMinTempC !== null && f.plateauMaxTempC !== null && f.plateauMinTempC >= f.band.lowC - 1e-9 && f.plateauMaxTempC <= f.band.highC + 1e-9;
  checks.push({
    key: "band",
    label: "Plateau temperature",
    measured: f && f.plateauMinTempC !== null && f.plateauMaxTempC !== null ? `${c1(f.plateauMinTempC)}–${c1(f.plateauMaxTempC)} °C` : "—",
    limit: f ? `${c1(f.band.lowC)}–${c1(f.band.highC)} °C` : r ? `${r.sterilisationTempC}–${r.sterilisationTempC + r.bandWidthK} °C` : "—",
    status: !f ? "missing" : inBand ? "pass" : "fail",
  });
  checks.push({
    key: "f0",
    label: "F0 (121.1 °C, z = 10 K)",
    measured: f ? `${c1(f.f0)} min` : "—",
    limit: r?.minF0 !== undefined ? `at least ${r.minF0} min` : "no minimum set (shown for information)",
    status: !f ? "missing" : r?.minF0 === undefined || f.f0 + 1e-9 >= r.minF0 ? "pass" : "fail",
  });
  const tol = r?.saturationToleranceK ?? null;
  checks.push({
    key: "saturation",
    label: "Agreement with saturated steam",
    measured: f?.saturation ? `${f.saturation.deviationK >= 0 ? "+" : "−"}${c1(Math.abs(f.saturation.deviationK))} K` : "—",
    limit: tol !== null ? `within ±${tol} K of saturated steam` : "—",
    status: !f || !f.saturation ? (f ? "fail" : "missing") : tol !== null && Math.abs(f.saturation.deviationK) <= tol + 1e-9 ? "pass" : "fail",
  });
  if (!f) blockers.push("The load has no checked record yet: finish it with the steriliser's record first.");
  else if (input.recordPassed === false) {
    blockers.push(`The record did not pass its checks: ${input.recordReasons.join(" ") || "see the load's record."}`);
  }

  const air = input.airRemoval;
  checks.push({
    key: "air_removal",
    label: "Air-removal (Bowie-Dick type) test of the day",
    measured: air ? `${air.result === "pass" ? "Passed" : "Failed"} on ${air.day}` : `None recorded on ${input.unitDay}`,
    limit: "passed the same unit day, before the first load",
    status: !air ? "missing" : air.result === "pass" ? "pass" : "fail",
  });
  if (!air || air.result !== "pass") {
    blockers.push(
      air
        ? `The steriliser's air-removal test on ${air.day} failed: no load of that day can be released.`
        : `The steriliser has no passed air-removal test on ${input.unitDay}: record the day's test before releasing its loads.`,
    );
  }

  checks.push({
    key: "ci",
    label: "Chemical indicator",
    measured: input.ci.result ? `${input.ci.result === "pass" ? "Changed as expected" : "Did not change"}${input.ci.type ? ` (type ${input.ci.type})` : ""}` : "—",
    limit: "changed as expected (ISO 11140-1)",
    status: !input.ci.result ? "missing" : input.ci.result === "pass" ? "pass" : "fail",
  });
  if (!input.ci.result) blockers.push("The chemical indicator result is missing.");
  else if (input.ci.result === "fail") blockers.push("The chemical indicator did not change as expected.");

  const bi = input.bi.result;
  const biStatus: CheckStatus =
    bi === "pass" ? "pass" : bi === "fail" ? "fail" : bi === "pending" ? (input.containsImplant && input.earlyRelease ? "waived" : "pending") : input.bi.required ? "missing" : "not_required";
  checks.push({
    key: "bi",
    label: "Biological indicator",
    measured:
      bi === "pass"
        ? "No growth"
        : bi === "fail"
          ? "Growth"
          : bi === "pending"
            ? input.earlyRelease
              ? `Incubating — early release documented: ${input.earlyRelease.reason}`
              : "Incubating"
            : "Not in this load",
    limit: input.containsImplant ? "required for a load with implants: no growth (ISO 11138-3; CDC 2008)" : "no growth, when one is used",
    status: biStatus,
  });
  if (bi === "fail") blockers.push("The biological indicator shows growth: the load must not be released.");
  if (input.containsImplant && bi !== "pass" && bi !== "fail") {
    if (bi === "pending" && input.earlyRelease) {
      // Documented early release: allowed, and shown.
    } else if (bi === "pending") {
      blockers.push("This load holds implants: wait for the biological indicator, or document an early release (reason, who).");
    } else {
      blockers.push("This load holds implants and has no biological indicator: a load with implants needs one.");
    }
  }
  return { checks, blockers };
}
