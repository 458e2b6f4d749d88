import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getOrganisationRoute } from "@/app/api/organisations/[id]/route";
import { GET as listOrganisationsRoute } from "@/app/api/organisations/route";
import { GET as listSitesRoute } from "@/app/api/sites/route";
import type { SeedResult } from "@/db/seed/demo";
import { AppError } from "@/lib/errors";
import { organisationSchema } from "@/lib/organisations/schemas";
import { createCustomer, setOrganisationActive, updateOrganisation } from "@/lib/organisations/service";
import { weeklyHours } from "@/lib/sites/opening-hours";
import { siteSchema } from "@/lib/sites/schemas";
import { createSite, setSiteActive, updateSite } from "@/lib/sites/service";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
const TABLES = ["organisations", "sites", "audit_log"] as const;

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
});
afterAll(() => t.cleanup());

const siteInput = (organisationId: number, overrides: Record<string, unknown> = {}) => ({
  organisationId,
  name: "Brackwater Minor Surgery Room",
  addressLine1: "3 Brackwater Row",
  addressLine2: "",
  town: "Brackwater",
  postcode: "LK20 1BW",
  latitude: "53.61",
  longitude: "-1.52",
  openingHours: weeklyHours(["mon", "wed", "fri"], "09:00", "17:00"),
  deliveryNotes: "",
  contactName: "",
  contactPhone: "",
  contactEmail: "",
  ...overrides,
});

async function rejects(promise: Promise<unknown>, code: AppError["code"]) {
  const error = await promise.then(() => null, (e: unknown) => e);
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).code).toBe(code);
  return error as AppError;
}

describe("customers", () => {
  it("adds a customer and refuses a duplicate name or short code without writing", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    const input = organisationSchema.parse({ name: "Brackwater Health Centre", shortCode: "bhc", billingEmail: "Pay@Brackwater.example" });
    expect(input).toEqual({ name: "Brackwater Health Centre", shortCode: "BHC", billingEmail: "pay@brackwater.example" });
    const { id } = await createCustomer(t.db, admin, input);
    const before = await countRows(t.db, [...TABLES]);
    const byName = await rejects(createCustomer(t.db, admin, { ...input, shortCode: "BHX" }), "conflict");
    expect(byName.fields?.name).toBeTruthy();
    const byCode = await rejects(createCustomer(t.db, admin, { ...input, name: "Other Name" }), "conflict");
    expect(byCode.message).toContain("BHC");
    await rejects(updateOrganisation(t.db, admin, { id, name: "Quillby Moor Hospitals", shortCode: "BHC", billingEmail: null }), "conflict");
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("validates the short code and e-mail with messages that say what to fix", () => {
    const result = organisationSchema.safeParse({ name: "X", shortCode: "a b", billingEmail: "nope" });
    expect(result.success).toBe(false);
    const byField = Object.fromEntries(result.error!.issues.map((i) => [i.path[0], i.message]));
    expect(byField.name).toMatch(/Enter the organisation's name/);
    expect(byField.shortCode).toMatch(/capital letters/);
    expect(byField.billingEmail).toMatch(/valid e-mail/);
  });

  it("keeps administration with the administrator", async () => {
    const finance = await sessionUser(t.db, seed.users["finance@larkmoor.example"]!);
    await rejects(createCustomer(t.db, finance, { name: "Nope", shortCode: "NOPE", billingEmail: null }), "forbidden");
    const manager = seed.users["manager@quillby.example"]!;
    const res = await listOrganisationsRoute(await requestAs(manager, "/api/organisations"), params({}));
    expect(res.status).toBe(403);
    const one = await getOrganisationRoute(await requestAs(manager, `/api/organisations/${seed.organisations.ODS}`), params({ id: String(seed.organisations.ODS) }));
    expect(one.status).toBe(403);
  });

  it("lists organisations with their counts, filtered and sorted on the server", async () => {
    const res = await listOrganisationsRoute(await requestAs(seed.users["dispatch@larkmoor.example"]!, "/api/organisations?sort=sites&dir=desc&active=yes"), params({}));
    const body = await res.json();
    expect(res.status).toBe(200);
    expect(body.rows[0]).toMatchObject({ name: "Quillby Moor Hospitals", sites: 3 });
    expect(body.rows.map((r: { sites: number }) => r.sites)).toEqual([...body.rows.map((r: { sites: number }) => r.sites)].sort((a, b) => b - a));
  });

  it("will not switch off the unit itself", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    await rejects(setOrganisationActive(t.db, admin, { id: seed.organisations.LSS!, active: false }), "conflict");
  });
});

describe("sites", () => {
  it("adds and edits a site; the opening hours are checked", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    const { id } = await createSite(t.db, admin, siteSchema.parse(siteInput(seed.organisations.PVC!)));
    await updateSite(t.db, admin, { ...siteSchema.parse(siteInput(seed.organisations.PVC!, { name: "Brackwater Surgery Room" })), id });
    const row = await t.db.selectFrom("sites").selectAll().where("id", "=", id).executeTakeFirstOrThrow();
    expect(row.name).toBe("Brackwater Surgery Room");
    expect(JSON.parse(row.opening_hours).mon).toEqual([{ start: "09:00", end: "17:00" }]);
    // A site cannot be moved to another organisation by editing it.
    await rejects(updateSite(t.db, admin, { ...siteSchema.parse(siteInput(seed.organisations.ODS!)), id }), "validation");
  });

  it("rejects bad hours, coordinates and a duplicate name, writing nothing", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    const before = await countRows(t.db, [...TABLES]);
    const bad = siteSchema.safeParse(
      siteInput(seed.organisations.PVC!, {
        latitude: "95",
        longitude: "east",
        openingHours: {
          ...weeklyHours([], "00:00", "00:00"),
          mon: [{ start: "17:00", end: "09:00" }],
          tue: [
            { start: "08:00", end: "12:00" },
            { start: "11:00", end: "15:00" },
          ],
          wed: [{ start: "8am", end: "12:00" }],
        },
      }),
    );
    expect(bad.success).toBe(false);
    const messages = bad.error!.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    expect(messages).toEqual(
      expect.arrayContaining([
        "latitude: Latitude is between −90 and 90.",
        "longitude: Enter the longitude in decimal degrees.",
        "openingHours.mon.0: The closing time must be after the opening time.",
        "openingHours.tue: Tuesday has overlapping hours.",
        "openingHours.wed.0.start: Use a time like 08:30.",
      ]),
    );
    await rejects(createSite(t.db, admin, siteSchema.parse(siteInput(seed.organisations.QMH!, { name: "Quillby Moor Eye Centre" }))), "conflict");
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("keeps the depot switched on", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    await rejects(setSiteActive(t.db, admin, { id: seed.sites["Larkmoor reprocessing unit"]!, active: false }), "conflict");
  });

  it("pages the sites table in the caller's scope", async () => {
    const manager = seed.users["manager@marrowgate.example"]!;
    const res = await listSitesRoute(await requestAs(manager, `/api/sites?organisationId=${seed.organisations.QMH}`), params({}));
    expect((await res.json()).rows).toEqual([]);
    const own = await (await listSitesRoute(await requestAs(manager, "/api/sites?sort=name&pageSize=2"), params({}))).json();
    expect(own.total).toBe(3);
    expect(own.rows.map((r: { name: string }) => r.name)).toEqual(["Cowl Street Dental", "Millbeck Dental"]);
  });
});
