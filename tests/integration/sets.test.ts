import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as labelPdfRoute } from "@/app/api/sets/[id]/label.pdf/route";
import { GET as labelSvgRoute } from "@/app/api/sets/[id]/label.svg/route";
import { GET as getSetRoute } from "@/app/api/sets/[id]/route";
import { GET as lookupRoute } from "@/app/api/sets/lookup/route";
import { GET as listSetsRoute } from "@/app/api/sets/route";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import { resetServerEnvCache, serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { encodeElementString } from "@/lib/labels/gs1";
import { setGiai } from "@/lib/sets/identifiers";
import { createSetsSchema } from "@/lib/sets/schemas";
import { changeSetStatus, createSets, findSetByScan, getSet, listSetAuditEntries, listSets } from "@/lib/sets/service";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
let admin: SessionUser;
const types: Record<string, number> = {};

const site = (name: string) => seed.sites[name]!;
const user = (email: string) => seed.users[email]!;
const THEATRES = "Quillby Moor General – Main Theatres";
const EYE_CENTRE = "Quillby Moor Eye Centre";
const OTTERWICK = "Otterwick Day Surgery Centre";

// Set types of our own, so these tests hold whatever the demo catalogue contains.
async function addSetType(organisation: string, code: string, items: [string, number][], active = 1): Promise<number> {
  const iso = new Date().toISOString();
  const { id } = await t.db
    .insertInto("set_types")
    .values({
      organisation_id: seed.organisations[organisation]!,
      code,
      name: `Test tray ${code}`,
      set_class: "basic_tray",
      packaging: "wrap",
      sterilisation_method: "steam_134",
      weight_g: 2400,
      size_stu: 0.5,
      active,
      created_at: iso,
      updated_at: iso,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  await t.db
    .insertInto("set_type_items")
    .values(items.map(([name, quantity], i) => ({ set_type_id: id, position: i + 1, name, quantity })))
    .execute();
  return id;
}

const sets = () => countRows(t.db, ["sets", "audit_log"]);

async function expectAppError(promise: Promise<unknown>, code: string, message?: RegExp): Promise<AppError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).code).toBe(code);
  if (message) expect((error as AppError).message).toMatch(message);
  return error as AppError;
}

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
  admin = await sessionUser(t.db, user("admin@larkmoor.example"));
  types.qmh = await addSetType("QMH", "ZZ-TEST-BASIC", [
    ["Mayo scissors, curved 170 mm", 1],
    ["Dissecting forceps, toothed 145 mm", 2],
    ["Needle holder, 180 mm", 1],
  ]);
  types.qmhWithdrawn = await addSetType("QMH", "ZZ-TEST-OLD", [["Sponge holder, 250 mm", 2]], 0);
  types.ods = await addSetType("ODS", "ZZ-TEST-MINOR", [["Scalpel handle No. 3", 1]]);
});
afterAll(() => t.cleanup());

describe("adding sets", () => {
  it("creates N sets with consecutive serials, unique GIAIs and one audit entry each", async () => {
    const before = await sets();
    const existing = await t.db.selectFrom("sets").select("giai").execute();
    const { sets: created } = await createSets(t.db, admin, {
      organisationId: seed.organisations.QMH!,
      setTypeId: types.qmh,
      homeSiteId: site(THEATRES),
      count: 5,
    });
    expect(created).toHaveLength(5);
    expect(new Set(created.map((s) => s.id)).size).toBe(5);
    const numbers = created.map((s) => Number(s.serial.slice(4)));
    expect(numbers).toEqual(numbers.map((_, i) => numbers[0] + i));
    for (const s of created) {
      expect(s.serial).toMatch(/^QMH-\d{6}$/);
      expect(s.giai).toBe(setGiai(s.serial));
      expect(s.giai).toBe(`9521234${s.serial.replace("-", "")}`);
    }
    const allGiais = [...existing.map((r) => r.giai), ...created.map((s) => s.giai)];
    expect(new Set(allGiais).size).toBe(allGiais.length);

    const after = await sets();
    expect(after.sets - before.sets).toBe(5);
    expect(after.audit_log - before.audit_log).toBe(5);
    const audit = await t.db
      .selectFrom("audit_log")
      .selectAll()
      .where("action", "=", "set.created")
      .where(
        "entity_id",
        "in",
        created.map((s) => String(s.id)),
      )
      .execute();
    expect(audit).toHaveLength(5);
    expect(audit.every((a) => a.entity === "set" && a.actor_user_id === admin.id && a.organisation_id === seed.organisations.QMH)).toBe(true);

    const view = await getSet(t.db, admin, created[0].id);
    expect(view).toMatchObject({
      status: "in_service",
      setTypeId: types.qmh,
      homeSiteName: THEATRES,
      organisationName: "Quillby Moor Hospitals",
      contentsLines: 3,
      contentsInstruments: 4,
      humanReadable: `(8004)${created[0].giai}`,
    });
  });

  it("gives new sets the unit's own GS1 Company Prefix from the settings, and finds them by it", async () => {
    process.env.GS1_COMPANY_PREFIX = "95299887";
    resetServerEnvCache();
    try {
      const { sets: created } = await createSets(t.db, admin, { organisationId: seed.organisations.QMH!, setTypeId: types.qmh, homeSiteId: site(THEATRES), count: 2 });
      for (const s of created) expect(s.giai).toBe(`95299887${s.serial.replace("-", "")}`);
      const found = await findSetByScan(t.db, admin, encodeElementString([{ ai: "8004", value: created[0]!.giai }]));
      expect(found?.id).toBe(created[0]!.id);
    } finally {
      delete process.env.GS1_COMPANY_PREFIX;
      resetServerEnvCache();
    }
    // A setting that is not a GS1 Company Prefix is refused with what to fix.
    process.env.GS1_COMPANY_PREFIX = "95-12";
    resetServerEnvCache();
    try {
      expect(() => serverEnv()).toThrow(/GS1_COMPANY_PREFIX: must be the unit's GS1 Company Prefix: 4 to 12 digits/);
    } finally {
      delete process.env.GS1_COMPANY_PREFIX;
      resetServerEnvCache();
    }
  });

  it("continues the numbering, and two batches at the same moment never share a number", async () => {
    const input = { organisationId: seed.organisations.QMH!, setTypeId: types.qmh, homeSiteId: site(EYE_CENTRE), count: 7 };
    const [a, b] = await Promise.all([createSets(t.db, admin, input), createSets(t.db, admin, input)]);
    const serials = [...a.sets, ...b.sets].map((s) => s.serial);
    expect(new Set(serials).size).toBe(14);
    const all = await t.db.selectFrom("sets").select(["serial", "giai"]).where("organisation_id", "=", seed.organisations.QMH!).execute();
    expect(new Set(all.map((r) => r.serial)).size).toBe(all.length);
    expect(new Set(all.map((r) => r.giai)).size).toBe(all.length);
  });

  it("refuses a set type or site of another customer, and writes nothing", async () => {
    const before = await sets();
    const base = { organisationId: seed.organisations.QMH!, setTypeId: types.qmh, homeSiteId: site(THEATRES), count: 3 };
    const forgedType = await expectAppError(createSets(t.db, admin, { ...base, setTypeId: types.ods }), "validation", /not in Quillby Moor Hospitals's catalogue/);
    expect(forgedType.fields?.setTypeId).toBeDefined();
    const forgedSite = await expectAppError(createSets(t.db, admin, { ...base, homeSiteId: site(OTTERWICK) }), "validation");
    expect(forgedSite.fields?.homeSiteId).toBeDefined();
    // The unit's own depot is nobody's home site.
    await expectAppError(createSets(t.db, admin, { ...base, homeSiteId: site("Larkmoor reprocessing unit") }), "validation");
    await expectAppError(createSets(t.db, admin, { ...base, organisationId: seed.organisations.LSS! }), "validation");
    await expectAppError(createSets(t.db, admin, { ...base, setTypeId: types.qmhWithdrawn }), "validation", /withdrawn/);
    await expectAppError(createSets(t.db, admin, { ...base, setTypeId: 999_999 }), "not_found");
    await expectAppError(createSets(t.db, admin, { ...base, homeSiteId: 999_999 }), "not_found");
    await expectAppError(createSets(t.db, admin, { ...base, organisationId: 999_999 }), "not_found");
    expect(await sets()).toEqual(before);
  });

  it("accepts 1 to 200 sets at a time, as the form says", () => {
    const base = { organisationId: 1, setTypeId: 1, homeSiteId: 1 };
    expect(createSetsSchema.safeParse({ ...base, count: 1 }).success).toBe(true);
    expect(createSetsSchema.safeParse({ ...base, count: "200" }).success).toBe(true);
    for (const count of [0, 201, 2.5, "", "many"]) {
      const parsed = createSetsSchema.safeParse({ ...base, count });
      expect(parsed.success, String(count)).toBe(false);
      expect(parsed.error?.issues[0]?.path).toEqual(["count"]);
    }
    const missing = createSetsSchema.safeParse({ count: 2, organisationId: "", setTypeId: "", homeSiteId: "" });
    expect(missing.error?.issues.map((i) => i.message).sort()).toEqual(["Choose the customer.", "Choose the home site.", "Choose the set type."]);
  });

  it("fails clearly and writes nothing when the next GIAI is already taken", async () => {
    // A set entered outside Steamlane's numbering holds the GIAI the next ODS set would get.
    const highest = await t.db.selectFrom("sets").select("serial").where("organisation_id", "=", seed.organisations.ODS!).execute();
    const next = highest.map((r) => Number(r.serial.split("-")[1])).reduce((a, b) => Math.max(a, b), 0) + 1;
    const iso = new Date().toISOString();
    await t.db
      .insertInto("sets")
      .values({
        organisation_id: seed.organisations.ODS!,
        set_type_id: types.ods,
        home_site_id: site(OTTERWICK),
        serial: "legacy tray 7",
        giai: setGiai(`ODS-${String(next).padStart(6, "0")}`),
        status: "in_service",
        notes: "entered by hand",
        created_at: iso,
        updated_at: iso,
      })
      .execute();
    const before = await sets();
    await expectAppError(
      createSets(t.db, admin, { organisationId: seed.organisations.ODS!, setTypeId: types.ods, homeSiteId: site(OTTERWICK), count: 4 }),
      "conflict",
      /Nothing was saved/,
    );
    expect(await sets()).toEqual(before);
    await t.db.deleteFrom("sets").where("serial", "=", "legacy tray 7").execute();
  });
});

describe("retiring and returning to service", () => {
  it("changes the status with the reason in the audit log, and refuses a change that changes nothing", async () => {
    const { sets: created } = await createSets(t.db, admin, {
      organisationId: seed.organisations.QMH!,
      setTypeId: types.qmh,
      homeSiteId: site(THEATRES),
      count: 1,
    });
    const id = created[0].id;
    const retired = await changeSetStatus(t.db, admin, { setId: id, status: "retired", reason: "Lid hinge cracked" });
    expect(retired.status).toBe("retired");
    await expectAppError(changeSetStatus(t.db, admin, { setId: id, status: "retired", reason: "again" }), "conflict", /already retired/);
    const back = await changeSetStatus(t.db, admin, { setId: id, status: "in_service", reason: "Hinge replaced and inspected" });
    expect(back.status).toBe("in_service");
    const history = await listSetAuditEntries(t.db, admin, id);
    expect(history.map((h) => h.action)).toEqual(["set.created", "set.retired", "set.returned_to_service"]);
    expect(history[1].details).toMatchObject({ reason: "Lid hinge cracked", from: "in_service", to: "retired" });
    expect(history[1].actorName).toBe("Imogen Harcastle");

    // Another tenant's set is not found, and nothing is written.
    const outsider = await sessionUser(t.db, user("manager@otterwick.example"));
    const before = await sets();
    await expectAppError(changeSetStatus(t.db, outsider, { setId: id, status: "retired", reason: "not mine" }), "not_found");
    await expectAppError(listSetAuditEntries(t.db, outsider, id), "not_found");
    expect(await sets()).toEqual(before);
  });
});

describe("listing and finding sets", () => {
  let theatreSet: { id: number; serial: string; giai: string };
  let eyeSet: { id: number; serial: string; giai: string };

  beforeAll(async () => {
    const base = { organisationId: seed.organisations.QMH!, setTypeId: types.qmh, count: 1 };
    theatreSet = (await createSets(t.db, admin, { ...base, homeSiteId: site(THEATRES) })).sets[0];
    eyeSet = (await createSets(t.db, admin, { ...base, homeSiteId: site(EYE_CENTRE) })).sets[0];
  });

  it("filters, searches and sorts in the database", async () => {
    const byType = await listSets(t.db, admin, { page: 1, pageSize: 200, sort: "serial", dir: "desc", setTypeId: types.qmh });
    expect(byType.rows.every((r) => r.setTypeId === types.qmh)).toBe(true);
    const serials = byType.rows.map((r) => r.serial);
    expect(serials).toEqual([...serials].sort().reverse());
    const bySerial = await listSets(t.db, admin, { page: 1, pageSize: 25, sort: "serial", dir: "asc", q: eyeSet.serial });
    expect(bySerial.rows.map((r) => r.id)).toEqual([eyeSet.id]);
    const byAssetReference = await listSets(t.db, admin, { page: 1, pageSize: 25, sort: "serial", dir: "asc", q: eyeSet.giai.slice(7) });
    expect(byAssetReference.rows.map((r) => r.id)).toEqual([eyeSet.id]);
    const bySite = await listSets(t.db, admin, { page: 1, pageSize: 200, sort: "serial", dir: "asc", siteId: site(EYE_CENTRE) });
    expect(bySite.rows.every((r) => r.homeSiteId === site(EYE_CENTRE))).toBe(true);
    expect(bySite.rows.map((r) => r.id)).toContain(eyeSet.id);
    const retired = await listSets(t.db, admin, { page: 1, pageSize: 200, sort: "serial", dir: "asc", status: "retired" });
    expect(retired.rows.every((r) => r.status === "retired")).toBe(true);
  });

  it("answers 404 for another organisation's set and for a clinic staff member's sibling site", async () => {
    const outsider = user("manager@otterwick.example");
    const res = await getSetRoute(await requestAs(outsider, `/api/sets/${theatreSet.id}`), params({ id: String(theatreSet.id) }));
    expect(res.status).toBe(404);
    expect(JSON.stringify(await res.json())).not.toContain(theatreSet.serial);

    const staff = user("theatres@quillby.example");
    const own = await getSetRoute(await requestAs(staff, `/api/sets/${theatreSet.id}`), params({ id: String(theatreSet.id) }));
    expect(own.status).toBe(200);
    expect((await own.json()).serial).toBe(theatreSet.serial);
    const sibling = await getSetRoute(await requestAs(staff, `/api/sets/${eyeSet.id}`), params({ id: String(eyeSet.id) }));
    expect(sibling.status).toBe(404);

    const manager = user("manager@quillby.example");
    const ownOrg = await getSetRoute(await requestAs(manager, `/api/sets/${eyeSet.id}`), params({ id: String(eyeSet.id) }));
    expect(ownOrg.status).toBe(200);
    const malformed = await getSetRoute(await requestAs(manager, "/api/sets/1%20or%201=1"), params({ id: "1 or 1=1" }));
    expect(malformed.status).toBe(404);
  });

  it("lists only the caller's sets, even when the query names another organisation", async () => {
    const outsider = user("manager@otterwick.example");
    const forged = await listSetsRoute(
      await requestAs(outsider, `/api/sets?organisationId=${seed.organisations.QMH}&pageSize=200`),
      params({}),
    );
    expect(forged.status).toBe(200);
    expect((await forged.json()).rows).toEqual([]);
    const own = await (await listSetsRoute(await requestAs(outsider, "/api/sets?pageSize=200"), params({}))).json();
    expect(own.rows.every((r: { organisationId: number }) => r.organisationId === seed.organisations.ODS)).toBe(true);

    const staff = user("theatres@quillby.example");
    const staffRows = (await (await listSetsRoute(await requestAs(staff, "/api/sets?pageSize=200"), params({}))).json()).rows;
    expect(staffRows.length).toBeGreaterThan(0);
    expect(staffRows.every((r: { homeSiteId: number }) => r.homeSiteId === site(THEATRES))).toBe(true);
    expect(staffRows.map((r: { id: number }) => r.id)).not.toContain(eyeSet.id);

    const anonymous = await listSetsRoute(await requestAs(null, "/api/sets"), params({}));
    expect(anonymous.status).toBe(401);
    const badQuery = await listSetsRoute(await requestAs(staff, "/api/sets?status=lost&sort=price"), params({}));
    expect(badQuery.status).toBe(422);
    expect(Object.keys((await badQuery.json()).error.fields).sort()).toEqual(["sort", "status"]);
  });

  it("finds a set from a scan or a typed code, within the caller's scope only", async () => {
    const manager = user("manager@quillby.example");
    const lookup = async (who: number, code: string) =>
      lookupRoute(await requestAs(who, `/api/sets/lookup?code=${encodeURIComponent(code)}`), params({}));
    const transmitted = encodeElementString([{ ai: "8004", value: eyeSet.giai }]);
    for (const code of [`]d2${transmitted}`, transmitted, `(8004)${eyeSet.giai}`, eyeSet.serial, eyeSet.serial.toLowerCase(), eyeSet.giai.slice(7), eyeSet.giai]) {
      const res = await lookup(manager, code);
      expect(res.status, code).toBe(200);
      expect((await res.json()).id).toBe(eyeSet.id);
    }
    const outsider = await lookup(user("manager@otterwick.example"), `]d2${transmitted}`);
    expect(outsider.status).toBe(404);
    expect(JSON.stringify(await outsider.json())).not.toContain("Quillby");
    const sibling = await lookup(user("theatres@quillby.example"), eyeSet.serial);
    expect(sibling.status).toBe(404);

    const product = await lookup(manager, "]d20109521234543213");
    expect(product.status).toBe(422);
    expect((await product.json()).error.message).toMatch(/product barcode \(GTIN 09521234543213\)/);
    const broken = await lookup(manager, "]d2800495");
    expect(broken.status).toBe(422);
    const missing = await lookupRoute(await requestAs(manager, "/api/sets/lookup"), params({}));
    expect(missing.status).toBe(422);

    // The same function the stations will call.
    const found = await findSetByScan(t.db, admin, `]d2${encodeElementString([{ ai: "8004", value: theatreSet.giai }])}`);
    expect(found.serial).toBe(theatreSet.serial);
  });

  it("serves the label as a PDF and the symbol as SVG, in scope and with the printing permission", async () => {
    const pdf = async (who: number, id: number, query = "") =>
      labelPdfRoute(await requestAs(who, `/api/sets/${id}/label.pdf${query}`), params({ id: String(id) }));
    const ok = await pdf(user("admin@larkmoor.example"), eyeSet.id);
    expect(ok.status).toBe(200);
    expect(ok.headers.get("content-type")).toBe("application/pdf");
    expect(ok.headers.get("content-disposition")).toContain(`label-${eyeSet.serial}.pdf`);
    const bytes = Buffer.from(await ok.arrayBuffer());
    expect(bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(bytes.includes(Buffer.from("/Subtype /Image"))).toBe(true); // the DataMatrix PNG
    // 100 × 50 mm = 283.46 × 141.73 pt (1 in = 25.4 mm = 72 pt).
    expect(bytes.toString("latin1")).toMatch(/\/MediaBox \[0 0 283\.46\d* 141\.73\d*\]/);
    const withContents = await pdf(user("tech@larkmoor.example"), eyeSet.id, "?contents=1");
    expect(withContents.status).toBe(200);
    expect(Buffer.from(await withContents.arrayBuffer()).toString("latin1")).toMatch(/\/MediaBox \[0 0 283\.46\d* 425\.19\d*\]/);

    expect((await pdf(user("manager@otterwick.example"), eyeSet.id)).status).toBe(404);
    expect((await pdf(user("theatres@quillby.example"), eyeSet.id)).status).toBe(404);
    // The owner may see the set but printing labels is the unit's job.
    expect((await pdf(user("manager@quillby.example"), eyeSet.id)).status).toBe(403);

    const svg = await labelSvgRoute(await requestAs(user("admin@larkmoor.example"), `/api/sets/${eyeSet.id}/label.svg`), params({ id: String(eyeSet.id) }));
    expect(svg.status).toBe(200);
    expect(svg.headers.get("content-type")).toContain("image/svg+xml");
    const text = await svg.text();
    expect(text).toContain("<svg");
    expect(text).toContain("<path");
    const outsiderSvg = await labelSvgRoute(
      await requestAs(user("manager@otterwick.example"), `/api/sets/${eyeSet.id}/label.svg`),
      params({ id: String(eyeSet.id) }),
    );
    expect(outsiderSvg.status).toBe(404);
  });
});
