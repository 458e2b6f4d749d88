import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as checkRoute } from "@/app/api/procedures/check/route";
import { GET as listUsesRoute } from "@/app/api/procedures/route";
import type { SeedResult } from "@/db/seed/demo";
import { AppError } from "@/lib/errors";
import { bookingSchema } from "@/lib/orders/schemas";
import { bookPickup } from "@/lib/orders/service";
import { caseReferenceSchema, recordUseSchema, theatreSchema } from "@/lib/procedures/schemas";
import { checkScannedSet, proceduresForCycles, recordProcedureUse } from "@/lib/procedures/service";
import { countRows } from "../support/db";
import { deliveredCycle, freshSets } from "../support/delivered-cycles";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { requestAs, sessionUser } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
// Tuesday 1 December 2026, 10:00 in London (GMT): the demo's contracts are in force.
const NOW = new Date("2026-12-01T10:00:00Z");
const THEATRES = "Quillby Moor General – Main Theatres";
const DAY_CASE = "Quillby Moor General – Day Case Unit";
const TABLES = ["procedure_uses", "audit_log", "cycles", "scan_events"] as const;

let theatreSets: { id: number; serial: string; giai: string; name: string }[] = [];
let dayCaseSets: { id: number; serial: string }[] = [];
let otterwickSets: { id: number; serial: string }[] = [];

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  theatreSets = await freshSets(t, THEATRES, 12, NOW);
  dayCaseSets = await freshSets(t, DAY_CASE, 2, NOW);
  otterwickSets = await freshSets(t, "Otterwick Day Surgery Centre", 2, NOW);
});
afterAll(() => t.cleanup());

const user = (email: string) => sessionUser(t.db, seed.users[email]!);
const use = (code: string, overrides: Record<string, unknown> = {}) =>
  recordUseSchema.parse({ code, theatre: "Theatre 2", caseReference: "QM-2026/0142", packChecked: true, indicatorChecked: true, ...overrides });

async function refused(promise: Promise<unknown>, code: AppError["code"], pattern: RegExp) {
  const error = await promise.then(() => null, (e: unknown) => e);
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).code).toBe(code);
  expect((error as AppError).message).toMatch(pattern);
}

describe("recording a set used for a procedure", () => {
  it("shows what was scanned, records the use with its checks, and lists it for the clinic", async () => {
    const staff = await user("theatres@quillby.example");
    const set = theatreSets[0]!;
    const cycleId = await deliveredCycle(t.db, set.id, { expiresOn: "2026-12-20" });

    // A GS1 scan of the label (bracketed, as a wedge configured for human-readable form sends it).
    const shown = await checkScannedSet(t.db, staff, `(8004)${set.giai}`, NOW);
    expect(shown).toMatchObject({ setId: set.id, serial: set.serial, setName: set.name, cycleId, expiresOn: "2026-12-20", problem: null });
    expect(shown.expiryText).toBe("20 Dec 2026 — expires in 19 days");

    const before = await countRows(t.db, ["procedure_uses", "audit_log"]);
    const recorded = await recordProcedureUse(t.db, staff, use(set.serial), NOW);
    expect(recorded).toMatchObject({ serial: set.serial, usedAt: NOW.toISOString() });
    const row = await t.db.selectFrom("procedure_uses").selectAll().where("id", "=", recorded.id).executeTakeFirstOrThrow();
    expect(row).toMatchObject({
      cycle_id: cycleId,
      set_id: set.id,
      organisation_id: seed.organisations.QMH,
      site_id: seed.sites[THEATRES],
      theatre: "Theatre 2",
      case_reference: "QM-2026/0142",
      pack_checked: 1,
      indicator_checked: 1,
      recorded_by: staff.id,
    });
    const audit = await t.db.selectFrom("audit_log").selectAll().orderBy("id", "desc").limit(1).executeTakeFirstOrThrow();
    expect(audit).toMatchObject({ action: "procedure.set_used", entity: "set", entity_id: String(set.id), actor_user_id: staff.id });
    expect(await countRows(t.db, ["procedure_uses", "audit_log"])).toEqual({ procedure_uses: before.procedure_uses + 1, audit_log: before.audit_log + 1 });
    // Recording a use moves nothing in the cycle: it stays delivered, with no new scan event.
    const cycle = await t.db.selectFrom("cycles").select("state").where("id", "=", cycleId).executeTakeFirstOrThrow();
    expect(cycle.state).toBe("delivered");

    // The list: staff and their manager see it; another customer does not.
    const list = async (email: string) => {
      const res = await listUsesRoute(await requestAs(seed.users[email]!, "/api/procedures?sort=used_at&dir=desc"), { params: Promise.resolve({}) });
      expect(res.status).toBe(200);
      return (await res.json()) as { total: number; rows: { serial: string; theatre: string; caseReference: string; recordedBy: string }[] };
    };
    expect((await list("theatres@quillby.example")).rows[0]).toMatchObject({ serial: set.serial, theatre: "Theatre 2", caseReference: "QM-2026/0142", recordedBy: staff.name });
    expect((await list("manager@quillby.example")).rows.map((r) => r.serial)).toContain(set.serial);
    expect((await list("daycase@quillby.example")).rows.map((r) => r.serial)).not.toContain(set.serial);
    expect((await list("staff@otterwick.example")).rows.map((r) => r.serial)).not.toContain(set.serial);
    expect((await list("staff@otterwick.example")).rows.every((r) => r.serial.startsWith("ODS-"))).toBe(true);
    // Unit staff record no uses.
    const forbidden = await listUsesRoute(await requestAs(seed.users["tech@larkmoor.example"]!, "/api/procedures"), { params: Promise.resolve({}) });
    expect(forbidden.status).toBe(403);
  });

  it("refuses a set that was not delivered, is booked again, was already used or has expired — and writes nothing", async () => {
    const staff = await user("theatres@quillby.example");
    const [, neverSent, midCycle, booked, used, expired, expiresToday] = theatreSets;
    await deliveredCycle(t.db, midCycle!.id, { upTo: "receive" });
    await deliveredCycle(t.db, booked!.id, { expiresOn: "2026-12-20" });
    const { reference } = await bookPickup(
      t.db,
      staff,
      bookingSchema.parse({
        siteId: seed.sites[THEATRES],
        setIds: [booked!.id],
        extras: [],
        collectionFrom: "2026-12-02T09:00",
        collectionUntil: "2026-12-02T12:00",
        neededBackBy: "2026-12-04T17:00",
        serviceLevel: "standard",
        heavySoil: false,
        notes: "",
      }),
      NOW,
    );
    await deliveredCycle(t.db, used!.id, { expiresOn: "2026-12-20" });
    await recordProcedureUse(t.db, staff, use(used!.serial, { caseReference: "QM-2026/0150" }), NOW);
    await deliveredCycle(t.db, expired!.id, { expiresOn: "2026-11-30" });
    await deliveredCycle(t.db, expiresToday!.id, { expiresOn: "2026-12-01" });

    const before = await countRows(t.db, [...TABLES]);
    await refused(recordProcedureUse(t.db, staff, use(neverSent!.serial), NOW), "conflict", /has no delivery from the unit on record/);
    await refused(recordProcedureUse(t.db, staff, use(midCycle!.serial), NOW), "conflict", /has not been delivered to you yet: it is received at the unit/);
    await refused(recordProcedureUse(t.db, staff, use(booked!.serial), NOW), "conflict", new RegExp(`booked for pickup on ${reference}`));
    await refused(
      recordProcedureUse(t.db, staff, use(used!.serial), NOW),
      "conflict",
      /was already used on 1 Dec 2026, 10:00 \(Theatre 2, case QM-2026\/0150\)\. Send it back for reprocessing/,
    );
    await refused(recordProcedureUse(t.db, staff, use(expired!.serial), NOW), "conflict", /expired on 30 Nov 2026\. Do not use it/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    // The screen says the same before anyone confirms.
    expect((await checkScannedSet(t.db, staff, expired!.serial, NOW)).problem).toMatch(/expired on 30 Nov 2026/);
    expect((await checkScannedSet(t.db, staff, used!.serial, NOW)).problem).toMatch(/already used/);
    // The expiry date itself is still a day of use.
    const today = await checkScannedSet(t.db, staff, expiresToday!.serial, NOW);
    expect(today).toMatchObject({ problem: null, expiryText: "1 Dec 2026 — expires today" });
    await recordProcedureUse(t.db, staff, use(expiresToday!.serial), NOW);
  });

  it("answers not found for another customer's set, and for another site's set to clinic staff", async () => {
    const staff = await user("theatres@quillby.example");
    const manager = await user("manager@quillby.example");
    const theirs = otterwickSets[0]!;
    const dayCase = dayCaseSets[0]!;
    await deliveredCycle(t.db, theirs.id, { expiresOn: "2026-12-20" });
    await deliveredCycle(t.db, dayCase.id, { expiresOn: "2026-12-20" });
    const before = await countRows(t.db, [...TABLES]);
    await refused(recordProcedureUse(t.db, staff, use(theirs.serial), NOW), "not_found", new RegExp(`No set with the code ${theirs.serial}`));
    await refused(recordProcedureUse(t.db, manager, use(theirs.serial), NOW), "not_found", /is among your sets/);
    await refused(recordProcedureUse(t.db, staff, use(dayCase.serial), NOW), "not_found", /is among your sets/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    const res = await checkRoute(await requestAs(seed.users["theatres@quillby.example"]!, `/api/procedures/check?code=${theirs.serial}`), { params: Promise.resolve({}) });
    expect(res.status).toBe(404);
    // Their own manager may record the day-case set: it is their organisation's.
    const ok = await recordProcedureUse(t.db, manager, use(dayCase.serial, { theatre: "Day case room 1" }), NOW);
    const row = await t.db.selectFrom("procedure_uses").select("site_id").where("id", "=", ok.id).executeTakeFirstOrThrow();
    expect(row.site_id).toBe(seed.sites[DAY_CASE]);
  });

  it("refuses what reads like a patient's name or date of birth, and missing checks", () => {
    const issues = (overrides: Record<string, unknown>) =>
      recordUseSchema.safeParse({ code: "QMH-000001", theatre: "Theatre 2", caseReference: "QM-2026/0142", packChecked: true, indicatorChecked: true, ...overrides }).error?.issues.map((i) => `${i.path.join(".")}: ${i.message}`) ?? [];
    expect(issues({})).toEqual([]);
    expect(issues({ caseReference: "Jane Doe" })).toEqual(["caseReference: Use only letters, digits, - and / (no spaces): the case number, never a patient's name."]);
    expect(issues({ caseReference: "Doe" })).toEqual(["caseReference: A case number has at least one digit. Enter the case number, never a patient's name."]);
    expect(issues({ caseReference: "12/03/1980" })).toEqual(["caseReference: That looks like a date (of birth?). Enter the case number instead."]);
    expect(issues({ caseReference: "A".repeat(29) + "1" })).toEqual([]);
    expect(issues({ caseReference: "A".repeat(30) + "1" })).toEqual(["caseReference: A case number has at most 30 characters."]);
    expect(issues({ caseReference: "" })[0]).toBe("caseReference: Enter the case number.");
    expect(issues({ theatre: "Mrs Okafor" })).toEqual(["theatre: That looks like a person's name. Enter the theatre or room, e.g. Theatre 2."]);
    expect(issues({ theatre: "Dr. Patel" })).toEqual(["theatre: That looks like a person's name. Enter the theatre or room, e.g. Theatre 2."]);
    expect(issues({ theatre: "Theatre <3>" })).toEqual(["theatre: Use letters, digits, spaces and . / & ( ) - only."]);
    expect(issues({ theatre: "T".repeat(41) })).toEqual(["theatre: Use at most 40 characters."]);
    expect(issues({ theatre: "Minor ops room (B)" })).toEqual([]);
    expect(issues({ packChecked: false })).toEqual(["packChecked: Check that the pack is intact and dry, then tick this."]);
    expect(issues({ indicatorChecked: undefined })).toEqual(["indicatorChecked: Check that the indicator has changed, then tick this."]);
  });

  it("answers 422 for an empty scan and says what the scan was when it is not a set's label", async () => {
    const empty = await checkRoute(await requestAs(seed.users["theatres@quillby.example"]!, "/api/procedures/check?code=%20"), { params: Promise.resolve({}) });
    expect(empty.status).toBe(422);
    const gtin = await checkRoute(await requestAs(seed.users["theatres@quillby.example"]!, "/api/procedures/check?code=(01)09521234543213"), { params: Promise.resolve({}) });
    expect(gtin.status).toBe(422);
    expect(((await gtin.json()) as { error: { message: string } }).error.message).toMatch(/product barcode/);
  });
});

describe("procedures for a recall", () => {
  it("finds which procedures used a set from the given cycles, across customers, and nothing else", async () => {
    const staff = await user("theatres@quillby.example");
    const otterwick = await user("staff@otterwick.example");
    const a = theatreSets[10]!;
    const b = theatreSets[11]!;
    const c = otterwickSets[1]!;
    const cycleA = await deliveredCycle(t.db, a.id, { expiresOn: "2026-12-20" });
    const cycleB = await deliveredCycle(t.db, b.id, { expiresOn: "2026-12-20" });
    const cycleC = await deliveredCycle(t.db, c.id, { expiresOn: "2026-12-20" });
    await recordProcedureUse(t.db, staff, use(a.serial, { theatre: "Theatre 4", caseReference: "QM-9001" }), NOW);
    await recordProcedureUse(t.db, otterwick, use(c.serial, { theatre: "Room 1", caseReference: "ODS-77" }), new Date("2026-12-01T11:00:00Z"));
    // cycleB was delivered but not used: it is in the load, not in any procedure.
    const found = await proceduresForCycles(t.db, [cycleA, cycleB, cycleC, cycleA]);
    expect(found.map((f) => [f.organisationName, f.serial, f.theatre, f.caseReference, f.cycleId])).toEqual([
      ["Otterwick Day Surgery", c.serial, "Room 1", "ODS-77", cycleC],
      ["Quillby Moor Hospitals", a.serial, "Theatre 4", "QM-9001", cycleA],
    ]);
    expect(found[1]).toMatchObject({ siteName: THEATRES, recordedBy: staff.name, usedAt: NOW.toISOString() });
    expect(await proceduresForCycles(t.db, [])).toEqual([]);
    expect(await proceduresForCycles(t.db, [cycleB])).toEqual([]);
  });
});

describe("the demo's recorded uses", () => {
  it("fall between a delivery and the set's next booking, with valid references, for sets that went back", async () => {
    const uses = await t.db
      .selectFrom("procedure_uses")
      .innerJoin("cycles", "cycles.id", "procedure_uses.cycle_id")
      .select((eb) => [
        "procedure_uses.theatre",
        "procedure_uses.case_reference",
        "procedure_uses.used_at",
        "procedure_uses.site_id",
        "procedure_uses.organisation_id",
        "cycles.site_id as cycle_site_id",
        "cycles.organisation_id as cycle_organisation_id",
        "cycles.state",
        "cycles.delivered_at",
        eb
          .selectFrom("cycles as next")
          .select((n) => n.fn.min("next.booked_at").as("at"))
          .whereRef("next.set_id", "=", "cycles.set_id")
          .whereRef("next.id", ">", "cycles.id")
          .where("next.state", "!=", "cancelled")
          .as("next_booked_at"),
      ])
      .where("procedure_uses.used_at", "<", "2026-12-01T08:00:00.000Z")
      .execute();
    expect(uses.length).toBeGreaterThan(50);
    for (const u of uses) {
      expect(u.state).toBe("delivered");
      expect([u.site_id, u.organisation_id]).toEqual([u.cycle_site_id, u.cycle_organisation_id]);
      expect(u.used_at > u.delivered_at!).toBe(true);
      expect(u.next_booked_at && u.used_at < String(u.next_booked_at)).toBe(true);
      expect(caseReferenceSchema.safeParse(u.case_reference).success, u.case_reference).toBe(true);
      expect(theatreSchema.safeParse(u.theatre).success, u.theatre).toBe(true);
    }
    // Every site with history has some, and no case number repeats within an organisation.
    expect(new Set(uses.map((u) => u.site_id)).size).toBeGreaterThan(5);
    const keys = uses.map((u) => `${u.organisation_id}:${u.case_reference}`);
    expect(new Set(keys).size).toBe(keys.length);
  });
});
