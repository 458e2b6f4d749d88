import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Kysely } from "kysely";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { openDatabase } from "@/db/connection";
import type { Database } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { loadSessionUser } from "@/lib/auth/session-user";
import { recordToCsv } from "@/lib/cycles/csv";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { synthWasherRecord } from "@/lib/cycles/synth";
import { createSets } from "@/lib/sets/service";
import { expectPath, launchBrowser, newPage, PHONE, screenshot, signIn } from "./browser";

// The data modules guard against client bundles; this test process uses them directly.
vi.mock("server-only", () => ({}));

let browser: Browser;
let db: Kysely<Database>;
let dir: string;
const THEATRES = "Quillby Moor General – Main Theatres";

/** New sets of a set type at the main theatres, each received at the unit (every move through applyCycleEvent). */
async function receivedSets(count: number, manualOnly: boolean): Promise<string[]> {
  const adminRow = await db.selectFrom("users").select(["id", "session_version"]).where("email", "=", "admin@larkmoor.example").executeTakeFirstOrThrow();
  const admin = (await loadSessionUser(db, { userId: adminRow.id, sessionVersion: adminRow.session_version }))!;
  const site = await db.selectFrom("sites").select(["id", "organisation_id"]).where("name", "=", THEATRES).executeTakeFirstOrThrow();
  const type = await db
    .selectFrom("set_types")
    .select("id")
    .where("organisation_id", "=", site.organisation_id)
    .where("set_class", "!=", "loaner_set")
    .where("active", "=", 1)
    .where("size_stu", "<=", 1)
    .where("processing_flags", manualOnly ? "like" : "not like", "%manual_wash_only%")
    .orderBy("code")
    .executeTakeFirstOrThrow();
  const { sets } = await createSets(db, admin, { organisationId: site.organisation_id, setTypeId: type.id, homeSiteId: site.id, count });
  const at = new Date(Date.now() - 3600_000);
  for (const set of sets) {
    const cycleId = await openCycle(db, {
      organisationId: site.organisation_id,
      siteId: site.id,
      setId: set.id,
      orderId: null,
      serviceLevel: "standard",
      heavySoil: false,
      outOfHours: false,
      loaner: false,
      neededBackBy: null,
      promisedAt: null,
      userId: null,
      at,
    });
    await applyCycleEvent(db, { cycleId, event: "receive", station: "receiving", userId: adminRow.id, at });
  }
  return sets.map((s) => s.serial);
}

/** A washer's CSV export: heating, a disinfection hold, drying, in seconds from the start (the run is not waited for here). */
function writeRecord(name: string, holdTempC: number, holdSeconds: number): string {
  const record = synthWasherRecord({ holdTempC, holdSeconds, rampSeconds: 600, dryingSeconds: 600, stepSeconds: 10, noiseK: 0.2, seed: 7 });
  const file = path.join(dir, name);
  fs.writeFileSync(file, recordToCsv(record, { decimals: 1 }));
  return file;
}

async function stateOf(serial: string): Promise<string> {
  const row = await db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .select("cycles.state")
    .where("sets.serial", "=", serial)
    .where("cycles.state", "not in", ["delivered", "cancelled"])
    .executeTakeFirstOrThrow();
  return row.state;
}

async function scan(page: Page, code: string) {
  await page.locator("#station-scan").fill(code);
  await page.keyboard.press("Enter");
}

async function openBatchOn(page: Page, washer: string, program: string, options: { chooseWasher: boolean }) {
  if (options.chooseWasher) await page.getByRole("button", { name: new RegExp(`^${washer}\\b`) }).click();
  await page.getByRole("radio", { name: new RegExp(program) }).click();
  await page.getByRole("button", { name: `Open a batch on ${washer}` }).click();
  await expect.poll(() => page.getByTestId("batch-status").textContent()).toContain("Loading");
  // The scan field has the focus for the scanner.
  await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe("station-scan");
}

beforeAll(async () => {
  browser = await launchBrowser();
  db = openDatabase(path.join(inject("dataDir"), "steamlane.db"));
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-washing-e2e-"));
});
afterAll(async () => {
  await browser?.close();
  await db?.destroy();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe("the washing station", () => {
  it("a technician loads received sets, starts the batch, closes it with a passing record and sees them washed; a too-cool record sends the next batch back", async () => {
    const [a, b, c, d] = await receivedSets(4, false);
    const [manualOnly] = await receivedSets(1, true);
    const passing = writeRecord("w1-passing.csv", 93, 300);
    // 80 °C held 300 s: A0 300 in the hold (EN ISO 15883-1 Annex B formula, computed), far below 3000.
    const failing = writeRecord("w1-too-cool.csv", 80, 300);
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "tech@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto("/unit/stations");
      await page.getByRole("link", { name: /Washing/ }).first().click();
      await expectPath(page, "/unit/stations/washing");
      await expect.poll(() => page.getByRole("button", { name: /^W1\b/ }).count()).toBe(1);
      await screenshot(page, "washing-washers");

      await openBatchOn(page, "W1", "Instruments A0 3000", { chooseWasher: true });
      const number = (await page.getByTestId("batch-number").textContent())!.trim();
      expect(number).toMatch(/^W1-\d{4}-\d{4}$/);

      await scan(page, a!);
      await expect.poll(() => page.getByTestId("scanned-set").textContent()).toContain(a!);
      await scan(page, b!);
      await expect.poll(() => page.getByTestId("batch-items").locator("li").count()).toBe(2);
      await expect.poll(() => page.getByRole("button", { name: "Processing notes" }).count()).toBe(1);
      await screenshot(page, "washing-loading");

      // A set for manual washing only is refused, big and red, and not added.
      await scan(page, manualOnly!);
      await expect.poll(() => page.getByTestId("station-refusal").textContent()).toContain("manual washing only");
      expect(await page.getByTestId("batch-items").locator("li").count()).toBe(2);
      await screenshot(page, "washing-refused");

      await page.getByRole("button", { name: "Start the batch" }).click();
      await expect.poll(() => page.getByTestId("batch-status").textContent()).toContain("Running");
      await page.getByLabel("Record file (CSV)").setInputFiles(passing);
      await page.getByRole("button", { name: "Close the batch with this record" }).click();
      await expect.poll(() => page.getByTestId("batch-result").textContent(), { timeout: 20_000 }).toContain("The record meets the program's requirement");
      await expect.poll(() => page.getByTestId("batch-items").getByText("Washed and disinfected").count()).toBe(2);
      await expect.poll(() => page.getByTestId("advisory-note").count()).toBeGreaterThan(0);
      await screenshot(page, "washing-passed");
      expect(await stateOf(a!)).toBe("washed");
      expect(await stateOf(b!)).toBe("washed");

      // The next batch on the same washer, with a record that stays too cool.
      await page.getByRole("button", { name: "Next batch" }).click();
      await openBatchOn(page, "W1", "Instruments A0 3000", { chooseWasher: false });
      await scan(page, c!);
      await expect.poll(() => page.getByTestId("batch-items").locator("li").count()).toBe(1);
      await scan(page, d!);
      await expect.poll(() => page.getByTestId("batch-items").locator("li").count()).toBe(2);
      await page.getByRole("button", { name: "Start the batch" }).click();
      await expect.poll(() => page.getByTestId("batch-status").textContent()).toContain("Running");
      await page.getByLabel("Record file (CSV)").setInputFiles(failing);
      await page.getByRole("button", { name: "Close the batch with this record" }).click();
      await expect.poll(() => page.getByTestId("batch-reasons").textContent(), { timeout: 20_000 }).toMatch(/^A0 \d+ is below the required 3000\.$/);
      await expect.poll(() => page.getByTestId("batch-items").getByText("Back to washing").count()).toBe(2);
      await screenshot(page, "washing-failed");
      expect(await stateOf(c!)).toBe("reprocess");
      expect(await stateOf(d!)).toBe("reprocess");

      // The batch's own page: the decision, the reasons and the temperature curve.
      await page.getByRole("link", { name: "Open the batch record" }).click();
      await expect.poll(() => new URL(page.url()).pathname).toMatch(/^\/unit\/batches\/\d+$/);
      await expect.poll(() => page.getByTestId("record-chart").count()).toBe(1);
      await expect.poll(() => page.getByTestId("batch-reasons").textContent()).toMatch(/below the required 3000/);
      await screenshot(page, "batch-failed-page");

      await page.goto("/unit/batches");
      await expect.poll(() => page.getByRole("link", { name: number }).count(), { timeout: 20_000 }).toBe(1);
      await screenshot(page, "batches-list");
    } finally {
      await context.close();
    }
  });

  it("a technician washes a manual-only set by hand, confirming each step", async () => {
    const [serial] = await receivedSets(1, true);
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "tech2@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto("/unit/stations/manual-washing");
      await scan(page, serial!);
      const card = page.getByTestId("manual-wash-set");
      await expect.poll(() => card.count()).toBe(1);
      const record = page.getByRole("button", { name: "Record the manual wash" });
      expect(await record.isDisabled()).toBe(true);
      const boxes = card.getByRole("checkbox");
      const n = await boxes.count();
      expect(n).toBeGreaterThanOrEqual(2);
      for (let i = 0; i < n; i++) await boxes.nth(i).check();
      await expect.poll(() => record.isEnabled()).toBe(true);
      await page.waitForTimeout(300); // let the button's colour transition finish before the picture
      await screenshot(page, "manual-washing-checklist");
      await record.click();
      await expect.poll(() => page.getByTestId("manual-wash-done").textContent()).toContain(`${serial} recorded as washed by hand`);
      expect(await stateOf(serial!)).toBe("washed");
      const event = await db
        .selectFrom("scan_events")
        .innerJoin("sets", "sets.id", "scan_events.set_id")
        .select(["scan_events.station", "scan_events.details"])
        .where("sets.serial", "=", serial!)
        .where("scan_events.event", "=", "manual_wash")
        .executeTakeFirstOrThrow();
      expect(event.station).toBe("manual_washing");
      expect(JSON.parse(event.details)).toMatchObject({ operator: "Janna Pikeworth" });
      await screenshot(page, "manual-washing-done");
    } finally {
      await context.close();
    }
  });

  it("the quality lead sees the machines and a washer's programs and batches; the station fits a narrow screen", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "quality@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.getByRole("link", { name: "Machines" }).first().click();
      await expectPath(page, "/unit/machines");
      await expect.poll(() => page.getByRole("heading", { name: "Steam sterilisers" }).count()).toBe(1);
      await screenshot(page, "machines-list");
      await page.getByRole("link", { name: "W3", exact: true }).click();
      await expect.poll(() => page.getByTestId("programs").locator("tr").count()).toBe(2);
      await expect.poll(() => page.getByText("90 °C held for 5 min").count()).toBe(1);
      await page.getByRole("button", { name: "Add a program" }).click();
      const dialog = page.getByRole("dialog");
      await dialog.getByRole("button", { name: /A0 600/ }).click();
      await dialog.getByLabel("Code").fill("A0-600");
      await dialog.getByLabel("Name").fill("Instruments A0 600");
      await screenshot(page, "machine-program-dialog");
      await dialog.getByRole("button", { name: "Add program" }).click();
      await expect.poll(() => page.getByRole("dialog").count()).toBe(0);
      await expect.poll(() => page.getByTestId("programs").locator("tr").count()).toBe(3);
      await screenshot(page, "machine-page");
    } finally {
      await context.close();
    }
    const phone = await newPage(browser, PHONE);
    try {
      await signIn(phone.page, "tech@larkmoor.example", DEMO_PASSWORD);
      await expectPath(phone.page, "/unit");
      await phone.page.goto("/unit/stations/washing");
      await expect.poll(() => phone.page.getByRole("button", { name: /^W2\b/ }).count()).toBe(1);
      await phone.page.getByRole("button", { name: /^W2\b/ }).click();
      await expect.poll(() => phone.page.getByRole("radiogroup", { name: "Program" }).count()).toBe(1);
      await screenshot(phone.page, "washing-phone");
    } finally {
      await phone.context.close();
    }
  });
});
