import type { CycleState } from "@/lib/cycles/lifecycle";

// What the unit's board counts, defined once so that reports count the same way (pure: no I/O).

/** The board's columns: where a set is now, by its cycle's state, in the order of the flow. */
export const BOARD_COLUMNS = [
  { state: "collected", label: "On the van", hint: "Collected, on its way to the unit" },
  { state: "received", label: "Received", hint: "Waiting to be washed" },
  { state: "washed", label: "Washed", hint: "Waiting for inspection and packing" },
  { state: "packed", label: "Packed", hint: "Waiting for a steriliser load" },
  { state: "sterilised", label: "Sterilised", hint: "Waiting for release" },
  { state: "released", label: "Released", hint: "Waiting for a van, or kept in the store" },
  { state: "dispatched", label: "Out for delivery", hint: "On a van to the clinic" },
  { state: "on_hold", label: "On hold", hint: "Quarantined until a decision" },
  { state: "reprocess", label: "Back to washing", hint: "To be washed again" },
  { state: "recalled", label: "Recalled", hint: "Its load failed after release" },
] as const satisfies readonly { state: CycleState; label: string; hint: string }[];

export type BoardState = (typeof BOARD_COLUMNS)[number]["state"];
export const BOARD_STATES: readonly BoardState[] = BOARD_COLUMNS.map((c) => c.state);

/** The sides of the flow where something needs attention. */
export const EXCEPTION_STATES: readonly BoardState[] = ["on_hold", "reprocess", "recalled"];

/**
 * States in which a set counts against its promised return time: collected and inside the unit,
 * not yet released. A booked set is not in the unit's hands yet; from release on the clock has
 * stopped (for contracts that stop it at delivery, the invoice run measures the rest).
 */
export const BEFORE_RELEASE: readonly CycleState[] = ["collected", "received", "washed", "packed", "sterilised", "on_hold", "reprocess"];

/** How soon a promised time counts as "due soon" on the board. */
export const DUE_SOON_MINUTES = 120;

const MINUTE_MS = 60_000;

/**
 * Overdue: not yet released and now is after its promised time. The same meaning of late as
 * lib/turnaround's turnaroundOutcome (finishing after the due time is late, exactly at it is on
 * time), applied to a cycle that has not finished yet.
 */
export function isOverdue(cycle: { state: CycleState | string; promisedAt: string | null }, now: Date): boolean {
  if (!cycle.promisedAt || !BEFORE_RELEASE.includes(cycle.state as CycleState)) return false;
  return now.getTime() > Date.parse(cycle.promisedAt);
}

/** Whole minutes past the promised time, rounded up as turnaroundOutcome does; 0 when not overdue. */
export function overdueMinutes(cycle: { state: CycleState | string; promisedAt: string | null }, now: Date): number {
  if (!isOverdue(cycle, now)) return 0;
  return Math.ceil((now.getTime() - Date.parse(cycle.promisedAt!)) / MINUTE_MS);
}

/** Not yet released, not overdue, and due within DUE_SOON_MINUTES. */
export function isDueSoon(cycle: { state: CycleState | string; promisedAt: string | null }, now: Date): boolean {
  if (!cycle.promisedAt || !BEFORE_RELEASE.includes(cycle.state as CycleState) || isOverdue(cycle, now)) return false;
  return Date.parse(cycle.promisedAt) - now.getTime() <= DUE_SOON_MINUTES * MINUTE_MS;
}
