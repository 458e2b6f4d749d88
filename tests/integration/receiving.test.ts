import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as finishRoute } from "@/app/api/stations/receiving/finish/route";
import { POST as heavySoilRoute } from "@/app/api/stations/receiving/heavy-soil/route";
import { POST as scanRoute } from "@/app/api/stations/receiving/scan/route";
import type { SeedResult } from "@/db/seed/demo";
import type { Database } from "@/db/schema";
import { applyCycleEvent } from "@/lib/cycles/store";
import { AppError } from "@/lib/errors";
import { getOrderDetail } from "@/lib/orders/service";
import { finishReceiving, listOrderNotices, receiveScan, setHeavySoil } from "@/lib/stations/receiving";
import { type ReceivingAnswer, routeAfterReceiving } from "@/lib/stations/receiving-shared";
import { bookedPickup } from "../support/bookings";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

// The receiving station: booked and collected sets, sets that came without a booking, finishing
// an order, heavy soil, where a set goes next, who may use it, and what bad scans answer.

let t: DemoDatabase;
let seed: SeedResult;
// Tuesday 1 December 2026, 10:00 in London (GMT): the demo's contracts are in force.
const NOW = new Date("2026-12-01T10:00:00Z");
const THEATRES = "Quillby Moor General – Main Theatres";
const TABLES = ["cycles", "scan_events", "order_notices", "outbox", "audit_log", "orders"] as const satisfies readonly (keyof Database)[];
const ORIGIN = "http://localhost:3000";

const user = (email: string) => seed.users[email]!;
const as = (email: string) => sessionUser(t.db, user(email));
const TECH = "tech@larkmoor.example";

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
});
afterAll(() => t.cleanup());

/** In-service, non-loaner sets of a site with no open cycle (optionally of a set type with a flag), highest serials first; each call moves past the ones it returned. */
const taken = new Set<number>();
async function freeSets(siteName: string | null, n: number, flag?: string): Promise<{ id: number; serial: string; giai: string; typeName: string }[]> {
  let query = t.db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial", "sets.giai", "set_types.name as typeName"])
    .where("sets.status", "=", "in_service")
    .where("set_types.set_class", "!=", "loaner_set")
    .where((eb) => eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))))
    .orderBy("sets.serial", "desc");
  if (siteName) query = query.where("sets.home_site_id", "=", seed.sites[siteName]!);
  // Manual-wash sets are few: keep them for the test that needs one.
  query = flag
    ? query.where("set_types.processing_flags", "like", `%"${flag}"%`)
    : query.where("set_types.processing_flags", "not like", '%"manual_wash_only"%');
  const rows = (await query.execute()).filter((r) => !taken.has(r.id)).slice(0, n);
  if (rows.length < n) throw new Error(`Only ${rows.length} free sets at ${siteName ?? "any site"}${flag ? ` with ${flag}` : ""}.`);
  rows.forEach((r) => taken.add(r.id));
  return rows;
}

/** Books a pickup of the sets at the site as its clinic staff. */
const book = (setIds: number[], email = "theatres@quillby.example", siteName = THEATRES) => bookedPickup(t, email, siteName, setIds, NOW);

async function scan(body: unknown, email = TECH) {
  const res = await scanRoute(await requestAs(user(email), "/api/stations/receiving/scan", { method: "POST", body, origin: ORIGIN }), params({}));
  return { status: res.status, body: await res.json() };
}

async function refused(promise: Promise<unknown>, pattern: RegExp): Promise<AppError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).message).toMatch(pattern);
  return error as AppError;
}

describe("receiving booked sets", () => {
  it("receives a booked set once, with its order and the order's other sets still expected; a retried request records nothing", async () => {
    const sets = await freeSets(THEATRES, 3);
    const { orderId, reference, cycles } = await book(sets.map((s) => s.id));
    const first = sets.find((s) => s.id === cycles[0]!.setId)!;
    const body = { code: first.serial, clientEventId: randomUUID() };

    const res = await scan(body);
    expect(res.status).toBe(200);
    const answer = res.body as ReceivingAnswer;
    expect(answer).toMatchObject({ outcome: "received", duplicate: false, headline: "Received" });
    expect(answer.set).toMatchObject({ serial: first.serial, customerName: "Quillby Moor Hospitals", homeSiteName: THEATRES });
    expect(answer.cycle).toMatchObject({ state: "received", receivedBy: "Sol Brackenbury", serviceLevel: "standard" });
    expect(answer.order).toMatchObject({
      id: orderId,
      reference,
      customerName: "Quillby Moor Hospitals",
      siteName: THEATRES,
      serviceLevel: "standard",
      booked: 3,
      received: 1,
      stillExpected: 2,
      missing: 0,
    });
    // Promised when booked: window end 12:00 + 60 min transit, 24 service hours of the 06:00–22:00
    // calendar → Thu 21:00 (the booking test's worked example).
    expect(answer.order!.promisedReturnAt).toBe("2026-12-03T21:00:00.000Z");
    expect(answer.order!.sets.map((s) => [s.serial, s.received])).toEqual(cycles.map((c) => [c.serial, c.setId === first.id]));

    const event = await t.db.selectFrom("scan_events").selectAll().where("client_event_id", "=", body.clientEventId).executeTakeFirstOrThrow();
    expect(event).toMatchObject({ cycle_id: cycles[0]!.cycleId, event: "receive", from_state: "booked", to_state: "received", station: "receiving", user_id: user(TECH) });

    const before = await countRows(t.db, [...TABLES]);
    const retry = await scan(body);
    expect(retry.status).toBe(200);
    expect(retry.body).toMatchObject({ outcome: "received", duplicate: true, cycle: { id: cycles[0]!.cycleId, state: "received" } });
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    expect((await getOrderDetail(t.db, await as("theatres@quillby.example"), orderId)).status).toBe("in_process");
  });

  it("receives a collected set by its label (GS1 element string) and ticks it off its order", async () => {
    const tech = await as(TECH);
    const sets = await freeSets(THEATRES, 2);
    const { cycles } = await book(sets.map((s) => s.id));
    for (const c of cycles) await applyCycleEvent(t.db, { cycleId: c.cycleId, event: "collect", station: "van", userId: null, at: NOW });
    const giai = sets.find((s) => s.id === cycles[1]!.setId)!.giai;
    const answer = await receiveScan(t.db, tech, { code: `]d28004${giai}`, clientEventId: randomUUID() }, new Date("2026-12-02T13:05:00Z"));
    expect(answer.outcome).toBe("received");
    expect(answer.cycle).toMatchObject({ id: cycles[1]!.cycleId, state: "received", receivedAt: "2026-12-02T13:05:00.000Z" });
    expect(answer.order!.sets.map((s) => [s.cycleId, s.received])).toEqual([
      [cycles[0]!.cycleId, false],
      [cycles[1]!.cycleId, true],
    ]);
  });

  it("says when and by whom a set was already received, and why it cannot be received again; nothing is written", async () => {
    const tech = await as(TECH);
    const [set] = await freeSets(THEATRES, 1);
    await book([set!.id]);
    await receiveScan(t.db, tech, { code: set!.serial, clientEventId: randomUUID() }, new Date("2026-12-02T09:12:00Z"));
    const before = await countRows(t.db, [...TABLES]);
    const again = await refused(
      receiveScan(t.db, await as("tech2@larkmoor.example"), { code: set!.serial, clientEventId: randomUUID() }, new Date("2026-12-02T09:30:00Z")),
      new RegExp(`^${set!.serial} \\(${set!.typeName}\\) was already received at 09:12 by Sol Brackenbury\\. Cannot receive this set: it has not been washed yet\\.$`),
    );
    expect(again.status).toBe(409);
    // Another day: the date is given too.
    await refused(
      receiveScan(t.db, tech, { code: set!.serial, clientEventId: randomUUID() }, new Date("2026-12-03T08:00:00Z")),
      /already received at 2 Dec 2026, 09:12 by Sol Brackenbury/,
    );
    // Through the route: a 409 with the reason, for the station to show.
    const res = await scan({ code: set!.serial, clientEventId: randomUUID() });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/was already received at .* by Sol Brackenbury\. Cannot receive this set/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("takes back a recalled set and sends it to washing again", async () => {
    const tech = await as(TECH);
    const [set] = await freeSets(THEATRES, 1);
    const { cycles } = await book([set!.id]);
    for (const event of ["receive", "wash_passed", "pack", "sterilise", "release", "dispatch", "recall"] as const) {
      await applyCycleEvent(t.db, { cycleId: cycles[0]!.cycleId, event, station: "quality", userId: null, at: NOW });
    }
    const answer = await receiveScan(t.db, tech, { code: set!.serial, clientEventId: randomUUID() }, NOW);
    expect(answer).toMatchObject({ outcome: "returned", headline: "Recalled set back at the unit", cycle: { state: "reprocess" } });
  });
});

describe("a set that came without a booking", () => {
  it("opens and receives a standard cycle promised from the contract, flags it to the clinic on the order it came with, and e-mails the site", async () => {
    const tech = await as(TECH);
    const [booked, stray] = await freeSets(THEATRES, 2);
    const { orderId, reference } = await book([booked!.id]);
    // The manager has turned off the e-mails about collections: no notice mail for them either.
    await t.db.updateTable("users").set({ mail_preferences: JSON.stringify({ collected: false }) }).where("id", "=", user("manager@quillby.example")).execute();
    try {
      // Wednesday 2 December 13:00 (GMT).
      const at = new Date("2026-12-02T13:00:00Z");
      await receiveScan(t.db, tech, { code: booked!.serial, clientEventId: randomUUID() }, at);
      const clientEventId = randomUUID();
      const answer = await receiveScan(t.db, tech, { code: stray!.serial, clientEventId, orderId }, at);
      expect(answer).toMatchObject({ outcome: "unexpected", headline: "Received without a booking", duplicate: false, warnings: [] });
      // 24 service hours of the contract's 06:00–22:00 calendar from Wed 13:00: 9 h on Wednesday,
      // 15 h of Thursday → Thu 21:00 (worked by hand, as in the booking test).
      expect(answer.cycle).toMatchObject({ state: "received", serviceLevel: "standard", promisedAt: "2026-12-03T21:00:00.000Z", heavySoil: false });
      expect(answer.order).toMatchObject({ id: orderId, reference, booked: 1, received: 1, stillExpected: 0 });
      expect(answer.order!.sets.map((s) => [s.serial, s.unexpected, s.received])).toEqual([
        [booked!.serial, false, true],
        [stray!.serial, true, true],
      ]);

      const cycle = await t.db.selectFrom("cycles").selectAll().where("id", "=", answer.cycle.id).executeTakeFirstOrThrow();
      expect(cycle).toMatchObject({ order_id: null, site_id: seed.sites[THEATRES], service_level: "standard", state: "received", received_at: at.toISOString() });
      const events = await t.db.selectFrom("scan_events").select(["event", "to_state", "station", "client_event_id", "details"]).where("cycle_id", "=", cycle.id).orderBy("id").execute();
      // Nobody booked it at the clinic: both steps are recorded at receiving.
      expect(events.map((e) => [e.event, e.to_state, e.station])).toEqual([
        ["book", "booked", "receiving"],
        ["receive", "received", "receiving"],
      ]);
      expect(events[1]!.client_event_id).toBe(clientEventId);
      expect(JSON.parse(events[1]!.details)).toEqual({ unexpected: true, withOrderId: orderId });

      const notices = await t.db.selectFrom("order_notices").selectAll().where("cycle_id", "=", cycle.id).execute();
      expect(notices).toHaveLength(1);
      expect(notices[0]).toMatchObject({ kind: "unexpected_set", order_id: orderId, set_id: stray!.id, site_id: seed.sites[THEATRES], created_by: user(TECH) });
      expect(notices[0]!.message).toBe(
        `${stray!.serial} (${stray!.typeName}) arrived at the unit on 2 Dec 2026, 13:00 without a booking, with pickup ${reference}. It is processed at standard turnaround and due back by 3 Dec 2026, 21:00.`,
      );
      const mail = await t.db.selectFrom("outbox").selectAll().where("dedupe_key", "like", `order_notice:${notices[0]!.id}:%`).execute();
      expect(mail.map((m) => [m.template, m.to_address])).toEqual([["receiving.unexpected_set", "theatres@quillby.example"]]);
      expect(mail[0]!.subject).toBe(`${stray!.serial} arrived without a booking (${reference})`);
      expect(mail[0]!.text_body).toContain("due back by 3 Dec 2026, 21:00");
      expect(mail[0]!.html_body).toContain(`/clinic/orders/${orderId}`);
      expect(mail[0]!.text_body).not.toMatch(/Otterwick|Marrowgate|Pellowfield/);

      // A retry of the same scan returns the first answer and writes nothing.
      const before = await countRows(t.db, [...TABLES]);
      const retry = await receiveScan(t.db, tech, { code: stray!.serial, clientEventId, orderId }, at);
      expect(retry).toMatchObject({ outcome: "unexpected", duplicate: true, cycle: { id: cycle.id } });
      expect(await countRows(t.db, [...TABLES])).toEqual(before);

      // The clinic sees the notice on the order's page; another customer and a sibling site do not.
      expect((await listOrderNotices(t.db, await as("theatres@quillby.example"), orderId)).map((n) => [n.kind, n.serial])).toEqual([["unexpected_set", stray!.serial]]);
      expect(await listOrderNotices(t.db, await as("manager@otterwick.example"), orderId)).toEqual([]);
      expect(await listOrderNotices(t.db, await as("daycase@quillby.example"), orderId)).toEqual([]);
    } finally {
      await t.db.updateTable("users").set({ mail_preferences: "{}" }).where("id", "=", user("manager@quillby.example")).execute();
    }
  });

  it("reports a set from another site on its own, with a link to the set, through the route", async () => {
    const [booked] = await freeSets(THEATRES, 1);
    const [other] = await freeSets("Otterwick Day Surgery Centre", 1);
    const { orderId } = await book([booked!.id]);
    const res = await scan({ code: other!.serial, clientEventId: randomUUID(), orderId });
    expect(res.status).toBe(200);
    const answer = res.body as ReceivingAnswer;
    expect(answer.outcome).toBe("unexpected");
    expect(answer.order).toBeNull();
    expect(answer.warnings).toEqual([`It is not one of ${THEATRES}'s sets, so it is reported to Otterwick Day Surgery Centre on its own, not with ${(await getOrderDetail(t.db, await as(TECH), orderId)).reference}.`]);
    const notice = await t.db.selectFrom("order_notices").selectAll().where("cycle_id", "=", answer.cycle.id).executeTakeFirstOrThrow();
    expect(notice).toMatchObject({ order_id: null, organisation_id: seed.organisations.ODS, kind: "unexpected_set" });
    const mail = await t.db.selectFrom("outbox").select(["to_address", "html_body"]).where("dedupe_key", "like", `order_notice:${notice.id}:%`).orderBy("to_address").execute();
    expect(mail.map((m) => m.to_address)).toEqual(["manager@otterwick.example", "staff@otterwick.example"]);
    expect(mail[0]!.html_body).toContain(`/clinic/sets/${other!.id}`);
    expect(mail.every((m) => !m.html_body.includes("Quillby"))).toBe(true);
  });
});

describe("finishing an order", () => {
  it("reports the booked sets that did not arrive as missing, once, and e-mails the site", async () => {
    const tech = await as(TECH);
    const sets = await freeSets(THEATRES, 3);
    const { orderId, reference, cycles } = await book(sets.map((s) => s.id));
    const at = new Date("2026-12-02T14:00:00Z");
    await receiveScan(t.db, tech, { code: cycles[0]!.serial, clientEventId: randomUUID() }, at);
    const before = await countRows(t.db, ["order_notices", "outbox"]);

    const result = await finishReceiving(t.db, tech, { orderId }, new Date("2026-12-02T14:30:00Z"));
    expect(result.reported.map((r) => r.serial)).toEqual([cycles[1]!.serial, cycles[2]!.serial]);
    expect(result.message).toBe(`${reference}: 1 of 3 booked sets received; 2 reported missing to the clinic (${cycles[1]!.serial}, ${cycles[2]!.serial}).`);
    expect(result.order).toMatchObject({ booked: 3, received: 1, stillExpected: 0, missing: 2 });
    const notices = await t.db.selectFrom("order_notices").selectAll().where("order_id", "=", orderId).where("kind", "=", "missing_set").orderBy("id").execute();
    expect(notices.map((n) => n.cycle_id)).toEqual([cycles[1]!.cycleId, cycles[2]!.cycleId]);
    expect(notices[0]!.message).toBe(
      `${cycles[1]!.serial} (${cycles[1]!.setName}) was booked on pickup ${reference} but was not among the sets the unit received; receiving was finished on 2 Dec 2026, 14:30.`,
    );
    const mail = await t.db.selectFrom("outbox").select(["template", "to_address", "subject", "dedupe_key"]).where("template", "=", "receiving.missing_set").where("dedupe_key", "like", `order_notice:${notices[0]!.id}:%`).orderBy("to_address").execute();
    expect(mail.map((m) => m.to_address)).toEqual(["manager@quillby.example", "theatres@quillby.example"]);
    expect(mail[0]!.subject).toBe(`${reference}: ${cycles[1]!.serial} did not arrive`);
    expect(await countRows(t.db, ["order_notices", "outbox"])).toEqual({ order_notices: before.order_notices + 2, outbox: before.outbox + 4 });

    // Finishing again reports nothing new.
    const again = await finishReceiving(t.db, tech, { orderId }, new Date("2026-12-02T15:00:00Z"));
    expect(again.reported).toEqual([]);
    expect(again.message).toMatch(/the missing sets were already reported to the clinic/);
    expect(await countRows(t.db, ["order_notices", "outbox"])).toEqual({ order_notices: before.order_notices + 2, outbox: before.outbox + 4 });

    // The clinic's order page lists both.
    const seen = await listOrderNotices(t.db, await as("manager@quillby.example"), orderId);
    expect(seen.map((n) => [n.kind, n.serial])).toEqual([
      ["missing_set", cycles[1]!.serial],
      ["missing_set", cycles[2]!.serial],
    ]);

    // A missing set that turns up later is received as normal, with a word about the report.
    const late = await receiveScan(t.db, tech, { code: cycles[2]!.serial, clientEventId: randomUUID() }, new Date("2026-12-02T16:00:00Z"));
    expect(late.warnings).toEqual(["This set was reported missing to the clinic on 2 Dec 2026, 14:30; it has now arrived and is processed as normal."]);
    expect(late.order).toMatchObject({ received: 2, missing: 1 });
  });

  it("refuses to finish an order nothing of which has arrived, through the route; clinic users get 403", async () => {
    const sets = await freeSets(THEATRES, 1);
    const { orderId, reference } = await book(sets.map((s) => s.id));
    const before = await countRows(t.db, [...TABLES]);
    const res = await finishRoute(await requestAs(user(TECH), "/api/stations/receiving/finish", { method: "POST", body: { orderId }, origin: ORIGIN }), params({}));
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toBe(`Nothing of ${reference} has been received yet. Scan its sets first; if the whole pickup did not arrive, tell the dispatcher.`);
    const clinic = await finishRoute(await requestAs(user("theatres@quillby.example"), "/api/stations/receiving/finish", { method: "POST", body: { orderId }, origin: ORIGIN }), params({}));
    expect(clinic.status).toBe(403);
    const unknown = await finishRoute(await requestAs(user(TECH), "/api/stations/receiving/finish", { method: "POST", body: { orderId: 999_999 }, origin: ORIGIN }), params({}));
    expect(unknown.status).toBe(404);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });
});

describe("heavy soil", () => {
  it("marks and clears a received set, audited, only while it is at receiving", async () => {
    const tech = await as(TECH);
    const [set, booked] = await freeSets(THEATRES, 2);
    const { cycles } = await book([set!.id, booked!.id]);
    const received = await receiveScan(t.db, tech, { code: set!.serial, clientEventId: randomUUID() }, NOW);
    const cycleId = received.cycle.id;
    const toggle = async (heavySoil: boolean, id = cycleId, email = TECH) => {
      const res = await heavySoilRoute(await requestAs(user(email), "/api/stations/receiving/heavy-soil", { method: "POST", body: { cycleId: id, heavySoil }, origin: ORIGIN }), params({}));
      return { status: res.status, body: await res.json() };
    };
    const audits = () => t.db.selectFrom("audit_log").select(["action", "actor_user_id"]).where("entity", "=", "cycle").where("entity_id", "=", String(cycleId)).orderBy("id").execute();

    expect(await toggle(true)).toEqual({ status: 200, body: { cycleId, heavySoil: true, changed: true } });
    expect((await t.db.selectFrom("cycles").select("heavy_soil").where("id", "=", cycleId).executeTakeFirstOrThrow()).heavy_soil).toBe(1);
    // Setting it again changes nothing and is not audited twice.
    expect(await toggle(true)).toEqual({ status: 200, body: { cycleId, heavySoil: true, changed: false } });
    expect(await toggle(false)).toEqual({ status: 200, body: { cycleId, heavySoil: false, changed: true } });
    expect(await audits()).toEqual([
      { action: "cycle.heavy_soil_marked", actor_user_id: user(TECH) },
      { action: "cycle.heavy_soil_cleared", actor_user_id: user(TECH) },
    ]);

    const before = await countRows(t.db, [...TABLES]);
    const notYet = cycles.find((c) => c.setId === booked!.id)!.cycleId;
    const early = await toggle(true, notYet);
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/Heavy soil is marked at receiving, before washing; .* is pickup booked\. Nothing was changed\./);
    expect((await toggle(true, cycleId, "theatres@quillby.example")).status).toBe(403);
    expect((await toggle(true, 999_999)).status).toBe(404);
    const bad = await heavySoilRoute(await requestAs(user(TECH), "/api/stations/receiving/heavy-soil", { method: "POST", body: { cycleId, heavySoil: "yes" }, origin: ORIGIN }), params({}));
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.fields.heavySoil).toBeTruthy();
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    await refused(setHeavySoil(t.db, tech, { cycleId: notYet, heavySoil: true }, NOW), /before washing/);
  });
});

describe("where a received set goes next", () => {
  it("sends a manual-wash-only set to manual washing", async () => {
    const [set] = await freeSets(null, 1, "manual_wash_only");
    const res = await scan({ code: set!.serial, clientEventId: randomUUID() });
    expect(res.status).toBe(200);
    const answer = res.body as ReceivingAnswer;
    expect(answer.processing.flags).toContain("manual_wash_only");
    expect(answer.route).toMatchObject({ destination: "manual_washing", label: "Manual washing" });
    expect(answer.route.steps.at(-1)).toBe("Wash by hand at the manual washing station — not in a washer-disinfector");
  });

  it("routes by the set type's flags: manual washing, then ultrasonic, then dismantling, else the washer-disinfector", () => {
    expect(routeAfterReceiving([])).toEqual({ destination: "washer", label: "Washer-disinfector", steps: ["Washer-disinfector"] });
    expect(routeAfterReceiving(["dismantle"])).toEqual({ destination: "dismantle", label: "Dismantle first", steps: ["Dismantle", "Washer-disinfector"] });
    expect(routeAfterReceiving(["ultrasonic"])).toMatchObject({ destination: "ultrasonic", label: "Ultrasonic first" });
    expect(routeAfterReceiving(["dismantle", "ultrasonic", "lumens_to_flush"])).toEqual({
      destination: "ultrasonic",
      label: "Ultrasonic first",
      steps: ["Dismantle", "Ultrasonic clean", "Flush the lumens", "Washer-disinfector"],
    });
    expect(routeAfterReceiving(["ultrasonic", "manual_wash_only"])).toMatchObject({ destination: "manual_washing", label: "Manual washing" });
  });
});

describe("who may use the station, and bad scans", () => {
  it("answers 403 to clinic users and 401 without a session, writing nothing", async () => {
    const [set] = await freeSets(THEATRES, 1);
    const before = await countRows(t.db, [...TABLES]);
    for (const email of ["theatres@quillby.example", "manager@quillby.example", "finance@larkmoor.example"]) {
      expect((await scan({ code: set!.serial, clientEventId: randomUUID() }, email)).status).toBe(403);
    }
    const anonymous = await scanRoute(await requestAs(null, "/api/stations/receiving/scan", { method: "POST", body: { code: set!.serial, clientEventId: randomUUID() }, origin: ORIGIN }), params({}));
    expect(anonymous.status).toBe(401);
    const crossSite = await scanRoute(
      await requestAs(user(TECH), "/api/stations/receiving/scan", { method: "POST", body: { code: set!.serial, clientEventId: randomUUID() }, origin: "http://elsewhere.example" }),
      params({}),
    );
    expect(crossSite.status).toBe(403);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("refuses unknown codes, product barcodes, malformed GS1 and bodies without an id, saying what to do, writing nothing", async () => {
    const before = await countRows(t.db, [...TABLES]);
    const unknown = await scan({ code: "QMH-999999", clientEventId: randomUUID() });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toBe("No set with the code QMH-999999 is among your sets.");
    // The GS1 General Specifications example GTIN (CHECKS.md).
    const gtin = await scan({ code: "0109521234543213", clientEventId: randomUUID() });
    expect(gtin.status).toBe(422);
    expect(gtin.body.error.message).toBe("That is a product barcode (GTIN 09521234543213), not a set's label. Scan the label on the set.");
    // The same GTIN with a wrong check digit (3 is right: CHECKS.md).
    const malformed = await scan({ code: "(01)09521234543214", clientEventId: randomUUID() });
    expect(malformed.status).toBe(422);
    expect(malformed.body.error.message).toMatch(/^That scan could not be read: .*check digit.*Scan the set's label again, or type its serial\.$/);
    const noId = await scan({ code: "QMH-000001" });
    expect(noId.status).toBe(422);
    expect(noId.body.error.fields.clientEventId).toEqual(["Each scan carries a fresh id made by the station (a UUID); reload the station page."]);
    const empty = await scan({ code: "   ", clientEventId: randomUUID() });
    expect(empty.status).toBe(422);
    expect(empty.body.error.fields.code).toEqual(["Scan or type a set's code."]);
    const notJson = await scanRoute(
      new (await import("next/server")).NextRequest(new URL("/api/stations/receiving/scan", ORIGIN), {
        method: "POST",
        headers: { host: "localhost:3000", origin: ORIGIN, "content-type": "application/json", cookie: (await requestAs(user(TECH), "/")).headers.get("cookie")! },
        body: "code=QMH-000001",
      }),
      params({}),
    );
    expect(notJson.status).toBe(400);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("refuses a retired set", async () => {
    const [set] = await freeSets(THEATRES, 1);
    await t.db.updateTable("sets").set({ status: "retired" }).where("id", "=", set!.id).execute();
    const before = await countRows(t.db, [...TABLES]);
    const res = await scan({ code: set!.serial, clientEventId: randomUUID() });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe(`${set!.serial} (${set!.typeName}) is retired and should not be in use. Put it aside and tell the quality lead; nothing was recorded.`);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });
});

describe("the demo's receiving", () => {
  it("has an Otterwick pickup received one set short and with one unbooked set, both on the order's page, with no mail left to send", async () => {
    const notices = await t.db
      .selectFrom("order_notices")
      .innerJoin("orders", "orders.id", "order_notices.order_id")
      .select(["order_notices.kind", "order_notices.order_id", "order_notices.created_at"])
      .where("orders.site_id", "=", seed.sites["Otterwick Day Surgery Centre"]!)
      .where("order_notices.created_at", "<", NOW.toISOString())
      .orderBy("order_notices.id")
      .execute();
    expect(notices.map((n) => n.kind)).toEqual(["unexpected_set", "missing_set"]);
    const orderId = notices[0]!.order_id!;
    const page = await listOrderNotices(t.db, await as("staff@otterwick.example"), orderId);
    expect(page.map((n) => n.kind)).toEqual(["unexpected_set", "missing_set"]);
    const order = await getOrderDetail(t.db, await as("staff@otterwick.example"), orderId);
    expect(order.cycles.map((c) => c.state).sort()).toEqual(["collected", "received", "received"]);
    const queued = await t.db.selectFrom("outbox").select("template").where("template", "like", "receiving.%").where("created_at", "<", NOW.toISOString()).execute();
    expect(queued).toEqual([]);
  });
});
