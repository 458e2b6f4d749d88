import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getOrderRoute } from "@/app/api/orders/[id]/route";
import { GET as listOrdersRoute } from "@/app/api/orders/route";
import type { SeedResult } from "@/db/seed/demo";
import { applyCycleEvent } from "@/lib/cycles/store";
import { AppError } from "@/lib/errors";
import { bookingSchema } from "@/lib/orders/schemas";
import { amendPickup, bookPickup, cancelPickup, getOrderDetail } from "@/lib/orders/service";
import { requestFromStore, storedSets } from "@/lib/orders/store-requests";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
// Tuesday 1 December 2026, 10:00 in London (GMT): the demo's contracts are in force.
const NOW = new Date("2026-12-01T10:00:00Z");
const TABLES = ["orders", "cycles", "scan_events", "order_extras", "outbox", "audit_log"] as const;

// In-service, non-loaner sets whose home is the main theatres, in serial order.
let theatreSets: { id: number; serial: string }[] = [];

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  theatreSets = await t.db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial"])
    .where("sets.home_site_id", "=", seed.sites["Quillby Moor General – Main Theatres"]!)
    .where("sets.status", "=", "in_service")
    .where("set_types.set_class", "!=", "loaner_set")
    .orderBy("sets.serial")
    .execute();
});
afterAll(() => t.cleanup());

const site = (name: string) => seed.sites[name]!;
const THEATRES = "Quillby Moor General – Main Theatres";
const setId = (serial: string) => seed.sets![serial]!;
/** The n-th main-theatres set (0-based). */
const T = (n: number) => theatreSets[n]!.id;
const TS = (n: number) => theatreSets[n]!.serial;

function booking(overrides: Record<string, unknown> = {}) {
  return bookingSchema.parse(rawBooking(overrides));
}

function rawBooking(overrides: Record<string, unknown> = {}) {
  return {
    siteId: site(THEATRES),
    setIds: [T(0), T(1)],
    extras: [{ description: "Loose retractor", quantity: 2 }],
    collectionFrom: "2026-12-02T09:00",
    collectionUntil: "2026-12-02T12:00",
    neededBackBy: "2026-12-04T17:00",
    serviceLevel: "standard",
    heavySoil: false,
    notes: "",
    ...overrides,
  };
}

async function refused(promise: Promise<unknown>, pattern: RegExp) {
  const error = await promise.then(() => null, (e: unknown) => e);
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).message).toMatch(pattern);
  return error as AppError;
}

describe("booking a pickup", () => {
  it("creates the order, a booked cycle per set, the items, and the confirmation e-mail to the booker", async () => {
    const staff = await sessionUser(t.db, seed.users["theatres@quillby.example"]!);
    const { orderId, reference } = await bookPickup(t.db, staff, booking(), NOW);
    expect(reference).toMatch(/^QMH-P\d{6}$/);
    const order = await getOrderDetail(t.db, staff, orderId);
    expect(order).toMatchObject({ status: "booked", sets: 2, siteName: THEATRES, extras: [{ description: "Loose retractor", quantity: 2 }] });
    expect(order.cycles.map((c) => c.state)).toEqual(["booked", "booked"]);
    // Promised: window end 12:00 + 60 min transit = received 13:00 Wed; 24 service hours of the
    // contract's 06:00–22:00 calendar: 9 h on Wed (13:00–22:00), then 15 h of Thursday from 06:00
    // → Thu 21:00 (GMT, so 21:00Z). Worked by hand.
    expect(order.promisedReturnAt).toBe("2026-12-03T21:00:00.000Z");
    const events = await t.db.selectFrom("scan_events").selectAll().where("cycle_id", "in", order.cycles.map((c) => c.cycleId)).execute();
    expect(events.map((e) => [e.event, e.to_state])).toEqual([["book", "booked"], ["book", "booked"]]);
    const mail = await t.db.selectFrom("outbox").selectAll().where("template", "=", "order.booking_confirmed").execute();
    expect(mail.map((m) => m.to_address)).toEqual(["theatres@quillby.example"]);
    expect(mail[0]!.text_body).toContain(reference);
    expect(mail[0]!.text_body).toContain(TS(0));
    expect(mail[0]!.html_body).toContain("Loose retractor");
  });

  it("refuses bad bookings with a clear message and creates nothing", async () => {
    const staff = await sessionUser(t.db, seed.users["theatres@quillby.example"]!);
    const manager = await sessionUser(t.db, seed.users["manager@quillby.example"]!);
    const before = await countRows(t.db, [...TABLES]);
    await refused(bookPickup(t.db, staff, booking({ collectionFrom: "2026-11-30T09:00", collectionUntil: "2026-11-30T12:00" }), NOW), /already started or passed/);
    await refused(
      bookPickup(t.db, manager, booking({ siteId: site("Quillby Moor Eye Centre"), setIds: [], collectionFrom: "2026-12-02T18:30", collectionUntil: "2026-12-02T19:30" }), NOW),
      /inside Quillby Moor Eye Centre's opening hours \(Wednesday: 08:00–18:00\)/,
    );
    await refused(bookPickup(t.db, staff, booking({ setIds: [setId("ODS-000001")] }), NOW), /not one of your organisation's sets/);
    await refused(bookPickup(t.db, staff, booking({ setIds: [T(0)] }), NOW), /already booked or at the unit/);
    await refused(bookPickup(t.db, staff, booking({ setIds: [setId("QMH-000150")] }), NOW), /loaner set without instructions for use/);
    const late = await refused(
      // Standard is back Thu 21:00; express (5 service hours from 13:00) Wed 18:00.
      bookPickup(t.db, staff, booking({ setIds: [T(2)], neededBackBy: "2026-12-03T08:00" }), NOW),
      /due back 3 Dec 2026, 21:00, after you need them\. Choose express: it has them back by 2 Dec 2026, 18:00\./,
    );
    expect(late.fields?.neededBackBy).toBeTruthy();
    await refused(bookPickup(t.db, staff, booking({ siteId: site("Quillby Moor Eye Centre"), setIds: [] }), NOW), /Choose one of your organisation's sites/);
    await refused(bookPickup(t.db, staff, booking({ setIds: [T(2)], neededBackBy: "2026-12-02T11:00" }), NOW), /cannot be back before they are collected/);
    const tooLate = await refused(bookPickup(t.db, staff, booking({ setIds: [T(2)], neededBackBy: "2026-12-02T16:00" }), NOW), /The earliest they can be back is 2 Dec 2026, 18:00 \(express\)/);
    expect(tooLate.fields?.neededBackBy).toBeTruthy();
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    // Field-level checks happen before the service: no sets, a duplicate, a nonsense date.
    expect(bookingSchema.safeParse(rawBooking({ setIds: [], extras: [] })).error?.issues[0]?.message).toBe("Add at least one set or item to collect.");
    expect(bookingSchema.safeParse(rawBooking({ setIds: [1, 1] })).error?.issues[0]?.message).toBe("A set is listed twice.");
  });

  it("meets a tight time with express, and flags a window outside the unit's service hours", async () => {
    const staff = await sessionUser(t.db, seed.users["theatres@quillby.example"]!);
    const { orderId } = await bookPickup(
      t.db,
      staff,
      booking({ setIds: [T(2)], extras: [], serviceLevel: "express", collectionFrom: "2026-12-02T05:00", collectionUntil: "2026-12-02T05:30", neededBackBy: "2026-12-02T16:00" }),
      NOW,
    );
    const order = await getOrderDetail(t.db, staff, orderId);
    expect(order.outOfHours).toBe(true);
    expect(order.serviceLevel).toBe("express");
  });
});

describe("changing and cancelling before collection", () => {
  it("amends the sets and times, then cancels, freeing the sets; after collection neither is allowed", async () => {
    const manager = await sessionUser(t.db, seed.users["manager@quillby.example"]!);
    const { orderId } = await bookPickup(t.db, manager, booking({ setIds: [T(3)], extras: [] }), NOW);
    await amendPickup(t.db, manager, orderId, booking({ setIds: [T(4), T(5)], extras: [], collectionUntil: "2026-12-02T11:00" }), NOW);
    let order = await getOrderDetail(t.db, manager, orderId);
    expect(order.cycles.map((c) => [c.serial, c.state])).toEqual([
      [TS(3), "cancelled"],
      [TS(4), "booked"],
      [TS(5), "booked"],
    ]);
    expect(order.collectionUntil).toBe("2026-12-02T11:00:00.000Z");
    await cancelPickup(t.db, manager, { orderId }, NOW);
    order = await getOrderDetail(t.db, manager, orderId);
    expect(order.status).toBe("cancelled");
    expect(order.cycles.every((c) => c.state === "cancelled")).toBe(true);
    // The sets can be booked again at once.
    const again = await bookPickup(t.db, manager, booking({ setIds: [T(3), T(4)], extras: [] }), NOW);
    const cycle = (await getOrderDetail(t.db, manager, again.orderId)).cycles[0]!;
    await applyCycleEvent(t.db, { cycleId: cycle.cycleId, event: "collect", station: "van", userId: null, at: NOW });
    await refused(cancelPickup(t.db, manager, { orderId: again.orderId }, NOW), /already collected/);
    await refused(amendPickup(t.db, manager, again.orderId, booking({ setIds: [T(3)], extras: [] }), NOW), /already collected/);
  });
});

describe("following an order", () => {
  it("moves the order's status with its sets and tells the clinic once per step", async () => {
    const staff = await sessionUser(t.db, seed.users["daycase@quillby.example"]!);
    const daySets = await t.db.selectFrom("sets").select("id").where("home_site_id", "=", site("Quillby Moor General – Day Case Unit")).where("status", "=", "in_service").limit(2).execute();
    const { orderId } = await bookPickup(
      t.db,
      staff,
      booking({ siteId: site("Quillby Moor General – Day Case Unit"), setIds: daySets.map((s) => s.id), extras: [], neededBackBy: "2026-12-07T17:00" }),
      NOW,
    );
    const cycles = (await getOrderDetail(t.db, staff, orderId)).cycles;
    const steps = [
      ["collect", "van", "collected"],
      ["receive", "receiving", "in_process"],
      ["wash_passed", "washing", "in_process"],
      ["pack", "packing", "in_process"],
      ["sterilise", "sterilising", "in_process"],
      ["release", "release", "ready"],
      ["dispatch", "dispatch", "out_for_delivery"],
      ["deliver", "van", "delivered"],
    ] as const;
    for (const [event, station, status] of steps) {
      for (const c of cycles) await applyCycleEvent(t.db, { cycleId: c.cycleId, event, station, userId: null, at: NOW });
      expect((await getOrderDetail(t.db, staff, orderId)).status).toBe(status);
    }
    const mail = await t.db
      .selectFrom("outbox")
      .select(["template", "to_address", "text_body"])
      .where("dedupe_key", "like", `order:${orderId}:%`)
      .orderBy("id")
      .execute();
    // The day-case nurse and the manager (no site: every site) hear of each step; the main
    // theatres' nurse does not.
    expect(new Set(mail.map((m) => m.to_address))).toEqual(new Set(["daycase@quillby.example", "manager@quillby.example"]));
    expect(mail.filter((m) => m.to_address === "manager@quillby.example").map((m) => m.template)).toEqual([
      "order.collected",
      "order.ready",
      "order.out_for_delivery",
      "order.delivered",
    ]);
    expect(mail.every((m) => !/Otterwick|Marrowgate|Pellowfield/.test(m.text_body))).toBe(true);
  });

  it("records a retried scan once", async () => {
    const staff = await sessionUser(t.db, seed.users["theatres@quillby.example"]!);
    const { orderId } = await bookPickup(t.db, staff, booking({ setIds: [T(6)], extras: [] }), NOW);
    const [cycle] = (await getOrderDetail(t.db, staff, orderId)).cycles;
    const first = await applyCycleEvent(t.db, { cycleId: cycle!.cycleId, event: "collect", station: "van", userId: null, at: NOW, clientEventId: "van-7f3a" });
    const retry = await applyCycleEvent(t.db, { cycleId: cycle!.cycleId, event: "collect", station: "van", userId: null, at: NOW, clientEventId: "van-7f3a" });
    expect(retry).toMatchObject({ duplicate: true, eventId: first.eventId });
    const events = await t.db.selectFrom("scan_events").select("id").where("cycle_id", "=", cycle!.cycleId).execute();
    expect(events).toHaveLength(2); // book + one collect
  });

  it("answers 404 for another tenant's order, and scopes the list to the caller", async () => {
    const theatres = seed.users["theatres@quillby.example"]!;
    const { rows } = await (await listOrdersRoute(await requestAs(theatres, "/api/orders?pageSize=100"), params({}))).json();
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.every((r: { siteName: string }) => r.siteName === THEATRES)).toBe(true);
    const id = String(rows[0].id);
    const otherOrg = await getOrderRoute(await requestAs(seed.users["manager@otterwick.example"]!, `/api/orders/${id}`), params({ id }));
    expect(otherOrg.status).toBe(404);
    const siblingSite = await getOrderRoute(await requestAs(seed.users["daycase@quillby.example"]!, `/api/orders/${id}`), params({ id }));
    expect(siblingSite.status).toBe(404);
    const own = await getOrderRoute(await requestAs(seed.users["manager@quillby.example"]!, `/api/orders/${id}`), params({ id }));
    expect(own.status).toBe(200);
    const filtered = await (await listOrdersRoute(await requestAs(seed.users["manager@quillby.example"]!, "/api/orders?status=cancelled&from=2026-12-01&to=2026-12-01"), params({}))).json();
    expect(filtered.rows.every((r: { status: string }) => r.status === "cancelled")).toBe(true);
    const bad = await listOrdersRoute(await requestAs(theatres, "/api/orders?from=2026-02-30"), params({}));
    expect(bad.status).toBe(422);
  });
});

describe("the unit's store", () => {
  it("keeps released sets booked for the store until the clinic asks for them", async () => {
    const staff = await sessionUser(t.db, seed.users["theatres@quillby.example"]!);
    const { orderId } = await bookPickup(t.db, staff, booking({ setIds: [T(7), T(8)], extras: [], keepInStore: true }), NOW);
    const cycles = (await getOrderDetail(t.db, staff, orderId)).cycles;
    for (const event of ["receive", "wash_passed", "pack", "sterilise", "release"] as const) {
      for (const c of cycles) await applyCycleEvent(t.db, { cycleId: c.cycleId, event, station: "receiving", userId: null, at: NOW });
    }
    const stored = await storedSets(t.db, staff);
    expect(stored.map((s) => s.serial).sort()).toEqual([TS(7), TS(8)].sort());
    // Another customer sees none of them.
    expect(await storedSets(t.db, await sessionUser(t.db, seed.users["manager@otterwick.example"]!))).toEqual([]);

    const before = () => countRows(t.db, [...TABLES]);
    await refused(requestFromStore(t.db, staff, { siteId: site(THEATRES), cycleIds: [cycles[0]!.cycleId], neededBy: "2026-11-01T10:00", notes: null }, NOW), /in the future/);
    // A cycle of another customer, booked by its own staff.
    const otterwick = await sessionUser(t.db, seed.users["staff@otterwick.example"]!);
    const odsSet = await t.db.selectFrom("sets").select("id").where("home_site_id", "=", site("Otterwick Day Surgery Centre")).where("status", "=", "in_service").limit(1).executeTakeFirstOrThrow();
    const odsOrder = await bookPickup(t.db, otterwick, booking({ siteId: site("Otterwick Day Surgery Centre"), setIds: [odsSet.id], extras: [], keepInStore: true, neededBackBy: "2026-12-08T17:00" }), NOW);
    const otherCycle = { id: (await getOrderDetail(t.db, otterwick, odsOrder.orderId)).cycles[0]!.cycleId };
    const counts = await before();
    await refused(requestFromStore(t.db, staff, { siteId: site(THEATRES), cycleIds: [otherCycle.id], neededBy: "2026-12-05T10:00", notes: null }, NOW), /not in your store/);
    await refused(requestFromStore(t.db, staff, { siteId: site("Otterwick Day Surgery Centre"), cycleIds: [cycles[0]!.cycleId], neededBy: "2026-12-05T10:00", notes: null }, NOW), /was not found/);
    expect(await countRows(t.db, [...TABLES])).toEqual(counts);

    const request = await requestFromStore(t.db, staff, { siteId: site(THEATRES), cycleIds: [cycles[0]!.cycleId], neededBy: "2026-12-05T10:00", notes: null }, NOW);
    expect(request.reference).toMatch(/^QMH-S\d{6}$/);
    const order = await getOrderDetail(t.db, staff, request.orderId);
    expect(order).toMatchObject({ kind: "store_request", status: "ready", sets: 1 });
    expect((await storedSets(t.db, staff)).map((s) => s.serial)).toEqual([TS(8)]);
    await refused(requestFromStore(t.db, staff, { siteId: site(THEATRES), cycleIds: [cycles[0]!.cycleId], neededBy: "2026-12-05T10:00", notes: null }, NOW), /not in the unit's store|already been asked/);
    // Delivering it completes the request.
    await applyCycleEvent(t.db, { cycleId: cycles[0]!.cycleId, event: "dispatch", station: "dispatch", userId: null, at: NOW });
    expect((await getOrderDetail(t.db, staff, request.orderId)).status).toBe("out_for_delivery");
  });
});
