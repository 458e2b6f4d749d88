import type { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as loadScanRoute } from "@/app/api/stations/sterilising/loads/[id]/scan/route";
import { POST as loadStartRoute } from "@/app/api/stations/sterilising/loads/[id]/start/route";
import { POST as openLoadRoute } from "@/app/api/stations/sterilising/loads/route";
import { POST as batchScanRoute } from "@/app/api/stations/washing/batches/[id]/scan/route";
import { POST as batchStartRoute } from "@/app/api/stations/washing/batches/[id]/start/route";
import { POST as openBatchRoute } from "@/app/api/stations/washing/batches/route";
import { POST as machineTestRoute } from "@/app/api/sterilisers/tests/route";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import { parseFlags } from "@/lib/catalogue/set-types";
import { toLocalDateTimeText } from "@/lib/local-time";
import { getMachine, listMachines, updateMachine } from "@/lib/machines/service";
import { clearFault, recordEntry } from "@/lib/monitoring/service";
import type { LoadView } from "@/lib/sterilising/loads";
import type { BatchView } from "@/lib/washing/service";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { type FreeSet, freeSteamSets, makeSteriliser, packedCycle } from "../support/loads";
import { params, requestAs, sessionUser } from "../support/session";

// A machine with an open fault in the monitoring log takes no new run: opening a steriliser load
// or a washer batch on it is refused with the machine's code and what to do, and so is starting
// a run that was opened before the fault was recorded. Each refusal writes nothing; once the
// quality lead clears the fault, the same request goes through.

const ZONE = "Europe/London";
const ORIGIN = "http://localhost:3000";
const LOAD_TABLES = ["steriliser_loads", "load_items", "scan_events", "cycles", "audit_log"] as const;
const BATCH_TABLES = ["washer_batches", "washer_batch_items", "scan_events", "cycles", "audit_log"] as const;

type Route = (req: NextRequest, ctx: never) => Promise<Response>;

let t: DemoDatabase;
let seed: SeedResult;
let tech: SessionUser;
let quality: SessionUser;
let free: FreeSet[] = [];
let washable: FreeSet[] = [];

async function post(route: Route, url: string, body: unknown, id = 0) {
  const req = await requestAs(tech.id, url, { method: "POST", body, origin: ORIGIN });
  const res = await route(req, params({ id: String(id) }) as never);
  return { status: res.status, body: (await res.json()) as Record<string, unknown> & { error?: { code: string; message: string } } };
}

/** Records a fault on the machine, dated a few minutes ago, as a technician does in the log. */
async function recordFault(machineId: number): Promise<number> {
  const at = toLocalDateTimeText(new Date(Date.now() - 10 * 60_000), ZONE);
  const { id } = await recordEntry(t.db, tech, { kind: "fault", machineId, at, notes: "Door seal leaking at the hinge side." }, ZONE);
  return id;
}

const clear = (faultId: number) => clearFault(t.db, quality, { id: faultId, note: "Door seal replaced; test cycle passed." });

/** A steriliser of this file's own with a 134 °C program and today's passed air-removal test. */
async function steriliser(code: string) {
  const m = await makeSteriliser(t.db, code, 6);
  const test = await post(machineTestRoute, "/api/sterilisers/tests", { machineId: m.machineId, kind: "air_removal", result: "pass" });
  expect(test.status, JSON.stringify(test.body)).toBe(200);
  return m;
}

/** A washer of this file's own with the demo W1's A0 3000 program. */
async function washer(code: string): Promise<{ machineId: number; programId: number }> {
  const source = await t.db.selectFrom("programs").select("requirement").where("id", "=", seed.programs!["W1/A0-3000"]!).executeTakeFirstOrThrow();
  const iso = new Date().toISOString();
  const { id: machineId } = await t.db
    .insertInto("machines")
    .values({ kind: "washer", code, name: `Test washer ${code}`, capacity_stu: 10, created_at: iso, updated_at: iso })
    .returning("id")
    .executeTakeFirstOrThrow();
  const { id: programId } = await t.db
    .insertInto("programs")
    .values({ machine_id: machineId, code: "A0-3000", name: "A0 3000", requirement: source.requirement })
    .returning("id")
    .executeTakeFirstOrThrow();
  return { machineId, programId };
}

/** Opens a cycle for a free set and receives it, so it waits to be washed. */
async function receivedSet(): Promise<FreeSet> {
  const set = washable.shift();
  if (!set) throw new Error("No free demo set left for this test.");
  await packedCycle(t.db, set.id, tech.id, "received", new Date(Date.now() - 3600_000));
  return set;
}

beforeAll(async () => {
  process.env.UNIT_TIME_ZONE = ZONE;
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  tech = await sessionUser(t.db, seed.users["tech@larkmoor.example"]!);
  quality = await sessionUser(t.db, seed.users["quality@larkmoor.example"]!);
  const sets = (await freeSteamSets(t.db)).filter((s) => s.sizeStu <= 1);
  const types = await t.db.selectFrom("set_types").select(["id", "processing_flags"]).execute();
  const manualOnly = new Set(types.filter((ty) => parseFlags(ty.processing_flags).includes("manual_wash_only")).map((ty) => ty.id));
  // Half the free sets for the steriliser's tests, the others (machine-washable) for the washer's.
  free = sets.filter((_, i) => i % 2 === 0);
  washable = sets.filter((s, i) => i % 2 === 1 && !manualOnly.has(s.setTypeId));
});
afterAll(() => t.cleanup());

describe("a steriliser with an open fault", () => {
  it("refuses a new load with the machine and what to do, writes nothing, and opens one once the fault is cleared", async () => {
    const m = await steriliser("TU1");
    const faultId = await recordFault(m.machineId);
    const before = await countRows(t.db, [...LOAD_TABLES]);
    const refused = await post(openLoadRoute, "/api/stations/sterilising/loads", m);
    expect(refused.status).toBe(409);
    expect(refused.body.error?.code).toBe("conflict");
    expect(refused.body.error?.message).toMatch(/^TU1 is out of use with a fault recorded .+; choose another steriliser until the fault is cleared in the monitoring log\.$/);
    expect(await countRows(t.db, [...LOAD_TABLES])).toEqual(before);
    expect(await t.db.selectFrom("steriliser_loads").select("id").where("machine_id", "=", m.machineId).execute()).toEqual([]);

    await clear(faultId);
    const opened = await post(openLoadRoute, "/api/stations/sterilising/loads", m);
    expect(opened.status, JSON.stringify(opened.body)).toBe(200);
    expect((opened.body.load as LoadView).status).toBe("loading");
  });

  it("refuses to start a load opened before the fault was recorded, and starts it once the fault is cleared", async () => {
    const m = await steriliser("TU2");
    const opened = await post(openLoadRoute, "/api/stations/sterilising/loads", m);
    expect(opened.status, JSON.stringify(opened.body)).toBe(200);
    const load = opened.body.load as LoadView;
    const set = free.shift()!;
    await packedCycle(t.db, set.id, tech.id);
    expect((await post(loadScanRoute, `/api/stations/sterilising/loads/${load.id}/scan`, { code: set.serial }, load.id)).status).toBe(200);

    const faultId = await recordFault(m.machineId);
    const before = await countRows(t.db, [...LOAD_TABLES]);
    const refused = await post(loadStartRoute, `/api/stations/sterilising/loads/${load.id}/start`, {}, load.id);
    expect(refused.status).toBe(409);
    expect(refused.body.error?.message).toMatch(new RegExp(`^TU2 is out of use with a fault recorded .+; load ${load.number} cannot be started until the fault is cleared in the monitoring log\\.`));
    expect(await countRows(t.db, [...LOAD_TABLES])).toEqual(before);
    const row = await t.db.selectFrom("steriliser_loads").select(["status", "started_at"]).where("id", "=", load.id).executeTakeFirstOrThrow();
    expect(row).toEqual({ status: "loading", started_at: null });

    await clear(faultId);
    const started = await post(loadStartRoute, `/api/stations/sterilising/loads/${load.id}/start`, {}, load.id);
    expect(started.status, JSON.stringify(started.body)).toBe(200);
    expect((started.body.load as LoadView).status).toBe("running");
  });

  it("refuses a load on a steriliser switched off while its load was being filled", async () => {
    const m = await steriliser("TU3");
    const opened = await post(openLoadRoute, "/api/stations/sterilising/loads", m);
    const load = opened.body.load as LoadView;
    const set = free.shift()!;
    await packedCycle(t.db, set.id, tech.id);
    expect((await post(loadScanRoute, `/api/stations/sterilising/loads/${load.id}/scan`, { code: set.serial }, load.id)).status).toBe(200);
    await t.db.updateTable("machines").set({ active: 0 }).where("id", "=", m.machineId).execute();
    const refused = await post(loadStartRoute, `/api/stations/sterilising/loads/${load.id}/start`, {}, load.id);
    expect(refused.status).toBe(409);
    expect(refused.body.error?.message).toMatch(new RegExp(`^TU3 is switched off, so load ${load.number} cannot be started`));
    const again = await post(openLoadRoute, "/api/stations/sterilising/loads", m);
    expect(again.status).toBe(409);
    expect(again.body.error?.message).toBe("TU3 is switched off; choose another steriliser.");
  });
});

describe("switching a steriliser off", () => {
  it("is refused while a load is open on it, names the load, and writes nothing; the machine shows its open load", async () => {
    const m = await steriliser("TU4");
    const opened = await post(openLoadRoute, "/api/stations/sterilising/loads", m);
    const load = opened.body.load as LoadView;
    const detail = await getMachine(t.db, m.machineId);
    expect(detail.openRun).toEqual({ kind: "load", id: load.id, number: load.number, status: "loading" });
    expect((await listMachines(t.db, { kind: "steriliser" })).find((x) => x.id === m.machineId)?.openRun?.number).toBe(load.number);
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    const before = await countRows(t.db, ["machines", "audit_log"]);
    const fields = { kind: "steriliser" as const, code: "TU4", name: detail.name, serialNumber: null, capacityStu: detail.capacityStu, active: false, chamberWidthMm: null, chamberHeightMm: null, chamberDepthMm: null };
    await expect(updateMachine(t.db, admin, { ...fields, id: m.machineId })).rejects.toThrow(
      `Load ${load.number} is loading on TU4: finish or abort it before switching the steriliser off or changing its code.`,
    );
    expect(await countRows(t.db, ["machines", "audit_log"])).toEqual(before);
    expect((await getMachine(t.db, m.machineId)).active).toBe(true);
  });
});

describe("a washer with an open fault", () => {
  it("still refuses a new batch with the same message, writing nothing, and opens one once the fault is cleared", async () => {
    const w = await washer("WU1");
    const faultId = await recordFault(w.machineId);
    const before = await countRows(t.db, [...BATCH_TABLES]);
    const refused = await post(openBatchRoute, "/api/stations/washing/batches", w);
    expect(refused.status).toBe(409);
    expect(refused.body.error?.message).toMatch(/^WU1 is out of use with a fault recorded .+; choose another washer until the fault is cleared in the monitoring log\.$/);
    expect(await countRows(t.db, [...BATCH_TABLES])).toEqual(before);

    await clear(faultId);
    const opened = await post(openBatchRoute, "/api/stations/washing/batches", w);
    expect(opened.status, JSON.stringify(opened.body)).toBe(200);
    expect((opened.body.batch as BatchView).status).toBe("loading");
  });

  it("refuses to start a batch opened before the fault was recorded, and starts it once the fault is cleared", async () => {
    const w = await washer("WU2");
    const opened = await post(openBatchRoute, "/api/stations/washing/batches", w);
    expect(opened.status, JSON.stringify(opened.body)).toBe(200);
    const batch = opened.body.batch as BatchView;
    const set = await receivedSet();
    const scanned = await post(batchScanRoute, `/api/stations/washing/batches/${batch.id}/scan`, { code: set.serial }, batch.id);
    expect(scanned.status, JSON.stringify(scanned.body)).toBe(200);

    const faultId = await recordFault(w.machineId);
    const before = await countRows(t.db, [...BATCH_TABLES]);
    const refused = await post(batchStartRoute, `/api/stations/washing/batches/${batch.id}/start`, {}, batch.id);
    expect(refused.status).toBe(409);
    expect(refused.body.error?.message).toMatch(new RegExp(`^WU2 is out of use with a fault recorded .+; batch ${batch.number} cannot be started until the fault is cleared in the monitoring log\\.`));
    expect(await countRows(t.db, [...BATCH_TABLES])).toEqual(before);
    expect((await t.db.selectFrom("washer_batches").select("status").where("id", "=", batch.id).executeTakeFirstOrThrow()).status).toBe("loading");

    await clear(faultId);
    const started = await post(batchStartRoute, `/api/stations/washing/batches/${batch.id}/start`, {}, batch.id);
    expect(started.status, JSON.stringify(started.body)).toBe(200);
    expect((started.body.batch as BatchView).status).toBe("running");
  });
});
