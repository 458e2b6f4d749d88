import { randomUUID } from "node:crypto";
import type { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as finishRoute } from "@/app/api/stations/sterilising/loads/[id]/finish/route";
import { POST as scanRoute } from "@/app/api/stations/sterilising/loads/[id]/scan/route";
import { POST as startRoute } from "@/app/api/stations/sterilising/loads/[id]/start/route";
import { POST as openRoute } from "@/app/api/stations/sterilising/loads/route";
import { POST as testRoute } from "@/app/api/sterilisers/tests/route";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import type { LoadView } from "@/lib/sterilising/loads";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { type FreeSet, freeSteamSets, makeSteriliser, packedCycle, steamCsv } from "../support/loads";
import { params, requestAs, sessionUser } from "../support/session";

// The sterilising station through its route handlers: the day's air-removal test before a start,
// the load list and its refusals (order, capacity, method), the record check with nothing saved
// on an unreadable file, and finishing, which moves every set with "sterilise".

let t: DemoDatabase;
let seed: SeedResult;
let free: FreeSet[] = [];
let tech: SessionUser;
const ORIGIN = "http://localhost:3000";
const LOAD_TABLES = ["steriliser_loads", "load_items", "scan_events", "cycles", "files", "audit_log"] as const;

type Route = (req: NextRequest, ctx: never) => Promise<Response>;

async function post(route: Route, url: string, body: unknown, id = 0, userId = tech.id) {
  const req = await requestAs(userId, url, { method: "POST", body, origin: ORIGIN });
  const res = await route(req, params({ id: String(id) }) as never);
  return { status: res.status, body: (await res.json()) as Record<string, unknown> & { error?: { message: string; fields?: Record<string, string[]> } } };
}

function take(match: (s: FreeSet) => boolean = (s) => s.sizeStu <= 0.5): FreeSet {
  const index = free.findIndex(match);
  if (index < 0) throw new Error("No free demo set left for this test.");
  return free.splice(index, 1)[0]!;
}

let steriliserNo = 0;
/** A fresh steriliser of the test's own, optionally with today's passed air-removal test. */
async function steriliser(capacityStu = 6, airTest: "pass" | "fail" | null = "pass") {
  steriliserNo += 1;
  const m = await makeSteriliser(t.db, `TL${steriliserNo}`, capacityStu);
  if (airTest) {
    const res = await post(testRoute, "/api/sterilisers/tests", { machineId: m.machineId, kind: "air_removal", result: airTest });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
  }
  return m;
}

async function openLoad(m: { machineId: number; programId: number }): Promise<LoadView> {
  const res = await post(openRoute, "/api/stations/sterilising/loads", m);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body.load as LoadView;
}

const scan = (loadId: number, code: string) => post(scanRoute, `/api/stations/sterilising/loads/${loadId}/scan`, { code }, loadId);
const start = (loadId: number) => post(startRoute, `/api/stations/sterilising/loads/${loadId}/start`, {}, loadId);
const finish = (loadId: number, text: string, extra: Record<string, unknown> = {}) =>
  post(finishRoute, `/api/stations/sterilising/loads/${loadId}/finish`, { record: { fileName: "load.csv", text }, ciType: 4, ciResult: "pass", biResult: "not_used", clientEventId: randomUUID(), ...extra }, loadId);

async function runningLoadWith(count = 1, capacity = 6) {
  const m = await steriliser(capacity);
  const load = await openLoad(m);
  const sets = Array.from({ length: count }, () => take());
  for (const s of sets) {
    await packedCycle(t.db, s.id, tech.id);
    const res = await scan(load.id, s.serial);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
  }
  expect((await start(load.id)).status).toBe(200);
  return { load, sets };
}

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  tech = await sessionUser(t.db, seed.users["tech@larkmoor.example"]!);
  free = await freeSteamSets(t.db);
});
afterAll(() => t.cleanup());

describe("daily air-removal test and starting a load", () => {
  it("refuses to start a load without that day's passed air-removal test, and after a failed one", async () => {
    for (const air of [null, "fail"] as const) {
      const m = await steriliser(6, air);
      const load = await openLoad(m);
      const s = take();
      await packedCycle(t.db, s.id, tech.id);
      expect((await scan(load.id, s.serial)).status).toBe(200);
      const res = await start(load.id);
      expect(res.status).toBe(409);
      expect(res.body.error?.message).toMatch(air ? /air-removal test on \d{4}-\d{2}-\d{2} failed/ : /no air-removal \(Bowie-Dick type\) test recorded/);
      const row = await t.db.selectFrom("steriliser_loads").select("status").where("id", "=", load.id).executeTakeFirstOrThrow();
      expect(row.status).toBe("loading");
    }
  });

  it("judges a leak test against the limit of 0.13 kPa/min (1.3 mbar/min, EN 285 / HTM 2010 via secondary sources)", async () => {
    const m = await makeSteriliser(t.db, "TLK", 6);
    const ok = await post(testRoute, "/api/sterilisers/tests", { machineId: m.machineId, kind: "leak", leakRateKpaMin: 0.13 });
    expect(ok.status).toBe(200);
    expect((ok.body.test as { result: string; leakLimitKpaMin: number }).result).toBe("pass");
    const bad = await post(testRoute, "/api/sterilisers/tests", { machineId: m.machineId, kind: "leak", leakRateKpaMin: 0.2 });
    expect((bad.body.test as { result: string }).result).toBe("fail");
    const missing = await post(testRoute, "/api/sterilisers/tests", { machineId: m.machineId, kind: "leak" });
    expect(missing.status).toBe(422);
  });

  it("lets a technician record tests but not a clinic manager", async () => {
    const m = await makeSteriliser(t.db, "TLP", 6);
    const res = await post(testRoute, "/api/sterilisers/tests", { machineId: m.machineId, kind: "air_removal", result: "pass" }, 0, seed.users["manager@quillby.example"]!);
    expect(res.status).toBe(403);
  });
});

describe("loading", () => {
  it("refuses a set that is not packed yet, with the reason", async () => {
    const m = await steriliser();
    const load = await openLoad(m);
    const s = take();
    await packedCycle(t.db, s.id, tech.id, "washed");
    const res = await scan(load.id, s.serial);
    expect(res.status).toBe(409);
    expect(res.body.error?.message).toMatch(/washed but not packed/);
  });

  it("refuses a set over the chamber's StU with a clear error, writing nothing (EN 285: 1 StU = 300 × 300 × 600 mm)", async () => {
    const m = await steriliser(1);
    const load = await openLoad(m);
    const big = take((s) => s.sizeStu >= 0.5 && s.sizeStu <= 1);
    const next = take((s) => s.sizeStu >= 0.5 && s.sizeStu <= 1);
    await packedCycle(t.db, big.id, tech.id);
    await packedCycle(t.db, next.id, tech.id);
    expect((await scan(load.id, big.serial)).status).toBe(200);
    const before = await countRows(t.db, [...LOAD_TABLES]);
    const res = await scan(load.id, next.serial);
    expect(res.status).toBe(409);
    expect(res.body.error?.message).toMatch(new RegExp(`holds 1 StU and load ${load.number} already has ${big.sizeStu} StU`));
    expect(await countRows(t.db, [...LOAD_TABLES])).toEqual(before);
  });

  it("shows the lower-shelf hint for a heavy set (heavy sets below: common practice, 7 kg default)", async () => {
    const m = await steriliser(8);
    const load = await openLoad(m);
    const heavy = take((s) => s.weightG >= 7000 && s.sizeStu <= 2);
    await packedCycle(t.db, heavy.id, tech.id);
    const res = await scan(load.id, heavy.serial);
    expect(res.status).toBe(200);
    const scanned = res.body.scanned as { shelf: string; placement: string };
    expect(scanned.shelf).toBe("lower");
    expect(scanned.placement).toMatch(/lower shelf/);
  });

  it("freezes the load list at start", async () => {
    const { load } = await runningLoadWith(1);
    const s = take();
    await packedCycle(t.db, s.id, tech.id);
    const res = await scan(load.id, s.serial);
    expect(res.status).toBe(409);
    expect(res.body.error?.message).toMatch(/frozen/);
  });
});

describe("finishing with the record", () => {
  it("moves every set with sterilise and awaits release", async () => {
    const { load, sets } = await runningLoadWith(2);
    const res = await finish(load.id, steamCsv(240));
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const view = res.body.load as LoadView;
    expect(view.status).toBe("awaiting_release");
    expect(view.recordPassed).toBe(true);
    expect(view.figures!.holdSeconds).toBeGreaterThanOrEqual(180);
    for (const s of sets) {
      const cycle = await t.db.selectFrom("cycles").select(["id", "state"]).where("set_id", "=", s.id).where("state", "not in", ["delivered", "cancelled"]).executeTakeFirstOrThrow();
      expect(cycle.state).toBe("sterilised");
      const event = await t.db.selectFrom("scan_events").select(["event", "load_id", "station"]).where("cycle_id", "=", cycle.id).orderBy("id", "desc").executeTakeFirstOrThrow();
      expect(event).toEqual({ event: "sterilise", load_id: load.id, station: "sterilising" });
    }
  });

  it("reads pressure given in bar or in kPa gauge by the header, converting it to absolute", async () => {
    for (const pressure of [{ unit: "bar", reference: "absolute" }, { unit: "kPa", reference: "gauge" }] as const) {
      const { load } = await runningLoadWith(1);
      const res = await finish(load.id, steamCsv(240, { pressure }));
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      const view = res.body.load as LoadView;
      // Saturated steam at the measured pressure: within the 2 K tolerance of the program.
      expect(Math.abs(view.figures!.saturation!.deviationK)).toBeLessThan(0.1);
      expect(view.recordPassed).toBe(true);
    }
  });

  it("refuses an unreadable record with the place to fix and saves nothing", async () => {
    const { load } = await runningLoadWith(1);
    const good = steamCsv(240).split("\n");
    const header = good[0]!;
    const cases: [string, RegExp][] = [
      ["", /empty|Upload/i],
      [["timestamp,temp_c", ...good.slice(1, 5).map((l) => l.split(",").slice(0, 2).join(","))].join("\n"), /pressure/i],
      [[header, good[3], good[2], ...good.slice(4)].join("\n"), /order|earlier|sort/i],
      [[header, good[1], good[1], ...good.slice(2)].join("\n"), /repeats|duplicate/i],
      [[header.replace("pressure_kpa_abs", "pressure_furlongs"), ...good.slice(1)].join("\n"), /unit|pressure/i],
    ];
    for (const [text, message] of cases) {
      const before = await countRows(t.db, [...LOAD_TABLES]);
      const res = await finish(load.id, text);
      expect([400, 409, 422]).toContain(res.status);
      const all = [res.body.error?.message ?? "", ...(res.body.error?.fields?.record ?? []), ...(res.body.error?.fields?.["record.text"] ?? [])].join(" ");
      expect(all, text.slice(0, 80)).toMatch(message);
      expect(await countRows(t.db, [...LOAD_TABLES])).toEqual(before);
    }
    const row = await t.db.selectFrom("steriliser_loads").select(["status", "record_file_id"]).where("id", "=", load.id).executeTakeFirstOrThrow();
    expect(row).toEqual({ status: "running", record_file_id: null });
  });

  it("requires a biological indicator in a load with implants", async () => {
    const s = take();
    await t.db.updateTable("set_types").set({ contains_implant: 1 }).where("id", "=", s.setTypeId).execute();
    free = free.filter((f) => f.setTypeId !== s.setTypeId);
    const m = await steriliser();
    const load = await openLoad(m);
    await packedCycle(t.db, s.id, tech.id);
    expect((await scan(load.id, s.serial)).status).toBe(200);
    expect((await start(load.id)).status).toBe(200);
    const before = await countRows(t.db, [...LOAD_TABLES]);
    const res = await finish(load.id, steamCsv(240), { biResult: "not_used" });
    expect(res.status).toBe(422);
    expect(res.body.error?.message).toMatch(/implants/);
    expect(await countRows(t.db, [...LOAD_TABLES])).toEqual(before);
    const ok = await finish(load.id, steamCsv(240), { biResult: "pending", biLot: "GS-2026-11" });
    expect(ok.status).toBe(200);
    expect((ok.body.load as LoadView).containsImplant).toBe(true);
  });
});
