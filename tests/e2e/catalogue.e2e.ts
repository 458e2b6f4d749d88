import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { expectPath, formError, launchBrowser, newPage, PHONE, screenshot, signIn } from "./browser";

let browser: Browser;
let dir: string;

beforeAll(async () => {
  browser = await launchBrowser();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-catalogue-e2e-"));
});
afterAll(async () => {
  await browser?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

/** A set type id of the demo database the stack is serving, by organisation and code. */
function setTypeIdOf(orgCode: string, code: string): number {
  const db = new Database(path.join(inject("dataDir"), "steamlane.db"), { readonly: true, fileMustExist: true });
  try {
    const row = db
      .prepare("select s.id from set_types s join organisations o on o.id = s.organisation_id where o.short_code = ? and s.code = ?")
      .get(orgCode, code) as { id: number } | undefined;
    if (!row) throw new Error(`No set type ${code} of ${orgCode} in the demo database.`);
    return row.id;
  } finally {
    db.close();
  }
}

const HEADER = "code,name,set_class,packaging,method,flags,weight_kg,size_stu,notes,item,count";
const lines = (count: string) => [
  HEADER,
  "VET-IMP-01,Imported feline spay set,basic_tray,wrap,steam_134,,1.35,0.25,,Spay hook,1",
  'VET-IMP-01,Imported feline spay set,basic_tray,wrap,steam_134,,1.35,0.25,,"Artery forceps, Halsted mosquito curved 125 mm",4',
  `VET-IMP-01,Imported feline spay set,basic_tray,wrap,steam_134,,1.35,0.25,,"Needle holder, Mayo-Hegar 140 mm",${count}`,
  "VET-IMP-02,Imported wound care set,basic_tray,single_pouch,steam_134,ultrasonic,0.45,0.1,Pack the scissors open.,Suture scissors,1",
];

describe("the set catalogue", () => {
  it("an administrator checks a CSV with an error, fixes it, imports it and finds the new set types", async () => {
    const bad = path.join(dir, "pellowfield-bad.csv");
    const good = path.join(dir, "pellowfield.csv");
    fs.writeFileSync(bad, lines("−2").join("\r\n") + "\r\n");
    fs.writeFileSync(good, lines("2").join("\r\n") + "\r\n");
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "admin@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.getByRole("link", { name: "Set catalogue", exact: true }).first().click();
      await expectPath(page, "/unit/catalogue");
      // The first customer by name is shown first.
      await expect.poll(() => page.getByRole("link", { name: "DEN-EXAM-01" }).count()).toBe(1);
      await page.getByRole("link", { name: "Import CSV" }).click();
      await expectPath(page, "/unit/catalogue/import");
      await page.getByLabel("Customer").selectOption({ label: "Pellowfield Veterinary Clinic (15 set types)" });
      await expect.poll(() => page.getByText(/Into the catalogue of Pellowfield Veterinary Clinic/).count()).toBe(1);

      await page.getByLabel("CSV file to import").setInputFiles(bad);
      const issues = page.getByTestId("import-issues");
      await expect.poll(() => issues.locator("tbody tr").count()).toBe(1);
      const cells = await issues.locator("tbody tr td").allTextContents();
      expect(cells).toEqual(["4", "count", "−2 is not a positive whole number"]);
      // The set type without problems would be created, but nothing can be imported while one line is wrong.
      await expect.poll(() => page.getByTestId("import-summary").textContent()).toContain("1 problem");
      await expect.poll(() => page.getByRole("button", { name: /^Import \d+ set types?$/ }).isDisabled()).toBe(true);
      await screenshot(page, "catalogue-import-error");

      // The corrected file, chosen again.
      await page.getByLabel("CSV file to import").setInputFiles(good);
      await expect.poll(() => page.getByTestId("import-summary").textContent()).toContain("0 problems");
      await expect.poll(() => page.getByTestId("import-issues").count()).toBe(0);
      await expect.poll(() => page.getByText("Imported feline spay set").count()).toBe(1);
      await screenshot(page, "catalogue-import-checked");
      await page.getByRole("button", { name: "Import 2 set types" }).click();
      await expect.poll(() => page.getByText(/Imported 2 new and 0 changed set types/).count()).toBe(1);
      await screenshot(page, "catalogue-import-done");

      await page.getByRole("link", { name: "Open the catalogue" }).click();
      await expectPath(page, "/unit/catalogue");
      await page.getByLabel("Search by code or name").fill("VET-IMP");
      await expect.poll(() => page.getByRole("link", { name: "VET-IMP-01" }).count()).toBe(1);
      await expect.poll(() => page.getByRole("link", { name: "VET-IMP-02" }).count()).toBe(1);
      await screenshot(page, "catalogue-after-import");
      await page.getByRole("link", { name: "Imported feline spay set" }).click();
      await expect.poll(() => page.getByRole("heading", { name: "Imported feline spay set" }).count()).toBe(1);
      await expect.poll(() => page.getByRole("cell", { name: "Needle holder, Mayo-Hegar 140 mm" }).count()).toBe(1);
    } finally {
      await context.close();
    }
  });

  it("an administrator adds a loaner set type with its contents and IFU", async () => {
    const ifu = path.join(dir, "loaner-ifu.pdf");
    fs.writeFileSync(ifu, "%PDF-1.4\n% a one-page loaner instructions document\n%%EOF\n");
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "admin@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto("/unit/catalogue");
      await page.getByLabel("Customer").selectOption({ label: "Otterwick Day Surgery (25 set types)" });
      await expect.poll(() => page.getByRole("link", { name: "DS-ARTH-01" }).count()).toBe(1);
      await page.getByRole("button", { name: "New set type" }).click();
      const dialog = page.getByRole("dialog");
      // Nothing filled in: the form says what to fix and saves nothing.
      await dialog.getByRole("button", { name: "Add set type" }).click();
      await expect.poll(() => dialog.getByText("Enter a code, e.g. ORTH-MAJ-01.").count()).toBe(1);
      await expect.poll(() => dialog.getByText("Enter the weight in kg, e.g. 4.25.").count()).toBe(1);

      await dialog.getByLabel("Code").fill("ds-ln-cmp-01");
      await dialog.getByLabel("Name").fill("Loaner compression screw instruments");
      await dialog.getByLabel("Set class").selectOption("loaner_set");
      await dialog.getByLabel("Packaging").selectOption("rigid_container");
      await dialog.getByLabel("Weight (kg)").fill("3.456");
      await dialog.getByLabel("Size (StU)").fill("0.5");
      await dialog.getByLabel("Dismantle before washing").check();
      await dialog.getByLabel("Lumens to flush").check();
      await expect.poll(() => dialog.getByText(/A loaner set needs its supplier's instructions for use/).count()).toBe(1);
      await dialog.getByLabel("Instrument 1", { exact: true }).fill("Cannulated drill bit 2.0 mm");
      await dialog.getByLabel("Count of instrument 1").fill("2");
      await dialog.getByRole("button", { name: "Add an instrument" }).click();
      await dialog.getByLabel("Instrument 2", { exact: true }).fill("Guide wire holder");
      await dialog.getByRole("button", { name: "Add an instrument" }).click();
      await dialog.getByLabel("Instrument 3", { exact: true }).fill("Screwdriver, cannulated");
      await dialog.getByRole("button", { name: "Move instrument 3 up" }).click();
      await dialog.getByRole("button", { name: "Add set type" }).click();
      await expect.poll(() => dialog.getByText("Check the weight in kg: use at most 2 decimals.").count()).toBe(1);
      await dialog.getByLabel("Weight (kg)").fill("3.45");
      await dialog.getByLabel("Instructions for use (PDF)").setInputFiles(ifu);
      await expect.poll(() => dialog.getByRole("link", { name: "loaner-ifu.pdf" }).count()).toBe(1);
      await expect.poll(() => dialog.getByText(/A loaner set needs its supplier's instructions for use/).count()).toBe(0);
      await screenshot(page, "catalogue-new-set-type");
      await dialog.getByRole("button", { name: "Add set type" }).click();

      await expect.poll(() => page.getByRole("heading", { name: "Loaner compression screw instruments" }).count(), { timeout: 20_000 }).toBe(1);
      await expect.poll(() => page.getByText("DS-LN-CMP-01").count()).toBeGreaterThan(0);
      const rows = page.getByRole("table", { name: /Contents of/ }).locator("tbody tr");
      await expect.poll(() => rows.count()).toBe(3);
      expect(await rows.allTextContents()).toEqual(["1Cannulated drill bit 2.0 mm2", "2Screwdriver, cannulated1", "3Guide wire holder1"]);
      await expect.poll(() => page.getByText("3.45 kg").count()).toBe(1);
      await expect.poll(() => page.getByRole("link", { name: /loaner-ifu\.pdf/ }).count()).toBe(1);
      await screenshot(page, "catalogue-set-type-card");

      // A second set type with the same name is refused under the field.
      await page.goto("/unit/catalogue");
      await page.getByLabel("Customer").selectOption({ label: "Otterwick Day Surgery (26 set types)" });
      await page.getByRole("button", { name: "New set type" }).click();
      const again = page.getByRole("dialog");
      await again.getByLabel("Code").fill("DS-LN-CMP-02");
      await again.getByLabel("Name").fill("loaner compression screw instruments");
      await again.getByLabel("Weight (kg)").fill("1");
      await again.getByLabel("Size (StU)").fill("0.25");
      await again.getByLabel("Instrument 1", { exact: true }).fill("Guide wire holder");
      await again.getByRole("button", { name: "Add set type" }).click();
      await expect.poll(() => again.getByText("Set type DS-LN-CMP-01 already has this name.").count()).toBe(1);
      await expect.poll(() => formError(page).textContent()).toMatch(/already has this name/);
    } finally {
      await context.close();
    }
  });

  it("a clinic manager reads its own catalogue and a set type's contents, on a phone", async () => {
    const { context, page } = await newPage(browser, PHONE);
    try {
      await signIn(page, "manager@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.goto("/clinic/catalogue");
      await expect.poll(() => page.getByRole("heading", { name: "Set catalogue" }).count()).toBe(1);
      await expect.poll(() => page.getByText("Rows 1–25 of 40").count()).toBe(1);
      await page.getByLabel("Set class").selectOption("loaner_set");
      await expect.poll(() => page.getByText("Rows 1–3 of 3").count()).toBe(1);
      await expect.poll(() => page.getByText("No IFU").count()).toBe(1);
      await screenshot(page, "clinic-catalogue-phone");
      await page.getByLabel("Set class").selectOption("");
      await page.getByLabel("Search by code or name").fill("Minor general");
      await page.getByRole("link", { name: "Minor general set" }).click();
      await expect.poll(() => page.getByRole("heading", { name: "Minor general set" }).count()).toBe(1);
      await expect.poll(() => page.getByRole("cell", { name: "Needle holder, Mayo-Hegar 160 mm" }).count()).toBe(1);
      await expect.poll(() => page.getByText("1.85 kg").count()).toBe(1);
      // Read-only: no editing for the clinic.
      expect(await page.getByRole("button", { name: "Edit" }).count()).toBe(0);
      await screenshot(page, "clinic-set-type-phone");
    } finally {
      await context.close();
    }
  });

  it("a clinic manager asking for another organisation's set type gets the not-found page", async () => {
    const other = setTypeIdOf("ODS", "DS-ARTH-01");
    const own = setTypeIdOf("QMH", "ORTH-LN-SPN-01");
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "manager@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.goto(`/clinic/catalogue/${other}`);
      await expect.poll(() => page.getByRole("heading", { name: "There is nothing here for you" }).count()).toBe(1);
      expect(await page.getByText("Knee arthroscopy set").count()).toBe(0);
      await screenshot(page, "clinic-catalogue-not-found");
      // Its own loaner set without an IFU says so.
      await page.goto(`/clinic/catalogue/${own}`);
      await expect.poll(() => page.getByText(/This loaner set has no instructions for use on file/).count()).toBe(1);
    } finally {
      await context.close();
    }
  });
});
