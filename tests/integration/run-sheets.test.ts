import { randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as runsRoute } from "@/app/api/runs/route";
import { GET as runRoute } from "@/app/api/runs/[runId]/route";
import { POST as completeRoute } from "@/app/api/runs/[runId]/stops/[stopId]/complete/route";
import { POST as scanRoute } from "@/app/api/runs/[runId]/stops/[stopId]/scans/route";
import { GET as dispatchBoardRoute } from "@/app/api/stations/dispatch/route";
import { POST as dispatchScanRoute } from "@/app/api/stations/dispatch/scan/route";
import type { SeedResult } from "@/db/seed/demo";
import type { Database } from "@/db/schema";
import { serverEnv } from "@/lib/env";
import type { CompleteStopResult, RunSheet, StopScanResult } from "@/lib/runs/shared";
import type { DispatchAnswer, DispatchBoard } from "@/lib/stations/dispatch-shared";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { advanceCycles, freeSetsAtOneSite, pickupInState, publishTodaysRun } from "../support/run-sheets";
import { params, requestAs } from "../support/session";

// The driver's run sheet and the dispatch station against a migrated database with the demo
// scenario: scans at a stop, proof of delivery, stops that could not be served, who may see a
// run, and the dispatch station's refusals.

let t: DemoDatabase;
let seed: SeedResult;
const ORIGIN = "http://localhost:3000";
const DRIVER = "driver@larkmoor.example";
const OTHER_DRIVER = "driver2@larkmoor.example";
const TECH = "tech@larkmoor.example";
const TABLES = ["cycles", "scan_events", "stop_scans", "files", "route_stops", "outbox", "audit_log"] as const satisfies readonly (keyof Database)[];
// The smallest valid PNG (1 × 1 pixel), as a data URL: what the phone's signature pad sends.
const PNG =
  "data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==";

const user = (email: string) => seed.users[email]!;

async function post<T>(
  route: (req: never, ctx: never) => Promise<Response>,
  as: string,
  url: string,
  body: unknown,
  p: Record<string, string> = {},
): Promise<{ status: number; body: T & { error?: { message: string; fields?: Record<string, string[]> } } }> {
  const req = await requestAs(user(as), url, { method: "POST", body, origin: ORIGIN });
  const res = await route(req as never, params(p) as never);
  return { status: res.status, body: await res.json() };
}

async function get<T>(route: (req: never, ctx: never) => Promise<Response>, as: string, url: string, p: Record<string, string> = {}) {
  const res = await route((await requestAs(user(as), url)) as never, params(p) as never);
  return { status: res.status, body: (await res.json()) as T & { error?: { message: string } } };
}

async function states(cycleIds: number[]): Promise<string[]> {
  const rows = await t.db.selectFrom("cycles").select(["id", "state"]).where("id", "in", cycleIds).execute();
  return cycleIds.map((id) => rows.find((r) => r.id === id)!.state);
}

// The whole demo scenario takes a while to write on a busy machine.
beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
}, 240_000);
afterAll(() => t.cleanup());

describe("a driver's run sheet", () => {
  let runId: number;
  let stopIds: number[];
  let deliverCycles: number[];
  let collectCycles: number[];
  let notServedCycles: number[];
  let badSignatureCycles: number[];
  let deliverOrderId: number;
  let sets: Awaited<ReturnType<typeof freeSetsAtOneSite>>;
  let secondSite: Awaited<ReturnType<typeof freeSetsAtOneSite>>;
  let thirdSite: Awaited<ReturnType<typeof freeSetsAtOneSite>>;
  const scan = (stop: number, body: unknown, as = DRIVER) =>
    post<StopScanResult>(scanRoute, as, `/api/runs/${runId}/stops/${stop}/scans`, body, { runId: String(runId), stopId: String(stop) });
  const complete = (stop: number, body: unknown, as = DRIVER) =>
    post<CompleteStopResult>(completeRoute, as, `/api/runs/${runId}/stops/${stop}/complete`, body, { runId: String(runId), stopId: String(stop) });

  beforeAll(async () => {
    const tech = user(TECH);
    sets = await freeSetsAtOneSite(t.db, 3);
    secondSite = await freeSetsAtOneSite(t.db, 1, [sets.siteId]);
    thirdSite = await freeSetsAtOneSite(t.db, 1, [sets.siteId, secondSite.siteId]);
    const site = { organisationId: sets.organisationId, siteId: sets.siteId };
    // Sets go back once released; the planned run is published before they are loaded on the van.
    const out = await pickupInState(t.db, { ...site, setIds: [sets.sets[0]!.id, sets.sets[1]!.id], userId: tech, upTo: "released" });
    deliverOrderId = out.orderId;
    deliverCycles = out.cycleIds;
    const pickup = await pickupInState(t.db, { ...site, setIds: [sets.sets[2]!.id], userId: tech, upTo: "booked" });
    collectCycles = pickup.cycleIds;
    const second = await pickupInState(t.db, { organisationId: secondSite.organisationId, siteId: secondSite.siteId, setIds: [secondSite.sets[0]!.id], userId: tech, upTo: "released" });
    notServedCycles = second.cycleIds;
    const third = await pickupInState(t.db, { organisationId: thirdSite.organisationId, siteId: thirdSite.siteId, setIds: [thirdSite.sets[0]!.id], userId: tech, upTo: "released" });
    badSignatureCycles = third.cycleIds;
    const plan = await publishTodaysRun(t.db, {
      driverId: user(DRIVER),
      stops: [
        { siteId: sets.siteId, kind: "both", deliverOrderIds: [out.orderId], collectOrderIds: [pickup.orderId] },
        { siteId: secondSite.siteId, kind: "delivery", deliverOrderIds: [second.orderId] },
        { siteId: thirdSite.siteId, kind: "delivery", deliverOrderIds: [third.orderId] },
      ],
    });
    runId = plan.runId;
    stopIds = plan.stopIds;
    await advanceCycles(t.db, { cycleIds: [...deliverCycles, ...notServedCycles, ...badSignatureCycles], userId: tech, upTo: "dispatched" });
  });

  it("lists today's run for its driver, with the stops in order and the sets of each", async () => {
    const runs = await get<{ runs: { runId: number; stops: number }[] }>(runsRoute, DRIVER, "/api/runs");
    expect(runs.status).toBe(200);
    expect(runs.body.runs.map((r) => r.runId)).toContain(runId);
    const sheet = await get<RunSheet>(runRoute, DRIVER, `/api/runs/${runId}`, { runId: String(runId) });
    expect(sheet.status).toBe(200);
    expect(sheet.body.stops.map((s) => s.id)).toEqual(stopIds);
    const first = sheet.body.stops[0]!;
    expect(first.deliver.map((s) => s.serial)).toEqual([sets.sets[0]!.serial, sets.sets[1]!.serial].sort());
    expect(first.collect.map((s) => s.serial)).toEqual([sets.sets[2]!.serial]);
    expect(first.deliver.every((s) => s.blocked === null && !s.scanned)).toBe(true);
    expect(first.window).toMatch(/^\d\d:\d\d–\d\d:\d\d$/);
  });

  it("shows another driver's run as not found, and a clinic user is refused", async () => {
    const other = await get(runRoute, OTHER_DRIVER, `/api/runs/${runId}`, { runId: String(runId) });
    expect(other.status).toBe(404);
    const otherRuns = await get<{ runs: { runId: number }[] }>(runsRoute, OTHER_DRIVER, "/api/runs");
    expect(otherRuns.body.runs.map((r) => r.runId)).not.toContain(runId);
    const before = await countRows(t.db, [...TABLES]);
    const otherScan = await scan(stopIds[0]!, { clientEventId: randomUUID(), code: sets.sets[0]!.serial }, OTHER_DRIVER);
    expect(otherScan.status).toBe(404);
    const clinicEmail = Object.keys(seed.users).find((e) => !e.endsWith("@larkmoor.example"))!;
    const clinic = await get(runRoute, clinicEmail, `/api/runs/${runId}`, { runId: String(runId) });
    expect([403, 404]).toContain(clinic.status);
    const clinicScan = await scan(stopIds[0]!, { clientEventId: randomUUID(), code: sets.sets[0]!.serial }, clinicEmail);
    expect(clinicScan.status).toBe(403);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("records a scan once however often the phone sends it, and refuses a set of another stop", async () => {
    const id = randomUUID();
    const first = await scan(stopIds[0]!, { clientEventId: id, code: sets.sets[0]!.serial });
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ duplicate: false, set: { serial: sets.sets[0]!.serial, role: "deliver" } });
    const again = await scan(stopIds[0]!, { clientEventId: id, code: sets.sets[0]!.serial });
    expect(again.status).toBe(200);
    expect(again.body.duplicate).toBe(true);
    const rows = await t.db.selectFrom("stop_scans").select("id").where("client_event_id", "=", id).execute();
    expect(rows).toHaveLength(1);
    // The cycle moves only when the stop is signed off.
    expect(await states([deliverCycles[0]!])).toEqual(["dispatched"]);

    const wrong = await scan(stopIds[0]!, { clientEventId: randomUUID(), code: secondSite.sets[0]!.serial });
    expect(wrong.status).toBe(409);
    expect(wrong.body.error!.message).toContain("belongs to stop 2");
    const bad = await scan(stopIds[0]!, { clientEventId: "not-a-uuid", code: sets.sets[0]!.serial });
    expect(bad.status).toBe(422);
  });

  it("signs off a stop: the scanned sets are delivered and collected, the signature stored, the stop served, the clinic told", async () => {
    expect((await scan(stopIds[0]!, { clientEventId: randomUUID(), cycleId: deliverCycles[1]! })).status).toBe(200);
    expect((await scan(stopIds[0]!, { clientEventId: randomUUID(), code: sets.sets[2]!.giai })).body.set.role).toBe("collect");
    const id = randomUUID();
    const done = await complete(stopIds[0]!, { clientEventId: id, outcome: "served", receiverName: "Wren Aldermoor", signature: PNG });
    expect(done.status).toBe(200);
    expect(done.body).toMatchObject({ duplicate: false, status: "served", delivered: 2, collected: 1 });
    expect(await states(deliverCycles)).toEqual(["delivered", "delivered"]);
    expect(await states(collectCycles)).toEqual(["collected"]);

    const stop = await t.db.selectFrom("route_stops").selectAll().where("id", "=", stopIds[0]!).executeTakeFirstOrThrow();
    expect(stop).toMatchObject({ status: "served", signed_by_name: "Wren Aldermoor", served_by: user(DRIVER) });
    const file = await t.db.selectFrom("files").selectAll().where("id", "=", stop.signature_file_id!).executeTakeFirstOrThrow();
    expect(file).toMatchObject({ purpose: "signature", content_type: "image/png", organisation_id: sets.organisationId });
    const stored = fs.readFileSync(path.join(serverEnv().uploadsDir, file.storage_key));
    expect(stored.subarray(1, 4).toString()).toBe("PNG");

    const events = await t.db.selectFrom("scan_events").select(["event", "station"]).where("cycle_id", "in", [...deliverCycles, ...collectCycles]).where("station", "=", "van").execute();
    expect(events.map((e) => e.event).sort()).toEqual(["collect", "deliver", "deliver"]);
    const mail = await t.db.selectFrom("outbox").select("template").where("dedupe_key", "like", `order:${deliverOrderId}:delivered:%`).execute();
    expect(mail.length).toBeGreaterThan(0);

    // The same completion again (its answer was lost) changes nothing.
    const before = await countRows(t.db, [...TABLES]);
    const again = await complete(stopIds[0]!, { clientEventId: id, outcome: "served", receiverName: "Wren Aldermoor", signature: PNG });
    expect(again.status).toBe(200);
    expect(again.body.duplicate).toBe(true);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    // A scan at a signed-off stop is refused.
    const late = await scan(stopIds[0]!, { clientEventId: randomUUID(), code: sets.sets[1]!.serial });
    expect(late.status).toBe(409);
  });

  it("refuses a signature that is not a PNG, and writes nothing", async () => {
    expect((await scan(stopIds[2]!, { clientEventId: randomUUID(), code: thirdSite.sets[0]!.serial })).status).toBe(200);
    const before = await countRows(t.db, [...TABLES]);
    const uploads = fs.existsSync(serverEnv().uploadsDir) ? fs.readdirSync(serverEnv().uploadsDir, { recursive: true }).length : 0;
    const jpeg = `data:image/png;base64,${Buffer.from([0xff, 0xd8, 0xff, 0xe0, 1, 2, 3, 4]).toString("base64")}`;
    const res = await complete(stopIds[2]!, { clientEventId: randomUUID(), outcome: "served", receiverName: "Ossian Pell", signature: jpeg });
    expect(res.status).toBe(422);
    expect(res.body.error!.message).toMatch(/PNG/);
    expect(res.body.error!.fields?.signature).toBeDefined();
    const text = await complete(stopIds[2]!, { clientEventId: randomUUID(), outcome: "served", receiverName: "Ossian Pell", signature: "not an image at all!" });
    expect(text.status).toBe(422);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    expect(await states(badSignatureCycles)).toEqual(["dispatched"]);
    const after = fs.existsSync(serverEnv().uploadsDir) ? fs.readdirSync(serverEnv().uploadsDir, { recursive: true }).length : 0;
    expect(after).toBe(uploads);
    const stop = await t.db.selectFrom("route_stops").select("status").where("id", "=", stopIds[2]!).executeTakeFirstOrThrow();
    expect(stop.status).toBe("planned");
  });

  it("records a stop that could not be served with its reason, and leaves its sets as they were", async () => {
    expect((await scan(stopIds[1]!, { clientEventId: randomUUID(), code: secondSite.sets[0]!.serial })).status).toBe(200);
    const noNote = await complete(stopIds[1]!, { clientEventId: randomUUID(), outcome: "not_served", reason: "other" });
    expect(noNote.status).toBe(422);
    expect(noNote.body.error!.fields?.note).toBeDefined();
    const res = await complete(stopIds[1]!, { clientEventId: randomUUID(), outcome: "not_served", reason: "closed", note: "Shutter down, no answer at the bell" });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: "not_served", delivered: 0, collected: 0 });
    expect(await states(notServedCycles)).toEqual(["dispatched"]);
    const stop = await t.db.selectFrom("route_stops").selectAll().where("id", "=", stopIds[1]!).executeTakeFirstOrThrow();
    expect(stop).toMatchObject({ status: "not_served", not_served_reason: "Site closed: Shutter down, no answer at the bell", signature_file_id: null });
    // Signing it off afterwards is refused: the dispatcher plans it again.
    const late = await complete(stopIds[1]!, { clientEventId: randomUUID(), outcome: "served", receiverName: "Ossian Pell", signature: PNG });
    expect(late.status).toBe(409);
  });
});

describe("the dispatch station", () => {
  let runId: number;
  let otherRunId: number;
  let released: { serial: string; cycleId: number }[];
  let sterilised: { serial: string; cycleId: number };
  let unplanned: { serial: string; cycleId: number };
  let otherVanSet: { serial: string; cycleId: number };

  beforeAll(async () => {
    const tech = user(TECH);
    const a = await freeSetsAtOneSite(t.db, 3);
    const b = await freeSetsAtOneSite(t.db, 2, [a.siteId]);
    const siteA = { organisationId: a.organisationId, siteId: a.siteId };
    const siteB = { organisationId: b.organisationId, siteId: b.siteId };
    // One order at site A: two sets released, one still sterilised (its load not released yet).
    const ready = await pickupInState(t.db, { ...siteA, setIds: [a.sets[0]!.id, a.sets[1]!.id, a.sets[2]!.id], userId: tech, upTo: "sterilised" });
    await advanceCycles(t.db, { cycleIds: ready.cycleIds.slice(0, 2), userId: tech, upTo: "released" });
    released = ready.cycleIds.slice(0, 2).map((cycleId, i) => ({ cycleId, serial: a.sets[i]!.serial }));
    sterilised = { cycleId: ready.cycleIds[2]!, serial: a.sets[2]!.serial };
    const elsewhere = await pickupInState(t.db, { ...siteB, setIds: [b.sets[0]!.id], userId: tech, upTo: "released" });
    otherVanSet = { cycleId: elsewhere.cycleIds[0]!, serial: b.sets[0]!.serial };
    // Released only after the day was planned and published: on no stop of today's plan.
    const loose = await pickupInState(t.db, { ...siteB, setIds: [b.sets[1]!.id], userId: tech, upTo: "sterilised" });
    unplanned = { cycleId: loose.cycleIds[0]!, serial: b.sets[1]!.serial };
    runId = (await publishTodaysRun(t.db, { driverId: user(DRIVER), vanName: "Van Heron", stops: [{ siteId: a.siteId, kind: "delivery", deliverOrderIds: [ready.orderId] }] })).runId;
    otherRunId = (await publishTodaysRun(t.db, { driverId: user(OTHER_DRIVER), vanName: "Van Plover", stops: [{ siteId: b.siteId, kind: "delivery", deliverOrderIds: [elsewhere.orderId] }] })).runId;
    await advanceCycles(t.db, { cycleIds: loose.cycleIds, userId: tech, upTo: "released" });
  });

  const load = (code: string, run = runId, clientEventId: string = randomUUID()) =>
    post<DispatchAnswer>(dispatchScanRoute, TECH, "/api/stations/dispatch/scan", { runId: run, code, clientEventId });

  it("shows per run what is still to load", async () => {
    const board = await get<DispatchBoard>(dispatchBoardRoute, TECH, "/api/stations/dispatch");
    expect(board.status).toBe(200);
    const run = board.body.runs.find((r) => r.runId === runId)!;
    expect(run.toLoad.map((s) => s.serial).sort()).toEqual(released.map((r) => r.serial).sort());
    expect(run.notReady.map((s) => s.serial)).toEqual([sterilised.serial]);
    expect(run.loaded).toEqual([]);
  });

  it("loads a released set of the run onto its van, once", async () => {
    const id = randomUUID();
    const res = await load(released[0]!.serial, runId, id);
    expect(res.status).toBe(200);
    expect(res.body.duplicate).toBe(false);
    expect(res.body.run.loaded.map((s) => s.serial)).toEqual([released[0]!.serial]);
    expect(res.body.run.toLoad.map((s) => s.serial)).toEqual([released[1]!.serial]);
    expect(await states([released[0]!.cycleId])).toEqual(["dispatched"]);
    const again = await load(released[0]!.serial, runId, id);
    expect(again.status).toBe(200);
    expect(again.body.duplicate).toBe(true);
    const events = await t.db.selectFrom("scan_events").select("station").where("cycle_id", "=", released[0]!.cycleId).where("event", "=", "dispatch").execute();
    expect(events).toEqual([{ station: "dispatch" }]);
  });

  it("refuses a set that is not released, with the reason, and writes nothing", async () => {
    const before = await countRows(t.db, [...TABLES]);
    const res = await load(sterilised.serial);
    expect(res.status).toBe(409);
    expect(res.body.error!.message).toContain("its load has not been released yet");
    expect(res.body.error!.message).toContain("Wait for the quality lead");
    expect(await states([sterilised.cycleId])).toEqual(["sterilised"]);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("refuses a set of another van's run, a set on no stop, a set already loaded, and a clinic user", async () => {
    const other = await load(otherVanSet.serial);
    expect(other.status).toBe(409);
    expect(other.body.error!.message).toContain("Van Plover");
    const loose = await load(unplanned.serial);
    expect(loose.status).toBe(409);
    expect(loose.body.error!.message).toContain("not on a delivery stop of today's plan");
    const twice = await load(released[0]!.serial);
    expect(twice.status).toBe(409);
    expect(twice.body.error!.message).toContain("already loaded on Van Heron");
    expect(await states([otherVanSet.cycleId, unplanned.cycleId])).toEqual(["released", "released"]);
    const ok = await load(otherVanSet.serial, otherRunId);
    expect(ok.status).toBe(200);
    const driver = await post(dispatchScanRoute, DRIVER, "/api/stations/dispatch/scan", { runId, code: released[1]!.serial, clientEventId: randomUUID() });
    expect(driver.status).toBe(403);
  });
});
