import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type SeedResult, seedDemo } from "@/db/seed/demo";
import { DEMO_SITE_FIT, planDemoSets, type PlannedSiteInput } from "@/db/seed/sets";
import { parseScan } from "@/lib/labels/gs1";
import { formatSetSerial, setGiai } from "@/lib/sets/identifiers";
import { type TestDatabase, useFreshDatabase } from "../support/db";

// The demo's sets, as seeded into a fresh database.

const now = new Date("2026-12-01T08:00:00Z");
let t: TestDatabase;
let seed: SeedResult;

beforeAll(async () => {
  t = await useFreshDatabase();
  seed = await seedDemo(t.db, now);
});
afterAll(() => t.cleanup());

describe("the demo's sets", () => {
  it("follow the plan for the catalogue's set types, every row as planned", async () => {
    const types = await t.db
      .selectFrom("set_types")
      .innerJoin("organisations", "organisations.id", "set_types.organisation_id")
      .select(["set_types.id", "set_types.organisation_id", "set_types.code", "set_types.set_class"])
      .where("organisations.kind", "=", "customer")
      .where("set_types.active", "=", 1)
      .execute();
    const sites = await t.db
      .selectFrom("sites")
      .innerJoin("organisations", "organisations.id", "sites.organisation_id")
      .select(["sites.id", "sites.organisation_id", "sites.name"])
      .where("organisations.kind", "=", "customer")
      .where("sites.is_depot", "=", 0)
      .where("sites.active", "=", 1)
      .orderBy("sites.id")
      .execute();
    const byOrg = new Map<number, PlannedSiteInput[]>();
    for (const s of sites) byOrg.set(s.organisation_id, [...(byOrg.get(s.organisation_id) ?? []), { id: s.id, ...DEMO_SITE_FIT[s.name] }]);
    const plan = planDemoSets(
      types.map((x) => ({ id: x.id, organisationId: x.organisation_id, code: x.code, setClass: x.set_class })),
      byOrg,
      now,
    );
    const codes = await t.db.selectFrom("organisations").select(["id", "short_code"]).execute();
    const shortCode = new Map(codes.map((c) => [c.id, c.short_code]));
    const rows = await t.db.selectFrom("sets").selectAll().orderBy("id").execute();

    expect(rows).toHaveLength(plan.length);
    expect(Object.keys(seed.sets ?? {})).toHaveLength(rows.length);
    rows.forEach((row, i) => {
      const planned = plan[i];
      const serial = formatSetSerial(shortCode.get(planned.organisationId)!, planned.sequence);
      expect(row).toMatchObject({
        organisation_id: planned.organisationId,
        set_type_id: planned.setTypeId,
        home_site_id: planned.homeSiteId,
        serial,
        giai: setGiai(serial),
        status: planned.retired ? "retired" : "in_service",
        created_at: planned.createdAt,
      });
      expect(seed.sets?.[serial]).toBe(row.id);
    });
  });

  it("are hundreds, over every customer, each set at a site of its own customer with a scannable GIAI", async () => {
    const rows = await t.db
      .selectFrom("sets")
      .innerJoin("sites", "sites.id", "sets.home_site_id")
      .innerJoin("set_types", "set_types.id", "sets.set_type_id")
      .select(["sets.giai", "sets.organisation_id", "sites.organisation_id as site_org", "set_types.organisation_id as type_org"])
      .execute();
    expect(rows.length).toBeGreaterThanOrEqual(200);
    const customers = await t.db.selectFrom("organisations").select("id").where("kind", "=", "customer").execute();
    for (const c of customers) expect(rows.some((r) => r.organisation_id === c.id)).toBe(true);
    for (const r of rows) {
      expect(r.site_org).toBe(r.organisation_id);
      expect(r.type_org).toBe(r.organisation_id);
      expect(parseScan(`(8004)${r.giai}`)).toMatchObject({ kind: "set", giai: r.giai });
    }
    expect(new Set(rows.map((r) => r.giai)).size).toBe(rows.length);
  });

  it("keep the ophthalmic sets at the eye centre, and only those", async () => {
    const rows = await t.db
      .selectFrom("sets")
      .innerJoin("sites", "sites.id", "sets.home_site_id")
      .innerJoin("set_types", "set_types.id", "sets.set_type_id")
      .select(["sites.name", "set_types.code"])
      .where("sets.organisation_id", "=", seed.organisations.QMH!)
      .execute();
    expect(rows.some((r) => r.name === "Quillby Moor Eye Centre")).toBe(true);
    for (const r of rows) expect(r.name === "Quillby Moor Eye Centre", `${r.code} at ${r.name}`).toBe(r.code.startsWith("OPH-"));
  });

  it("record each retirement in the audit log, with its reason", async () => {
    const retired = await t.db.selectFrom("sets").select("id").where("status", "=", "retired").execute();
    const audit = await t.db.selectFrom("audit_log").select(["entity_id", "details"]).where("action", "=", "set.retired").execute();
    expect(audit.map((a) => Number(a.entity_id)).sort((a, b) => a - b)).toEqual(retired.map((r) => r.id).sort((a, b) => a - b));
    for (const a of audit) expect(JSON.parse(a.details).reason).toMatch(/\w{4}/);
  });

  // Last: the second fresh database replaces the first as the process's database.
  // Seeds the whole demo a second time: allow for a loaded machine.
  it("is the same scenario every time", { timeout: 120_000 }, async () => {
    const first = await t.db.selectFrom("sets").select(["serial", "giai", "home_site_id", "status", "created_at"]).orderBy("id").execute();
    const again = await useFreshDatabase();
    try {
      await seedDemo(again.db, now);
      const second = await again.db.selectFrom("sets").select(["serial", "giai", "home_site_id", "status", "created_at"]).orderBy("id").execute();
      expect(second).toEqual(first);
    } finally {
      await again.cleanup();
    }
  });
});
