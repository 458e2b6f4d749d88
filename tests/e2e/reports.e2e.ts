import fs from "node:fs";
import Papa from "papaparse";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { expectPath, launchBrowser, newPage, screenshot, signIn } from "./browser";

// The quality lead reads the unit's on-time report for one customer and exports its table as
// CSV, which holds the rows on screen; a clinic manager sees only its own organisation's figures.

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** The cell texts of one report table as shown ("—" is an empty cell). */
async function tableCells(page: Page, key: string): Promise<string[][]> {
  const rows = page.locator(`section[data-table="${key}"] tbody tr`);
  const texts = await rows.evaluateAll((trs) => trs.map((tr) => Array.from(tr.querySelectorAll("td")).map((td) => (td.textContent ?? "").trim())));
  return texts.map((row) => row.map((cell) => (cell === "—" ? "" : cell)));
}

describe("reports", () => {
  it("a manager filters the on-time report by a customer and exports the CSV that matches the table", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "quality@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.getByRole("link", { name: "Reports" }).first().click();
      await expectPath(page, "/unit/reports/on-time");
      await expect.poll(() => page.locator('section[data-table="figures"] tbody tr').count(), { timeout: 30_000 }).toBeGreaterThan(1);
      await screenshot(page, "reports-unit-on-time");

      await page.locator('select[name="customer"]').selectOption({ label: "Quillby Moor Hospitals" });
      await page.locator('select[name="grain"]').selectOption("month");
      await expect.poll(async () => [...new Set((await tableCells(page, "figures")).map((r) => r[0]))], { timeout: 30_000 }).toEqual(["Quillby Moor Hospitals"]);
      await expect.poll(async () => (await tableCells(page, "figures"))[0]?.[2], { timeout: 30_000 }).toMatch(/^\d{4}-\d{2}$/);
      await expect.poll(() => page.locator(".recharts-surface").count(), { timeout: 20_000 }).toBeGreaterThan(0);
      await screenshot(page, "reports-unit-on-time-quillby");

      const shown = await tableCells(page, "figures");
      const [download] = await Promise.all([page.waitForEvent("download"), page.locator('a[data-csv="figures"]').click()]);
      expect(download.suggestedFilename()).toMatch(/^on-time-figures-\d{4}-\d{2}-\d{2}-to-\d{4}-\d{2}-\d{2}\.csv$/);
      const csv = fs.readFileSync((await download.path())!, "utf8").replace(/^\uFEFF/, "");
      const parsed = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
      expect(parsed[0]).toEqual(["Customer", "Service level", "Month", "Sets measured", "On time", "Late", "On time %"]);
      expect(parsed.slice(1)).toEqual(shown);

      // The late sets behind the figures, and their export.
      const late = await tableCells(page, "late");
      const [lateCsv] = await Promise.all([page.waitForEvent("download"), page.locator('a[data-csv="late"]').click()]);
      const lateRows = Papa.parse<string[]>(fs.readFileSync((await lateCsv.path())!, "utf8").replace(/^\uFEFF/, ""), { skipEmptyLines: true }).data;
      expect(lateRows.slice(1)).toEqual(late);

      await page.goto("/unit/reports/machines");
      await expect.poll(() => page.locator('section[data-table="days"] tbody tr').count(), { timeout: 30_000 }).toBeGreaterThan(1);
      await expect.poll(() => page.getByText(/qualified staff, its validated procedures and local regulations/).count()).toBe(1);
      await screenshot(page, "reports-unit-machines");
      await page.goto("/unit/reports/capacity");
      await expect.poll(() => page.locator('section[data-table="capacity"] tbody tr').count(), { timeout: 30_000 }).toBe(14);
      await screenshot(page, "reports-unit-capacity");
      await page.goto("/unit/reports/stations");
      await expect.poll(() => page.locator('section[data-table="stations"] tbody tr').count(), { timeout: 30_000 }).toBeGreaterThan(1);
      await screenshot(page, "reports-unit-stations");
    } finally {
      await context.close();
    }
  });

  it("finance reads revenue and receivables", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "finance@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto("/unit/reports/revenue");
      await expect.poll(() => page.locator('section[data-table="revenue"] tbody tr').count(), { timeout: 30_000 }).toBeGreaterThan(1);
      await screenshot(page, "reports-unit-revenue");
      await page.goto("/unit/reports/receivables");
      await expect.poll(() => page.locator('section[data-table="ageing"] tbody tr').count(), { timeout: 30_000 }).toBeGreaterThan(0);
      await screenshot(page, "reports-unit-receivables");
    } finally {
      await context.close();
    }
  });

  it("a clinic manager sees only its own organisation's figures", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "manager@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.getByRole("link", { name: "Reports" }).first().click();
      await expectPath(page, "/clinic/reports");
      await expect.poll(() => page.locator('section[data-table="figures"] tbody tr').count(), { timeout: 30_000 }).toBeGreaterThan(0);
      const customers = new Set((await tableCells(page, "figures")).map((r) => r[0]));
      expect([...customers]).toEqual(["Quillby Moor Hospitals"]);
      await expect.poll(() => page.locator('select[name="customer"]').count()).toBe(0);
      await expect.poll(() => page.getByRole("link", { name: /sets nearing expiry/ }).count()).toBe(1);
      await screenshot(page, "reports-clinic-on-time");
      await page.getByRole("link", { name: "Spend" }).click();
      await expect.poll(() => page.locator('section[data-table="revenue"] tbody tr').count(), { timeout: 30_000 }).toBeGreaterThan(0);
      expect(new Set((await tableCells(page, "revenue")).map((r) => r[0]))).toEqual(new Set(["Quillby Moor Hospitals"]));
      await screenshot(page, "reports-clinic-spend");
    } finally {
      await context.close();
    }
  });
});
