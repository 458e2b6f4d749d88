import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as boardRoute } from "@/app/api/board/route";
import type { SeedResult } from "@/db/seed/demo";
import { BOARD_STATES, type BoardState, isDueSoon, isOverdue, overdueMinutes } from "@/lib/board/definitions";
import { getUnitBoard, type UnitBoard } from "@/lib/board/service";
import type { CycleEvent } from "@/lib/cycles/lifecycle";
import { applyCycleEvent } from "@/lib/cycles/store";
import { bookingSchema } from "@/lib/orders/schemas";
import { bookPickup, getOrderDetail } from "@/lib/orders/service";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

// The unit's board on a prepared database: two orders moved to known states, counted against the
// board of the same moment before they were added (whatever else the demo holds stays the same).

let t: DemoDatabase;
let seed: SeedResult;
const NOW = new Date("2026-12-01T10:00:00Z");
// A week later: every prepared set not yet released is past its promised time.
const LATER = new Date("2026-12-10T12:00:00Z");
const THEATRES = "Quillby Moor General – Main Theatres";
const OTTERWICK = "Otterwick Day Surgery Centre";

let before: { now: UnitBoard; later: UnitBoard };
let standard: { serial: string; cycleId: number; promisedAt: string }[];
let express: { serial: string; cycleId: number; promisedAt: string }[];

const PATH: Record<string, CycleEvent[]> = {
  collected: ["collect"],
  received: ["collect", "receive"],
  washed: ["collect", "receive", "wash_passed"],
  packed: ["collect", "receive", "wash_passed", "pack"],
  sterilised: ["collect", "receive", "wash_passed", "pack", "sterilise"],
  released: ["collect", "receive", "wash_passed", "pack", "sterilise", "release"],
  dispatched: ["collect", "receive", "wash_passed", "pack", "sterilise", "release", "dispatch"],
  on_hold: ["collect", "receive", "hold"],
  reprocess: ["collect", "receive", "wash_failed"],
  recalled: ["collect", "receive", "wash_passed", "pack", "sterilise", "release", "recall"],
};

async function prepare(email: string, siteName: string, serviceLevel: "standard" | "express", states: string[]) {
  const staff = await sessionUser(t.db, seed.users[email]!);
  const sets = await t.db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select("sets.id")
    .where("sets.home_site_id", "=", seed.sites[siteName]!)
    .where("sets.status", "=", "in_service")
    .where("set_types.set_class", "!=", "loaner_set")
    .where((eb) => eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))))
    .orderBy("sets.serial", "desc")
    .limit(states.length)
    .execute();
  const { orderId } = await bookPickup(
    t.db,
    staff,
    bookingSchema.parse({
      siteId: seed.sites[siteName]!,
      setIds: sets.map((s) => s.id),
      extras: [],
      collectionFrom: "2026-12-02T09:00",
      collectionUntil: "2026-12-02T12:00",
      neededBackBy: "2026-12-09T17:00",
      serviceLevel,
      heavySoil: false,
      notes: "",
    }),
    NOW,
  );
  const cycles = (await getOrderDetail(t.db, staff, orderId)).cycles;
  const out: { serial: string; cycleId: number; promisedAt: string; state: string }[] = [];
  for (const [i, c] of cycles.entries()) {
    const state = states[i]!;
    for (const event of PATH[state]!) {
      await applyCycleEvent(t.db, {
        cycleId: c.cycleId,
        event,
        station: "quality",
        userId: null,
        at: new Date("2026-12-02T14:00:00Z"),
        details: event === "hold" ? { reason: "Needle holder missing from the tray; asked the clinic" } : undefined,
      });
    }
    const row = await t.db.selectFrom("cycles").select("promised_at").where("id", "=", c.cycleId).executeTakeFirstOrThrow();
    out.push({ serial: c.serial, cycleId: c.cycleId, promisedAt: row.promised_at!, state });
  }
  return out;
}

const counts = (board: UnitBoard) => Object.fromEntries(board.columns.map((c) => [c.state, c.count])) as Record<BoardState, number>;
const minus = (a: Record<string, number>, b: Record<string, number>) => Object.fromEntries(Object.keys(a).map((k) => [k, a[k]! - (b[k] ?? 0)]));

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
  before = { now: await getUnitBoard(t.db, admin, NOW), later: await getUnitBoard(t.db, admin, LATER) };
  standard = await prepare("theatres@quillby.example", THEATRES, "standard", ["collected", "received", "washed", "packed", "sterilised", "released"]);
  express = await prepare("staff@otterwick.example", OTTERWICK, "express", ["on_hold", "reprocess", "dispatched", "recalled"]);
});
afterAll(() => t.cleanup());

describe("the definitions", () => {
  it("count a set as overdue only before release and only after its promised time", () => {
    const promisedAt = "2026-12-03T21:00:00.000Z";
    // Exactly at the promised time is on time (lib/turnaround's meaning of late).
    expect(isOverdue({ state: "washed", promisedAt }, new Date(promisedAt))).toBe(false);
    expect(isOverdue({ state: "washed", promisedAt }, new Date("2026-12-03T21:00:01Z"))).toBe(true);
    expect(overdueMinutes({ state: "washed", promisedAt }, new Date("2026-12-03T21:00:01Z"))).toBe(1);
    expect(isOverdue({ state: "released", promisedAt }, LATER)).toBe(false);
    expect(isOverdue({ state: "booked", promisedAt }, LATER)).toBe(false);
    expect(isOverdue({ state: "on_hold", promisedAt }, LATER)).toBe(true);
    expect(isOverdue({ state: "washed", promisedAt: null }, LATER)).toBe(false);
    expect(isDueSoon({ state: "packed", promisedAt }, new Date("2026-12-03T19:00:00Z"))).toBe(true);
    expect(isDueSoon({ state: "packed", promisedAt }, new Date("2026-12-03T18:59:59Z"))).toBe(false);
    expect(isDueSoon({ state: "packed", promisedAt }, new Date("2026-12-03T21:30:00Z"))).toBe(false);
  });
});

describe("the unit's board", () => {
  it("counts the sets at each station", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    const board = await getUnitBoard(t.db, admin, NOW);
    expect(board.columns.map((c) => c.state)).toEqual([...BOARD_STATES]);
    expect(minus(counts(board), counts(before.now))).toEqual({
      collected: 1,
      received: 1,
      washed: 1,
      packed: 1,
      sterilised: 1,
      released: 1,
      dispatched: 1,
      on_hold: 1,
      reprocess: 1,
      recalled: 1,
    });
    const expressDelta = minus(
      Object.fromEntries(board.columns.map((c) => [c.state, c.express])),
      Object.fromEntries(before.now.columns.map((c) => [c.state, c.express])),
    );
    expect(expressDelta).toMatchObject({ on_hold: 1, reprocess: 1, dispatched: 1, recalled: 1, collected: 0, washed: 0 });
    expect(board.totals.sets - before.now.totals.sets).toBe(10);
    expect(board.totals.express - before.now.totals.express).toBe(4);
    // On 1 December nothing prepared is due yet.
    expect(board.totals.overdue - before.now.totals.overdue).toBe(0);
  });

  it("lists the sets past their promised time, express first, and counts them by customer and level", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    const board = await getUnitBoard(t.db, admin, LATER);
    // Not yet released: five standard sets and the held and rewashed express ones.
    expect(board.totals.overdue - before.later.totals.overdue).toBe(7);
    const ours = new Set([...standard, ...express].map((c) => c.cycleId));
    const listed = board.overdue.filter((c) => ours.has(c.cycleId));
    expect(listed.map((c) => c.serial)).toEqual([
      ...express.slice(0, 2).map((c) => c.serial).sort(),
      ...standard.slice(0, 5).map((c) => c.serial).sort(),
    ]);
    // Promised Thu 3 Dec 21:00; on Thu 10 Dec 12:00 that is 6 days 15 hours = 9,540 minutes late.
    expect(standard[0]!.promisedAt).toBe("2026-12-03T21:00:00.000Z");
    expect(listed.find((c) => c.cycleId === standard[0]!.cycleId)).toMatchObject({ state: "collected", serviceLevel: "standard", overdueMinutes: 9540, customerName: "Quillby Moor Hospitals", siteName: THEATRES });
    // Express first in the whole list, too.
    const firstStandard = board.overdue.findIndex((c) => c.serviceLevel === "standard");
    expect(board.overdue.slice(firstStandard).every((c) => c.serviceLevel === "standard")).toBe(true);

    const customer = (code: string, b: UnitBoard) => b.byCustomer.find((c) => c.shortCode === code) ?? { total: 0, overdue: 0, onHold: 0 };
    expect(customer("QMH", board).total - customer("QMH", before.later).total).toBe(6);
    expect(customer("QMH", board).overdue - customer("QMH", before.later).overdue).toBe(5);
    expect(customer("ODS", board).total - customer("ODS", before.later).total).toBe(4);
    expect(customer("ODS", board).onHold - customer("ODS", before.later).onHold).toBe(1);
    expect(board.byCustomer.map((c) => c.label)).toEqual([...board.byCustomer.map((c) => c.label)].sort((a, b) => a.localeCompare(b)));
    expect(board.byLevel.map((l) => l.level)).toEqual(["express", "standard"]);
    expect(board.byLevel[0]!.total - before.later.byLevel[0]!.total).toBe(4);
    expect(board.byLevel[0]!.overdue - before.later.byLevel[0]!.overdue).toBe(2);
    expect(board.byLevel[1]!.byState.packed - before.later.byLevel[1]!.byState.packed).toBe(1);
  });

  it("shows which sets are on hold, why, since when and from where", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    const board = await getUnitBoard(t.db, admin, LATER);
    const held = board.holds.find((h) => h.cycleId === express[0]!.cycleId);
    expect(held).toMatchObject({
      serial: express[0]!.serial,
      state: "on_hold",
      reason: "Needle holder missing from the tray; asked the clinic",
      heldFrom: "received",
      heldFromLabel: "Received at the unit",
      since: "2026-12-02T14:00:00.000Z",
      serviceLevel: "express",
      customerName: "Otterwick Day Surgery",
    });
    expect(board.holds.length - before.later.holds.length).toBe(1);
  });

  it("is for the unit only: clinic users and drivers get 403, unit roles with the board get it", async () => {
    for (const email of ["manager@quillby.example", "theatres@quillby.example", "driver@larkmoor.example"]) {
      const res = await boardRoute(await requestAs(seed.users[email]!, "/api/board"), params({}));
      expect(res.status).toBe(403);
    }
    for (const email of ["tech@larkmoor.example", "dispatch@larkmoor.example", "finance@larkmoor.example"]) {
      const res = await boardRoute(await requestAs(seed.users[email]!, "/api/board"), params({}));
      expect(res.status).toBe(200);
      const body = (await res.json()) as UnitBoard;
      expect(body.columns).toHaveLength(BOARD_STATES.length);
      expect(body.columns.find((c) => c.state === "recalled")!.count).toBeGreaterThanOrEqual(1);
    }
  });
});
