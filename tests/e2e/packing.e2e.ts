import path from "node:path";
import type { Kysely } from "kysely";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { openDatabase } from "@/db/connection";
import { DEMO_PASSWORD } from "@/db/seed/people";
import type { Database } from "@/db/schema";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { expectPath, formError, launchBrowser, newPage, PHONE, screenshot, signIn } from "./browser";

// The data modules guard themselves with `server-only`; this test calls the cycle store directly
// on the stack's database to bring sets to the packing station, as the earlier stations would.
vi.mock("server-only", () => ({}));

const NEEDLE_HOLDER = "Needle holder, Mayo-Hegar 160 mm";
const TECH = "tech@larkmoor.example";

let browser: Browser;
let db: Kysely<Database>;

interface Prepared {
  setId: number;
  serial: string;
  giai: string;
  cycleId: number;
}

beforeAll(async () => {
  browser = await launchBrowser();
  db = openDatabase(path.join(inject("dataDir"), "steamlane.db"));
});
afterAll(async () => {
  await browser?.close();
  await db?.destroy();
});

/** Wrapped sets holding one Mayo-Hegar 160 mm needle holder, not on their way through the unit, booked → received (→ washed). */
async function prepare(count: number, state: "received" | "washed"): Promise<Prepared[]> {
  const sets = await db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("set_type_items", "set_type_items.set_type_id", "set_types.id")
    .select(["sets.id", "sets.serial", "sets.giai", "sets.organisation_id", "sets.home_site_id"])
    .where("sets.status", "=", "in_service")
    .where("set_types.set_class", "!=", "loaner_set")
    .where("set_types.packaging", "=", "wrap")
    .where("set_type_items.name", "=", NEEDLE_HOLDER)
    .where("set_type_items.quantity", "=", 1)
    .where((eb) =>
      eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))),
    )
    .orderBy("sets.serial", "desc")
    .limit(count)
    .execute();
  expect(sets).toHaveLength(count);
  const tech = await db.selectFrom("users").select("id").where("email", "=", TECH).executeTakeFirstOrThrow();
  const prepared: Prepared[] = [];
  for (const set of sets) {
    const at = new Date();
    const cycleId = await db.transaction().execute(async (trx) => {
      const id = await openCycle(trx, {
        organisationId: set.organisation_id,
        siteId: set.home_site_id,
        setId: set.id,
        orderId: null,
        serviceLevel: "standard",
        heavySoil: false,
        outOfHours: false,
        loaner: false,
        neededBackBy: null,
        promisedAt: null,
        userId: tech.id,
        at,
      });
      await applyCycleEvent(trx, { cycleId: id, event: "receive", station: "receiving", userId: tech.id, at });
      if (state === "washed") await applyCycleEvent(trx, { cycleId: id, event: "wash_passed", station: "washing", userId: tech.id, at });
      return id;
    });
    prepared.push({ setId: set.id, serial: set.serial, giai: set.giai, cycleId });
  }
  return prepared;
}

async function scanSet(page: Page, serial: string) {
  const field = page.getByLabel("Scan set", { exact: true });
  await field.fill(serial);
  await field.press("Enter");
  await expect.poll(() => page.getByTestId("packing-serial").textContent().catch(() => null), { timeout: 15_000 }).toBe(serial);
}

/** Counts every line as listed, except `counted` overrides by line name; one line by its + button. */
async function countLines(page: Page, counted: Record<string, number> = {}) {
  const lines = page.getByTestId("checklist-line");
  const n = await lines.count();
  expect(n).toBeGreaterThan(1);
  for (let i = 0; i < n; i++) {
    const line = lines.nth(i);
    const name = (await line.getAttribute("data-line"))!;
    const listed = Number(/Listed:\s*(\d+)/.exec((await line.textContent()) ?? "")![1]);
    const wanted = counted[name] ?? listed;
    if (i === 0 && wanted > 0) {
      // The touch way: + from blank counts one.
      for (let k = 0; k < wanted; k++) await line.getByRole("button", { name: /^One more: counted/ }).click();
    } else {
      await line.getByLabel(/^Counted/).fill(String(wanted));
    }
  }
}

describe("the packing station", () => {
  it("a technician counts a washed set, packs it and prints its label; a set short of an instrument is packed with the irregularity on its label", async () => {
    const [first, second] = await prepare(2, "washed");
    const [unwashed] = await prepare(1, "received");
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, TECH, DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto("/unit/stations");
      await page.getByRole("link", { name: /Packing/ }).click();
      await expectPath(page, "/unit/stations/packing");
      await expect.poll(() => page.getByLabel("Scan set", { exact: true }).evaluate((el) => el === document.activeElement)).toBe(true);

      // A set that has not been washed is refused, big and red, with the reason.
      const field = page.getByLabel("Scan set", { exact: true });
      await field.fill(unwashed!.serial);
      await field.press("Enter");
      await expect.poll(() => page.getByTestId("station-refusal").textContent()).toContain("Cannot pack this set: it has not been washed yet.");
      await screenshot(page, "packing-refused");

      // The washed set: its contents list to count, every line blank.
      await scanSet(page, first!.serial);
      await expect.poll(() => page.getByTestId("station-refusal").count()).toBe(0);
      await expect.poll(() => page.getByTestId("line-status").first().textContent()).toBe("Not counted");
      await page.getByRole("button", { name: "Pack", exact: true }).click();
      await expect.poll(() => formError(page).textContent()).toMatch(/^Count every line before packing\. Not counted: /);
      await screenshot(page, "packing-not-counted");

      await countLines(page);
      await expect.poll(() => page.getByTestId("uncounted").count()).toBe(0);
      await screenshot(page, "packing-counted");
      await page.getByRole("button", { name: "Pack", exact: true }).click();
      const result = page.getByTestId("packing-result");
      await expect.poll(() => result.textContent(), { timeout: 15_000 }).toContain(`${first!.serial} packed`);
      expect(await result.textContent()).toContain("Sol Brackenbury");
      await screenshot(page, "packing-packed");

      // Print label: the label page of this cycle, with the packer's name and the set's GIAI.
      const [labelPage] = await Promise.all([context.waitForEvent("page"), result.getByRole("link", { name: "Print label" }).click()]);
      await labelPage.waitForLoadState();
      expect(new URL(labelPage.url()).pathname + new URL(labelPage.url()).search).toBe(`/unit/sets/${first!.setId}/label?cycle=${first!.cycleId}`);
      await expect.poll(() => labelPage.getByTestId("set-label-field-packed-by").textContent()).toContain("Sol Brackenbury");
      await expect.poll(() => labelPage.getByTestId("set-label-hri").textContent()).toBe(`(8004)${first!.giai}`);
      await expect.poll(() => labelPage.getByTestId("set-label-packaging").textContent()).toBe("Wrapped tray");
      await expect.poll(() => labelPage.getByTestId("set-label-symbol").locator("svg path").count()).toBeGreaterThan(0);
      expect(await labelPage.getByTestId("set-label-irregularity").textContent()).toBe("");
      await screenshot(labelPage, "packing-label");
      const pdfHref = await result.getByRole("link", { name: "Download PDF" }).getAttribute("href");
      expect(pdfHref).toBe(`/api/sets/${first!.setId}/label.pdf?cycle=${first!.cycleId}`);
      const pdf = await context.request.get(pdfHref!);
      expect(pdf.status()).toBe(200);
      expect((await pdf.body()).subarray(0, 5).toString("latin1")).toBe("%PDF-");
      await labelPage.close();

      // The second set: the needle holder is missing; the packer packs it with the irregularity.
      await scanSet(page, second!.serial);
      await countLines(page, { [NEEDLE_HOLDER]: 0 });
      await expect.poll(() => page.getByTestId("irregularities").textContent()).toContain(`1 × ${NEEDLE_HOLDER} missing`);
      await expect.poll(() => page.getByRole("button", { name: "Pack", exact: true }).count()).toBe(0);
      await screenshot(page, "packing-irregularity");
      await page.getByRole("button", { name: "Pack with irregularity" }).click();
      await expect.poll(() => result.textContent(), { timeout: 15_000 }).toContain(`${second!.serial} packed`);
      expect(await page.getByTestId("result-irregularity").textContent()).toContain(`1 × ${NEEDLE_HOLDER} missing`);
      const [irregularLabel] = await Promise.all([context.waitForEvent("page"), result.getByRole("link", { name: "Print label" }).click()]);
      await irregularLabel.waitForLoadState();
      await expect.poll(() => irregularLabel.getByTestId("set-label-irregularity").textContent()).toBe(`IRREGULARITY: 1 × ${NEEDLE_HOLDER} missing`);
      await expect.poll(() => irregularLabel.getByTestId("set-label-field-packed-by").textContent()).toContain("Sol Brackenbury");
      await screenshot(irregularLabel, "packing-label-irregularity");
      await irregularLabel.getByLabel(/Include the contents list/).check();
      await expect.poll(() => irregularLabel.getByText(`— 1 missing`).count()).toBe(1);
      await screenshot(irregularLabel, "packing-label-irregularity-contents");
      await irregularLabel.close();

      const cycle = await db.selectFrom("cycles").select(["state", "missing_instrument"]).where("id", "=", second!.cycleId).executeTakeFirstOrThrow();
      expect(cycle).toEqual({ state: "packed", missing_instrument: 1 });
    } finally {
      await context.close();
    }
  });

  it("works at a narrow width, with the pouch helper for pouch packaging", async () => {
    const [set] = await prepare(1, "washed");
    const { context, page } = await newPage(browser, PHONE);
    try {
      await signIn(page, TECH, DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto("/unit/stations/packing");
      await scanSet(page, set!.serial);
      await page.getByLabel("Packaging for this pack").selectOption("single_pouch");
      const helper = page.getByTestId("pouch-helper");
      await helper.getByLabel("Length (mm)", { exact: true }).fill("145");
      await helper.getByLabel("Width (mm)", { exact: true }).fill("40");
      // Worked by hand in tests/unit/packing/pouch.test.ts: 100 × 300 mm.
      await expect.poll(() => helper.getByTestId("pouch-advice").textContent()).toContain("Use 100 × 300 mm.");
      await helper.getByRole("button", { name: "Use 100 × 300 mm" }).click();
      await expect.poll(() => helper.getByLabel("Pouch used").inputValue()).toBe("100x300");
      await screenshot(page, "packing-phone-pouch");
      // Changing the packaging needs a reason.
      await countLines(page);
      await page.getByRole("button", { name: "Pack", exact: true }).click();
      await expect.poll(() => formError(page).textContent()).toContain("Say why this pack is different.");
      await page.getByLabel("Why is it packed differently?").fill("Single instrument sent alone this time");
      await page.getByRole("button", { name: "Pack", exact: true }).click();
      await expect.poll(() => page.getByTestId("packing-result").textContent(), { timeout: 15_000 }).toContain(`${set!.serial} packed`);
      await screenshot(page, "packing-phone-packed");
      const record = await db.selectFrom("pack_records").select(["packaging", "packaging_reason", "pouch"]).where("cycle_id", "=", set!.cycleId).executeTakeFirstOrThrow();
      expect(record).toEqual({ packaging: "single_pouch", packaging_reason: "Single instrument sent alone this time", pouch: "100 × 300 mm" });
    } finally {
      await context.close();
    }
  });
});
