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
import { synthWasherRecord } from "@/lib/cycles/synth";
import { toLocalDateTimeText } from "@/lib/local-time";
import { createSets } from "@/lib/sets/service";
import { expectPath, formError, launchBrowser, newPage, screenshot, signIn } from "./browser";

// One set all the way through the unit's first stations, in one browser session of a technician:
// the day-case nurse books a pickup of it, the technician receives it against that pickup, washes
// it in a batch closed with a passing washer record, packs it with its contents counted and opens
// its label. Every scan is typed as a keyboard-wedge scanner types it: the DataMatrix's element
// string, then Enter. The set is made for this test, and the washer is one with no open batch, so
// other tests on the same demo database do not get in its way.

// The data modules guard against client bundles; this test process uses them directly.
vi.mock("server-only", () => ({}));

const DAY_CASE = "Quillby Moor General – Day Case Unit";
const NURSE = "daycase@quillby.example";
const TECH = "tech@larkmoor.example";
const TECH_NAME = "Sol Brackenbury";
const PROGRAM_CODE = "A0-3000";

let browser: Browser;
let db: Kysely<Database>;
let dir: string;

beforeAll(async () => {
  browser = await launchBrowser();
  db = openDatabase(path.join(inject("dataDir"), "steamlane.db"));
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-station-run-e2e-"));
});
afterAll(async () => {
  await browser?.close();
  await db?.destroy();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

/** A local date-time text on the next weekday at least `days` from now, at the hour, in the unit's zone. */
function weekdayAt(days: number, hour: number): string {
  for (let d = days; ; d++) {
    const at = new Date(Date.now() + d * 86_400_000);
    const weekday = new Intl.DateTimeFormat("en-GB", { weekday: "short", timeZone: "Europe/London" }).format(at);
    if (weekday !== "Sat" && weekday !== "Sun") return `${toLocalDateTimeText(at, "Europe/London").slice(0, 10)}T${String(hour).padStart(2, "0")}:00`;
  }
}

/**
 * A new set at the day-case unit, of a wrapped or contained tray type that goes through the
 * washer-disinfector and has a contents list of several lines to count.
 */
async function newDayCaseSet(): Promise<{ id: number; serial: string; giai: string; typeName: string }> {
  const adminRow = await db.selectFrom("users").select(["id", "session_version"]).where("email", "=", "admin@larkmoor.example").executeTakeFirstOrThrow();
  const admin = (await loadSessionUser(db, { userId: adminRow.id, sessionVersion: adminRow.session_version }))!;
  const site = await db.selectFrom("sites").select(["id", "organisation_id"]).where("name", "=", DAY_CASE).executeTakeFirstOrThrow();
  const type = await db
    .selectFrom("set_types")
    .innerJoin("set_type_items", "set_type_items.set_type_id", "set_types.id")
    .select(["set_types.id", "set_types.name"])
    .where("set_types.organisation_id", "=", site.organisation_id)
    .where("set_types.set_class", "!=", "loaner_set")
    .where("set_types.active", "=", 1)
    .where("set_types.size_stu", "<=", 1)
    .where("set_types.packaging", "in", ["wrap", "rigid_container"])
    .where("set_types.processing_flags", "not like", "%manual_wash_only%")
    .groupBy(["set_types.id", "set_types.name", "set_types.code"])
    .having((eb) => eb.fn.countAll(), ">=", 3)
    .orderBy("set_types.code")
    .executeTakeFirstOrThrow();
  const { sets } = await createSets(db, admin, { organisationId: site.organisation_id, setTypeId: type.id, homeSiteId: site.id, count: 1 });
  const set = await db.selectFrom("sets").select(["id", "serial", "giai"]).where("id", "=", sets[0]!.id).executeTakeFirstOrThrow();
  return { ...set, typeName: type.name };
}

/** A washer-disinfector with the A0 3000 program and no batch loading or running now. */
async function freeWasher(): Promise<{ code: string; program: string }> {
  const row = await db
    .selectFrom("machines")
    .innerJoin("programs", "programs.machine_id", "machines.id")
    .select(["machines.code", "programs.name"])
    .where("machines.kind", "=", "washer")
    .where("machines.active", "=", 1)
    .where("programs.code", "=", PROGRAM_CODE)
    .where("programs.active", "=", 1)
    .where((eb) =>
      eb.not(
        eb.exists(
          eb.selectFrom("washer_batches").select("washer_batches.id").whereRef("washer_batches.machine_id", "=", "machines.id").where("washer_batches.status", "in", ["loading", "running"]),
        ),
      ),
    )
    // W1 is the washing station's own test washer; start from the other end.
    .orderBy("machines.code", "desc")
    .executeTakeFirst();
  if (!row) throw new Error(`Every washer with the ${PROGRAM_CODE} program has a batch open; close one in the demo first.`);
  return { code: row.code, program: row.name };
}

async function stateOf(setId: number): Promise<string> {
  const row = await db.selectFrom("cycles").select("state").where("set_id", "=", setId).where("state", "not in", ["delivered", "cancelled"]).executeTakeFirstOrThrow();
  return row.state;
}

/** What a keyboard-wedge scanner does with the set's DataMatrix: types its element string, then Enter. */
async function wedgeScan(page: Page, fieldId: string, text: string) {
  const field = page.locator(`#${fieldId}`);
  await expect.poll(() => field.evaluate((el) => el === document.activeElement), { timeout: 15_000 }).toBe(true);
  await page.keyboard.type(text, { delay: 5 });
  await page.keyboard.press("Enter");
}

describe("one set through the stations", () => {
  it("is booked by the clinic, received against its pickup, washed in a passing batch, packed with its contents counted and labelled", async () => {
    const set = await newDayCaseSet();
    // The element string of the set's DataMatrix as a scanner sends it: symbology identifier ]d2, AI 8004, the GIAI.
    const barcode = `]d28004${set.giai}`;
    const washer = await freeWasher();
    const record = path.join(dir, `${washer.code}-passing.csv`);
    // 93 °C held 300 s: the hold alone gives A0 = 300 × 10^1.3 ≈ 5986 (EN ISO 15883-1 Annex B formula, computed), above 3000.
    fs.writeFileSync(
      record,
      recordToCsv(synthWasherRecord({ holdTempC: 93, holdSeconds: 300, rampSeconds: 600, dryingSeconds: 600, stepSeconds: 10, noiseK: 0.2, seed: 11 }), { decimals: 1 }),
    );

    // 1. The day-case nurse books a pickup of the set, scanning it into the booking.
    let reference = "";
    const clinic = await newPage(browser);
    try {
      await signIn(clinic.page, NURSE, DEMO_PASSWORD);
      await expectPath(clinic.page, "/clinic");
      await clinic.page.goto("/clinic/orders/new");
      await expect.poll(() => clinic.page.getByRole("checkbox", { name: /QMH-/ }).count()).toBeGreaterThan(0);
      await clinic.page.locator("#scan").focus();
      await wedgeScan(clinic.page, "scan", barcode);
      await expect.poll(() => clinic.page.getByRole("checkbox", { name: new RegExp(set.serial) }).isChecked()).toBe(true);
      await clinic.page.getByLabel("Collect from").fill(weekdayAt(1, 9));
      await clinic.page.getByLabel("Collect by").fill(weekdayAt(1, 11));
      await clinic.page.getByLabel("Needed back by").fill(weekdayAt(8, 17));
      await expect.poll(() => clinic.page.getByTestId("promised-return").textContent(), { timeout: 15_000 }).toMatch(/Back by/);
      await screenshot(clinic.page, "station-run-booking");
      await clinic.page.getByRole("button", { name: "Book pickup" }).click();
      await expect.poll(() => new URL(clinic.page.url()).pathname, { timeout: 20_000 }).toMatch(/^\/clinic\/orders\/\d+$/);
      reference = (await clinic.page.getByRole("heading", { level: 1 }).textContent())!.replace("Pickup ", "").trim();
      await expect.poll(() => clinic.page.getByTestId("order-set").allTextContents()).toEqual([expect.stringContaining(set.serial)]);
    } finally {
      await clinic.context.close();
    }
    expect(await stateOf(set.id)).toBe("booked");

    const { context, page } = await newPage(browser, { width: 1440, height: 960 });
    try {
      await signIn(page, TECH, DEMO_PASSWORD);
      await expectPath(page, "/unit");

      // 2. Receiving: the set is matched to its pickup.
      await page.getByRole("link", { name: "Stations" }).first().click();
      await expectPath(page, "/unit/stations");
      await page.getByRole("link", { name: /^Receiving/ }).click();
      await expectPath(page, "/unit/stations/receiving");
      await wedgeScan(page, "station-scan", barcode);
      await expect.poll(() => page.getByTestId("receiving-outcome").textContent(), { timeout: 15_000 }).toContain("Received");
      expect(await page.getByTestId("receiving-serial").textContent()).toBe(set.serial);
      expect(await page.getByTestId("receiving-route").textContent()).toMatch(/^Next.*Washer-disinfector/);
      const order = page.getByTestId("receiving-order");
      await expect.poll(() => order.textContent()).toContain(`Pickup ${reference}`);
      expect(await order.textContent()).toContain(DAY_CASE);
      expect(await page.getByTestId("receiving-order-progress").textContent()).toBe("1 of 1 received");
      await screenshot(page, "station-run-receiving");
      expect(await stateOf(set.id)).toBe("received");

      // 3. Washing: a batch on a free washer, the set scanned in, started, closed with a passing record.
      await page.goto("/unit/stations");
      await page.getByRole("link", { name: /^Washing/ }).click();
      await expectPath(page, "/unit/stations/washing");
      await page.getByRole("button", { name: new RegExp(`^${washer.code}\\b`) }).click();
      await page.getByRole("radio", { name: new RegExp(washer.program) }).click();
      await page.getByRole("button", { name: `Open a batch on ${washer.code}` }).click();
      await expect.poll(() => page.getByTestId("batch-status").textContent()).toContain("Loading");
      const batchNumber = (await page.getByTestId("batch-number").textContent())!.trim();
      expect(batchNumber).toMatch(new RegExp(`^${washer.code}-\\d{4}-\\d{4}$`));
      await wedgeScan(page, "station-scan", barcode);
      await expect.poll(() => page.getByTestId("scanned-set").textContent()).toContain(set.serial);
      await expect.poll(() => page.getByTestId("batch-items").locator("li").count()).toBe(1);
      await screenshot(page, "station-run-washing-loaded");
      await page.getByRole("button", { name: "Start the batch" }).click();
      await expect.poll(() => page.getByTestId("batch-status").textContent()).toContain("Running");
      await page.getByLabel("Record file (CSV)").setInputFiles(record);
      await page.getByRole("button", { name: "Close the batch with this record" }).click();
      await expect.poll(() => page.getByTestId("batch-result").textContent(), { timeout: 20_000 }).toContain("The record meets the program's requirement");
      await expect.poll(() => page.getByTestId("batch-items").getByText("Washed and disinfected").count()).toBe(1);
      await expect.poll(() => page.getByTestId("advisory-note").count()).toBeGreaterThan(0);
      await screenshot(page, "station-run-washing-passed");
      expect(await stateOf(set.id)).toBe("washed");

      // 4. Packing: every line of the contents list counted as listed, then packed.
      await page.goto("/unit/stations");
      await page.getByRole("link", { name: /^Packing/ }).click();
      await expectPath(page, "/unit/stations/packing");
      await wedgeScan(page, "station-scan", barcode);
      await expect.poll(() => page.getByTestId("packing-serial").textContent().catch(() => null), { timeout: 15_000 }).toBe(set.serial);
      await expect.poll(() => page.getByTestId("station-refusal").count()).toBe(0);
      const lines = page.getByTestId("checklist-line");
      const n = await lines.count();
      expect(n).toBeGreaterThanOrEqual(3);
      // Packing before counting is refused, naming what is left.
      await page.getByRole("button", { name: "Pack", exact: true }).click();
      await expect.poll(() => formError(page).textContent()).toMatch(/^Count every line before packing\. Not counted: /);
      for (let i = 0; i < n; i++) {
        const line = lines.nth(i);
        const listed = /Listed:\s*(\d+)/.exec((await line.textContent()) ?? "")![1]!;
        await line.getByLabel(/^Counted/).fill(listed);
      }
      await expect.poll(() => page.getByTestId("uncounted").count()).toBe(0);
      // Counted in full, the earlier complaint is gone.
      await expect.poll(() => formError(page).count()).toBe(0);
      await screenshot(page, "station-run-packing-counted");
      await page.getByRole("button", { name: "Pack", exact: true }).click();
      const result = page.getByTestId("packing-result");
      await expect.poll(() => result.textContent(), { timeout: 15_000 }).toContain(`${set.serial} packed`);
      expect(await result.textContent()).toContain(TECH_NAME);
      await screenshot(page, "station-run-packed");
      expect(await stateOf(set.id)).toBe("packed");
      const cycle = await db.selectFrom("cycles").select(["id", "order_id"]).where("set_id", "=", set.id).where("state", "=", "packed").executeTakeFirstOrThrow();
      const booked = await db.selectFrom("orders").select("reference").where("id", "=", cycle.order_id!).executeTakeFirstOrThrow();
      expect(booked.reference).toBe(reference);

      // 5. The label: the set's DataMatrix with its GIAI, the set's name and who packed it.
      const [label] = await Promise.all([context.waitForEvent("page"), result.getByRole("link", { name: "Print label" }).click()]);
      await label.waitForLoadState();
      expect(new URL(label.url()).pathname + new URL(label.url()).search).toBe(`/unit/sets/${set.id}/label?cycle=${cycle.id}`);
      const article = label.getByTestId("set-label");
      await expect.poll(() => article.getByRole("img", { name: `GS1 DataMatrix (8004)${set.giai}` }).count()).toBe(1);
      await expect.poll(() => label.getByTestId("set-label-symbol").locator("svg path").count()).toBeGreaterThan(0);
      expect(await label.getByTestId("set-label-hri").textContent()).toBe(`(8004)${set.giai}`);
      expect(await article.locator("header").textContent()).toContain(set.typeName);
      expect(await article.textContent()).toContain(set.serial);
      await expect.poll(() => label.getByTestId("set-label-field-packed-by").textContent()).toContain(TECH_NAME);
      await screenshot(label, "station-run-label");
      await label.close();
    } finally {
      await context.close();
    }
  });
});
