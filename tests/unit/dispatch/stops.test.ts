import { describe, expect, it } from "vitest";
import { buildDayStops, type CollectionInput, type DeliveryInput, planClock, type StopSite } from "@/lib/dispatch/stops";
import { weeklyHours } from "@/lib/sites/opening-hours";

// The day's stops from orders. Time-zone facts: the UK's clocks go forward at 01:00 UTC on the
// last Sunday of March (29 March 2026) and back on the last Sunday of October (25 October 2026)
// (UK Summer Time Order, as published on gov.uk "When do the clocks change?").

const TZ = "Europe/London";
const WEEKDAYS = ["mon", "tue", "wed", "thu", "fri"] as const;

const clinic: StopSite = { id: 10, organisationId: 2, name: "Fenwold Clinic", openingHours: weeklyHours(WEEKDAYS, "08:00", "17:00") };
const dental: StopSite = {
  id: 11,
  organisationId: 3,
  name: "Brindle Lane Dental",
  openingHours: { ...weeklyHours(WEEKDAYS, "09:00", "12:30"), wed: [{ start: "09:00", end: "12:30" }, { start: "13:30", end: "17:00" }] },
};

const set = (n: number) => ({ cycleId: n, setId: 100 + n, serial: `S-${n}`, name: `Tray ${n}` });
const sets = (from: number, count: number) => Array.from({ length: count }, (_, i) => set(from + i));

function pickup(orderId: number, site: number, from: string, until: string, count = 2): CollectionInput {
  return { orderId, reference: `P-${orderId}`, siteId: site, collectionFrom: from, collectionUntil: until, sets: sets(orderId * 10, count) };
}
function ret(orderId: number, site: number, neededBackBy: string | null, n: number): DeliveryInput {
  return { orderId, reference: `P-${orderId}`, siteId: site, neededBackBy, set: set(n) };
}

describe("the plan day's clock", () => {
  it("counts elapsed minutes from local midnight, also across a clock change", () => {
    // Winter (GMT): 08:00 local is 08:00 UTC.
    const winter = planClock("2026-12-02", TZ);
    expect(winter.minutesOf("2026-12-02T08:00:00Z")).toBe(480);
    expect(winter.weekday).toBe("wed");
    // Summer (BST, UTC+1): 08:00 local is 07:00 UTC, still minute 480 of the local day.
    expect(planClock("2026-07-01", TZ).minutesOf("2026-07-01T07:00:00Z")).toBe(480);
    // 29 March 2026: the clock skips 01:00–02:00, so 08:00 local is only 420 minutes after midnight.
    const spring = planClock("2026-03-29", TZ);
    expect(spring.wallMinutes(8 * 60)).toBe(420);
    expect(spring.instantOf(420).toISOString()).toBe("2026-03-29T07:00:00.000Z");
  });
});

describe("collections", () => {
  it("cuts the collection window to the site's opening hours", () => {
    const { stops, infeasible } = buildDayStops([clinic], [pickup(1, 10, "2026-12-02T07:00:00Z", "2026-12-02T10:00:00Z")], [], { day: "2026-12-02", timeZone: TZ });
    expect(infeasible).toEqual([]);
    expect(stops).toHaveLength(1);
    expect(stops[0]).toMatchObject({ kind: "collection", windowStartMin: 480, windowEndMin: 600, hard: true, soiledCarts: 1, cleanCarts: 0 });
    expect(stops[0]!.notes[0]).toContain("08:00–10:00");
  });

  it("reads the window in local time in summer", () => {
    // 14:00–16:00 BST is 13:00–15:00 UTC.
    const { stops } = buildDayStops([clinic], [pickup(1, 10, "2026-07-01T13:00:00Z", "2026-07-01T15:00:00Z")], [], { day: "2026-07-01", timeZone: TZ });
    expect(stops[0]).toMatchObject({ windowStartMin: 840, windowEndMin: 960 });
  });

  it("explains a site closed that day", () => {
    // 5 December 2026 is a Saturday; the clinic opens Monday to Friday.
    const { stops, infeasible } = buildDayStops([clinic], [pickup(1, 10, "2026-12-05T09:00:00Z", "2026-12-05T11:00:00Z")], [], { day: "2026-12-05", timeZone: TZ });
    expect(stops).toEqual([]);
    expect(infeasible).toHaveLength(1);
    expect(infeasible[0]!.reason).toBe("Pickup P-1: Fenwold Clinic is closed on Saturday, so the collection window 09:00–11:00 cannot be kept.");
  });

  it("explains a window that does not meet the opening hours", () => {
    const { stops, infeasible } = buildDayStops([dental], [pickup(1, 11, "2026-12-03T13:00:00Z", "2026-12-03T14:00:00Z")], [], { day: "2026-12-03", timeZone: TZ });
    expect(stops).toEqual([]);
    expect(infeasible[0]!.reason).toContain("13:00–14:00 is outside Brindle Lane Dental's opening hours on Thursday (09:00–12:30)");
  });

  it("takes the longest piece when the hours have a break", () => {
    // Wednesday 09:00–12:30 and 13:30–17:00; window 12:00–15:00 → pieces 12:00–12:30 and 13:30–15:00.
    const { stops } = buildDayStops([dental], [pickup(1, 11, "2026-12-02T12:00:00Z", "2026-12-02T15:00:00Z")], [], { day: "2026-12-02", timeZone: TZ });
    expect(stops[0]).toMatchObject({ windowStartMin: 810, windowEndMin: 900 });
  });

  it("leaves out another day's pickups", () => {
    const { stops, infeasible } = buildDayStops([clinic], [pickup(1, 10, "2026-12-03T09:00:00Z", "2026-12-03T11:00:00Z")], [], { day: "2026-12-02", timeZone: TZ });
    expect(stops).toEqual([]);
    expect(infeasible).toEqual([]);
  });

  it("groups overlapping pickups of one site into one visit and keeps apart those that do not overlap", () => {
    const { stops } = buildDayStops(
      [clinic],
      [
        pickup(1, 10, "2026-12-02T09:00:00Z", "2026-12-02T11:00:00Z", 4),
        pickup(2, 10, "2026-12-02T10:00:00Z", "2026-12-02T12:00:00Z", 4),
        pickup(3, 10, "2026-12-02T15:00:00Z", "2026-12-02T16:00:00Z", 1),
      ],
      [],
      { day: "2026-12-02", timeZone: TZ },
    );
    expect(stops).toHaveLength(2);
    expect(stops[0]).toMatchObject({ windowStartMin: 600, windowEndMin: 660, soiledCarts: 2 }); // 8 sets, 6 per cart
    expect(stops[0]!.orders.map((o) => o.orderId)).toEqual([1, 2]);
    // Service: 5 min per stop + 1 min per set (our planning defaults).
    expect(stops[0]!.serviceMin).toBe(5 + 8);
    expect(stops[1]).toMatchObject({ windowStartMin: 900, windowEndMin: 960, soiledCarts: 1, serviceMin: 6 });
  });
});

describe("deliveries", () => {
  it("delivers while open and by the needed-back-by time, as a soft window", () => {
    const { stops } = buildDayStops([clinic], [], [ret(5, 10, "2026-12-02T13:00:00Z", 1), ret(5, 10, "2026-12-02T13:00:00Z", 2)], { day: "2026-12-02", timeZone: TZ });
    expect(stops).toEqual([
      expect.objectContaining({ kind: "delivery", windowStartMin: 480, windowEndMin: 780, hard: false, cleanCarts: 1, soiledCarts: 0, serviceMin: 7 }),
    ]);
    expect(stops[0]!.orders).toEqual([expect.objectContaining({ orderId: 5, role: "deliver", sets: [set(1), set(2)] })]);
  });

  it("meets a collection at the same site in one stop when the windows overlap", () => {
    const { stops } = buildDayStops(
      [clinic],
      [pickup(1, 10, "2026-12-02T14:00:00Z", "2026-12-02T16:00:00Z", 3)],
      [ret(5, 10, null, 1), ret(6, 10, null, 2)],
      { day: "2026-12-02", timeZone: TZ, setsPerCart: 2 },
    );
    expect(stops).toHaveLength(1);
    expect(stops[0]).toMatchObject({ kind: "both", windowStartMin: 840, windowEndMin: 960, hard: true, soiledCarts: 2, cleanCarts: 1, serviceMin: 10 });
  });

  it("keeps a delivery apart from a collection whose window comes after its deadline", () => {
    const { stops } = buildDayStops(
      [clinic],
      [pickup(1, 10, "2026-12-02T15:00:00Z", "2026-12-02T16:00:00Z")],
      [ret(5, 10, "2026-12-02T10:00:00Z", 1)],
      { day: "2026-12-02", timeZone: TZ },
    );
    expect(stops.map((s) => [s.kind, s.windowStartMin, s.windowEndMin])).toEqual([
      ["collection", 900, 960],
      ["delivery", 480, 600],
    ]);
  });

  it("says when a set was already needed back before the day", () => {
    const { stops } = buildDayStops([clinic], [], [ret(5, 10, "2026-12-01T15:00:00Z", 1)], { day: "2026-12-02", timeZone: TZ });
    expect(stops[0]!.notes[0]).toBe("Return P-5 was needed back by 1 Dec, 15:00, before this day: deliver as early as the site opens.");
  });

  it("holds back deliveries to a site closed that day", () => {
    const { stops, infeasible } = buildDayStops([clinic], [], [ret(5, 10, null, 1), ret(5, 10, null, 2)], { day: "2026-12-06", timeZone: TZ });
    expect(stops).toEqual([]);
    expect(infeasible).toEqual([expect.objectContaining({ orderId: 5, role: "deliver", reason: "Return P-5: Fenwold Clinic is closed on Sunday; the sets wait for its next opening day." })]);
  });
});

describe("options", () => {
  it("refuses impossible cart sizes", () => {
    expect(() => buildDayStops([clinic], [], [], { day: "2026-12-02", timeZone: TZ, setsPerCart: 0 })).toThrow(/Sets per cart/);
    expect(() => buildDayStops([clinic], [], [], { day: "02/12/2026", timeZone: TZ })).toThrow(/YYYY-MM-DD/);
  });
});
