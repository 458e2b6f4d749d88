import fs from "node:fs";
import path from "node:path";
import type { Kysely } from "kysely";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { openDatabase } from "@/db/connection";
import type { Database } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { expectPath, launchBrowser, newPage, screenshot, signIn } from "./browser";

// The quality lead's monitoring log: an out-of-range sterile store humidity reading shows as a
// warning on the unit's home; a washer batch shows its cycle record chart and downloads its
// one-page PDF.

let browser: Browser;
let db: Kysely<Database>;

beforeAll(async () => {
  browser = await launchBrowser();
  db = openDatabase(path.join(inject("dataDir"), "steamlane.db"));
});
afterAll(async () => {
  await browser?.close();
  await db?.destroy();
});

describe("the monitoring log", () => {
  it("the quality lead records a humid store, sees the warning at home, and opens a batch's chart and cycle record PDF", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "quality@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      // The demo's own warnings: the conductivity reading and W3's overdue cleaning.
      const panel = page.getByTestId("monitoring-warnings");
      await expect.poll(() => panel.textContent()).toContain("Final-rinse water conductivity 38.5 µS/cm");
      expect(await panel.textContent()).toContain("Cleaning of wash arms and sieves on W3");

      await page.getByRole("link", { name: "Monitoring log" }).click();
      await expectPath(page, "/unit/monitoring");
      expect(await page.getByTestId("advisory-note").textContent()).toContain("advisory");
      await page.getByLabel("Entry", { exact: true }).selectOption("store_climate");
      await page.getByLabel("Temperature, °C").fill("19.4");
      await page.getByLabel("Relative humidity, %").fill("hot");
      await page.getByRole("button", { name: "Record entry" }).click();
      await expect.poll(() => page.locator("#entry-humidity-error").textContent()).toContain("relative humidity in %");
      await page.getByLabel("Relative humidity, %").fill("67");
      await page.getByRole("button", { name: "Record entry" }).click();
      await expect.poll(() => page.getByText("Recorded, out of range").count()).toBeGreaterThan(0);
      await expect.poll(() => page.getByTestId("log-entries").locator("tr").nth(1).textContent()).toContain("67 % RH");
      expect(await page.getByTestId("log-entries").locator("tr").nth(1).textContent()).toContain("Out of range");
      await screenshot(page, "monitoring-log");

      const row = await db.selectFrom("machine_log").select(["humidity_pct", "out_of_range"]).where("kind", "=", "store_climate").orderBy("id", "desc").executeTakeFirstOrThrow();
      expect(row).toEqual({ humidity_pct: 67, out_of_range: 1 });

      await page.getByRole("link", { name: "Overview" }).click();
      await expectPath(page, "/unit");
      await expect.poll(() => panel.textContent()).toContain("Sterile store relative humidity 67 % is above the upper limit of 60 %.");
      await screenshot(page, "monitoring-home-warnings");

      const batch = await db.selectFrom("washer_batches").select("id").where("status", "=", "passed").orderBy("id", "desc").executeTakeFirstOrThrow();
      await page.goto(`/unit/batches/${batch.id}`);
      const chart = page.getByTestId("record-chart");
      await expect.poll(() => chart.count()).toBe(1);
      expect(await page.getByTestId("record-chart-figures").textContent()).toMatch(/A0 \d+ s/);
      await page.getByText("The curve as a table").click();
      await expect.poll(() => page.getByTestId("record-chart-key-points").locator("tbody tr").count()).toBeGreaterThanOrEqual(4);
      await screenshot(page, "monitoring-batch-chart");

      const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("batch-record-pdf").click()]);
      expect(download.suggestedFilename()).toMatch(/^batch-W\d-[0-9-]+-record\.pdf$/);
      const pdf = fs.readFileSync((await download.path())!);
      expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
      expect(pdf.toString("latin1")).toMatch(/\/Type \/Pages\s*\/Count 1\b/);
    } finally {
      await context.close();
    }
  });
});
