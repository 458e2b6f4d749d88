import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { UK_BANK_HOLIDAYS_2026_2027 } from "@/db/seed/contracts";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { addDaysToDate, lastDayOfMonth, localDateOf } from "@/lib/contracts/dates";
import { formatLocalDate } from "@/lib/contracts/format";
import { expectPath, formError, launchBrowser, newPage, PHONE, screenshot, signIn } from "./browser";

// Finance ends a customer's version and writes the next one from it, an overlapping version is
// refused on screen, and a clinic manager reads its own contract but never another's.

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const today = localDateOf(new Date(), "Europe/London");
/** The first day of the month `months` after this one. */
function monthStart(months: number): string {
  const [y, m] = today.split("-").map(Number) as [number, number];
  const index = y * 12 + (m - 1) + months;
  return `${Math.floor(index / 12)}-${String((index % 12) + 1).padStart(2, "0")}-01`;
}
// Far enough ahead not to touch the months the demo bills.
const lastDay = lastDayOfMonth(monthStart(23));
const nextStart = addDaysToDate(lastDay, 1);

async function openCustomerVersion(page: Page, customer: string): Promise<void> {
  await page.goto("/unit/contracts");
  await page.getByLabel("Customer", { exact: true }).selectOption({ label: customer });
  await expect.poll(() => page.getByRole("row").count(), { timeout: 20_000 }).toBe(2);
  await page.getByRole("row").nth(1).getByRole("link").click();
  await expect.poll(() => new URL(page.url()).pathname).toMatch(/^\/unit\/contracts\/\d+$/);
}

describe("contracts", () => {
  let newVersionPath = "";

  it("finance ends the current version and writes the next one from it", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "finance@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.getByRole("link", { name: "Contracts", exact: true }).first().click();
      await expectPath(page, "/unit/contracts");
      await expect.poll(() => page.getByRole("link", { name: /^QMH-/ }).count(), { timeout: 20_000 }).toBe(2);
      await screenshot(page, "contracts-list");

      await openCustomerVersion(page, "Pellowfield Veterinary Clinic");
      const reference = (await page.getByRole("heading", { level: 1 }).textContent())!.split(": ")[1]!;
      expect(reference).toMatch(/^PVC-\d{4}-01$/);
      await screenshot(page, "contract-view");

      await page.getByRole("button", { name: "End this version" }).click();
      const dialog = page.getByRole("dialog");
      await dialog.getByLabel("Last day").fill(lastDay);
      await dialog.getByRole("button", { name: "Save last day" }).click();
      await expect.poll(() => page.getByRole("dialog").count()).toBe(0);
      await expect.poll(() => page.getByText(`to ${formatLocalDate(lastDay)}`).count()).toBeGreaterThan(0);

      await page.getByRole("link", { name: "New version from this one" }).click();
      await expectPath(page, "/unit/contracts/new");
      await expect.poll(() => page.getByLabel("Valid from").inputValue()).toBe(nextStart);
      const nextReference = reference.replace(/-01$/, "-02");
      expect(await page.getByLabel("Reference").inputValue()).toBe(nextReference);

      // A second band for basic trays, and express not quicker than standard first.
      await page.getByRole("button", { name: "Add band to Basic tray (up to 25 instruments)" }).click();
      await page.getByLabel("Basic tray (up to 25 instruments), band 1, up to").fill("200");
      await page.getByLabel("Basic tray (up to 25 instruments), band 1, price per set").fill("17.25");
      await page.getByLabel("Basic tray (up to 25 instruments), band 2, price per set").fill("16.10");
      await page.getByLabel("Express (hours)").fill("30");
      await page.getByRole("button", { name: "Save version" }).click();
      await expect.poll(() => page.getByText("Express must be quicker than standard: fewer than 24 hours.").count()).toBe(1);
      await screenshot(page, "contract-form-error");
      await page.getByLabel("Express (hours)").fill("6");
      await page.getByRole("button", { name: "Save version" }).click();

      await expect.poll(() => new URL(page.url()).pathname, { timeout: 20_000 }).toMatch(/^\/unit\/contracts\/\d+$/);
      newVersionPath = new URL(page.url()).pathname;
      await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe(`Pellowfield Veterinary Clinic: ${nextReference}`);
      await expect.poll(() => page.getByRole("cell", { name: "£17.25" }).count()).toBe(1);
      expect(await page.getByRole("cell", { name: "Sets 201 and over in a month" }).count()).toBe(1);
      expect(await page.getByText(`from ${formatLocalDate(nextStart)}, open-ended`).count()).toBeGreaterThan(0);
      await screenshot(page, "contract-new-version");

      // A correction is recorded with the value before and after.
      await page.getByRole("link", { name: "Correct" }).click();
      await expect.poll(() => new URL(page.url()).pathname).toBe(`${newVersionPath}/edit`);
      await page.getByLabel("Payment terms (days)").fill("45");
      await page.getByRole("button", { name: "Save corrections" }).click();
      await expectPath(page, newVersionPath);
      await expect.poll(() => page.getByText("Payment terms (days): 30 → 45").count(), { timeout: 20_000 }).toBe(1);
      expect(await page.getByText("45 days from the invoice date").count()).toBe(1);
      await screenshot(page, "contract-corrected");

      await page.goto("/unit/contracts");
      await page.getByLabel("Customer", { exact: true }).selectOption({ label: "Pellowfield Veterinary Clinic" });
      await expect.poll(() => page.getByRole("row").count(), { timeout: 20_000 }).toBe(3);
      const row = page.getByRole("row", { name: new RegExp(nextReference) });
      await expect.poll(() => row.getByText("Starts later").count()).toBe(1);
      await screenshot(page, "contracts-list-after");
    } finally {
      await context.close();
    }
  });

  it("refuses an overlapping version with the reason on screen", async () => {
    expect(newVersionPath).not.toBe("");
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "finance@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto(newVersionPath);
      await page.getByRole("link", { name: "New version from this one" }).click();
      await expectPath(page, "/unit/contracts/new");
      await expect.poll(() => page.getByText(/is open-ended, so any later version would overlap it/).count()).toBe(1);
      const clashStart = addDaysToDate(nextStart, 40);
      await page.getByLabel("Valid from").fill(clashStart);
      await page.getByLabel("Reference").fill("PVC-OVERLAP-1");
      await page.getByRole("button", { name: "Save version" }).click();
      await expect
        .poll(() => formError(page).textContent(), { timeout: 20_000 })
        .toContain(`These dates overlap version`);
      expect(await formError(page).textContent()).toContain(`valid from ${formatLocalDate(nextStart)}, open-ended`);
      expect(new URL(page.url()).pathname).toBe("/unit/contracts/new");
      await screenshot(page, "contract-overlap-refused");

      // Nothing was written: the customer still has two versions.
      const listed = await context.request.get(`/api/contracts?q=${encodeURIComponent("Pellowfield")}`);
      expect((await listed.json()).total).toBe(2);
    } finally {
      await context.close();
    }
  });

  it("a clinic manager reads its own contract on a phone, and another organisation's is not found", async () => {
    // The id of another customer's version, as finance sees it.
    const finance = await newPage(browser);
    let otherId = 0;
    try {
      await signIn(finance.page, "finance@larkmoor.example", DEMO_PASSWORD);
      await expectPath(finance.page, "/unit");
      const res = await finance.context.request.get("/api/contracts?q=Otterwick");
      otherId = (await res.json()).rows[0].id;
    } finally {
      await finance.context.close();
    }
    expect(otherId).toBeGreaterThan(0);

    const { context, page } = await newPage(browser, PHONE);
    try {
      await signIn(page, "manager@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.getByRole("button", { name: "Open menu" }).click();
      await page.getByRole("link", { name: "Contract", exact: true }).last().click();
      await expectPath(page, "/clinic/contract");
      await expect
        .poll(() => page.getByTestId("turnaround-standard").textContent())
        .toBe("Standard: back within 24 service hours of receipt, clock stops at delivery to the clinic.");
      expect(await page.getByTestId("turnaround-express").textContent()).toBe(
        "Express: back within 5 service hours of receipt, clock stops at delivery to the clinic.",
      );
      const basicTray = page.getByRole("row", { name: /Basic tray \(up to 25 instruments\) Sets 1–400 in a month/ });
      expect(await basicTray.getByRole("cell", { name: "£14.50" }).count()).toBe(1);
      const nextHoliday = UK_BANK_HOLIDAYS_2026_2027.find((day) => day >= today);
      if (nextHoliday) expect(await page.getByText(formatLocalDate(nextHoliday, { weekday: true })).count()).toBe(1);
      expect(await page.getByText("£4,000.00").count()).toBe(1);
      // The ended earlier version is listed too.
      expect(await page.getByRole("link", { name: /^QMH-\d{4}-01$/ }).count()).toBe(1);
      await screenshot(page, "clinic-contract-phone");

      await page.goto(`/clinic/contract/${otherId}`);
      await expect.poll(() => page.getByRole("heading", { name: "There is nothing here for you" }).count()).toBe(1);
      expect(await page.content()).not.toContain("Otterwick");
      await screenshot(page, "clinic-contract-not-found");
      const api = await context.request.get(`/api/contracts/${otherId}`);
      expect(api.status()).toBe(404);
    } finally {
      await context.close();
    }
  });

  it("clinic staff have no contract page", async () => {
    const { context, page } = await newPage(browser, PHONE);
    try {
      await signIn(page, "theatres@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.goto("/clinic/contract");
      await expect.poll(() => page.getByRole("heading", { name: "There is nothing here for you" }).count()).toBe(1);
      expect((await context.request.get("/api/contracts")).status()).toBe(403);
    } finally {
      await context.close();
    }
  });
});
