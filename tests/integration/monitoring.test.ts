import type { NextRequest } from "next/server";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { GET as recordPdfRoute } from "@/app/api/batches/[id]/record.pdf/route";
import { GET as loadPdfRoute } from "@/app/api/loads/[id]/record.pdf/route";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import { toLocalDateTimeText } from "@/lib/local-time";
import { clearFaultAction, recordEntryAction, saveSettingsAction } from "@/lib/monitoring/actions";
import { DEFAULT_SETTINGS } from "@/lib/monitoring/limits";
import { checkStatuses, listEntries, loadSettings, monitoringWarnings } from "@/lib/monitoring/service";
import { openBatch } from "@/lib/washing/service";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

// The monitoring and maintenance log on the seeded demo: the home warnings it seeds, recording
// entries through the server actions (with the limits applied and bad input refused with
// nothing written), faults taking a machine out of use, the quality lead's limits, who may do
// what, and the one-page cycle record PDF of a washer batch.

const session = vi.hoisted(() => ({ user: null as SessionUser | null }));
vi.mock("@/lib/auth/current-user", async (importOriginal) => ({
  ...(await importOriginal<typeof import("@/lib/auth/current-user")>()),
  getCurrentUser: async () => session.user,
}));

const ZONE = "Europe/London";
const SEEDED_AT = new Date("2026-12-01T08:00:00Z");
const TABLES = ["machine_log", "monitoring_settings", "audit_log"] as const;
type Route = (req: NextRequest, ctx: never) => Promise<Response>;

let t: DemoDatabase;
let seed: SeedResult;
const as = async (email: string) => {
  session.user = await sessionUser(t.db, seed.users[email]!);
};
/** A time a few minutes ago, as the form's datetime-local field gives it. */
const recently = () => toLocalDateTimeText(new Date(Date.now() - 10 * 60_000), ZONE);

beforeAll(async () => {
  process.env.UNIT_TIME_ZONE = ZONE;
  t = await useDemoDatabase(SEEDED_AT);
  seed = t.seed;
});
afterAll(() => t.cleanup());
beforeEach(() => as("quality@larkmoor.example"));

describe("the seeded log", () => {
  it("holds 90 days of entries of every kind", async () => {
    const kinds = await t.db.selectFrom("machine_log").select(["kind", (eb) => eb.fn.countAll<number>().as("n")]).groupBy("kind").execute();
    const byKind = Object.fromEntries(kinds.map((k) => [k.kind, Number(k.n)]));
    expect(byKind.seal_test).toBeGreaterThanOrEqual(180);
    expect(byKind.store_climate).toBe(90);
    expect(byKind.water_reading).toBe(90);
    expect(byKind.washer_cleaning).toBeGreaterThan(30);
    expect(byKind.service).toBe(2);
    expect(byKind.fault).toBe(1);
    expect(byKind.salt_refill).toBeGreaterThan(5);
  });

  it("warns on the home page about the recent conductivity reading and W3's overdue cleaning, and nothing else", async () => {
    const warnings = await monitoringWarnings(t.db, SEEDED_AT, ZONE);
    expect(warnings.openFaults).toEqual([]);
    expect(warnings.outOfRange.map((e) => e.findings)).toEqual([["Final-rinse water conductivity 38.5 µS/cm is above the upper limit of 30 µS/cm."]]);
    expect(warnings.overdue.map((c) => [c.check, c.machine?.code])).toEqual([["washer_cleaning", "W3"]]);
    expect(warnings.overdue[0]!.state).toMatchObject({ status: "overdue", dueOn: "2026-11-28", daysLate: 3 });
  });

  it("counts today's seal tests and store reading as done, and a failed seal test as not done", async () => {
    const statuses = await checkStatuses(t.db, SEEDED_AT, ZONE);
    const state = (check: string, code?: string) => statuses.find((s) => s.check === check && s.machine?.code === code)?.state.status;
    expect(state("seal_test", "HS1")).toBe("done");
    expect(state("seal_test", "HS2")).toBe("done");
    expect(state("store_climate")).toBe("done");
    expect(state("washer_cleaning", "W1")).toBe("done");
    // Fourteen days back HS2 failed at 07:20 and passed at 09:05: the check counts from the pass.
    const day = await listEntries(t.db, { kind: "seal_test", machine: seed.machines!.HS2!, from: "2026-11-17", to: "2026-11-17" }, ZONE);
    expect(day.map((e) => [e.summary, e.outOfRange])).toEqual([
      ["Passed", false],
      ["Failed", true],
    ]);
    expect((await checkStatuses(t.db, new Date("2026-11-17T08:00:00Z"), ZONE)).find((s) => s.check === "seal_test" && s.machine?.code === "HS2")?.state.status).toBe("due");
  });

  it("filters the log by the unit's local days", async () => {
    const oneDay = await listEntries(t.db, { kind: "store_climate", from: "2026-11-30", to: "2026-11-30" }, ZONE);
    expect(oneDay).toHaveLength(1);
    expect(oneDay[0]!.at).toBe("2026-11-30T08:00:00.000Z");
    const flagged = await listEntries(t.db, { flagged: "1" }, ZONE);
    expect(flagged.every((e) => e.outOfRange)).toBe(true);
  });
});

describe("recording entries", () => {
  it("records an out-of-range store humidity reading with its finding and an audit entry", async () => {
    const before = await countRows(t.db, ["machine_log", "audit_log"]);
    const result = await recordEntryAction({ kind: "store_climate", at: recently(), place: "Sterile store", temperatureC: "19,1", humidityPct: "68", notes: "" });
    expect(result).toEqual({
      ok: true,
      data: { id: expect.any(Number), outOfRange: true, findings: ["Sterile store relative humidity 68 % is above the upper limit of 60 %."] },
    });
    if (!result.ok) return;
    const row = await t.db.selectFrom("machine_log").selectAll().where("id", "=", result.data.id).executeTakeFirstOrThrow();
    expect(row).toMatchObject({ kind: "store_climate", temperature_c: 19.1, humidity_pct: 68, out_of_range: 1, recorded_by: seed.users["quality@larkmoor.example"] });
    expect(await countRows(t.db, ["machine_log", "audit_log"])).toEqual({ machine_log: before.machine_log! + 1, audit_log: before.audit_log! + 1 });
    const warnings = await monitoringWarnings(t.db, new Date(), ZONE);
    expect(warnings.outOfRange.some((e) => e.id === result.data.id)).toBe(true);
  });

  it("converts hardness typed in °dH to mmol/l before checking it", async () => {
    const result = await recordEntryAction({ kind: "water_reading", at: recently(), conductivityUsCm: "4.2", hardness: "5.6", hardnessUnit: "dh", notes: "" });
    expect(result.ok && result.data.findings).toEqual(["Hardness after softening 1 mmol/l is above the upper limit of 0.5 mmol/l."]);
  });

  it("refuses bad input with the fields to fix and writes nothing", async () => {
    const before = await countRows(t.db, [...TABLES]);
    const bad = await recordEntryAction({ kind: "store_climate", at: recently(), place: "", temperatureC: "warm", humidityPct: "140", notes: "" });
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(bad.error.code).toBe("validation");
    expect(Object.keys(bad.error.fields ?? {}).sort()).toEqual(["humidityPct", "place", "temperatureC"]);
    expect(bad.error.fields?.humidityPct).toEqual(["The relative humidity is from 0 to 100 %."]);

    const washerSeal = await recordEntryAction({ kind: "seal_test", machineId: seed.machines!.W1!, at: recently(), outcome: "pass", notes: "" });
    expect(washerSeal).toMatchObject({ ok: false, error: { code: "validation", fields: { machineId: ["Choose a heat sealer."] } } });

    const future = toLocalDateTimeText(new Date(Date.now() + 3 * 3600_000), ZONE);
    const later = await recordEntryAction({ kind: "seal_test", machineId: seed.machines!.HS1!, at: future, outcome: "pass", notes: "" });
    expect(later).toMatchObject({ ok: false, error: { code: "validation", fields: { at: ["Enter the time the check was done, not later than now."] } } });

    const nothing = await recordEntryAction({ kind: "water_reading", at: recently(), conductivityUsCm: "", hardness: "", notes: "" });
    expect(nothing).toMatchObject({ ok: false, error: { fields: { conductivityUsCm: ["Enter the conductivity, the hardness, or both."] } } });

    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("lets a technician record routine entries but not service visits, and no clinic user anything", async () => {
    await as("tech@larkmoor.example");
    expect((await recordEntryAction({ kind: "seal_test", machineId: seed.machines!.HS1!, at: recently(), outcome: "pass", notes: "" })).ok).toBe(true);
    const before = await countRows(t.db, [...TABLES]);
    const service = await recordEntryAction({ kind: "service", machineId: seed.machines!.W1!, at: recently(), provider: "Visiting engineer", reference: "", notes: "Pump replaced" });
    expect(service).toMatchObject({ ok: false, error: { code: "forbidden" } });
    await as("manager@quillby.example");
    expect(await recordEntryAction({ kind: "seal_test", machineId: seed.machines!.HS1!, at: recently(), outcome: "pass", notes: "" })).toMatchObject({
      ok: false,
      error: { code: "forbidden" },
    });
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });
});

describe("faults", () => {
  it("takes the machine out of use until the quality lead clears it", async () => {
    await as("tech@larkmoor.example");
    const fault = await recordEntryAction({ kind: "fault", machineId: seed.machines!.W1!, at: recently(), notes: "Spray arm does not turn." });
    expect(fault.ok).toBe(true);
    if (!fault.ok) return;
    const now = new Date();
    let warnings = await monitoringWarnings(t.db, now, ZONE);
    expect(warnings.openFaults.map((f) => f.machine?.code)).toEqual(["W1"]);
    // No batch opens on it, and it owes no routine checks.
    const tech = await sessionUser(t.db, seed.users["tech@larkmoor.example"]!);
    await expect(openBatch(t.db, tech, { machineId: seed.machines!.W1!, programId: seed.programs!["W1/A0-3000"]! })).rejects.toThrow(/W1 is out of use/);
    expect((await checkStatuses(t.db, now, ZONE)).some((s) => s.machine?.code === "W1")).toBe(false);

    const again = await recordEntryAction({ kind: "fault", machineId: seed.machines!.W1!, at: recently(), notes: "Still broken." });
    expect(again).toMatchObject({ ok: false, error: { code: "conflict" } });
    expect(await clearFaultAction({ id: fault.data.id, note: "Repaired." })).toMatchObject({ ok: false, error: { code: "forbidden" } });

    await as("quality@larkmoor.example");
    expect(await clearFaultAction({ id: fault.data.id, note: "" })).toMatchObject({ ok: false, error: { code: "validation" } });
    expect(await clearFaultAction({ id: fault.data.id, note: "Spray arm bearing replaced; test cycle passed." })).toEqual({ ok: true, data: { id: fault.data.id } });
    expect(await clearFaultAction({ id: fault.data.id, note: "Twice." })).toMatchObject({ ok: false, error: { code: "conflict" } });
    warnings = await monitoringWarnings(t.db, new Date(), ZONE);
    expect(warnings.openFaults).toEqual([]);
  });
});

describe("limits and intervals", () => {
  it("lets the quality lead change them, and checks later entries against the new limits", async () => {
    const settings = {
      limits: {
        store_temperature: { low: "18", high: "24" },
        store_humidity: { low: "40", high: "70" },
        rinse_conductivity: { low: "", high: "30" },
        softened_hardness: { low: "", high: "0.5" },
      },
      intervals: { seal_test: "1", store_climate: "1", washer_cleaning: "14", water_reading: "1" },
    };
    expect(await saveSettingsAction(settings)).toEqual({ ok: true, data: { saved: true } });
    const loaded = await loadSettings(t.db);
    expect(loaded.limits.store_humidity).toEqual({ low: 40, high: 70 });
    expect(loaded.limits.rinse_conductivity).toEqual({ low: null, high: 30 });
    expect(loaded.intervals.washer_cleaning).toBe(14);
    // W3 was cleaned ten days before the seed: with a 14-day interval it is no longer overdue.
    expect((await monitoringWarnings(t.db, SEEDED_AT, ZONE)).overdue).toEqual([]);
    const reading = await recordEntryAction({ kind: "store_climate", at: recently(), place: "Sterile store", temperatureC: "22", humidityPct: "68", notes: "" });
    expect(reading.ok && reading.data.outOfRange).toBe(false);

    const before = await countRows(t.db, [...TABLES]);
    const crossed = await saveSettingsAction({ ...settings, limits: { ...settings.limits, store_humidity: { low: "65", high: "60" } } });
    expect(crossed).toMatchObject({ ok: false, error: { code: "validation", fields: { "limits.store_humidity.low": ["The lower limit is above the upper limit."] } } });
    const fractional = await saveSettingsAction({ ...settings, intervals: { ...settings.intervals, seal_test: "0.5" } });
    expect(fractional).toMatchObject({ ok: false, error: { code: "validation" } });
    await as("tech@larkmoor.example");
    expect(await saveSettingsAction(settings)).toMatchObject({ ok: false, error: { code: "forbidden" } });
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    await as("quality@larkmoor.example");
    const defaults = {
      limits: Object.fromEntries(Object.entries(DEFAULT_SETTINGS.limits).map(([k, r]) => [k, { low: r.low ?? "", high: r.high ?? "" }])),
      intervals: DEFAULT_SETTINGS.intervals,
    } as unknown as typeof settings;
    expect((await saveSettingsAction(defaults)).ok).toBe(true);
  });
});

describe("the cycle record PDF of a washer batch", () => {
  const get = async (email: string | null, id: string) =>
    (recordPdfRoute as Route)(await requestAs(email ? seed.users[email]! : null, `/api/batches/${id}/record.pdf`), params({ id }) as never);

  it("answers a one-page PDF of a sane size", async () => {
    const batch = await t.db.selectFrom("washer_batches").select("id").where("status", "=", "passed").orderBy("id").executeTakeFirstOrThrow();
    const res = await get("quality@larkmoor.example", String(batch.id));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="batch-[A-Z0-9-]+-record\.pdf"$/);
    const bytes = Buffer.from(await res.arrayBuffer());
    expect(bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(bytes.length).toBeGreaterThan(3_000);
    expect(bytes.length).toBeLessThan(400_000);
    const text = bytes.toString("latin1");
    expect(text).toMatch(/\/Type \/Pages\s*\/Count 1\b/);
  });

  it("draws a failed batch too, and answers 404 for no batch and 403 for clinic users", async () => {
    const failed = await t.db.selectFrom("washer_batches").select("id").where("status", "=", "failed").orderBy("id").executeTakeFirstOrThrow();
    expect((await get("tech@larkmoor.example", String(failed.id))).status).toBe(200);
    expect((await get("quality@larkmoor.example", "999999")).status).toBe(404);
    expect((await get("quality@larkmoor.example", "abc")).status).toBe(404);
    expect((await get("manager@quillby.example", String(failed.id))).status).toBe(403);
    expect((await get(null, String(failed.id))).status).toBe(401);
  });
});

describe("the cycle record PDF of a steriliser load", () => {
  const get = async (email: string, id: string) =>
    (loadPdfRoute as Route)(await requestAs(seed.users[email]!, `/api/loads/${id}/record.pdf`), params({ id }) as never);

  it("answers a one-page PDF for every finished load of the demo, 404 for none and 403 for clinic users", async () => {
    const loads = await t.db.selectFrom("steriliser_loads").select(["id", "status"]).where("status", "in", ["released", "failed", "awaiting_release"]).orderBy("id").execute();
    expect(loads.length).toBeGreaterThan(0);
    for (const load of [loads[0]!, loads[loads.length - 1]!]) {
      const res = await get("quality@larkmoor.example", String(load.id));
      expect(res.status).toBe(200);
      const bytes = Buffer.from(await res.arrayBuffer());
      expect(bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
      expect(bytes.toString("latin1")).toMatch(/\/Type \/Pages\s*\/Count 1\b/);
    }
    expect((await get("quality@larkmoor.example", "999999")).status).toBe(404);
    expect((await get("manager@quillby.example", String(loads[0]!.id))).status).toBe(403);
  });
});
