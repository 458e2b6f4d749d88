import { describe, expect, it } from "vitest";
import {
  allowedEvents,
  CYCLE_EVENTS,
  CYCLE_STATES,
  type CycleEvent,
  type CycleState,
  isOpenState,
  MAIN_LINE,
  transition,
} from "@/lib/cycles/lifecycle";

// The flow of a set through the unit (the product's design: booked → … → delivered, with the side
// states on hold, back to washing, recalled). Every allowed move is listed here by hand, so a
// change to the rules has to change this table too.
const ALLOWED: Record<CycleEvent, Partial<Record<CycleState, CycleState>>> = {
  collect: { booked: "collected" },
  receive: { booked: "received", collected: "received" },
  wash_passed: { received: "washed", reprocess: "washed" },
  manual_wash: { received: "washed", reprocess: "washed" },
  wash_failed: { received: "reprocess", reprocess: "reprocess", washed: "reprocess" },
  pack: { washed: "packed" },
  sterilise: { packed: "sterilised" },
  release: { sterilised: "released" },
  dispatch: { released: "dispatched" },
  deliver: { dispatched: "delivered" },
  hold: { received: "on_hold", washed: "on_hold", packed: "on_hold", sterilised: "on_hold", reprocess: "on_hold" },
  resume: { on_hold: "washed" }, // with previous = washed
  send_to_rewash: { on_hold: "reprocess", washed: "reprocess", packed: "reprocess", sterilised: "reprocess" },
  recall: { released: "recalled", dispatched: "recalled", delivered: "recalled" },
  return_recalled: { recalled: "reprocess" },
  cancel: { booked: "cancelled" },
};

describe("the cycle state machine", () => {
  it("walks the main line from booking to delivery", () => {
    const events: CycleEvent[] = ["collect", "receive", "wash_passed", "pack", "sterilise", "release", "dispatch", "deliver"];
    let state: CycleState = "booked";
    const visited: CycleState[] = [state];
    for (const event of events) {
      const result = transition(state, event);
      if (!result.ok) throw new Error(result.reason);
      state = result.to;
      visited.push(state);
    }
    expect(visited).toEqual(MAIN_LINE);
    expect(isOpenState(state)).toBe(false);
  });

  it.each(CYCLE_EVENTS.flatMap((event) => CYCLE_STATES.map((state) => [event, state] as const)))(
    "%s from %s is allowed exactly when the table says so",
    (event, state) => {
      const result = transition(state, event, "washed");
      const expected = ALLOWED[event][state];
      if (expected) {
        expect(result).toEqual({ ok: true, to: expected });
      } else {
        expect(result.ok).toBe(false);
        if (!result.ok) expect(result.reason).toMatch(/^Cannot .+: .+\.$/);
      }
    },
  );

  it("refuses to pack a set that was never washed, and says why", () => {
    expect(transition("received", "pack")).toEqual({ ok: false, reason: "Cannot pack this set: it has not been washed yet." });
    expect(transition("booked", "pack")).toEqual({ ok: false, reason: "Cannot pack this set: it has not been received at the unit yet." });
  });

  it("refuses to release or dispatch out of order", () => {
    expect(transition("packed", "release")).toMatchObject({ ok: false, reason: expect.stringContaining("waiting for a steriliser load") });
    expect(transition("sterilised", "dispatch")).toMatchObject({ ok: false, reason: expect.stringContaining("not been released") });
    expect(transition("on_hold", "dispatch")).toMatchObject({ ok: false, reason: expect.stringContaining("on hold") });
  });

  it("returns a held set to where it was held, and never further", () => {
    expect(transition("on_hold", "resume", "packed")).toEqual({ ok: true, to: "packed" });
    expect(transition("on_hold", "resume", null).ok).toBe(false);
    expect(transition("on_hold", "resume", "released").ok).toBe(false);
  });

  it("restarts the cycle from washing after a failed wash or a fault mid-cycle", () => {
    expect(transition("washed", "wash_failed")).toEqual({ ok: true, to: "reprocess" });
    expect(transition("sterilised", "send_to_rewash")).toEqual({ ok: true, to: "reprocess" });
    expect(transition("reprocess", "pack").ok).toBe(false);
    expect(transition("reprocess", "wash_passed")).toEqual({ ok: true, to: "washed" });
  });

  it("recalls only what was released, and takes it back through washing", () => {
    expect(transition("delivered", "recall")).toEqual({ ok: true, to: "recalled" });
    expect(transition("sterilised", "recall").ok).toBe(false);
    expect(transition("recalled", "return_recalled")).toEqual({ ok: true, to: "reprocess" });
  });

  it("lists the allowed events of each state consistently with transition()", () => {
    for (const state of CYCLE_STATES) {
      for (const event of allowedEvents(state)) expect(transition(state, event, "received").ok || event === "resume").toBe(true);
    }
    expect(allowedEvents("delivered")).toEqual(["recall"]);
    expect(allowedEvents("cancelled")).toEqual([]);
  });
});
