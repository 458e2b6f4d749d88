import type { WasherBatchStatus } from "@/db/schema";

// The words for a washer batch's status, and the badge tone each reads in.

export const BATCH_STATUS_LABELS: Record<WasherBatchStatus, string> = {
  loading: "Loading",
  running: "Running",
  passed: "Passed checks",
  failed: "Failed checks",
  aborted: "Aborted",
};

export const BATCH_STATUS_TONES: Record<WasherBatchStatus, "neutral" | "info" | "ok" | "warn" | "danger"> = {
  loading: "neutral",
  running: "info",
  passed: "ok",
  failed: "danger",
  aborted: "warn",
};

/** Shown wherever a computed check appears. */
export const ADVISORY_TEXT =
  "These checks are computed from the machine's record and are advisory only. Whether a batch is accepted and its sets released follows the unit's validated procedures, the decision of qualified staff and local regulations.";
