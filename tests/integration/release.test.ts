import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as releaseRoute } from "@/app/api/loads/[id]/release/route";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import { serverEnv } from "@/lib/env";
import { getSetLabel } from "@/lib/sets/label";
import { recordMachineTest, unitDayOf } from "@/lib/sterilising/machine-tests";
import { addToLoad, finishLoad, getLoadDetail, openLoad, recordBiResult, releaseLoad, startLoad } from "@/lib/sterilising/loads";
import { expiryDate } from "@/lib/sterilising/shelf-life";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { type FreeSet, freeSteamSets, makeSteriliser, packedCycle, steamCsv } from "../support/loads";
import { params, requestAs, sessionUser } from "../support/session";

// Release by the quality lead: refused without the day's passed air-removal test and for an
// implant load without its biological indicator (unless an early release is documented); a
// release moves every set with "release" and gives each its expiry date from the shelf-life
// rules, which the set's label then shows with the load number.

let t: DemoDatabase;
let seed: SeedResult;
let free: FreeSet[] = [];
let tech: SessionUser;
let quality: SessionUser;
const TABLES = ["steriliser_loads", "scan_events", "cycles", "audit_log"] as const;
let machineNo = 0;

function take(match: (s: FreeSet) => boolean): FreeSet {
  const index = free.findIndex(match);
  if (index < 0) throw new Error("No free demo set left for this test.");
  return free.splice(index, 1)[0]!;
}

/** A load of the given sets, finished with a passing record, on a steriliser of its own. */
async function finishedLoad(sets: FreeSet[], opts: { airTest?: boolean; bi?: "pending" | "pass" | "not_used"; startAt?: Date } = {}) {
  machineNo += 1;
  const m = await makeSteriliser(t.db, `TR${machineNo}`, 8);
  const at = opts.startAt ?? new Date();
  // A test is needed to start; a load "of yesterday" is started with yesterday's test only.
  await recordMachineTest(t.db, quality, { machineId: m.machineId, kind: "air_removal", result: "pass" }, at);
  const load = await openLoad(t.db, tech, m, at);
  for (const s of sets) {
    await packedCycle(t.db, s.id, tech.id);
    await addToLoad(t.db, tech, load.id, s.serial, at);
  }
  await startLoad(t.db, tech, load.id, at);
  if (opts.airTest === false) {
    // As if the day's test had never been recorded (a record entered on the wrong steriliser, withdrawn).
    await t.db.updateTable("steriliser_loads").set({ air_removal_test_id: null }).where("id", "=", load.id).execute();
    await t.db.deleteFrom("machine_tests").where("machine_id", "=", m.machineId).execute();
  }
  const { load: done } = await finishLoad(t.db, tech, load.id, { record: { fileName: "r.csv", text: steamCsv(240) }, ciType: 4, ciResult: "pass", biResult: opts.bi ?? "not_used", clientEventId: randomUUID() }, at);
  return done;
}

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  tech = await sessionUser(t.db, seed.users["tech@larkmoor.example"]!);
  quality = await sessionUser(t.db, seed.users["quality@larkmoor.example"]!);
  free = await freeSteamSets(t.db);
});
afterAll(() => t.cleanup());

describe("release refusals", () => {
  it("refuses release without the day's passed air-removal test, with a clear message, writing nothing", async () => {
    const load = await finishedLoad([take((s) => s.sizeStu <= 0.5)], { airTest: false });
    const before = await countRows(t.db, [...TABLES]);
    const req = await requestAs(quality.id, `/api/loads/${load.id}/release`, { method: "POST", body: {}, origin: "http://localhost:3000" });
    const res = await releaseRoute(req, params({ id: String(load.id) }));
    expect(res.status).toBe(409);
    const body = (await res.json()) as { error: { message: string } };
    expect(body.error.message).toContain(`no passed air-removal test on ${unitDayOf(new Date())}`);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    const detail = await getLoadDetail(t.db, load.id);
    expect(detail.assessment.checks.find((c) => c.key === "air_removal")!.status).toBe("missing");
  });

  it("does not let a technician release", async () => {
    const load = await finishedLoad([take((s) => s.sizeStu <= 0.5)]);
    const req = await requestAs(tech.id, `/api/loads/${load.id}/release`, { method: "POST", body: {}, origin: "http://localhost:3000" });
    expect((await releaseRoute(req, params({ id: String(load.id) }))).status).toBe(403);
  });

  it("holds an implant load until its biological indicator is read, unless an early release is documented", async () => {
    const implant = take((s) => s.sizeStu <= 0.5);
    await t.db.updateTable("set_types").set({ contains_implant: 1 }).where("id", "=", implant.setTypeId).execute();
    free = free.filter((f) => f.setTypeId !== implant.setTypeId);
    const load = await finishedLoad([implant], { bi: "pending" });
    await expect(releaseLoad(t.db, quality, load.id, {})).rejects.toThrow(/holds implants: wait for the biological indicator/);
    await expect(releaseLoad(t.db, quality, load.id, { earlyReleaseReason: "short" })).rejects.toThrow(/Document the early release/);
    const released = await releaseLoad(t.db, quality, load.id, { earlyReleaseReason: "Emergency theatre case needs the set before the 24 h read-out." });
    expect(released.status).toBe("released");
    expect(released.earlyRelease?.reason).toMatch(/Emergency/);
    expect(released.earlyRelease?.by).toBe(quality.name);

    const second = take((s) => s.sizeStu <= 0.5 && s.setTypeId !== implant.setTypeId);
    await t.db.updateTable("set_types").set({ contains_implant: 1 }).where("id", "=", second.setTypeId).execute();
    free = free.filter((f) => f.setTypeId !== second.setTypeId);
    const waited = await finishedLoad([second], { bi: "pending" });
    await recordBiResult(t.db, quality, waited.id, "pass");
    expect((await releaseLoad(t.db, quality, waited.id, {})).status).toBe("released");
  });
});

describe("expiry from the shelf-life rules", () => {
  it("gives each set its expiry by packaging and the site's storage (DIN 58953-8 guide values), shown on its label with the load", async () => {
    const tzName = serverEnv().UNIT_TIME_ZONE;
    const pouch = take((s) => s.packaging === "single_pouch");
    const container = take((s) => s.packaging === "rigid_container" && s.sizeStu <= 2);
    // The pouch's home site stores on open shelves: 48 h; the container: 5 years.
    const site = await t.db.selectFrom("sets").select("home_site_id").where("id", "=", pouch.id).executeTakeFirstOrThrow();
    await t.db.updateTable("sites").set({ sterile_storage: "unprotected" }).where("id", "=", site.home_site_id).execute();
    const load = await finishedLoad([pouch, container]);
    const released = await releaseLoad(t.db, quality, load.id, {});
    expect(released.status).toBe("released");
    const byId = Object.fromEntries(
      await Promise.all(
        [pouch, container].map(async (s) => {
          const c = await t.db.selectFrom("cycles").select(["state", "expires_on", "sterilised_at"]).where("set_id", "=", s.id).orderBy("id", "desc").executeTakeFirstOrThrow();
          return [s.serial, c] as const;
        }),
      ),
    );
    const sterilisedAt = new Date(byId[pouch.serial]!.sterilised_at!);
    expect(byId[pouch.serial]!.state).toBe("released");
    // DIN 58953-8: single sterile barrier, unprotected storage, ≤ 48 h.
    expect(byId[pouch.serial]!.expires_on).toBe(expiryDate(sterilisedAt, { amount: 48, unit: "hours" }, tzName));
    // DIN 58953-8: packaging system (container), up to 5 years.
    const fiveYears = expiryDate(new Date(byId[container.serial]!.sterilised_at!), { amount: 5, unit: "years" }, tzName);
    expect(byId[container.serial]!.expires_on).toBe(fiveYears);
    expect(Number(fiveYears.slice(0, 4)) - Number(unitDayOf(sterilisedAt).slice(0, 4))).toBe(5);

    const label = await getSetLabel(t.db, quality, container.id);
    expect(label.cycle?.load).toBe(load.number);
    const [y, mo, d] = fiveYears.split("-");
    expect(label.cycle?.useBy).toContain(String(Number(d)));
    expect(label.cycle?.useBy).toContain(y);
    expect(mo).toBeTruthy();
  });

  it("uses a rule the quality lead changed", async () => {
    await t.db.insertInto("shelf_life_rules").values({ packaging: "wrap", storage: "protected", amount: 6, unit: "months", updated_by: quality.id, updated_at: new Date().toISOString() }).execute();
    const wrapped = take((s) => s.packaging === "wrap" && s.sizeStu <= 0.5);
    const site = await t.db.selectFrom("sets").select("home_site_id").where("id", "=", wrapped.id).executeTakeFirstOrThrow();
    await t.db.updateTable("sites").set({ sterile_storage: "protected" }).where("id", "=", site.home_site_id).execute();
    const load = await finishedLoad([wrapped]);
    await releaseLoad(t.db, quality, load.id, {});
    const c = await t.db.selectFrom("cycles").select(["expires_on", "sterilised_at"]).where("set_id", "=", wrapped.id).orderBy("id", "desc").executeTakeFirstOrThrow();
    expect(c.expires_on).toBe(expiryDate(new Date(c.sterilised_at!), { amount: 6, unit: "months" }, serverEnv().UNIT_TIME_ZONE));
  });
});
