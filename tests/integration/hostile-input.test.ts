import fc from "fast-check";
import { sql } from "kysely";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { z } from "zod";
import type { SeedResult } from "@/db/seed/demo";
import { can, PERMISSIONS, type Action } from "@/lib/auth/permissions";
import type { Role } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session-user";
import { commitImport } from "@/lib/catalogue/import-service";
import { readCatalogueFile } from "@/lib/catalogue/import";
import { CycleRecordError } from "@/lib/cycles/errors";
import { parseSterilizerRecord, parseWasherRecord } from "@/lib/cycles/parse";
import { AppError } from "@/lib/errors";
import { declaredPermission, declaredSchema } from "@/lib/http/entry-points";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { absolute, routeModules, serverActionModules } from "../support/entry-points";
import { params, requestAs, sessionUser } from "../support/session";

// Hostile input everywhere people type: unicode, very long text, control characters, SQL- and
// HTML-looking text, emoji, right-to-left marks, NUL. Every server action (through its real
// wrapper, with inputs shaped by its own schema), every GET handler's query and path, and the CSV
// importers (catalogue, washer and steriliser records) must answer with a clear error or a correct
// save: never an unhandled exception, and nothing written when they refuse.

const session = vi.hoisted(() => ({ user: null as SessionUser | null }));
vi.mock("@/lib/auth/current-user", async (importOriginal) => ({
  ...(await importOriginal<typeof import("@/lib/auth/current-user")>()),
  getCurrentUser: async () => session.user,
}));
// Called outside a Next.js request here, revalidating a page's cache has no store to clear.
vi.mock("next/cache", async (importOriginal) => ({
  ...(await importOriginal<typeof import("next/cache")>()),
  revalidatePath: () => undefined,
  revalidateTag: () => undefined,
}));

const hostileText = fc.oneof(
  fc.string({ unit: "grapheme", maxLength: 40 }),
  fc.string({ unit: "binary", maxLength: 40 }),
  fc.constantFrom(
    "' OR 1=1 --",
    '"); DROP TABLE users; --',
    "<script>alert(1)</script>",
    "<img src=x onerror=alert(1)>",
    "\u0000",
    "a\u0000b",
    "\u202Ereversed\u202C",
    "\u200F\u200E",
    "🧼🦠💉🏥",
    "x".repeat(10_000),
    "=HYPERLINK(\"http://x\")",
    "../../etc/passwd",
    "%00%0d%0a",
    "NaN",
    "-1",
    "1e309",
    "0x10",
    "   ",
    "",
    "2026-02-30T25:61",
  ),
  fc.string({ unit: fc.constantFrom("\u0000", "\u200F", "\u202E", "\uFEFF", "'", '"', "<", ">", "&", "\\", "%", "_", "é", "🦠", "\n", "\r", "\t"), maxLength: 30 }),
);

type Def = { type: string; innerType?: z.ZodType; in?: z.ZodType; element?: z.ZodType; values?: unknown[]; entries?: Record<string, unknown>; options?: z.ZodType[] };
const defOf = (schema: z.ZodType): Def => (schema as unknown as { _zod: { def: Def } })._zod.def;

/** Values of the shape the schema expects, with hostile text wherever text (or anything) goes. */
function shaped(schema: z.ZodType, depth = 0): fc.Arbitrary<unknown> {
  const def = defOf(schema);
  const anything = fc.oneof(hostileText, fc.constantFrom(null, undefined, 0, -1, 1.5, 2 ** 53, true, [], {}));
  if (depth > 4) return anything;
  switch (def.type) {
    case "optional":
    case "nullable":
    case "default":
    case "prefault":
    case "readonly":
    case "catch":
    case "nonoptional":
      return fc.oneof(shaped(def.innerType!, depth + 1), fc.constant(undefined), fc.constant(null));
    case "pipe":
      return shaped(def.in!, depth + 1);
    case "object": {
      const shape = (schema as unknown as { shape: Record<string, z.ZodType> }).shape;
      return fc.record(Object.fromEntries(Object.entries(shape).map(([k, v]) => [k, shaped(v, depth + 1)])));
    }
    case "array":
      return fc.array(shaped(def.element!, depth + 1), { maxLength: 3 });
    case "enum":
      return fc.oneof(fc.constantFrom(...Object.values(def.entries ?? {})), hostileText);
    case "literal":
      return fc.oneof(fc.constantFrom(...(def.values ?? [])), anything);
    case "boolean":
      return fc.oneof(fc.boolean(), anything);
    case "number":
    case "int":
      return fc.oneof(fc.integer({ min: 1, max: 5 }), fc.constantFrom("1", "2", "-3", "9999999999999999"), anything);
    case "union":
      return fc.oneof(...(def.options ?? []).map((o) => shaped(o, depth + 1)), anything);
    case "string":
      return fc.oneof(hostileText, fc.constantFrom("2026-12-05T09:00", "2026-12-05", "Theatre 2", "CASE-1", "QMH-000001", "ab@clinic.example"));
    default:
      return anything;
  }
}

let t: DemoDatabase;
let seed: SeedResult;
const users = new Map<Role, SessionUser>();

async function totalChanges(): Promise<number> {
  const { rows } = await sql<{ n: number }>`select total_changes() as n`.execute(t.db);
  return Number(rows[0]!.n);
}

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
  const byRole = new Map<string, number>();
  for (const [email, id] of Object.entries(seed.users)) {
    const row = await t.db.selectFrom("users").select("role").where("id", "=", id).executeTakeFirstOrThrow();
    if (!byRole.has(row.role) && email !== "driver2@larkmoor.example") byRole.set(row.role, id);
  }
  for (const [role, id] of byRole) users.set(role as Role, await sessionUser(t.db, id));
}, 300_000);
afterAll(() => t.cleanup());

/** A role that may do the action, unit roles first (they reach every organisation's records). */
function actorFor(action: Action): SessionUser | undefined {
  const order: Role[] = ["admin", "finance", "quality_lead", "technician", "dispatcher", "driver", "clinic_manager", "clinic_staff"];
  const role = order.find((r) => PERMISSIONS[r] && can(r, action) && users.has(r));
  return role ? users.get(role) : undefined;
}

describe("server actions under hostile input", () => {
  for (const file of serverActionModules()) {
    it(file, async () => {
      const exports = (await import(/* @vite-ignore */ absolute(file))) as Record<string, unknown>;
      const problems: string[] = [];
      for (const [name, fn] of Object.entries(exports)) {
        const permission = declaredPermission(fn);
        const schema = declaredSchema(fn);
        if (!permission || !schema || typeof fn !== "function") continue;
        const actor = actorFor(permission);
        if (!actor) continue;
        await fc.assert(
          fc.asyncProperty(shaped(schema), async (input) => {
            session.user = actor;
            const before = await totalChanges();
            let result: { ok: boolean; error?: { code: string; message: string } };
            try {
              result = await (fn as (i: unknown) => Promise<typeof result>)(input);
            } catch (error) {
              problems.push(`${name} threw ${String(error)}`);
              return false;
            }
            if (!result.ok) {
              if (result.error?.code === "internal") problems.push(`${name} crashed on ${JSON.stringify(input).slice(0, 200)}`);
              if (!result.error?.message) problems.push(`${name} refused without a message`);
              if ((await totalChanges()) !== before) problems.push(`${name} refused but wrote rows: ${JSON.stringify(input).slice(0, 200)}`);
            }
            return problems.length === 0;
          }),
          { numRuns: 15, seed: 20261202 },
        ).catch(() => undefined);
        if (problems.length) break;
      }
      session.user = null;
      expect(problems.slice(0, 5)).toEqual([]);
    }, 300_000);
  }
});

describe("GET route handlers under hostile query strings and path segments", () => {
  const QUERY_KEYS = ["q", "page", "pageSize", "sort", "dir", "code", "status", "from", "to", "day", "month", "period", "organisationId", "siteId"];
  it("never answer 500, for the unit's administrator or a clinic manager", async () => {
    const problems: string[] = [];
    const callers = [seed.users["admin@larkmoor.example"]!, seed.users["manager@quillby.example"]!, seed.users["finance@larkmoor.example"]!];
    let calls = 0;
    for (const mod of routeModules()) {
      const exports = (await import(/* @vite-ignore */ mod.file)) as Record<string, unknown>;
      const handler = exports.GET as ((req: Request, ctx: unknown) => Promise<Response>) | undefined;
      if (!handler || !declaredPermission(handler)) continue;
      await fc.assert(
        fc.asyncProperty(
          fc.dictionary(fc.constantFrom(...QUERY_KEYS), hostileText, { maxKeys: 4 }),
          fc.array(hostileText, { minLength: mod.params.length, maxLength: mod.params.length }),
          fc.constantFrom(...callers),
          async (query, segments, caller) => {
            const values = Object.fromEntries(mod.params.map((p, i) => [p, segments[i]!]));
            const pathname = mod.params.reduce((p, id, i) => p.replace(new RegExp(`\\[(\\.\\.\\.)?${id}\\]`), encodeURIComponent(segments[i]!)), mod.route);
            const search = new URLSearchParams(Object.entries(query).map(([k, v]) => [k, v.replaceAll("\u0000", "")]));
            const res = await handler((await requestAs(caller, `${pathname}?${search}`)) as never, params(values));
            calls++;
            if (res.status >= 500) problems.push(`${mod.route}?${search.toString().slice(0, 120)}: ${res.status} ${(await res.text()).slice(0, 160)}`);
            return res.status < 500;
          },
        ),
        { numRuns: 8, seed: 20261202 },
      ).catch(() => undefined);
    }
    expect(problems.slice(0, 10)).toEqual([]);
    expect(calls).toBeGreaterThan(200);
  }, 600_000);
});

const CATALOGUE_HEADER = "code,name,set_class,packaging,method,flags,weight_kg,size_stu,notes,item,count";
const csvCell = (v: string) => `"${v.replaceAll('"', '""')}"`;

describe("CSV importers under hostile files", () => {
  it("reads any catalogue file into rows or issues, never an exception", () => {
    fc.assert(
      fc.property(fc.array(fc.array(hostileText, { minLength: 11, maxLength: 11 }), { maxLength: 6 }), fc.boolean(), (rows, quoted) => {
        const text = [CATALOGUE_HEADER, ...rows.map((r) => r.map((c) => (quoted ? csvCell(c) : c)).join(","))].join("\r\n");
        const file = readCatalogueFile(new TextEncoder().encode(text));
        expect(Array.isArray(file.issues)).toBe(true);
        for (const issue of file.issues) expect(typeof issue.message).toBe("string");
      }),
      { numRuns: 300 },
    );
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 400 }), (bytes) => {
        const file = readCatalogueFile(bytes);
        expect(file.setTypes.length + file.issues.length).toBeGreaterThanOrEqual(0);
      }),
      { numRuns: 300 },
    );
  }, 300_000);

  it("imports a hostile catalogue all or nothing: refused with a clear error and no rows, or saved whole", async () => {
    const admin = users.get("admin")!;
    const tables = ["set_types", "set_type_items", "audit_log"] as const;
    await fc.assert(
      fc.asyncProperty(fc.array(fc.tuple(hostileText, hostileText, hostileText), { minLength: 1, maxLength: 4 }), async (rows) => {
        const lines = rows.map(([code, name, item], i) =>
          [`HX-${i}${code.replace(/[^A-Z0-9-]/g, "")}`.slice(0, 20), name, "basic_tray", "container", "steam_134", "", "2.5", "1", name, item, "1"].map(csvCell).join(","),
        );
        const bytes = new TextEncoder().encode([CATALOGUE_HEADER, ...lines].join("\r\n"));
        const before = await countRows(t.db, [...tables]);
        try {
          await commitImport(t.db, admin, { organisationId: seed.organisations.PVC!, fileName: "hostile.csv", bytes });
        } catch (error) {
          expect(error, String(error)).toBeInstanceOf(AppError);
          expect((error as AppError).message.length).toBeGreaterThan(0);
          expect(await countRows(t.db, [...tables])).toEqual(before);
        }
      }),
      { numRuns: 40, seed: 20261202 },
    );
  }, 300_000);

  it("parses any washer or steriliser record into a record, or refuses it with a record error", () => {
    const recordText = fc.oneof(
      fc.array(fc.array(hostileText, { maxLength: 4 }), { maxLength: 8 }).map((rows) => ["t_s,temp_c,pressure_kpa_abs,phase", ...rows.map((r) => r.join(","))].join("\n")),
      fc.array(fc.tuple(fc.oneof(fc.integer({ min: -5, max: 4000 }).map(String), hostileText), fc.oneof(fc.double({ noNaN: false }).map(String), hostileText)), { maxLength: 20 }).map(
        (rows) => ["t_s;temp_c", ...rows.map(([a, b]) => `${a};${b}`)].join("\r\n"),
      ),
      hostileText,
    );
    fc.assert(
      fc.property(recordText, (text) => {
        for (const parse of [parseWasherRecord, (x: string) => parseSterilizerRecord(x)]) {
          try {
            const record = parse(text);
            expect(Array.isArray(record.samples)).toBe(true);
          } catch (error) {
            expect(error, String(error)).toBeInstanceOf(CycleRecordError);
          }
        }
      }),
      { numRuns: 400 },
    );
  }, 300_000);
});
