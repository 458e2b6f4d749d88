import fs from "node:fs";
import path from "node:path";
import { type Browser, type BrowserContext, chromium, type Page } from "playwright-core";
import { expect, inject } from "vitest";

// Chromium from Debian's package, driven by Playwright; sign-in and mail helpers for the suite.

export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
const SHOTS = path.join("test-results", "screenshots");

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

export const PHONE = { width: 390, height: 844 };

export async function newPage(browser: Browser, viewport = { width: 1280, height: 860 }): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport, baseURL: inject("appUrl"), locale: "en-GB", timezoneId: "Europe/London" });
  const page = await context.newPage();
  return { context, page };
}

export async function screenshot(page: Page, name: string): Promise<void> {
  fs.mkdirSync(SHOTS, { recursive: true });
  await page.screenshot({ path: path.join(SHOTS, `${name}.png`), fullPage: true });
}

export async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

export async function expectPath(page: Page, pathname: string): Promise<void> {
  await expect.poll(() => new URL(page.url()).pathname, { timeout: 20_000 }).toBe(pathname);
}

/** The text of the form-level error message. */
export function formError(page: Page) {
  return page.getByTestId("form-error");
}

export interface CaughtMail {
  id: string;
  subject: string;
  text: string;
  html: string;
  to: { address: string }[];
}

/** Waits for a message to the address in the mail catcher (matching the subject, if given). */
export async function waitForMail(to: string, subject?: RegExp, timeoutMs = 30_000): Promise<CaughtMail> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const res = await fetch(`${inject("mailUrl")}/api/email`);
    const all = (await res.json()) as CaughtMail[];
    const found = all.find((m) => m.to.some((r) => r.address.toLowerCase() === to.toLowerCase()) && (!subject || subject.test(m.subject)));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error(`No e-mail to ${to} arrived within ${timeoutMs / 1000} s.`);
}
