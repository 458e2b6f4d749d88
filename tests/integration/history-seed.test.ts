import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase } from "@/db/connection";
import { migrateToLatest } from "@/db/migrator";
import { type SeedResult, seedDemo } from "@/db/seed/demo";
import { localDateOf } from "@/lib/contracts/dates";
import { contractTermsFor } from "@/lib/contracts/service";
import { type CycleEvent, type CycleState, CYCLE_STATES, isOpenState, transition } from "@/lib/cycles/lifecycle";
import { ORDER_STATUSES } from "@/lib/orders/schemas";
import { turnaroundOutcome } from "@/lib/turnaround";
import { type TestDatabase, useFreshDatabase } from "../support/db";

// The demo's 90 days of ordering history, as seeded into a fresh database.

// Tuesday 1 December 2026, 08:00 in London (GMT).
const now = new Date("2026-12-01T08:00:00Z");
const DAY = 86_400_000;
let t: TestDatabase;
let seed: SeedResult;

// Seeding takes seconds; allow for a busy machine.
beforeAll(async () => {
  t = await useFreshDatabase();
  const started = performance.now();
  const cpu = process.cpuUsage();
  seed = await seedDemo(t.db, now);
  const used = process.cpuUsage(cpu);
  // Reported, never asserted: timings belong to benchmarks, not to tests.
  console.info(`seedDemo with its ordering history: ${(performance.now() - started).toFixed(0)} ms, ${((used.user + used.system) / 1000).toFixed(0)} ms of CPU`);
}, 180_000);
afterAll(() => t.cleanup());

/** The ids of the orders the history wrote (other parts of the demo may add their own). */
const historyOrders = () => Object.values(seed.history?.orders ?? {});

const TIME_COLUMN = {
  collected: "collected_at",
  received: "received_at",
  washed: "washed_at",
  packed: "packed_at",
  sterilised: "sterilised_at",
  released: "released_at",
  dispatched: "dispatched_at",
  delivered: "delivered_at",
  cancelled: "cancelled_at",
} as const;

describe("the demo's ordering history", () => {
  it("has cycles in every state, and orders in every status", async () => {
    const cycles = await t.db.selectFrom("cycles").select(["id", "state", "order_id"]).where("order_id", "in", historyOrders()).execute();
    const states = new Set(cycles.map((r) => r.state));
    expect([...states].sort()).toEqual([...CYCLE_STATES].sort());
    // The recalled ones are exactly the sets of the demo's recall still out at the clinic (db/seed/loads.ts).
    const outstanding = await t.db.selectFrom("recall_items").select("cycle_id").where("returned_at", "is", null).execute();
    expect(cycles.filter((c) => c.state === "recalled").map((c) => c.id).sort()).toEqual(outstanding.map((o) => o.cycle_id).sort());
    const statuses = new Set((await t.db.selectFrom("orders").select("status").where("id", "in", historyOrders()).execute()).map((r) => r.status));
    expect([...statuses].sort()).toEqual([...ORDER_STATUSES].sort());

    // Most delivered; a few on hold (each with its reason); one or two orders back to washing.
    expect(cycles.filter((c) => c.state === "delivered").length).toBeGreaterThan(cycles.length * 0.85);
    const held = await t.db.selectFrom("cycles").select(["hold_reason", "held_from"]).where("state", "=", "on_hold").where("order_id", "in", historyOrders()).execute();
    expect(held.length).toBeGreaterThanOrEqual(2);
    expect(held.length).toBeLessThanOrEqual(6);
    for (const h of held) {
      expect(h.hold_reason).toMatch(/\w{4,}/);
      expect(["received", "washed", "packed", "sterilised", "reprocess"]).toContain(h.held_from);
    }
    const rewash = await t.db.selectFrom("cycles").select("order_id").distinct().where("state", "=", "reprocess").where("order_id", "in", historyOrders()).execute();
    expect(rewash.length).toBeGreaterThanOrEqual(1);
    expect(rewash.length).toBeLessThanOrEqual(2);
  });

  it("replays every cycle's scan events through the state machine from booked to its state", async () => {
    const cycles = await t.db.selectFrom("cycles").selectAll().where("order_id", "in", historyOrders()).orderBy("id").execute();
    const events = await t.db
      .selectFrom("scan_events")
      .selectAll()
      .where("cycle_id", "in", cycles.map((c) => c.id))
      .orderBy("cycle_id")
      .orderBy("id")
      .execute();
    const byCycle = new Map<number, typeof events>();
    for (const e of events) byCycle.set(e.cycle_id, [...(byCycle.get(e.cycle_id) ?? []), e]);
    expect(cycles.length).toBeGreaterThan(500);
    for (const cycle of cycles) {
      const list = byCycle.get(cycle.id) ?? [];
      const [book, ...rest] = list;
      expect(book).toMatchObject({ event: "book", from_state: null, to_state: "booked", at: cycle.booked_at, set_id: cycle.set_id, organisation_id: cycle.organisation_id });
      let state: CycleState = "booked";
      let beforeHold: CycleState | null = null;
      let at = book!.at;
      const lastInto = new Map<CycleState, string>();
      for (const e of rest) {
        const moved = transition(state, e.event as CycleEvent, beforeHold);
        if (!moved.ok) throw new Error(`cycle ${cycle.id}: ${moved.reason} (${e.event} from ${state})`);
        expect(e.from_state).toBe(state);
        expect(e.to_state).toBe(moved.to);
        expect(e.at >= at, `cycle ${cycle.id}: ${e.event} at ${e.at} before ${at}`).toBe(true);
        expect(e.set_id).toBe(cycle.set_id);
        if (moved.to === "on_hold") beforeHold = state;
        else if (state === "on_hold") beforeHold = null;
        if (moved.to === "reprocess") for (const s of ["washed", "packed", "sterilised"] as const) lastInto.delete(s);
        state = moved.to;
        at = e.at;
        lastInto.set(state, e.at);
      }
      expect(state).toBe(cycle.state);
      expect(cycle.held_from).toBe(beforeHold);
      // The cycle's time columns are the times of the events that took it into each state.
      for (const [s, column] of Object.entries(TIME_COLUMN)) expect(cycle[column], `cycle ${cycle.id} ${column}`).toBe(lastInto.get(s as CycleState) ?? null);
      expect(at <= now.toISOString()).toBe(true);
    }
  });

  it("books a set again only after its previous cycle is back, so no set has two open cycles", async () => {
    const history = new Set(historyOrders());
    const cycles = await t.db.selectFrom("cycles").select(["set_id", "order_id", "state", "booked_at", "delivered_at", "cancelled_at"]).orderBy("set_id").orderBy("booked_at").execute();
    const bySet = new Map<number, typeof cycles>();
    for (const c of cycles) bySet.set(c.set_id, [...(bySet.get(c.set_id) ?? []), c]);
    for (const [setId, list] of bySet) {
      expect(list.filter((c) => isOpenState(c.state as CycleState)).length, `set ${setId}`).toBeLessThanOrEqual(1);
      for (let i = 1; i < list.length; i++) {
        const previous = list[i - 1]!;
        const closed = previous.delivered_at ?? previous.cancelled_at;
        expect(closed, `set ${setId}: cycle before ${list[i]!.booked_at} still open`).not.toBeNull();
        expect(closed! <= list[i]!.booked_at).toBe(true);
      }
    }
    // Orders still open today leave the first third (at least eight) of each site's sets free.
    const sets = await t.db.selectFrom("sets").select(["id", "home_site_id"]).where("status", "=", "in_service").orderBy("serial").execute();
    const firstSets = new Set<number>();
    for (const siteId of new Set(sets.map((s) => s.home_site_id))) {
      const own = sets.filter((s) => s.home_site_id === siteId);
      for (const s of own.slice(0, Math.max(8, Math.ceil(own.length / 3)))) firstSets.add(s.id);
    }
    const open = cycles.filter((c) => isOpenState(c.state as CycleState) && history.has(c.order_id!));
    expect(open.length).toBeGreaterThan(20);
    expect(open.filter((c) => firstSets.has(c.set_id))).toEqual([]);
  });

  it("delivers a few orders late against their promise and the turnaround clock, and the rest on time", async () => {
    const late = seed.history?.lateOrders ?? [];
    expect(late.length).toBeGreaterThanOrEqual(3);
    expect(late.length).toBeLessThanOrEqual(8);
    const rows = await t.db
      .selectFrom("cycles")
      .innerJoin("orders", "orders.id", "cycles.order_id")
      .select(["cycles.id", "cycles.organisation_id", "cycles.service_level", "cycles.promised_at", "cycles.received_at", "cycles.released_at", "cycles.delivered_at", "orders.reference", "orders.promised_return_at", "orders.created_at"])
      .where("cycles.state", "=", "delivered")
      .where("orders.id", "in", historyOrders())
      .execute();
    const lateCycles: string[] = [];
    const contracts = new Map<string, Awaited<ReturnType<typeof contractTermsFor>>>();
    for (const r of rows) {
      expect(r.promised_at).toBe(r.promised_return_at);
      // The terms in force when the order was booked, as the booking computed its promise.
      const key = `${r.organisation_id}:${localDateOf(new Date(r.created_at), "Europe/London")}`;
      if (!contracts.has(key)) contracts.set(key, await contractTermsFor(t.db, r.organisation_id, new Date(r.created_at)));
      const terms = contracts.get(key)!;
      const stopped = terms.clockStopsAt === "released" ? r.released_at! : r.delivered_at!;
      const outcome = turnaroundOutcome({
        calendar: terms.serviceCalendar,
        startedAt: new Date(r.received_at!),
        finishedAt: new Date(stopped),
        turnaroundHours: terms.turnaroundHours[r.service_level],
      });
      const afterPromise = stopped > r.promised_at!;
      if (late.includes(r.reference)) {
        if (afterPromise) {
          expect(outcome.late).toBe(true);
          lateCycles.push(r.reference);
        }
      } else {
        expect(afterPromise, `${r.reference} delivered after its promise`).toBe(false);
        expect(outcome.late, `${r.reference} late on the turnaround clock`).toBe(false);
      }
    }
    // Every late order has at least one late set; they span several customers.
    expect(new Set(lateCycles)).toEqual(new Set(late));
    expect(new Set(late.map((ref) => ref.slice(0, 3))).size).toBeGreaterThanOrEqual(3);
  });

  it("follows each site's rhythm over the 90 days up to now, 1 to 8 sets an order, a few booked for tomorrow", async () => {
    const orders = await t.db
      .selectFrom("orders")
      .innerJoin("sites", "sites.id", "orders.site_id")
      .select((eb) => [
        "orders.id",
        "orders.status",
        "orders.collection_from",
        "orders.created_at",
        "orders.cancelled_at",
        "sites.name",
        eb.selectFrom("cycles").select(eb.fn.countAll<number>().as("n")).whereRef("cycles.order_id", "=", "orders.id").as("sets"),
      ])
      .where("orders.id", "in", historyOrders())
      .execute();
    const customerSites = await t.db
      .selectFrom("sites")
      .innerJoin("organisations", "organisations.id", "sites.organisation_id")
      .select("sites.name")
      .where("organisations.kind", "=", "customer")
      .execute();
    const perSite = (name: string) => orders.filter((o) => o.name === name).length;
    for (const s of customerSites) expect(perSite(s.name), s.name).toBeGreaterThan(0);
    expect(perSite("Quillby Moor General – Main Theatres")).toBeGreaterThanOrEqual(80); // daily
    expect(perSite("Otterwick Day Surgery Centre")).toBeGreaterThanOrEqual(40); // most weekdays
    expect(perSite("Tanner Row Dental")).toBeGreaterThanOrEqual(20); // 2–3 a week
    expect(perSite("Tanner Row Dental")).toBeLessThanOrEqual(45);
    expect(perSite("Pellowfield Veterinary Clinic")).toBeGreaterThanOrEqual(10); // weekly
    expect(perSite("Pellowfield Veterinary Clinic")).toBeLessThanOrEqual(15);
    for (const o of orders) {
      expect(Number(o.sets)).toBeGreaterThanOrEqual(1);
      expect(Number(o.sets)).toBeLessThanOrEqual(8);
      expect(o.created_at <= now.toISOString()).toBe(true);
      expect(new Date(o.collection_from!).getTime()).toBeGreaterThan(now.getTime() - 91 * DAY);
      expect(new Date(o.collection_from!).getTime()).toBeLessThan(now.getTime() + 2 * DAY);
      if (o.status === "cancelled") expect(o.cancelled_at).not.toBeNull();
    }
    // Tomorrow is Wednesday 2 December (local).
    const tomorrow = orders.filter((o) => o.status === "booked" && o.collection_from!.startsWith("2026-12-02"));
    expect(tomorrow.length).toBeGreaterThanOrEqual(3);
    expect(orders.filter((o) => o.status === "cancelled").length).toBeGreaterThanOrEqual(3);
    expect(orders.filter((o) => o.status === "cancelled").length).toBeLessThan(orders.length * 0.06);
  });

  it("leaves no mail to send", async () => {
    const orderMail = await t.db.selectFrom("outbox").select(["template", "status", "dedupe_key"]).where("template", "like", "order.%").execute();
    expect(orderMail).toEqual([]);
    const ids = new Set(historyOrders().map(String));
    const aboutHistory = (await t.db.selectFrom("outbox").select("dedupe_key").where("status", "!=", "sent").execute()).filter((m) => ids.has(m.dedupe_key?.split(":")[1] ?? ""));
    expect(aboutHistory).toEqual([]);
  });

  // Seeds a second database: allow for a busy machine.
  it("is the same for the same now", { timeout: 120_000 }, async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-history-"));
    const other = openDatabase(path.join(dir, "again.db"));
    try {
      await migrateToLatest(other);
      const again = await seedDemo(other, now);
      expect(again.history).toEqual(seed.history);
      const rows = async (db: typeof t.db) => {
        const orders = await db.selectFrom("orders").selectAll().where("id", "in", historyOrders()).orderBy("id").execute();
        const cycles = await db.selectFrom("cycles").selectAll().where("order_id", "in", historyOrders()).orderBy("id").execute();
        const events = await db.selectFrom("scan_events").selectAll().where("cycle_id", "in", cycles.map((c) => c.id)).orderBy("id").execute();
        return { orders, cycles, events };
      };
      const [a, b] = [await rows(t.db), await rows(other)];
      expect(a.orders.length).toBeGreaterThan(300);
      expect(b).toEqual(a);
    } finally {
      await other.destroy();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
