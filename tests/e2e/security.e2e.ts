import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { expectPath, launchBrowser, newPage, screenshot, signIn } from "./browser";

// The production server's security headers, its Content Security Policy as Chromium enforces it,
// and the flags of the session cookie it sets.

const PAGES = ["/sign-in", "/clinic", "/clinic/orders", "/unit", "/unit/board"];

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

function directives(csp: string): Map<string, string> {
  return new Map(
    csp
      .split(";")
      .map((d) => d.trim())
      .filter(Boolean)
      .map((d) => {
        const [name, ...values] = d.split(/\s+/);
        return [name!, values.join(" ")];
      }),
  );
}

describe("security headers on every page and handler", () => {
  for (const pathname of [...PAGES, "/api/orders", "/api/auth/csrf"]) {
    it(`${pathname} carries the CSP and the hardening headers`, async () => {
      const res = await fetch(new URL(pathname, inject("appUrl")), { redirect: "manual" });
      const csp = res.headers.get("content-security-policy");
      expect(csp, pathname).toBeTruthy();
      const d = directives(csp!);
      expect(d.get("default-src")).toBe("'self'");
      expect(d.get("frame-ancestors")).toBe("'none'");
      expect(d.get("object-src")).toBe("'none'");
      expect(d.get("base-uri")).toBe("'self'");
      expect(d.get("form-action")).toBe("'self'");
      // Scripts need this response's nonce (or a script carrying it that loads them); production
      // never allows eval or inline scripts without the nonce (lib/http/csp.ts).
      expect(d.get("script-src")).toMatch(/^'self' 'nonce-[A-Za-z0-9+/]{22}==' 'strict-dynamic'$/);
      expect(d.get("connect-src")).toBe("'self'");
      expect(res.headers.get("x-content-type-options")).toBe("nosniff");
      expect(res.headers.get("x-frame-options")).toBe("DENY");
      expect(res.headers.get("referrer-policy")).toBe("same-origin");
      expect(res.headers.get("permissions-policy")).toContain("geolocation=()");
      expect(res.headers.get("x-powered-by")).toBeNull();
    });
  }

  it("gives every page a fresh nonce, and every script of the page carries it", async () => {
    const nonces: string[] = [];
    for (let i = 0; i < 2; i++) {
      const res = await fetch(new URL("/sign-in", inject("appUrl")));
      const nonce = /'nonce-([^']+)'/.exec(res.headers.get("content-security-policy") ?? "")?.[1];
      expect(nonce).toBeDefined();
      nonces.push(nonce!);
      const html = await res.text();
      const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
      expect(scripts.length).toBeGreaterThan(0);
      for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);
    }
    expect(nonces[0]).not.toBe(nonces[1]);
  });

  it("sets the session cookie HttpOnly and SameSite=Lax (and, over plain http here, without Secure)", async () => {
    const base = inject("appUrl");
    const csrfRes = await fetch(new URL("/api/auth/csrf", base));
    const csrfCookies = csrfRes.headers.getSetCookie();
    const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
    expect(csrfCookies.find((c) => c.includes("next-auth.csrf-token="))).toMatch(/HttpOnly.*SameSite=Lax|SameSite=Lax.*HttpOnly/i);
    const res = await fetch(new URL("/api/auth/callback/credentials", base), {
      method: "POST",
      redirect: "manual",
      headers: { "content-type": "application/x-www-form-urlencoded", cookie: csrfCookies.map((c) => c.split(";")[0]).join("; ") },
      body: new URLSearchParams({ csrfToken, email: "manager@quillby.example", password: DEMO_PASSWORD, json: "true" }),
    });
    const session = res.headers.getSetCookie().find((c) => c.startsWith("next-auth.session-token="));
    expect(session, res.headers.getSetCookie().join("\n")).toBeDefined();
    expect(session).toMatch(/; HttpOnly/i);
    expect(session).toMatch(/; SameSite=Lax/i);
    expect(session).toMatch(/; Path=\//i);
    expect(session).not.toMatch(/; Secure/i);
    // The token lives one working day (SESSION_MAX_AGE_SECONDS), not the library's 30 days.
    const expires = /Expires=([^;]+)/i.exec(session!)?.[1];
    expect(expires).toBeDefined();
    const hours = (Date.parse(expires!) - Date.now()) / 3_600_000;
    expect(hours).toBeGreaterThan(9);
    expect(hours).toBeLessThan(11);
  });

  it("a state-changing request from another site is refused by the running server", async () => {
    const res = await fetch(new URL("/api/orders/preview", inject("appUrl")), {
      method: "POST",
      headers: { origin: "https://evil.example", "content-type": "application/json" },
      body: "{}",
    });
    expect(res.status).toBe(403);
  });
});

describe("the CSP in Chromium", () => {
  it("loads the sign-in page and the pages of a clinic and of the unit without a single CSP violation", async () => {
    const { context, page } = await newPage(browser);
    const refused: string[] = [];
    page.on("console", (message) => {
      if (/Refused to|Content Security Policy/i.test(message.text())) refused.push(`${page.url()}: ${message.text()}`);
    });
    page.on("pageerror", (error) => refused.push(`${page.url()}: ${error.message}`));
    await page.goto("/sign-in");
    await signIn(page, "manager@quillby.example", DEMO_PASSWORD);
    await expectPath(page, "/clinic");
    for (const pathname of ["/clinic/orders", "/clinic/invoices"]) {
      await page.goto(pathname);
      await page.waitForLoadState("networkidle");
    }
    await screenshot(page, "security-clinic-invoices");
    await context.close();

    const unit = await newPage(browser);
    unit.page.on("console", (message) => {
      if (/Refused to|Content Security Policy/i.test(message.text())) refused.push(`${unit.page.url()}: ${message.text()}`);
    });
    await signIn(unit.page, "tech@larkmoor.example", DEMO_PASSWORD);
    await expect.poll(() => new URL(unit.page.url()).pathname, { timeout: 20_000 }).toMatch(/^\/unit/);
    await unit.page.waitForLoadState("networkidle");
    await screenshot(unit.page, "security-unit-home");
    await unit.context.close();
    expect(refused).toEqual([]);
  });
});
