import { createHash, randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import type { Kysely } from "kysely";
import type { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as batchRoute } from "@/app/api/batches/[id]/route";
import { GET as listBatchesRoute } from "@/app/api/batches/route";
import { GET as machinesRoute } from "@/app/api/machines/route";
import { POST as confirmRoute } from "@/app/api/stations/manual-washing/confirm/route";
import { POST as manualScanRoute } from "@/app/api/stations/manual-washing/scan/route";
import { POST as abortRoute } from "@/app/api/stations/washing/batches/[id]/abort/route";
import { POST as closeRoute } from "@/app/api/stations/washing/batches/[id]/close/route";
import { POST as removeRoute } from "@/app/api/stations/washing/batches/[id]/remove/route";
import { POST as scanRoute } from "@/app/api/stations/washing/batches/[id]/scan/route";
import { POST as startRoute } from "@/app/api/stations/washing/batches/[id]/start/route";
import { POST as openRoute } from "@/app/api/stations/washing/batches/route";
import { GET as stationRoute } from "@/app/api/stations/washing/route";
import type { SeedResult } from "@/db/seed/demo";
import type { Database } from "@/db/schema";
import { parseFlags } from "@/lib/catalogue/set-types";
import { recordToCsv } from "@/lib/cycles/csv";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { parseWasherRecord } from "@/lib/cycles/parse";
import { synthWasherRecord } from "@/lib/cycles/synth";
import { checkWasherBatch } from "@/lib/cycles/washer";
import { serverEnv } from "@/lib/env";
import { batchNumberPrefix } from "@/lib/washing/numbering";
import type { BatchView } from "@/lib/washing/service";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs } from "../support/session";

// The washing and manual-washing stations through their route handlers, on the seeded demo:
// opening, loading, starting, closing (passing, failing, unreadable records), aborting, the
// refusals, washing by hand, the batch list and who may do what.

let t: DemoDatabase;
let seed: SeedResult;
const ORIGIN = "http://localhost:3000";
const TABLES = ["washer_batches", "washer_batch_items", "scan_events", "cycles", "files", "audit_log"] as const;

/** Any of the route handlers under test; each reads only the params it declares. */
type Route = (req: NextRequest, ctx: never) => Promise<Response>;

interface FreeSet {
  id: number;
  serial: string;
  flags: string[];
  sizeStu: number;
}
let free: FreeSet[] = [];
let used = 0;

const user = (email: string) => seed.users[email]!;
const tech = () => user("tech@larkmoor.example");

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  // Sets with no open cycle, small enough for a washer's rack, in serial order.
  const rows = await t.db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial", "set_types.processing_flags", "set_types.size_stu"])
    .where("sets.status", "=", "in_service")
    .where("set_types.size_stu", "<=", 1)
    .where((eb) =>
      eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))),
    )
    .orderBy("sets.serial")
    .execute();
  free = rows.map((r) => ({ id: r.id, serial: r.serial, flags: parseFlags(r.processing_flags), sizeStu: r.size_stu }));
});
afterAll(() => t.cleanup());

/** The next free set matching the test (each test takes its own). */
function take(match: (s: FreeSet) => boolean = (s) => !s.flags.includes("manual_wash_only")): FreeSet {
  const index = free.findIndex(match);
  if (index < 0) throw new Error("No free demo set left for this test.");
  const [set] = free.splice(index, 1);
  used += 1;
  return set!;
}

/** Opens a cycle for the set and receives it at the unit, as the receiving station would. */
async function received(db: Kysely<Database>, set: FreeSet, upTo: "booked" | "received" = "received"): Promise<number> {
  const row = await db.selectFrom("sets").select(["organisation_id", "home_site_id"]).where("id", "=", set.id).executeTakeFirstOrThrow();
  const at = new Date(Date.now() - 3600_000);
  const cycleId = await openCycle(db, {
    organisationId: row.organisation_id,
    siteId: row.home_site_id,
    setId: set.id,
    orderId: null,
    serviceLevel: "standard",
    heavySoil: false,
    outOfHours: false,
    loaner: false,
    neededBackBy: null,
    promisedAt: null,
    userId: null,
    at,
  });
  if (upTo === "received") await applyCycleEvent(db, { cycleId, event: "receive", station: "receiving", userId: tech(), at });
  return cycleId;
}

async function call(route: Route, userId: number | null, url: string, body?: unknown, id?: number) {
  const req = await requestAs(userId, url, { method: body === undefined ? "GET" : "POST", body, origin: ORIGIN });
  const res = await route(req, params({ id: String(id ?? 0) }) as never);
  return { status: res.status, body: (await res.json()) as Record<string, unknown> & { error?: { message: string; fields?: Record<string, string[]> } } };
}

const post = (route: Route, url: string, body: unknown, id?: number, userId = tech()) => call(route, userId, url, body, id);

async function openOn(machineCode: string, programCode = "A0-3000"): Promise<BatchView> {
  const res = await post(openRoute, "/api/stations/washing/batches", {
    machineId: seed.machines![machineCode],
    programId: seed.programs![`${machineCode}/${programCode}`],
  });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body.batch as BatchView;
}

const scan = (batchId: number, code: string) => post(scanRoute, `/api/stations/washing/batches/${batchId}/scan`, { code }, batchId);
const start = (batchId: number) => post(startRoute, `/api/stations/washing/batches/${batchId}/start`, {}, batchId);
const close = (batchId: number, record: unknown, clientEventId = randomUUID()) =>
  post(closeRoute, `/api/stations/washing/batches/${batchId}/close`, { record, clientEventId }, batchId);

/** A record with a constant disinfection hold, as the washer would export it. */
function csvRecord(holdTempC: number, holdSeconds: number, rampSeconds = 0): string {
  return recordToCsv(synthWasherRecord({ holdTempC, holdSeconds, rampSeconds, dryingSeconds: 300, stepSeconds: 10 }), {
    startedAt: new Date().toISOString(),
    decimals: 3,
  });
}

async function eventsOf(cycleId: number) {
  return t.db.selectFrom("scan_events").selectAll().where("cycle_id", "=", cycleId).orderBy("id").execute();
}

/** Closes any open batch of the washer, so each test starts from a free washer. */
async function freeWasher(code: string) {
  const open = await t.db
    .selectFrom("washer_batches")
    .select(["id", "status"])
    .where("machine_id", "=", seed.machines![code]!)
    .where("status", "in", ["loading", "running"])
    .execute();
  for (const b of open) {
    if (b.status === "loading") {
      await t.db.deleteFrom("washer_batch_items").where("batch_id", "=", b.id).execute();
      await t.db.updateTable("washer_batches").set({ status: "aborted" }).where("id", "=", b.id).execute();
    } else {
      await post(abortRoute, `/api/stations/washing/batches/${b.id}/abort`, { reason: "test clean-up", clientEventId: randomUUID() }, b.id);
    }
  }
}

describe("the demo's machines and washer batches", () => {
  it("has the unit's machines with their programs", async () => {
    const machines = await t.db.selectFrom("machines").select(["kind", "code", "capacity_stu"]).orderBy("code").execute();
    const byKind = (kind: string) => machines.filter((m) => m.kind === kind).map((m) => m.code);
    expect(byKind("washer")).toEqual(["W1", "W2", "W3"]);
    expect(machines.filter((m) => m.kind === "steriliser").map((m) => m.capacity_stu)).toEqual([6, 8]);
    expect(byKind("heat_sealer")).toHaveLength(2);
    expect(byKind("drying_cabinet")).toHaveLength(1);
    expect(byKind("ultrasonic")).toHaveLength(1);
    const p134 = await t.db.selectFrom("programs").select("requirement").where("id", "=", seed.programs!["S1/P134"]!).executeTakeFirstOrThrow();
    expect(JSON.parse(p134.requirement)).toMatchObject({ kind: "steam", sterilisationTempC: 134, minHoldSeconds: 210, airRemoval: "prevacuum" });
  });

  it("puts every machine wash of the history in one batch, after its sets were ready and before they were recorded washed", async () => {
    const washes = await t.db
      .selectFrom("scan_events as e")
      .innerJoin("sets as s", "s.id", "e.set_id")
      .innerJoin("set_types as st", "st.id", "s.set_type_id")
      .select(["e.cycle_id", "e.event", "e.at", "st.processing_flags"])
      .where("e.event", "in", ["wash_passed", "wash_failed"])
      .execute();
    const machineWashes = washes.filter((w) => !parseFlags(w.processing_flags).includes("manual_wash_only"));
    expect(machineWashes.length).toBeGreaterThan(500);
    const items = await t.db
      .selectFrom("washer_batch_items as i")
      .innerJoin("washer_batches as b", "b.id", "i.batch_id")
      .select(["i.cycle_id", "b.status", "b.started_at", "b.ended_at", "b.closed_at", "b.machine_id", "b.id"])
      .execute();
    for (const w of machineWashes) {
      const status = w.event === "wash_passed" ? "passed" : "failed";
      const matches = items.filter((i) => i.cycle_id === w.cycle_id && i.status === status && i.ended_at! <= w.at && w.at <= i.closed_at!);
      expect(matches, `${w.event} of cycle ${w.cycle_id} at ${w.at}`).toHaveLength(1);
    }
    expect(items).toHaveLength(machineWashes.length);
    // No washer runs two batches at once.
    const overlaps = await t.db
      .selectFrom("washer_batches as a")
      .innerJoin("washer_batches as b", (j) => j.onRef("a.machine_id", "=", "b.machine_id").onRef("a.id", "<", "b.id"))
      .select("a.number")
      .whereRef("a.started_at", "<", "b.ended_at")
      .whereRef("b.started_at", "<", "a.ended_at")
      .execute();
    expect(overlaps).toEqual([]);
    const numbers = await t.db.selectFrom("washer_batches").select("number").execute();
    expect(numbers.every((n) => /^W[123]-\d{4}-\d{4}$/.test(n.number))).toBe(true);
  });

  it("keeps a failed batch whose sets went back to washing, with the reasons, and figures that match its stored record", async () => {
    const failed = await t.db.selectFrom("washer_batches").selectAll().where("status", "=", "failed").execute();
    expect(failed.length).toBeGreaterThan(0);
    for (const b of failed) {
      expect(JSON.parse(b.reasons!)[0]).toMatch(/^A0 \d+ is below the required 3000\.$/);
      const cycles = await t.db.selectFrom("washer_batch_items").select("cycle_id").where("batch_id", "=", b.id).execute();
      for (const c of cycles) {
        const events = await eventsOf(c.cycle_id);
        expect(events.some((e) => e.event === "wash_failed" && e.to_state === "reprocess")).toBe(true);
      }
    }
    const some = [...failed, ...(await t.db.selectFrom("washer_batches").selectAll().where("status", "=", "passed").limit(3).execute())];
    for (const b of some) {
      const file = await t.db.selectFrom("files").selectAll().where("id", "=", b.record_file_id!).executeTakeFirstOrThrow();
      const text = fs.readFileSync(path.join(serverEnv().uploadsDir, file.storage_key), "utf8");
      expect(createHash("sha256").update(text).digest("hex")).toBe(file.sha256);
      const program = await t.db.selectFrom("programs").select("requirement").where("id", "=", b.program_id).executeTakeFirstOrThrow();
      const check = checkWasherBatch(parseWasherRecord(text), JSON.parse(program.requirement));
      expect(check.passed).toBe(b.status === "passed");
      expect(JSON.parse(b.figures!).a0).toBeCloseTo(check.figures.a0, 6);
      expect(check.reasons).toEqual(JSON.parse(b.reasons!));
    }
  });
});

describe("a washer batch from opening to a passing record", () => {
  it("numbers the batch per washer and month, loads scanned sets, starts, and moves every set to washed with one event each", async () => {
    await freeWasher("W1");
    const sets = [take(), take()];
    const cycles = [await received(t.db, sets[0]!), await received(t.db, sets[1]!)];
    const batch = await openOn("W1");
    const prefix = batchNumberPrefix("W1", new Date(), "Europe/London");
    expect(batch.number.startsWith(`${prefix}-`)).toBe(true);
    const previous = await t.db.selectFrom("washer_batches").select("number").where("number", "like", `${prefix}-%`).where("id", "!=", batch.id).execute();
    const highest = Math.max(0, ...previous.map((p) => Number(p.number.slice(prefix.length + 1))));
    expect(batch.number).toBe(`${prefix}-${String(highest + 1).padStart(4, "0")}`);
    expect(batch).toMatchObject({ status: "loading", machine: { code: "W1" }, program: { code: "A0-3000" }, items: [] });

    const first = await scan(batch.id, sets[0]!.serial);
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ alreadyInBatch: false, scanned: { serial: sets[0]!.serial, cycleId: cycles[0] } });
    // The same scan again changes nothing.
    const again = await scan(batch.id, sets[0]!.serial);
    expect(again.body).toMatchObject({ alreadyInBatch: true });
    const second = await scan(batch.id, sets[1]!.serial);
    expect((second.body.batch as BatchView).items.map((i) => i.serial).sort()).toEqual([sets[0]!.serial, sets[1]!.serial].sort());

    const started = await start(batch.id);
    expect(started.status).toBe(200);
    expect(started.body.batch).toMatchObject({ status: "running", startedBy: "Sol Brackenbury" });
    // Loading is over: no more sets in or out.
    const late = await scan(batch.id, take().serial);
    expect(late.status).toBe(409);
    expect(late.body.error!.message).toMatch(/already running/);
    const out = await post(removeRoute, `/api/stations/washing/batches/${batch.id}/remove`, { cycleId: cycles[0] }, batch.id);
    expect(out.status).toBe(409);

    // 90 °C held 300 s gives A0 3000 (CHECKS.md, computed); the program needs at least 3000.
    const closed = await close(batch.id, { kind: "csv", fileName: "W1-export.csv", text: csvRecord(90, 300) });
    expect(closed.status, JSON.stringify(closed.body)).toBe(200);
    const view = closed.body.batch as BatchView;
    expect(view.status).toBe("passed");
    expect(view.reasons).toEqual([]);
    expect(Math.abs(view.figures!.a0 - 3000) / 3000).toBeLessThan(1e-6);
    expect(view.figures!.requirement).toEqual({ kind: "a0", minA0: 3000 });
    expect(view.record!.name).toBe("W1-export.csv");
    expect(view.items.map((i) => i.state)).toEqual(["washed", "washed"]);

    for (const cycleId of cycles) {
      const events = await eventsOf(cycleId);
      const washes = events.filter((e) => e.event === "wash_passed");
      expect(washes).toHaveLength(1);
      expect(washes[0]).toMatchObject({ batch_id: batch.id, station: "washing", from_state: "received", to_state: "washed", user_id: tech() });
      expect(JSON.parse(washes[0]!.details)).toMatchObject({ batch: batch.number, a0: 3000 });
    }
    const file = await t.db.selectFrom("files").selectAll().where("id", "=", view.record!.fileId).executeTakeFirstOrThrow();
    expect(file).toMatchObject({ purpose: "cycle_record", organisation_id: null, content_type: "text/csv" });
  });
});

describe("a failing record, an unreadable record and a second close", () => {
  it("refuses a record it cannot read with the line and column, and writes nothing", async () => {
    await freeWasher("W2");
    const set = take();
    const cycleId = await received(t.db, set);
    const batch = await openOn("W2");
    await scan(batch.id, set.serial);
    await start(batch.id);
    const before = await countRows(t.db, [...TABLES]);
    const bad = "t_s,temp_c,phase\n0,20,heating\n10,ninety,disinfection\n20,90,disinfection\n";
    const res = await close(batch.id, { kind: "csv", fileName: "bad.csv", text: bad });
    expect(res.status).toBe(422);
    expect(res.body.error!.message).toMatch(/nothing was saved/);
    expect(res.body.error!.fields!.record![0]).toMatch(/^Line 3, column 2 \(temp_c\): "ninety" is not a number/);
    // Typed values are placed by table row.
    const typed = await close(batch.id, {
      kind: "entered",
      rows: [
        { t: "0", tempC: "20", phase: "heating" },
        { t: "60", tempC: "9o", phase: "disinfection" },
        { t: "120", tempC: "90", phase: "drying" },
      ],
    });
    expect(typed.status).toBe(422);
    expect(typed.body.error!.fields!.record![0]).toMatch(/^Row 2, temperature \(°C\): /);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    expect((await t.db.selectFrom("washer_batches").select("status").where("id", "=", batch.id).executeTakeFirstOrThrow()).status).toBe("running");
    expect((await t.db.selectFrom("cycles").select("state").where("id", "=", cycleId).executeTakeFirstOrThrow()).state).toBe("received");
  });

  it("sends every set back to washing when the record is too cool, keeps the reasons, and refuses a second close", async () => {
    await freeWasher("W2");
    const sets = [take(), take()];
    const cycles = [await received(t.db, sets[0]!), await received(t.db, sets[1]!)];
    const batch = await openOn("W2");
    for (const s of sets) await scan(batch.id, s.serial);
    await start(batch.id);
    // 80 °C held 600 s gives A0 600 (CHECKS.md, computed): short of the 3000 the program requires.
    const requestId = randomUUID();
    const res = await close(batch.id, { kind: "csv", fileName: "cool.csv", text: csvRecord(80, 600) }, requestId);
    expect(res.status).toBe(200);
    const view = res.body.batch as BatchView;
    expect(view.status).toBe("failed");
    expect(view.reasons).toEqual(["A0 600 is below the required 3000."]);
    expect(view.items.map((i) => i.state)).toEqual(["reprocess", "reprocess"]);
    const stored = await t.db.selectFrom("washer_batches").select(["figures", "reasons", "closed_by"]).where("id", "=", batch.id).executeTakeFirstOrThrow();
    expect(JSON.parse(stored.reasons!)).toEqual(["A0 600 is below the required 3000."]);
    expect(Math.abs(JSON.parse(stored.figures!).a0 - 600) / 600).toBeLessThan(1e-6);
    expect(stored.closed_by).toBe(tech());
    for (const cycleId of cycles) {
      const failed = (await eventsOf(cycleId)).filter((e) => e.event === "wash_failed");
      expect(failed).toHaveLength(1);
      expect(failed[0]).toMatchObject({ batch_id: batch.id, station: "washing", from_state: "received", to_state: "reprocess" });
    }

    // The same request again answers the first result and records nothing; another close is a conflict.
    const before = await countRows(t.db, [...TABLES]);
    const repeat = await close(batch.id, { kind: "csv", fileName: "cool.csv", text: csvRecord(80, 600) }, requestId);
    expect(repeat.status).toBe(200);
    expect(repeat.body).toMatchObject({ duplicate: true, batch: { status: "failed" } });
    const second = await close(batch.id, { kind: "csv", fileName: "hot.csv", text: csvRecord(93, 300) });
    expect(second.status).toBe(409);
    expect(second.body.error!.message).toMatch(/already closed \(failed checks\)/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    // Back to washing: the sets go into the next batch and pass this time.
    const next = await openOn("W2");
    for (const s of sets) expect((await scan(next.id, s.serial)).status).toBe(200);
    await start(next.id);
    const passed = await close(next.id, { kind: "csv", fileName: "hot.csv", text: csvRecord(93, 300, 300) });
    expect((passed.body.batch as BatchView).items.map((i) => i.state)).toEqual(["washed", "washed"]);
    const again = (await eventsOf(cycles[0]!)).filter((e) => e.event === "wash_passed");
    expect(again[0]).toMatchObject({ from_state: "reprocess", to_state: "washed", batch_id: next.id });
  });

  it("questions a record whose clock says it ended before the batch was started", async () => {
    await freeWasher("W3");
    const set = take();
    await received(t.db, set);
    const batch = await openOn("W3");
    await scan(batch.id, set.serial);
    await start(batch.id);
    const record = recordToCsv(synthWasherRecord({ holdTempC: 93, holdSeconds: 300, rampSeconds: 300, dryingSeconds: 300, stepSeconds: 10 }), {
      startedAt: new Date(Date.now() - 3 * 3600_000).toISOString(),
    });
    const res = await close(batch.id, { kind: "csv", fileName: "old.csv", text: record });
    const view = res.body.batch as BatchView;
    expect(view.status).toBe("passed");
    expect(view.figures!.notes).toContain("The record ends before the batch was started at the station: check the washer's clock and that it is this batch's record.");
    // The end of the run is the record's own: its first timestamp plus its length.
    expect(Date.parse(view.endedAt!)).toBe(Date.parse(view.figures!.recordStartedAt!) + 900_000);
  });

  it("closes a time-and-temperature program with values typed in at the station", async () => {
    await freeWasher("W3");
    const set = take();
    await received(t.db, set);
    const batch = await openOn("W3", "CONT-90-5");
    await scan(batch.id, set.serial);
    await start(batch.id);
    // 91 °C from 120 s to 480 s: 360 s at or above 90 °C, more than the 300 s required.
    const rows = [
      { t: "0", tempC: "25", phase: "heating" as const },
      { t: "120", tempC: "91", phase: "disinfection" as const },
      { t: "300", tempC: "91,4", phase: "disinfection" as const },
      { t: "480", tempC: "84", phase: "drying" as const },
      { t: "600", tempC: "70", phase: "drying" as const },
    ];
    const res = await close(batch.id, { kind: "entered", rows });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const view = res.body.batch as BatchView;
    expect(view).toMatchObject({ status: "passed", figures: { holdSeconds: 360, minTempC: 91, maxTempC: 91.4 } });
    expect(view.figures!.notes).toContain("The values were typed in at the station from the washer's display or printout.");
  });
});

describe("what the washing station refuses", () => {
  it("refuses a set for manual washing only, a set not yet received, a set in another open batch, and a second batch on a washer", async () => {
    await freeWasher("W1");
    await freeWasher("W2");
    const manualOnly = take((s) => s.flags.includes("manual_wash_only"));
    await received(t.db, manualOnly);
    const booked = take();
    await received(t.db, booked, "booked");
    const batch = await openOn("W1");
    const before = await countRows(t.db, [...TABLES]);
    const refused = await scan(batch.id, manualOnly.serial);
    expect(refused.status).toBe(409);
    expect(refused.body.error!.message).toContain("manual washing only");

    const notReceived = await scan(batch.id, booked.serial);
    expect(notReceived.status).toBe(409);
    expect(notReceived.body.error!.message).toBe("Cannot record a wash for this set: it has not been received at the unit yet.");

    const noCycle = take();
    expect((await scan(batch.id, noCycle.serial)).body.error!.message).toMatch(/no open cycle/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    const shared = take();
    await received(t.db, shared);
    expect((await scan(batch.id, shared.serial)).status).toBe(200);
    const other = await openOn("W2");
    const twice = await scan(other.id, shared.serial);
    expect(twice.status).toBe(409);
    expect(twice.body.error!.message).toBe(`${shared.serial} is already in batch ${batch.number} on W1 (loading); a set goes in one batch at a time.`);

    // Taken out of the first batch while it is loading, it can go in the other one.
    const removed = await post(removeRoute, `/api/stations/washing/batches/${batch.id}/remove`, { cycleId: (await setCycle(shared.id)) }, batch.id);
    expect((removed.body.batch as BatchView).items).toEqual([]);
    expect((await scan(other.id, shared.serial)).status).toBe(200);

    // A washer has one open batch; an empty batch cannot start.
    const second = await post(openRoute, "/api/stations/washing/batches", { machineId: seed.machines!.W1, programId: seed.programs!["W1/A0-600"] });
    expect(second.status).toBe(409);
    expect(second.body.error!.message).toContain(`already has batch ${batch.number}`);
    const empty = await start(batch.id);
    expect(empty.status).toBe(409);
    expect(empty.body.error!.message).toMatch(/is empty/);
    // Another washer's program is not this washer's.
    const wrong = await post(openRoute, "/api/stations/washing/batches", { machineId: seed.machines!.W3, programId: seed.programs!["W1/A0-600"] });
    expect(wrong.status).toBe(422);
  });

  it("refuses a set that would overfill the washer's rack", async () => {
    await freeWasher("W1");
    const batch = await openOn("W1");
    // Fill W1 (6 StU) with 1 StU sets, then one more.
    const big = free.filter((s) => s.sizeStu === 1 && !s.flags.includes("manual_wash_only")).slice(0, 7);
    expect(big).toHaveLength(7);
    for (const s of big) {
      free.splice(free.indexOf(s), 1);
      await received(t.db, s);
    }
    for (const s of big.slice(0, 6)) expect((await scan(batch.id, s.serial)).status).toBe(200);
    const over = await scan(batch.id, big[6]!.serial);
    expect(over.status).toBe(409);
    expect(over.body.error!.message).toBe(
      `W1 holds 6 StU and batch ${batch.number} already has 6 StU; ${big[6]!.serial} needs 1 StU more. Start this batch and put the set in the next one.`,
    );
  });
});

async function setCycle(setId: number): Promise<number> {
  const row = await t.db.selectFrom("cycles").select("id").where("set_id", "=", setId).where("state", "not in", ["delivered", "cancelled"]).executeTakeFirstOrThrow();
  return row.id;
}

describe("a fault mid-cycle", () => {
  it("aborts a running batch with the reason: every set goes back to washing", async () => {
    await freeWasher("W3");
    const sets = [take(), take()];
    const cycles = [await received(t.db, sets[0]!), await received(t.db, sets[1]!)];
    const batch = await openOn("W3");
    for (const s of sets) await scan(batch.id, s.serial);
    const early = await post(abortRoute, `/api/stations/washing/batches/${batch.id}/abort`, { reason: "Door seal alarm", clientEventId: randomUUID() }, batch.id);
    expect(early.status).toBe(409);
    await start(batch.id);
    const noReason = await post(abortRoute, `/api/stations/washing/batches/${batch.id}/abort`, { reason: "", clientEventId: randomUUID() }, batch.id);
    expect(noReason.status).toBe(422);
    const res = await post(abortRoute, `/api/stations/washing/batches/${batch.id}/abort`, { reason: "Circulation pump fault F12", clientEventId: randomUUID() }, batch.id);
    expect(res.status).toBe(200);
    expect(res.body.batch).toMatchObject({ status: "aborted", reasons: ["Aborted: Circulation pump fault F12"] });
    for (const cycleId of cycles) {
      const failed = (await eventsOf(cycleId)).filter((e) => e.event === "wash_failed");
      expect(failed).toHaveLength(1);
      expect(failed[0]).toMatchObject({ batch_id: batch.id, to_state: "reprocess" });
      expect(JSON.parse(failed[0]!.details)).toMatchObject({ aborted: true, reason: "Circulation pump fault F12" });
    }
  });
});

describe("the manual-washing station", () => {
  it("asks for the steps the set type needs, refuses an incomplete checklist, and records the wash once", async () => {
    const set = take((s) => s.flags.includes("manual_wash_only") && s.flags.includes("dismantle"));
    const cycleId = await received(t.db, set);
    const scanned = await post(manualScanRoute, "/api/stations/manual-washing/scan", { code: set.serial });
    expect(scanned.status).toBe(200);
    const steps = (scanned.body.set as { steps: { step: string }[] }).steps.map((s) => s.step);
    expect(steps).toEqual(["dismantled", "brushed", "rinsed", ...(set.flags.includes("lumens_to_flush") ? ["lumensFlushed"] : [])]);

    const before = await countRows(t.db, [...TABLES]);
    const incomplete = await post(confirmRoute, "/api/stations/manual-washing/confirm", { cycleId, checks: { brushed: true, rinsed: true }, clientEventId: randomUUID() });
    expect(incomplete.status).toBe(422);
    expect(Object.keys(incomplete.body.error!.fields!)).toContain("checks.dismantled");
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    const checks = Object.fromEntries(steps.map((s) => [s, true]));
    const clientEventId = randomUUID();
    const done = await post(confirmRoute, "/api/stations/manual-washing/confirm", { cycleId, checks, clientEventId });
    expect(done.status).toBe(200);
    expect(done.body).toMatchObject({ serial: set.serial, stateLabel: "Washed and disinfected", duplicate: false });
    const repeat = await post(confirmRoute, "/api/stations/manual-washing/confirm", { cycleId, checks, clientEventId });
    expect(repeat.body).toMatchObject({ duplicate: true });
    const washes = (await eventsOf(cycleId)).filter((e) => e.event === "manual_wash");
    expect(washes).toHaveLength(1);
    expect(washes[0]).toMatchObject({ station: "manual_washing", from_state: "received", to_state: "washed", user_id: tech(), client_event_id: clientEventId });
    expect(JSON.parse(washes[0]!.details)).toEqual({ checklist: checks, operator: "Sol Brackenbury" });

    // Washed now: a second scan says why it cannot be washed again.
    const after = await post(manualScanRoute, "/api/stations/manual-washing/scan", { code: set.serial });
    expect(after.status).toBe(409);
    expect(after.body.error!.message).toBe("Cannot record a manual wash for this set: it has been washed but not packed yet.");
  });

  it("refuses a set that is loaded in a washer batch", async () => {
    await freeWasher("W1");
    const set = take();
    await received(t.db, set);
    const batch = await openOn("W1");
    await scan(batch.id, set.serial);
    const res = await post(manualScanRoute, "/api/stations/manual-washing/scan", { code: set.serial });
    expect(res.status).toBe(409);
    expect(res.body.error!.message).toContain(`in washer batch ${batch.number} on W1`);
  });
});

describe("the batch list, the batch and who may see them", () => {
  it("lists batches paged and filtered, and answers 404 for an unknown batch", async () => {
    const all = await call(listBatchesRoute, user("quality@larkmoor.example"), "/api/batches?pageSize=5&sort=created_at&dir=desc");
    expect(all.status).toBe(200);
    expect((all.body.rows as unknown[]).length).toBe(5);
    expect(all.body.total as number).toBeGreaterThan(100);
    const failed = await call(listBatchesRoute, user("quality@larkmoor.example"), "/api/batches?status=failed&pageSize=50");
    const rows = failed.body.rows as { status: string; number: string; a0: number | null }[];
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.every((r) => r.status === "failed")).toBe(true);
    const one = await call(batchRoute, user("quality@larkmoor.example"), "/api/batches/1", undefined, 1);
    expect(one.status).toBe(200);
    expect((await call(batchRoute, user("quality@larkmoor.example"), "/api/batches/999999", undefined, 999999)).status).toBe(404);
  });

  it("refuses clinic users (403), callers without a session (401) and posts from another site (403)", async () => {
    const clinic = user("manager@quillby.example");
    expect((await call(listBatchesRoute, clinic, "/api/batches")).status).toBe(403);
    expect((await call(machinesRoute, clinic, "/api/machines")).status).toBe(403);
    expect((await call(stationRoute, clinic, "/api/stations/washing")).status).toBe(403);
    expect((await post(manualScanRoute, "/api/stations/manual-washing/scan", { code: "QMH-000001" }, undefined, clinic)).status).toBe(403);
    expect((await call(stationRoute, null, "/api/stations/washing")).status).toBe(401);
    // The dispatcher may look at the machines but not work a station.
    expect((await call(machinesRoute, user("dispatch@larkmoor.example"), "/api/machines")).status).toBe(200);
    expect((await post(openRoute, "/api/stations/washing/batches", { machineId: 1, programId: 1 }, undefined, user("dispatch@larkmoor.example"))).status).toBe(403);
    const req = await requestAs(tech(), "/api/stations/washing/batches", { method: "POST", body: { machineId: 1, programId: 1 }, origin: "https://elsewhere.example" });
    expect((await openRoute(req, params({}) as never)).status).toBe(403);
    const station = await call(stationRoute, tech(), "/api/stations/washing");
    expect((station.body.washers as { code: string }[]).map((w) => w.code)).toEqual(["W1", "W2", "W3"]);
    expect(used).toBeGreaterThan(0);
  });
});
