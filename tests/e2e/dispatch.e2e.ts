import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { expectPath, launchBrowser, newPage, screenshot, signIn, waitForMail } from "./browser";

// The dispatcher plans the demo day, moves a stop, publishes, and a clinic hears the van's
// expected time by e-mail.

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** Who at each demo site is told about a van visit: the site's own staff, else the customer's manager. */
const SITE_CONTACT: Record<string, string> = {
  "Quillby Moor General – Main Theatres": "theatres@quillby.example",
  "Quillby Moor General – Day Case Unit": "daycase@quillby.example",
  "Quillby Moor Eye Centre": "manager@quillby.example",
  "Otterwick Day Surgery Centre": "staff@otterwick.example",
  "Hesketh Fold Treatment Rooms": "manager@otterwick.example",
  "Tanner Row Dental": "tanner@marrowgate.example",
  "Millbeck Dental": "manager@marrowgate.example",
  "Cowl Street Dental": "manager@marrowgate.example",
  "Pellowfield Veterinary Clinic": "manager@pellowfield.example",
};

describe("the dispatcher's day", () => {
  it("plans, moves a stop, publishes, and the clinic gets its expected time", async () => {
    const { context, page } = await newPage(browser, { width: 1440, height: 1000 });
    try {
      await signIn(page, "dispatch@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.getByRole("link", { name: "Dispatch" }).first().click();
      await expect.poll(() => new URL(page.url()).pathname, { timeout: 20_000 }).toMatch(/^\/unit\/dispatch\/\d{4}-\d{2}-\d{2}$/);
      const day = new URL(page.url()).pathname.split("/").pop()!;
      expect(await page.getByTestId("advisory-note").textContent()).toContain("advisory");

      await page.getByLabel("Planner seed").fill("11");
      await page.getByRole("button", { name: /Plan (again|the day)/ }).click();
      await expect.poll(() => page.getByText(/^Planned: /).first().isVisible(), { timeout: 30_000 }).toBe(true);
      await expect.poll(() => page.getByTestId("plan-stop").count(), { timeout: 20_000 }).toBeGreaterThan(0);
      const runs = page.getByTestId("plan-run");
      expect(await runs.count()).toBeGreaterThan(0);
      await expect.poll(() => page.locator("svg[role=img] polyline").count()).toBeGreaterThan(0);
      await screenshot(page, "dispatch-plan");

      // Move the first stop of a run with two or more stops to the end of its run, by keyboard-reachable buttons.
      const busy = runs.filter({ has: page.getByTestId("plan-stop").nth(1) }).first();
      if ((await busy.count()) > 0) {
        const first = busy.getByTestId("plan-stop").first();
        const site = (await first.locator("p").first().textContent())!.split(" · ")[0]!.trim();
        await first.getByRole("button", { name: `Move ${site} later` }).click();
        await expect.poll(() => busy.getByTestId("plan-stop").nth(1).textContent(), { timeout: 20_000 }).toContain(site);
        await expect.poll(() => busy.getByTestId("plan-stop").nth(1).textContent()).toContain("Locked");
      }

      const firstSite = (await page.getByTestId("plan-run").getByTestId("plan-stop").first().locator("p").first().textContent())!.split(" · ")[0]!.trim();
      const contact = SITE_CONTACT[firstSite];
      expect(contact, `a contact for ${firstSite}`).toBeDefined();

      await page.getByRole("button", { name: /^Publish/ }).click();
      await expect.poll(() => page.getByText(/^Published\. /).first().isVisible(), { timeout: 20_000 }).toBe(true);
      await screenshot(page, "dispatch-published");

      const mail = await waitForMail(contact!, /The van visits/, 60_000);
      expect(mail.text).toContain(firstSite);
      expect(mail.text).toMatch(/around \d\d:\d\d, between \d\d:\d\d and \d\d:\d\d/);

      // The printable manifest of the first van with stops.
      await page.getByRole("link", { name: "Manifest" }).first().click();
      await expect.poll(() => new URL(page.url()).pathname, { timeout: 20_000 }).toMatch(new RegExp(`^/unit/dispatch/${day}/manifest/\\d+$`));
      await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toContain("Van manifest");
      await screenshot(page, "dispatch-manifest");
    } finally {
      await context.close();
    }
  });

  it("keeps clinic users out of the dispatcher's screen", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "manager@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      const res = await page.request.get("/api/dispatch/2026-12-02");
      expect(res.status()).toBe(403);
      await page.goto("/unit/dispatch");
      expect(new URL(page.url()).pathname).not.toMatch(/^\/unit\/dispatch/);
    } finally {
      await context.close();
    }
  });
});
