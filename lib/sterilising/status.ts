import type { LoadStatus } from "@/db/schema";

// The words for a steriliser load's status, the badge tone of each, and the advisory notice shown
// beside every computed check, release decision and recall.

export const LOAD_STATUS_LABELS: Record<LoadStatus, string> = {
  loading: "Loading",
  running: "Running",
  awaiting_release: "Awaiting release",
  released: "Released",
  failed: "Failed",
  aborted: "Aborted",
};

export const LOAD_STATUS_TONES: Record<LoadStatus, "neutral" | "info" | "ok" | "warn" | "danger"> = {
  loading: "neutral",
  running: "info",
  awaiting_release: "warn",
  released: "ok",
  failed: "danger",
  aborted: "warn",
};

export const LOAD_STATUSES = ["loading", "running", "awaiting_release", "released", "failed", "aborted"] as const satisfies readonly LoadStatus[];

export const RELEASE_ADVISORY_TEXT =
  "These checks are computed from the steriliser's record and the results entered here, and are advisory only. Releasing or failing a load follows the unit's validated procedures, the decision of its qualified staff and local regulations, which take precedence over anything shown here.";

export const RECALL_ADVISORY_TEXT =
  "This recall list is compiled from the unit's records and is advisory. How affected sets are traced, quarantined and reported, and whether patients must be followed up, is decided under the unit's and each clinic's validated procedures by qualified staff and according to local regulations.";
