import fs from "node:fs";
import path from "node:path";
import { encode } from "next-auth/jwt";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as listSitesRoute } from "@/app/api/sites/route";
import type { SeedResult } from "@/db/seed/demo";
import { authOptions, SESSION_MAX_AGE_SECONDS } from "@/lib/auth/options";
import { declaredPermission } from "@/lib/http/entry-points";
import { saveUpload } from "@/lib/storage/files";
import { revokeSessions } from "@/lib/users/service";
import { countRows, writeCounter } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { HTTP_METHODS, routeModules } from "../support/entry-points";
import { params, requestAs } from "../support/session";

// Security basics below the browser: cross-site writes refused on every state-changing route
// handler, sessions that expire and can be revoked, cookie flags, uploads checked by content.

let t: DemoDatabase;
let seed: SeedResult;

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
  totalChanges = await writeCounter(t.db);
}, 300_000);
afterAll(() => t.cleanup());

/** Rows written so far (tests/support/db.ts). */
let totalChanges: () => Promise<number>;

describe("cross-site request forgery", () => {
  it("refuses a foreign Origin, and a missing one, on every state-changing route handler, before reading the body", async () => {
    const admin = seed.users["admin@larkmoor.example"]!;
    const checked: string[] = [];
    const problems: string[] = [];
    for (const mod of routeModules()) {
      const exports = (await import(/* @vite-ignore */ mod.file)) as Record<string, unknown>;
      for (const method of HTTP_METHODS.filter((m) => !["GET", "HEAD", "OPTIONS"].includes(m) && typeof exports[m] === "function")) {
        const handler = exports[method] as (req: Request, ctx: unknown) => Promise<Response>;
        // Unwrapped handlers (sign-in, the payment webhook) authenticate otherwise; the isolation matrix lists them.
        if (!declaredPermission(handler)) continue;
        const values = Object.fromEntries(mod.params.map((p) => [p, "1"]));
        const pathname = mod.params.reduce((p, id) => p.replace(new RegExp(`\\[(\\.\\.\\.)?${id}\\]`), "1"), mod.route);
        for (const origin of ["https://evil.example", "http://evil.localhost:3000", "http://localhost:3000.evil.example", "null", undefined]) {
          const before = await totalChanges();
          const req = await requestAs(admin, pathname, { method, origin, body: { anything: true } });
          const res = await handler(req as never, params(values));
          if (res.status !== 403) problems.push(`${method} ${mod.route} from ${origin ?? "no origin"}: ${res.status}`);
          if ((await totalChanges()) !== before) problems.push(`${method} ${mod.route} from ${origin ?? "no origin"} wrote rows`);
        }
        checked.push(`${method} ${mod.route}`);
      }
    }
    console.info(`cross-site check: ${checked.length} state-changing route handlers`);
    expect(problems).toEqual([]);
    expect(checked.length).toBeGreaterThan(15);
  }, 300_000);
});

describe("sessions", () => {
  it("answers 401 to a session past its lifetime", async () => {
    const manager = seed.users["manager@quillby.example"]!;
    const expired = await encode({ token: { sub: String(manager), sv: 0 }, secret: process.env.NEXTAUTH_SECRET!, maxAge: -60 });
    const req = new NextRequest("http://localhost:3000/api/sites", { headers: { host: "localhost:3000", cookie: `next-auth.session-token=${expired}` } });
    expect((await listSitesRoute(req, params({}))).status).toBe(401);
    expect(SESSION_MAX_AGE_SECONDS).toBeLessThanOrEqual(12 * 3600);
    expect(authOptions.session?.maxAge).toBe(SESSION_MAX_AGE_SECONDS);
    expect(authOptions.jwt?.maxAge).toBe(SESSION_MAX_AGE_SECONDS);
  });

  it("ends every open session of a user when their sessions are revoked", async () => {
    const manager = seed.users["manager@quillby.example"]!;
    const before = await listSitesRoute(await requestAs(manager, "/api/sites"), params({}));
    expect(before.status).toBe(200);
    await revokeSessions(t.db, manager);
    const after = await listSitesRoute(await requestAs(manager, "/api/sites"), params({}));
    expect(after.status).toBe(401);
    const renewed = await listSitesRoute(await requestAs(manager, "/api/sites", { sessionVersion: 1 }), params({}));
    expect(renewed.status).toBe(200);
  });

  it("leaves next-auth's cookie settings alone: httpOnly, sameSite=lax, and secure whenever NEXTAUTH_URL is https", () => {
    // next-auth 4 sets httpOnly and sameSite=lax on its cookies and, when NEXTAUTH_URL starts with
    // https://, the secure flag and __Secure-/__Host- names. Overriding `cookies` or
    // `useSecureCookies` would lose that; the end-to-end security suite reads the real headers.
    expect(authOptions.useSecureCookies).toBeUndefined();
    expect(authOptions.cookies).toBeUndefined();
  });
});

describe("uploads are checked by what they contain, not by their name", () => {
  const exe = new Uint8Array([0x4d, 0x5a, 0x90, 0x00, 0x03, 0x00, 0x00, 0x00, 0x04, 0x00, 0x00, 0x00, 0xff, 0xff]); // "MZ": a Windows executable
  const html = new TextEncoder().encode(`<!doctype html><html><body><script>fetch("/api/users")</script></body></html>`);
  const elf = new Uint8Array([0x7f, 0x45, 0x4c, 0x46, 0x02, 0x01, 0x01, 0x00]);
  const cases: [string, Uint8Array, "problem_photo" | "signature" | "ifu"][] = [
    ["tray.png", exe, "problem_photo"],
    ["tray.jpg", elf, "problem_photo"],
    ["signature.png", html, "signature"],
    ["instructions.pdf", html, "ifu"],
    ["instructions.pdf", exe, "ifu"],
  ];

  for (const [name, bytes, purpose] of cases) {
    it(`refuses ${name} (${purpose}) that is really ${bytes[0] === 0x3c ? "HTML" : "an executable"}, writing no row and no file`, async () => {
      const uploads = path.join(t.dir, "uploads");
      const filesBefore = fs.existsSync(uploads) ? fs.readdirSync(uploads, { recursive: true }).length : 0;
      const before = await countRows(t.db, ["files"]);
      await expect(saveUpload(t.db, { bytes, originalName: name, purpose, organisationId: seed.organisations.QMH!, uploadedBy: null })).rejects.toMatchObject({
        code: "validation",
        fields: { file: [expect.stringMatching(/^Expected /)] },
      });
      expect(await countRows(t.db, ["files"])).toEqual(before);
      const filesAfter = fs.existsSync(uploads) ? fs.readdirSync(uploads, { recursive: true }).length : 0;
      expect(filesAfter).toBe(filesBefore);
    });
  }
});
