import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { NextRequest } from "next/server";
import type { SeedResult } from "@/db/seed/demo";
import { can, PERMISSIONS, type Action } from "@/lib/auth/permissions";
import { isCustomerRole, type Role } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session-user";
import { declaredPermission } from "@/lib/http/entry-points";
import type { DB } from "@/db";
import { writeCounter } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { absolute, HTTP_METHODS, routeModules, serverActionModules } from "../support/entry-points";
import { params, requestAs, sessionUser } from "../support/session";

// Tenant isolation over every entry point the code defines: each route handler method and each
// server action, called as every role of two customer organisations with the OTHER
// organisation's ids, and as every role of the unit. Nothing here is a hand-kept list of entry
// points: a new route or action without a fixture fails with "add a fixture for …".

const session = vi.hoisted(() => ({ user: null as SessionUser | null }));
vi.mock("@/lib/auth/current-user", async (importOriginal) => ({
  ...(await importOriginal<typeof import("@/lib/auth/current-user")>()),
  getCurrentUser: async () => session.user,
}));

/** Entry points that are public on purpose, with the reason. */
const PUBLIC_ROUTES: Record<string, string> = {
  "GET /api/auth/[...nextauth]": "next-auth's own sign-in endpoints: the caller is not signed in yet",
  "POST /api/auth/[...nextauth]": "next-auth's own sign-in endpoints: the caller is not signed in yet",
  "POST /api/webhooks/stripe": "the payment service's webhook, authenticated by its signature",
};
const PUBLIC_ACTIONS: Record<string, string> = {
  "app/(auth)/accept-invite/actions.ts#acceptInvitationAction": "sets an invited person's password; the one-time token is the credential",
};
/** Actions whose input names no record: they act on the caller's own row only. */
const SELF_ONLY_ACTIONS: Record<string, string> = {
  "app/(clinic)/clinic/settings/actions.ts#saveMailPreferencesAction": "saves the caller's own e-mail preferences; its input has no id",
};

const CUSTOMER_A = "QMH";
const CUSTOMER_B = "ODS";
const CALLERS: { email: string; org: string }[] = [
  { email: "manager@quillby.example", org: CUSTOMER_A },
  { email: "theatres@quillby.example", org: CUSTOMER_A },
  { email: "manager@otterwick.example", org: CUSTOMER_B },
  { email: "staff@otterwick.example", org: CUSTOMER_B },
  { email: "admin@larkmoor.example", org: "LSS" },
  { email: "dispatch@larkmoor.example", org: "LSS" },
  { email: "driver@larkmoor.example", org: "LSS" },
  { email: "tech@larkmoor.example", org: "LSS" },
  { email: "quality@larkmoor.example", org: "LSS" },
  { email: "finance@larkmoor.example", org: "LSS" },
];

/** One organisation's records of each kind, picked from the demo data. */
interface TenantRecords {
  orgId: number;
  siteId: number;
  userId: number;
  orderId: number;
  bookedOrderId: number;
  cycleId: number;
  setId: number;
  setSerial: string;
  setTypeId: number;
  contractId: number;
  problemId: number;
  fileId: number;
  invoiceId: number;
  creditNoteId: number;
  /** Text that must never appear in an answer to another tenant. */
  markers: string[];
}

async function tenantRecords(db: DB, orgId: number): Promise<TenantRecords> {
  const first = async <T>(q: Promise<T | undefined>, what: string): Promise<T> => {
    const row = await q;
    if (!row) throw new Error(`the demo data has no ${what} for organisation ${orgId}: add one to db/seed`);
    return row;
  };
  const org = await first(db.selectFrom("organisations").select("name").where("id", "=", orgId).executeTakeFirst(), "organisation");
  const sites = await db.selectFrom("sites").select(["id", "name"]).where("organisation_id", "=", orgId).orderBy("id").execute();
  const users = await db.selectFrom("users").select(["id", "email"]).where("organisation_id", "=", orgId).orderBy("id").execute();
  const sets = await db.selectFrom("sets").select(["id", "serial", "set_type_id"]).where("organisation_id", "=", orgId).orderBy("id").execute();
  const orders = await db.selectFrom("orders").select(["id", "reference", "status"]).where("organisation_id", "=", orgId).orderBy("id").execute();
  const cycle = await first(
    db.selectFrom("cycles").select(["id", "set_id"]).where("organisation_id", "=", orgId).orderBy("id", "desc").executeTakeFirst(),
    "cycle",
  );
  const contract = await first(db.selectFrom("contracts").select("id").where("organisation_id", "=", orgId).executeTakeFirst(), "contract");
  const problem = await first(db.selectFrom("problems").select("id").where("organisation_id", "=", orgId).executeTakeFirst(), "problem");
  const invoice = await first(db.selectFrom("invoices").select("id").where("organisation_id", "=", orgId).orderBy("id").executeTakeFirst(), "invoice");
  const creditNote = await db
    .selectFrom("credit_notes")
    .innerJoin("invoices", "invoices.id", "credit_notes.invoice_id")
    .select("credit_notes.id")
    .where("invoices.organisation_id", "=", orgId)
    .executeTakeFirst();
  let fileId = (await db.selectFrom("files").select("id").where("organisation_id", "=", orgId).executeTakeFirst())?.id;
  if (fileId === undefined) {
    const row = await db
      .insertInto("files")
      .values({
        organisation_id: orgId,
        purpose: "problem_photo",
        original_name: "tray.png",
        content_type: "image/png",
        size_bytes: 1,
        sha256: "0".repeat(64),
        storage_key: `isolation-${orgId}`,
        uploaded_by: users[0]!.id,
        created_at: new Date().toISOString(),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    fileId = row.id;
  }
  if (!sites.length || !users.length || !sets.length || !orders.length) throw new Error(`organisation ${orgId} lacks sites, users, sets or orders`);
  return {
    orgId,
    siteId: sites[0]!.id,
    userId: users[users.length - 1]!.id,
    orderId: orders[0]!.id,
    bookedOrderId: (orders.find((o) => o.status === "booked") ?? orders[orders.length - 1]!).id,
    cycleId: cycle.id,
    setId: sets[0]!.id,
    setSerial: sets[0]!.serial,
    setTypeId: sets[0]!.set_type_id,
    contractId: contract.id,
    problemId: problem.id,
    fileId,
    invoiceId: invoice.id,
    // An organisation without a credit note still gets a real credit-note id of its own invoice's
    // kind from nowhere else: a missing one is a gap in the demo data, answered by an impossible id.
    creditNoteId: creditNote?.id ?? 999_999,
    markers: [org.name, ...sites.map((s) => s.name), ...users.map((u) => u.email), ...sets.map((s) => s.serial), ...orders.map((o) => o.reference)],
  };
}

/** Prefixes whose records belong to the unit, not to a customer: customers never see them. */
const UNIT_RECORDS = new Set([
  "/api/batches/[id]",
  "/api/billing/runs/[id]",
  "/api/stations/washing/batches/[id]",
  "/api/stations/sterilising/loads/[id]",
  "/api/loads/[id]",
  "/api/runs/[runId]",
  "/api/dispatch/[day]",
  "/api/dispatch/[day]/manifest/[vanId]",
]);

/** The first row of a unit-owned table; a table the demo leaves empty gives an id that does not exist. */
async function anyId(db: DB, table: "washer_batches" | "invoice_runs" | "route_runs" | "steriliser_loads" | "vans"): Promise<number> {
  return (await db.selectFrom(table).select("id").orderBy("id").executeTakeFirst())?.id ?? 987_654;
}

/** The record each dynamic segment names, by the route prefix that ends in it. */
const ID_FIXTURES: Record<string, (t: TenantRecords, db: DB) => Promise<number | string> | number | string> = {
  "/api/batches/[id]": (_t, db) => anyId(db, "washer_batches"),
  "/api/billing/invoices/[id]": (t) => t.invoiceId,
  "/api/billing/invoices/[id]/credit-notes/[creditNoteId]": (t) => t.creditNoteId,
  "/api/billing/runs/[id]": (_t, db) => anyId(db, "invoice_runs"),
  "/api/contracts/[id]": (t) => t.contractId,
  "/api/dispatch/[day]": async (_t, db) => (await db.selectFrom("route_plans").select("day").orderBy("day", "desc").executeTakeFirst())?.day ?? "2026-12-02",
  "/api/dispatch/[day]/manifest/[vanId]": (_t, db) => anyId(db, "vans"),
  "/api/loads/[id]": (_t, db) => anyId(db, "steriliser_loads"),
  // A recall of the other tenant's sets only, so that nothing in it is the caller's.
  "/api/recalls/[id]": async (t, db) =>
    (
      await db
        .selectFrom("recall_items")
        .select("recall_id")
        .groupBy("recall_id")
        .having((eb) => eb.fn.min("organisation_id"), "=", t.orgId)
        .having((eb) => eb.fn.max("organisation_id"), "=", t.orgId)
        .executeTakeFirst()
    )?.recall_id ?? 987_654,
  "/api/files/[id]": (t) => t.fileId,
  "/api/orders/[id]": (t) => t.orderId,
  "/api/organisations/[id]": (t) => t.orgId,
  "/api/problems/[id]": (t) => t.problemId,
  "/api/set-types/[id]": (t) => t.setTypeId,
  "/api/sets/[id]": (t) => t.setId,
  "/api/sites/[id]": (t) => t.siteId,
  "/api/runs/[runId]": (_t, db) => anyId(db, "route_runs"),
  "/api/runs/[runId]/stops/[stopId]": async (t, db) =>
    (await db.selectFrom("route_stops").select("id").where("organisation_id", "=", t.orgId).orderBy("id").executeTakeFirst())?.id ?? 987_654,
  "/api/stations/sterilising/loads/[id]": (_t, db) => anyId(db, "steriliser_loads"),
  "/api/stations/washing/batches/[id]": (_t, db) => anyId(db, "washer_batches"),
  "/api/users/[id]": (t) => t.userId,
};

const day = (offset: number, time: string) => {
  const d = new Date(Date.now() + offset * 86_400_000);
  return `${d.toISOString().slice(0, 10)}T${time}`;
};
const booking = (t: TenantRecords) => ({
  siteId: t.siteId,
  setIds: [t.setId],
  extras: [],
  collectionFrom: day(2, "09:00"),
  collectionUntil: day(2, "12:00"),
  neededBackBy: day(6, "08:00"),
  serviceLevel: "standard",
  heavySoil: false,
  keepInStore: false,
  notes: "",
});

/** Bodies for state-changing routes without an id in the path, naming the other tenant's records. */
const BODY_FIXTURES: Record<string, (t: TenantRecords) => BodyInit | object> = {
  "POST /api/orders/preview": (t) => booking(t),
  "POST /api/files": (t) => {
    const form = new FormData();
    form.set("file", new File([new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0])], "photo.png", { type: "image/png" }));
    form.set("purpose", "problem_photo");
    form.set("organisationId", String(t.orgId));
    return form;
  },
};
/**
 * Entry points that refuse another tenant's record as a field error of the form (the booking
 * rules list every problem at once). Allowed only when the answer is exactly the one a record
 * that does not exist gets, so the refusal tells the caller nothing.
 */
const FIELD_REFUSALS: Record<string, string> = {
  "POST /api/orders/preview": "the booking preview lists the site as a problem of the form",
  "lib/orders/actions.ts#bookPickupAction": "booking reports a foreign site as a field error, like a site that does not exist",
};
/** The same kind of records, none of which exists. */
const nowhere = (t: TenantRecords): TenantRecords => ({
  ...t,
  ...Object.fromEntries(Object.entries(t).filter(([, v]) => typeof v === "number").map(([k]) => [k, 987_654])),
  setSerial: "NOPE-987654",
  markers: [],
});

/** Routes that may answer 2xx to another tenant's ids because they never act on them, and the check that proves it. */
const OWN_WRITE_ROUTES: Record<string, string> = {
  "POST /api/files": "a customer's upload always lands in the caller's own organisation, whatever organisationId it names",
};

/** Inputs for the server actions a customer may call, naming the other tenant's records. */
const ACTION_FIXTURES: Record<string, (t: TenantRecords) => unknown> = {
  "lib/orders/actions.ts#bookPickupAction": (t) => booking(t),
  "lib/orders/actions.ts#amendPickupAction": (t) => ({ ...booking(t), orderId: t.bookedOrderId }),
  "lib/orders/actions.ts#cancelPickupAction": (t) => ({ orderId: t.bookedOrderId, reason: "No longer needed" }),
  "lib/orders/actions.ts#requestFromStoreAction": (t) => ({ siteId: t.siteId, cycleIds: [t.cycleId], neededBy: day(5, "08:00"), notes: "" }),
  "lib/expiry/actions.ts#sendBackAction": (t) => ({ cycleId: t.cycleId }),
  "lib/problems/actions.ts#reportProblemAction": (t) => ({
    orderId: t.orderId,
    cycleId: null,
    kind: "other",
    description: "The lid of the container does not close.",
    photoFileId: t.fileId,
  }),
  "lib/procedures/actions.ts#recordUseAction": (t) => ({
    code: t.setSerial,
    theatre: "Theatre 2",
    caseReference: "CASE-4471",
    packChecked: true,
    indicatorChecked: true,
  }),
  "lib/users/actions.ts#inviteUserAction": (t) => ({
    name: "Wren Oddsworth",
    email: "wren.oddsworth@isolation.example",
    role: "clinic_staff",
    organisationId: t.orgId,
    siteId: t.siteId,
  }),
  "lib/users/actions.ts#resendInvitationAction": (t) => ({ userId: t.userId }),
  "lib/users/actions.ts#setUserStatusAction": (t) => ({ userId: t.userId, status: "disabled" }),
  "app/(clinic)/clinic/invoices/[id]/actions.ts#startPaymentAction": (t) => ({ invoiceId: t.invoiceId }),
};

/** A query string naming the other tenant's records under every filter name the lists use. */
const foreignQuery = (t: TenantRecords) =>
  new URLSearchParams({
    organisationId: String(t.orgId),
    siteId: String(t.siteId),
    orderId: String(t.orderId),
    setId: String(t.setId),
    setTypeId: String(t.setTypeId),
    cycleId: String(t.cycleId),
    invoiceId: String(t.invoiceId),
    userId: String(t.userId),
    code: t.setSerial,
    pageSize: "200",
  }).toString();

const unitRoles = (Object.keys(PERMISSIONS) as Role[]).filter((r) => !isCustomerRole(r));
/** An action only customers hold: unit staff must be refused it. */
const customerOnly = (action: Action) => unitRoles.every((r) => !can(r, action));

let t: DemoDatabase;
let seed: SeedResult;
const records: Record<string, TenantRecords> = {};
const users: Record<string, SessionUser> = {};
let cells = 0;

/** Rows written so far (tests/support/db.ts). */
let totalChanges: () => Promise<number>;

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
  totalChanges = await writeCounter(t.db);
  for (const code of [CUSTOMER_A, CUSTOMER_B]) records[code] = await tenantRecords(t.db, seed.organisations[code]!);
  for (const c of CALLERS) users[c.email] = await sessionUser(t.db, seed.users[c.email]!);
}, 300_000);
afterAll(async () => {
  console.info(`tenant isolation matrix: ${cells} checks over ${routeModules().length} route modules and ${serverActionModules().length} action modules`);
  await t.cleanup();
});

const other = (org: string) => records[org === CUSTOMER_A ? CUSTOMER_B : CUSTOMER_A]!;
const own = (org: string) => records[org]!;

const fixturePrefix = (route: string, param: string) => route.slice(0, route.indexOf(`[${param}]`) + param.length + 2);
const fixtureFor = (route: string, param: string): (typeof ID_FIXTURES)[string] | undefined => ID_FIXTURES[fixturePrefix(route, param)];

describe("tenant isolation over every route handler", () => {
  const modules = routeModules();

  it("finds the route handlers from the code", () => {
    expect(modules.length).toBeGreaterThan(40);
  });

  for (const mod of modules) {
    it(`${mod.route}`, async () => {
      const exports = (await import(/* @vite-ignore */ mod.file)) as Record<string, unknown>;
      const methods = HTTP_METHODS.filter((m) => typeof exports[m] === "function");
      expect(methods.length, `${mod.route} exports no HTTP method`).toBeGreaterThan(0);
      const failures: string[] = [];
      for (const method of methods) {
        const key = `${method} ${mod.route}`;
        const handler = exports[method] as (req: Request, ctx: unknown) => Promise<Response>;
        const permission = declaredPermission(handler);
        if (!permission) {
          expect(PUBLIC_ROUTES[key], `${key} is not wrapped in withAuth: wrap it, or list it as public with the reason`).toBeDefined();
          continue;
        }
        for (const id of mod.params) {
          expect(fixtureFor(mod.route, id), `add a fixture for ${mod.route} (its [${id}] segment) in ID_FIXTURES`).toBeDefined();
        }
        for (const caller of CALLERS) {
          const user = users[caller.email]!;
          const customer = isCustomerRole(user.role);
          if (!customer && can(user.role, permission) && !customerOnly(permission)) continue;
          const target = customer ? other(caller.org) : own(CUSTOMER_A);
          const values: Record<string, string> = {};
          for (const id of mod.params) values[id] = String(await fixtureFor(mod.route, id)!(target, t.db));
          const pathname = mod.params.reduce((p, id) => p.replace(new RegExp(`\\[(\\.\\.\\.)?${id}\\]`), values[id]!), mod.route);
          const allowed = customer && can(user.role, permission);
          let body: BodyInit | object | undefined;
          if (method !== "GET" && method !== "HEAD" && allowed && mod.params.length === 0) {
            const make = BODY_FIXTURES[key];
            expect(make, `add a fixture for ${key} in BODY_FIXTURES`).toBeDefined();
            body = make!(target);
          }
          const url = method === "GET" ? `${pathname}?${foreignQuery(target)}` : pathname;
          const call = async (payload: typeof body) => {
            const req = await requestAs(seed.users[caller.email]!, url, { method, origin: "http://localhost:3000" });
            const headers = new Headers(req.headers);
            if (payload !== undefined && !(payload instanceof FormData)) headers.set("content-type", "application/json");
            const sent =
              payload === undefined
                ? req
                : new NextRequest(req.url, { method, headers, body: payload instanceof FormData ? payload : JSON.stringify(payload) });
            return handler(sent as never, params(values));
          };
          const before = await totalChanges();
          const res = await call(body);
          const text = await res.text();
          cells++;
          // What the caller sent may come back in a message ("no set X in your scope"): that is no leak.
          const sentText = decodeURIComponent(url) + (body && !(body instanceof FormData) ? JSON.stringify(body) : "");
          const where = `${key} as ${caller.email} (${user.role}) with ${customer ? "the other tenant's" : "a customer's"} ids`;
          if (!allowed) {
            if (res.status !== 403) failures.push(`${where}: expected 403, got ${res.status}`);
          } else if (FIELD_REFUSALS[key]) {
            const ghost = await call(BODY_FIXTURES[key]!(nowhere(target)));
            const ghostText = await ghost.text();
            if (res.status !== ghost.status || text !== ghostText) {
              failures.push(`${where}: answers ${res.status} ${text.slice(0, 160)} but a record that does not exist gets ${ghost.status} ${ghostText.slice(0, 160)}`);
            }
          } else if (mod.params.length > 0 || (method !== "GET" && !OWN_WRITE_ROUTES[key])) {
            if (res.status !== 403 && res.status !== 404) failures.push(`${where}: expected 403 or 404, got ${res.status} ${text.slice(0, 200)}`);
          } else {
            // A list or an own-tenant write answers the caller's own data: never the other's.
            if (res.status >= 500) failures.push(`${where}: ${res.status} ${text.slice(0, 200)}`);
            const leaked = target.markers.filter((m) => text.includes(m) && !sentText.includes(m));
            if (leaked.length) failures.push(`${where}: the answer names the other tenant's ${leaked.slice(0, 3).join(", ")}`);
            if (OWN_WRITE_ROUTES[key] && res.ok) {
              const saved = await t.db.selectFrom("files").select("organisation_id").where("id", "=", JSON.parse(text).id).executeTakeFirstOrThrow();
              if (saved.organisation_id !== user.organisationId) failures.push(`${where}: saved into organisation ${saved.organisation_id}`);
            }
          }
          const wrote = (await totalChanges()) - before;
          if (wrote !== 0 && !(OWN_WRITE_ROUTES[key] && res.ok)) failures.push(`${where}: wrote ${wrote} rows`);
        }
      }
      expect(failures).toEqual([]);
    });
  }

  it("gives the owner its own records through the same fixtures, so a 404 above is not a wrong id", async () => {
    const manager = users["manager@quillby.example"]!;
    const checked: string[] = [];
    for (const mod of modules.filter((m) => m.params.length > 0)) {
      const exports = (await import(/* @vite-ignore */ mod.file)) as Record<string, unknown>;
      const handler = exports.GET as ((req: Request, ctx: unknown) => Promise<Response>) | undefined;
      const permission = declaredPermission(handler);
      if (!handler || !permission || !can(manager.role, permission)) continue;
      const values: Record<string, string> = {};
      for (const id of mod.params) values[id] = String(await fixtureFor(mod.route, id)!(own(CUSTOMER_A), t.db));
      // A kind the demo has no record of for this organisation cannot prove anything here.
      if (Object.values(values).some((v) => v === "999999" || v === "987654") || UNIT_RECORDS.has(fixturePrefix(mod.route, mod.params[0]!))) continue;
      const pathname = mod.params.reduce((p, id) => p.replace(`[${id}]`, values[id]!), mod.route);
      const res = await handler((await requestAs(manager.id, pathname)) as never, params(values));
      // 403: the route refuses the role whatever the record (a label is the unit's to print).
      expect([200, 403], `${mod.route} as the owner`).toContain(res.status);
      if (res.status === 200) checked.push(mod.route);
    }
    expect(checked.length).toBeGreaterThan(8);
  });
});

describe("tenant isolation over every server action", () => {
  const files = serverActionModules();

  it("finds the server action modules from the code", () => {
    expect(files.length).toBeGreaterThan(10);
  });

  for (const file of files) {
    it(file, async () => {
      const exports = (await import(/* @vite-ignore */ absolute(file))) as Record<string, unknown>;
      const problems: string[] = [];
      for (const [name, fn] of Object.entries(exports)) {
        const key = `${file}#${name}`;
        if (typeof fn !== "function") {
          problems.push(`${key} is not a function: a "use server" module exports only actions`);
          continue;
        }
        const permission = declaredPermission(fn);
        if (!permission) {
          if (!PUBLIC_ACTIONS[key]) problems.push(`${key} is not built with defineAction: build it so, or list it as public with the reason`);
          continue;
        }
        for (const caller of CALLERS) {
          const user = users[caller.email]!;
          const customer = isCustomerRole(user.role);
          if (!customer && can(user.role, permission) && !customerOnly(permission)) continue;
          const allowed = customer && can(user.role, permission);
          if (allowed && SELF_ONLY_ACTIONS[key]) continue;
          let input: unknown = {};
          if (allowed) {
            const make = ACTION_FIXTURES[key];
            if (!make) {
              problems.push(`add a fixture for ${key} in ACTION_FIXTURES`);
              continue;
            }
            input = make(other(caller.org));
          }
          session.user = user;
          const before = await totalChanges();
          const result = (await (fn as (i: unknown) => Promise<{ ok: boolean; error?: { code: string; message: string } }>)(input)) ?? {};
          const wrote = (await totalChanges()) - before;
          cells++;
          const where = `${key} as ${caller.email} (${user.role})`;
          const expected = allowed ? ["forbidden", "not_found"] : ["forbidden"];
          if (allowed && FIELD_REFUSALS[key]) {
            const ghost = await (fn as (i: unknown) => Promise<unknown>)(ACTION_FIXTURES[key]!(nowhere(other(caller.org))));
            if (result.ok || JSON.stringify(result) !== JSON.stringify(ghost)) {
              problems.push(`${where}: answers ${JSON.stringify(result).slice(0, 160)} but a record that does not exist gets ${JSON.stringify(ghost).slice(0, 160)}`);
            }
          } else if (result.ok || !expected.includes(result.error?.code ?? "")) {
            problems.push(`${where}: expected ${expected.join(" or ")}, got ${JSON.stringify(result).slice(0, 240)}`);
          }
          if (wrote !== 0) problems.push(`${where}: wrote ${wrote} rows`);
        }
      }
      session.user = null;
      expect(problems).toEqual([]);
    });
  }
});
