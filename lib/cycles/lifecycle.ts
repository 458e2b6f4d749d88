// The life of one cycle — one trip of one set through the unit — as a state machine. Every move
// is an append-only scan event; this module decides which moves are allowed and, when one is
// not, says why in words a technician at the station can act on.

export const CYCLE_STATES = [
  "booked",
  "collected",
  "received",
  "washed",
  "packed",
  "sterilised",
  "released",
  "dispatched",
  "delivered",
  "on_hold",
  "reprocess",
  "recalled",
  "cancelled",
] as const;
export type CycleState = (typeof CYCLE_STATES)[number];

/** The main line a set follows when nothing goes wrong. */
export const MAIN_LINE: readonly CycleState[] = [
  "booked",
  "collected",
  "received",
  "washed",
  "packed",
  "sterilised",
  "released",
  "dispatched",
  "delivered",
];

export const CYCLE_STATE_LABELS: Record<CycleState, string> = {
  booked: "Pickup booked",
  collected: "Collected by van",
  received: "Received at the unit",
  washed: "Washed and disinfected",
  packed: "Inspected and packed",
  sterilised: "Sterilised, awaiting release",
  released: "Released",
  dispatched: "Out for delivery",
  delivered: "Delivered",
  on_hold: "On hold",
  reprocess: "Back to washing",
  recalled: "Recalled",
  cancelled: "Cancelled",
};

/** What happened, as recorded by a scan or an event. */
export const CYCLE_EVENTS = [
  "collect", // driver scans the set at the clinic
  "receive", // receiving station
  "wash_passed", // its washer batch passed its checks
  "manual_wash", // washed by hand, recorded as a step of its own
  "wash_failed", // its washer batch failed: back to washing
  "pack", // packing station, contents checked
  "sterilise", // its steriliser load finished and is awaiting release
  "release", // the quality lead released the load
  "dispatch", // loaded on a van for delivery
  "deliver", // proof of delivery at the clinic
  "hold", // quarantine: failed or unconfirmed load, missing instrument, damage
  "resume", // hold cleared: back to where it was held
  "send_to_rewash", // a hold or a fault mid-cycle restarts the cycle from washing
  "recall", // its load failed after release
  "return_recalled", // a recalled set is back at the unit
  "cancel", // the clinic cancelled before collection
] as const;
export type CycleEvent = (typeof CYCLE_EVENTS)[number];

/** States where the set is inside the unit (it can be held or sent back to washing). */
const IN_UNIT: readonly CycleState[] = ["received", "washed", "packed", "sterilised", "reprocess"];
/** States after release (a failed load recalls them). */
const AFTER_RELEASE: readonly CycleState[] = ["released", "dispatched", "delivered"];

interface Rule {
  from: readonly CycleState[];
  to: CycleState | "previous";
}

const RULES: Record<CycleEvent, Rule> = {
  collect: { from: ["booked"], to: "collected" },
  // The receiving station is authoritative: a set may arrive without a van scan.
  receive: { from: ["booked", "collected"], to: "received" },
  wash_passed: { from: ["received", "reprocess"], to: "washed" },
  manual_wash: { from: ["received", "reprocess"], to: "washed" },
  wash_failed: { from: ["received", "reprocess", "washed"], to: "reprocess" },
  pack: { from: ["washed"], to: "packed" },
  sterilise: { from: ["packed"], to: "sterilised" },
  release: { from: ["sterilised"], to: "released" },
  dispatch: { from: ["released"], to: "dispatched" },
  deliver: { from: ["dispatched"], to: "delivered" },
  hold: { from: IN_UNIT, to: "on_hold" },
  resume: { from: ["on_hold"], to: "previous" },
  send_to_rewash: { from: ["on_hold", "washed", "packed", "sterilised"], to: "reprocess" },
  recall: { from: AFTER_RELEASE, to: "recalled" },
  return_recalled: { from: ["recalled"], to: "reprocess" },
  cancel: { from: ["booked"], to: "cancelled" },
};

/** States in which a cycle is finished: the set's next trip opens a new cycle. */
export const CLOSED_STATES: readonly CycleState[] = ["delivered", "cancelled"];

export function isOpenState(state: CycleState): boolean {
  return !CLOSED_STATES.includes(state);
}

export type TransitionResult =
  | { ok: true; to: CycleState }
  | { ok: false; reason: string };

const NEXT_STEP: Partial<Record<CycleState, string>> = {
  booked: "it has not been received at the unit yet",
  collected: "it has not been received at the unit yet",
  received: "it has not been washed yet",
  reprocess: "it is waiting to be washed again",
  washed: "it has been washed but not packed yet",
  packed: "it is packed and waiting for a steriliser load",
  sterilised: "its load has not been released yet",
  released: "it is released and waiting for a van",
  dispatched: "it is out for delivery",
  delivered: "it was delivered; its next pickup opens a new cycle",
  on_hold: "it is on hold; clear the hold or send it back to washing first",
  recalled: "it is recalled; it must come back to the unit first",
  cancelled: "its pickup was cancelled",
};

const EVENT_WORDS: Record<CycleEvent, string> = {
  collect: "collect",
  receive: "receive",
  wash_passed: "record a wash for",
  manual_wash: "record a manual wash for",
  wash_failed: "fail the wash of",
  pack: "pack",
  sterilise: "sterilise",
  release: "release",
  dispatch: "dispatch",
  deliver: "deliver",
  hold: "hold",
  resume: "clear the hold on",
  send_to_rewash: "send back to washing",
  recall: "recall",
  return_recalled: "take back",
  cancel: "cancel",
};

/**
 * Where the event takes a cycle in `state`, or why it cannot. `previous` is the state the cycle
 * was in before it was put on hold (needed only for "resume").
 */
export function transition(state: CycleState, event: CycleEvent, previous?: CycleState | null): TransitionResult {
  const rule = RULES[event];
  if (!rule.from.includes(state)) {
    return { ok: false, reason: `Cannot ${EVENT_WORDS[event]} this set: ${NEXT_STEP[state] ?? `it is ${CYCLE_STATE_LABELS[state].toLowerCase()}`}.` };
  }
  if (rule.to === "previous") {
    if (!previous || previous === "on_hold" || !IN_UNIT.includes(previous)) {
      return { ok: false, reason: "Cannot clear this hold: the state before the hold is unknown. Send the set back to washing instead." };
    }
    return { ok: true, to: previous };
  }
  return { ok: true, to: rule.to };
}

/** Every event allowed from a state (for the station to offer the right buttons). */
export function allowedEvents(state: CycleState): CycleEvent[] {
  return CYCLE_EVENTS.filter((e) => RULES[e].from.includes(state));
}
