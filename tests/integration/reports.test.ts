import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as clinicOnTimeRoute } from "@/app/api/reports/clinic/on-time/route";
import { GET as clinicRevenueRoute } from "@/app/api/reports/clinic/revenue/route";
import { GET as unitOnTimeRoute } from "@/app/api/reports/on-time/route";
import { GET as unitReceivablesRoute } from "@/app/api/reports/receivables/route";
import { GET as unitVolumesRoute } from "@/app/api/reports/volumes/route";
import type { SeedResult } from "@/db/seed/demo";
import { previewRun } from "@/lib/billing/run";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { onTimeVerdicts, resolveFilters, reportQuerySchema } from "@/lib/reports/service";
import type { Report } from "@/lib/reports/types";
import { addCustomer, type TestCustomer } from "../unit/billing/db-fixtures";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

// The reports against the demo database: the on-time figure, the invoice's turnaround credit and
// the customer's own view agree cycle for cycle; month and week boundaries in the unit's time
// zone; the tenant scope; the CSV is the table.

let t: DemoDatabase;
let seed: SeedResult;
let brack: TestCustomer;
let brackManager: number;
const NOW = new Date("2026-12-01T10:00:00Z");
const iso = "2026-01-01T00:00:00.000Z";
let serial = 0;

interface Answer {
  report: Report;
}

/** One cycle with each step at the time given (only the steps given are taken). */
async function cycleAt(customer: TestCustomer, times: { received: string; released: string; delivered?: string; level?: "standard" | "express" }) {
  serial += 1;
  const code = `R${String(serial).padStart(5, "0")}`;
  const { id: setId } = await t.db
    .insertInto("sets")
    .values({ organisation_id: customer.organisationId, set_type_id: customer.setTypes.basic_tray!, home_site_id: customer.siteId, serial: code, giai: `952000001${code}`, status: "in_service", created_at: iso, updated_at: iso })
    .returning("id")
    .executeTakeFirstOrThrow();
  const received = Date.parse(times.received);
  const cycleId = await openCycle(t.db, {
    organisationId: customer.organisationId,
    siteId: customer.siteId,
    setId,
    orderId: null,
    serviceLevel: times.level ?? "standard",
    heavySoil: false,
    outOfHours: false,
    loaner: false,
    neededBackBy: null,
    promisedAt: null,
    userId: null,
    at: new Date(received - 3_600_000),
  });
  const released = Date.parse(times.released);
  const step = (released - received) / 4;
  const moves = [
    ["receive", "receiving", received],
    ["wash_passed", "washing", received + step],
    ["pack", "packing", received + 2 * step],
    ["sterilise", "sterilising", received + 3 * step],
    ["release", "release", released],
  ] as const;
  for (const [event, station, at] of moves) await applyCycleEvent(t.db, { cycleId, event, station, userId: null, at: new Date(at) });
  if (times.delivered) {
    await applyCycleEvent(t.db, { cycleId, event: "dispatch", station: "dispatch", userId: null, at: new Date(released + 60_000) });
    await applyCycleEvent(t.db, { cycleId, event: "deliver", station: "clinic", userId: null, at: new Date(times.delivered) });
  }
  return { cycleId, serial: code };
}

const get = async (route: typeof unitOnTimeRoute, userId: number, url: string) => route(await requestAs(userId, url), params({}));
const json = async (route: typeof unitOnTimeRoute, userId: number, url: string) => {
  const res = await get(route, userId, url);
  expect(res.status, await res.clone().text()).toBe(200);
  return ((await res.json()) as Answer).report;
};
const table = (report: Report, key: string) => report.tables.find((x) => x.key === key)!;

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  // An invented customer on a 24/7 clock with a 24-hour standard turnaround; its name starts
  // with "=", as a spreadsheet formula would.
  brack = await addCustomer(t.db, {
    code: "BFS",
    name: "=Brackenfold Surgery",
    classes: ["basic_tray"],
    versions: [{ reference: "BFS-2026-01", validFrom: "2026-01-01", validUntil: null, slaCreditBasisPoints: 1000, rates: { basic_tray: [{ upToQuantity: null, unitPriceMinor: 1000 }] } }],
  });
  const { id } = await t.db
    .insertInto("users")
    .values({ organisation_id: brack.organisationId, site_id: null, email: "manager@brackenfold.example", name: "Ivo Brackenfold", role: "clinic_manager", password_hash: null, status: "active", created_at: iso, updated_at: iso })
    .returning("id")
    .executeTakeFirstOrThrow();
  brackManager = id;
});

afterAll(async () => {
  await t?.cleanup();
});

const unitUser = () => seed.users["quality@larkmoor.example"]!;
const financeUser = () => seed.users["finance@larkmoor.example"]!;

describe("one definition of late", () => {
  it("gives the report, the invoice preview's turnaround credit and the customer's own view the same late sets", async () => {
    // November 2026, delivered-clock contract, 24 h: on time, late, on time, late (hours worked by hand).
    await cycleAt(brack, { received: "2026-11-02T10:00:00Z", released: "2026-11-02T20:00:00Z", delivered: "2026-11-03T09:00:00Z" }); // 23 h
    const late1 = await cycleAt(brack, { received: "2026-11-05T10:00:00Z", released: "2026-11-06T02:00:00Z", delivered: "2026-11-06T12:00:00Z" }); // 26 h
    await cycleAt(brack, { received: "2026-11-09T08:00:00Z", released: "2026-11-09T18:00:00Z", delivered: "2026-11-10T08:00:00Z" }); // exactly 24 h: on time
    const late2 = await cycleAt(brack, { received: "2026-11-10T10:00:00Z", released: "2026-11-11T01:00:00Z", delivered: "2026-11-11T10:01:00Z" }); // 24 h 1 min

    const preview = await previewRun(t.db, "2026-11", NOW);
    const customer = preview.customers.find((c) => c.organisationId === brack.organisationId)!;
    const credit = customer.lines.find((l) => l.kind === "sla_credit")!;
    expect([...credit.cycleIds].sort()).toEqual([late1.cycleId, late2.cycleId].sort());

    const query = `?from=2026-11-01&to=2026-11-30&grain=month&customer=${brack.organisationId}`;
    const unit = await json(unitOnTimeRoute, unitUser(), `/api/reports/on-time${query}`);
    const own = await json(clinicOnTimeRoute, brackManager, `/api/reports/clinic/on-time?from=2026-11-01&to=2026-11-30&grain=month`);
    expect(table(unit, "figures").rows).toEqual([
      { customer: "=Brackenfold Surgery", service_level: "Standard", period: "2026-11", measured: 4, on_time: 2, late: 2, on_time_pct: "50.0" },
    ]);
    expect(table(own, "figures").rows).toEqual(table(unit, "figures").rows);
    const lateSerials = (r: Report) => table(r, "late").rows.map((row) => row.serial);
    expect(lateSerials(unit)).toEqual([late1.serial, late2.serial]);
    expect(lateSerials(own)).toEqual(lateSerials(unit));
    expect(table(unit, "late").rows[1]).toMatchObject({ late_by: "0:01", contract: "BFS-2026-01" });
  });

  it("agrees with every cycle the demo's issued invoices priced, for every customer and both clocks", async () => {
    const priced = await t.db.selectFrom("priced_cycles").select(["cycle_id", "late"]).execute();
    expect(priced.length).toBeGreaterThan(50);
    const user = await sessionUser(t.db, unitUser());
    const filters = await resolveFilters(t.db, user, reportQuerySchema.parse({ from: "2026-08-01", to: "2026-11-30" }), NOW);
    const verdicts = new Map((await onTimeVerdicts(t.db, user, filters)).map((v) => [v.cycle.cycleId, v.late]));
    const compared = priced.filter((p) => verdicts.has(p.cycle_id));
    // Every priced cycle of the demo's history has its clock stopped within these four months.
    expect(compared.length).toBe(priced.length);
    for (const p of compared) expect(verdicts.get(p.cycle_id), `cycle ${p.cycle_id}`).toBe(p.late === 1);
    expect(compared.some((p) => p.late === 1)).toBe(true);
  });
});

describe("periods in the unit's time zone (Europe/London)", () => {
  let early: { serial: string };
  let lastEvening: { serial: string };
  let nextMorning: { serial: string };
  let wrcId: number;

  beforeAll(async () => {
    // A release-clock customer of its own, so that the release instant decides the month.
    const rel = await addCustomer(t.db, {
      code: "WRC",
      name: "Wrenhollow Clinic",
      classes: ["basic_tray"],
      versions: [{ reference: "WRC-2026-01", validFrom: "2026-01-01", validUntil: null, rates: { basic_tray: [{ upToQuantity: null, unitPriceMinor: 900 }] } }],
    });
    await t.db.updateTable("contracts").set({ clock_stops_at: "released" }).where("organisation_id", "=", rel.organisationId).execute();
    // 1 Oct 00:30 BST is 30 Sep 23:30 UTC: October locally, September in UTC.
    early = await cycleAt(rel, { received: "2026-09-30T12:00:00Z", released: "2026-09-30T23:30:00Z" });
    // 31 Oct 23:30 GMT (after the clocks went back on 25 Oct): still October.
    lastEvening = await cycleAt(rel, { received: "2026-10-31T08:00:00Z", released: "2026-10-31T23:30:00Z", delivered: "2026-11-01T09:00:00Z" });
    // 1 Nov 00:30 GMT: November.
    nextMorning = await cycleAt(rel, { received: "2026-10-31T09:00:00Z", released: "2026-11-01T00:30:00Z" });
    wrcId = rel.organisationId;
  });

  const wrc = () => wrcId;

  it("counts a set released at 23:30 on the last day of a month in that month, and one released at 00:30 local in the next", async () => {
    const report = await json(unitOnTimeRoute, unitUser(), `/api/reports/on-time?from=2026-09-01&to=2026-11-30&grain=month&customer=${wrc()}`);
    expect(table(report, "figures").rows.map((r) => [r.period, r.measured])).toEqual([
      ["2026-10", 2],
      ["2026-11", 1],
    ]);
    // A month filter ending on 31 October keeps the 23:30 release and drops the 00:30 one.
    const october = await json(unitOnTimeRoute, unitUser(), `/api/reports/on-time?from=2026-10-01&to=2026-10-31&grain=month&customer=${wrc()}`);
    expect(table(october, "figures").rows.map((r) => r.measured)).toEqual([2]);
    const september = await json(unitOnTimeRoute, unitUser(), `/api/reports/on-time?from=2026-09-01&to=2026-09-30&grain=month&customer=${wrc()}`);
    expect(table(september, "figures").rows).toEqual([]);
    expect([early.serial, lastEvening.serial, nextMorning.serial]).toHaveLength(3);
  });

  it("puts the Sunday before a change of clock and the Monday after it in different weeks", async () => {
    const report = await json(unitOnTimeRoute, unitUser(), `/api/reports/on-time?from=2026-09-28&to=2026-11-08&grain=week&customer=${wrc()}`);
    // 1 Oct (Thu) is in the week from Mon 28 Sep; 31 Oct (Sat) in the week from 26 Oct; 1 Nov
    // (Sun) in the same week, which is 169 real hours long (the clocks went back on 25 Oct).
    expect(table(report, "figures").rows.map((r) => [r.period, r.measured])).toEqual([
      ["2026-09-28", 1],
      ["2026-10-26", 2],
    ]);
  });

  it("refuses a period that ends before it starts, or a date that is not one, and says what to fix", async () => {
    const backwards = await get(unitOnTimeRoute, unitUser(), "/api/reports/on-time?from=2026-11-30&to=2026-11-01");
    expect(backwards.status).toBe(422);
    expect(((await backwards.json()) as { error: { message: string } }).error.message).toMatch(/starts \(2026-11-30\) after it ends \(2026-11-01\)/);
    const bad = await get(unitOnTimeRoute, unitUser(), "/api/reports/on-time?from=2026-02-30");
    expect(bad.status).toBe(422);
  });
});

describe("the tenant scope", () => {
  const quillbyManager = () => seed.users["manager@quillby.example"]!;

  it("answers 404 to a customer asking for another customer's or another customer's site's figures", async () => {
    const other = seed.organisations.ODS ?? Object.values(seed.organisations).find((id) => id !== seed.organisations.QMH)!;
    expect((await get(clinicOnTimeRoute, quillbyManager(), `/api/reports/clinic/on-time?customer=${other}`)).status).toBe(404);
    expect((await get(clinicOnTimeRoute, quillbyManager(), `/api/reports/clinic/on-time?customer=${brack.organisationId}`)).status).toBe(404);
    expect((await get(clinicOnTimeRoute, quillbyManager(), `/api/reports/clinic/on-time?site=${brack.siteId}`)).status).toBe(404);
    // Their own id is fine, and the unit's reports are not theirs at all.
    const me = await sessionUser(t.db, quillbyManager());
    expect((await get(clinicOnTimeRoute, quillbyManager(), `/api/reports/clinic/on-time?customer=${me.organisationId}`)).status).toBe(200);
    expect((await get(unitOnTimeRoute, quillbyManager(), "/api/reports/on-time")).status).toBe(403);
  });

  it("shows a customer only its own figures, and clinic staff only their own site's", async () => {
    const me = await sessionUser(t.db, quillbyManager());
    const own = await json(clinicOnTimeRoute, quillbyManager(), "/api/reports/clinic/on-time?from=2026-09-01&to=2026-11-30&grain=month");
    const customers = new Set(table(own, "figures").rows.map((r) => r.customer));
    const name = (await t.db.selectFrom("organisations").select("name").where("id", "=", me.organisationId).executeTakeFirstOrThrow()).name;
    expect([...customers]).toEqual([name]);

    const staffId = seed.users["theatres@quillby.example"]!;
    const staff = await sessionUser(t.db, staffId);
    const staffReport = await json(clinicOnTimeRoute, staffId, "/api/reports/clinic/on-time?from=2026-09-01&to=2026-11-30&grain=month");
    const siteName = (await t.db.selectFrom("sites").select("name").where("id", "=", staff.siteId!).executeTakeFirstOrThrow()).name;
    expect(table(staffReport, "late").rows.every((r) => r.site === siteName)).toBe(true);
    const measured = (r: Report) => table(r, "figures").rows.reduce((n, row) => n + Number(row.measured), 0);
    expect(measured(staffReport)).toBeGreaterThan(0);
    expect(measured(staffReport)).toBeLessThan(measured(own));
    // Asking for a sister site answers 404; spend is not for clinic staff.
    const sister = await t.db.selectFrom("sites").select("id").where("organisation_id", "=", me.organisationId).where("id", "!=", staff.siteId!).executeTakeFirstOrThrow();
    expect((await get(clinicOnTimeRoute, staffId, `/api/reports/clinic/on-time?site=${sister.id}`)).status).toBe(404);
    expect((await get(clinicRevenueRoute, staffId, "/api/reports/clinic/revenue")).status).toBe(403);
  });
});

describe("CSV exports", () => {
  it("hold exactly the table's header and rows, with formula-like cells made safe", async () => {
    const query = "from=2026-08-01&to=2026-11-30&grain=month";
    const report = await json(unitOnTimeRoute, unitUser(), `/api/reports/on-time?${query}`);
    for (const key of ["figures", "late"]) {
      const res = await get(unitOnTimeRoute, unitUser(), `/api/reports/on-time?${query}&format=csv&table=${key}`);
      expect(res.status).toBe(200);
      expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
      const parsed = Papa.parse<string[]>((await res.text()).replace(/^\uFEFF/, ""), { skipEmptyLines: true });
      const shown = table(report, key);
      expect(parsed.data[0]).toEqual(shown.columns.map((c) => c.label));
      const safe = (v: unknown) => {
        const text = v === null || v === undefined ? "" : String(v);
        return /^[=+\-@\t\r]/.test(text) && !/^-?\d+(\.\d+)?$/.test(text) ? `'${text}` : text;
      };
      expect(parsed.data.slice(1)).toEqual(shown.rows.map((row) => shown.columns.map((c) => safe(row[c.key]))));
      expect(shown.rows.length).toBeGreaterThan(0);
    }
    const figures = await (await get(unitOnTimeRoute, unitUser(), `/api/reports/on-time?${query}&format=csv`)).text();
    expect(figures).toContain("'=Brackenfold Surgery");
    expect(figures).not.toMatch(/(^|,)=Brackenfold/m);
  });

  it("exports the volumes and receivables the same way, and refuses a table the report does not have", async () => {
    const volumes = await json(unitVolumesRoute, unitUser(), "/api/reports/volumes?from=2026-09-01&to=2026-11-30");
    expect(table(volumes, "volumes").rows.length).toBeGreaterThan(0);
    const csv = await (await get(unitVolumesRoute, unitUser(), "/api/reports/volumes?from=2026-09-01&to=2026-11-30&format=csv")).text();
    expect(csv.trim().split("\r\n")).toHaveLength(table(volumes, "volumes").rows.length + 1);
    expect((await get(unitVolumesRoute, unitUser(), "/api/reports/volumes?format=csv&table=nope")).status).toBe(422);
    // Money reports are for roles that see invoices: finance yes, the quality lead no.
    expect((await get(unitReceivablesRoute, unitUser(), "/api/reports/receivables")).status).toBe(403);
    const receivables = await json(unitReceivablesRoute, financeUser(), "/api/reports/receivables");
    expect(table(receivables, "ageing").columns.map((c) => c.label)).toEqual(["Customer", "Currency", "Not yet due", "1–30 days", "31–60 days", "61–90 days", "Over 90 days", "Total due"]);
  });
});
