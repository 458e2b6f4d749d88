import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { expectPath, launchBrowser, newPage, PHONE, screenshot, signIn } from "./browser";

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("sets and their labels", () => {
  it("an administrator adds sets of a type, opens one, prints its label and downloads the PDF", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "admin@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.getByRole("link", { name: "Sets", exact: true }).first().click();
      await expectPath(page, "/unit/sets");
      await expect.poll(() => page.getByRole("heading", { name: "Sets", exact: true }).count()).toBe(1);
      await screenshot(page, "sets-list");

      await page.getByRole("button", { name: "Add sets" }).click();
      const dialog = page.getByRole("dialog");
      // Nothing chosen: the form says what to fix and adds nothing.
      await dialog.getByRole("button", { name: "Add sets" }).click();
      await expect.poll(() => dialog.getByText("Choose the customer.").count()).toBe(1);
      await dialog.getByLabel("Customer").selectOption({ label: "Quillby Moor Hospitals" });
      const typeSelect = dialog.getByLabel("Set type");
      await expect.poll(() => typeSelect.locator("option").count()).toBeGreaterThan(1);
      const typeName = ((await typeSelect.locator("option").nth(1).textContent()) ?? "").replace(/ \([^)]*\)$/, "");
      await typeSelect.selectOption({ index: 1 });
      await dialog.getByLabel("Home site").selectOption({ label: "Quillby Moor Eye Centre" });
      await dialog.getByLabel("How many").fill("201");
      await dialog.getByRole("button", { name: "Add sets" }).click();
      await expect.poll(() => dialog.getByText("Add at most 200 sets at a time.").count()).toBe(1);
      await dialog.getByLabel("How many").fill("3");
      await screenshot(page, "sets-add-dialog");
      await dialog.getByRole("button", { name: "Add sets" }).click();
      await expect.poll(() => page.getByRole("dialog").count()).toBe(0);
      const toast = page.getByText(/^Added 3 sets, QMH-\d{6} to QMH-\d{6}$/);
      await expect.poll(() => toast.count()).toBe(1);
      const [, first, last] = /(QMH-\d{6}) to (QMH-\d{6})/.exec((await toast.textContent()) ?? "") ?? [];
      expect(Number(last.slice(4)) - Number(first.slice(4))).toBe(2);

      await page.getByLabel("Search by serial, GS1 code or set type").fill(first);
      const link = page.getByRole("link", { name: first, exact: true });
      await expect.poll(() => link.count()).toBe(1);
      await screenshot(page, "sets-list-search");
      await link.click();
      await expect.poll(() => page.getByRole("heading", { name: first, exact: true }).count()).toBe(1);
      const giai = `9521234${first.replace("-", "")}`;
      await expect.poll(() => page.getByTestId("set-giai").textContent()).toBe(`(8004)${giai}`);
      await expect.poll(() => page.getByText(typeName, { exact: false }).count()).toBeGreaterThan(0);
      await expect.poll(() => page.getByText("Quillby Moor Eye Centre").count()).toBeGreaterThan(0);
      await expect.poll(() => page.getByRole("heading", { name: "Recorded changes" }).count()).toBe(1);
      await screenshot(page, "set-detail");
      const setPath = new URL(page.url()).pathname;

      // Retire it with a reason, then see the reason in its recorded changes.
      await page.getByRole("button", { name: "Retire this set" }).click();
      const retire = page.getByRole("dialog");
      await retire.getByRole("button", { name: "Retire set" }).click();
      await expect.poll(() => retire.getByText("Say why, in a few words.").count()).toBe(1);
      await retire.getByLabel("Reason").fill("Basket bent during unloading");
      await retire.getByRole("button", { name: "Retire set" }).click();
      await expect.poll(() => page.getByText("Basket bent during unloading").count()).toBe(1);
      await expect.poll(() => page.getByRole("button", { name: "Return to service" }).count()).toBe(1);
      await screenshot(page, "set-detail-retired");
      // And back: repaired, in service again, both reasons on record.
      await page.getByRole("button", { name: "Return to service" }).click();
      const back = page.getByRole("dialog");
      await back.getByLabel("Reason").fill("Basket straightened and inspected");
      await back.getByRole("button", { name: "Return to service" }).click();
      await expect.poll(() => page.getByText("Basket straightened and inspected").count()).toBe(1);
      await expect.poll(() => page.getByRole("button", { name: "Retire this set" }).count()).toBe(1);

      await page.getByRole("link", { name: "Label" }).click();
      await expectPath(page, `${setPath}/label`);
      const label = page.getByTestId("set-label");
      await expect.poll(() => label.count()).toBe(1);
      expect(await page.getByText(/This set is retired/).count()).toBe(0);
      await expect.poll(() => page.getByTestId("set-label-symbol").locator("svg path").count()).toBeGreaterThan(0);
      const symbolBox = await page.getByTestId("set-label-symbol").boundingBox();
      expect(symbolBox && symbolBox.width > 50 && Math.abs(symbolBox.width - symbolBox.height) < 2).toBe(true);
      await expect.poll(() => page.getByTestId("set-label-hri").textContent()).toBe(`(8004)${giai}`);
      await expect.poll(() => label.getByText(first, { exact: true }).count()).toBe(1);
      await expect.poll(() => label.getByText("Quillby Moor Hospitals").count()).toBe(1);
      for (const caption of ["Packed by", "Load", "Sterilised on", "Use by"]) {
        await expect.poll(() => label.getByText(caption, { exact: true }).count(), { message: caption }).toBe(1);
      }
      await screenshot(page, "set-label");

      await page.getByLabel(/Include the contents list/).check();
      await expect.poll(() => label.getByRole("region", { name: "Contents" }).count()).toBe(1);
      await screenshot(page, "set-label-contents");
      await page.emulateMedia({ media: "print" });
      await screenshot(page, "set-label-print");
      await page.emulateMedia({ media: "screen" });

      // The PDF: the link's own address answers a PDF, and clicking it downloads one.
      const href = await page.getByRole("link", { name: "Download PDF" }).getAttribute("href");
      expect(href).toMatch(/\/api\/sets\/\d+\/label\.pdf\?contents=1$/);
      const res = await context.request.get(href!);
      expect(res.status()).toBe(200);
      expect(res.headers()["content-type"]).toBe("application/pdf");
      expect((await res.body()).subarray(0, 5).toString("latin1")).toBe("%PDF-");
      const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Download PDF" }).click()]);
      expect(download.suggestedFilename()).toBe(`label-${first}.pdf`);
    } finally {
      await context.close();
    }
  });

  it("clinic staff see their own site's sets on a phone, read-only", async () => {
    const { context, page } = await newPage(browser, PHONE);
    try {
      await signIn(page, "daycase@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.goto("/clinic/sets");
      await expect.poll(() => page.getByRole("heading", { name: "Our sets" }).count()).toBe(1);
      await expect.poll(() => page.getByRole("button", { name: "Add sets" }).count()).toBe(0);
      // On a phone the sets come as cards; the wide table is hidden.
      const cards = page.getByTestId("set-cards").locator("li");
      await expect.poll(() => cards.count()).toBeGreaterThan(0);
      await expect.poll(() => page.locator("table").isVisible()).toBe(false);
      await screenshot(page, "clinic-sets-phone");
      await cards.first().getByRole("link").first().click();
      await expect.poll(() => page.getByTestId("set-giai").count()).toBe(1);
      await expect.poll(() => page.getByText("Quillby Moor General – Day Case Unit").count()).toBeGreaterThan(0);
      expect(await page.getByText("Quillby Moor General – Main Theatres").count()).toBe(0);
      await expect.poll(() => page.getByRole("button", { name: "Retire this set" }).count()).toBe(0);
      await expect.poll(() => page.getByRole("link", { name: "Label" }).count()).toBe(0);
      await screenshot(page, "clinic-set-phone");
    } finally {
      await context.close();
    }
  });
});
