import path from "node:path";
import type { Kysely } from "kysely";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { openDatabase } from "@/db/connection";
import type { Database } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { loadSessionUser } from "@/lib/auth/session-user";
import type { CycleEvent } from "@/lib/cycles/lifecycle";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { addDays, localDateOf } from "@/lib/expiry/dates";
import { parseMailPreferences } from "@/lib/orders/mail-preferences";
import { createSets } from "@/lib/sets/service";
import { expectPath, launchBrowser, newPage, PHONE, screenshot, signIn } from "./browser";

// The data modules guard against client bundles; this test process uses them directly.
vi.mock("server-only", () => ({}));

let browser: Browser;
let db: Kysely<Database>;
const THEATRES = "Quillby Moor General – Main Theatres";
const TO_DELIVERED: CycleEvent[] = ["collect", "receive", "wash_passed", "pack", "sterilise", "release", "dispatch", "deliver"];

interface Prepared {
  serial: string;
  giai: string;
}

/**
 * New sets at the main theatres, each taken through a whole trip to "delivered" with an expiry
 * date. The trip ends now, so the delivery always falls in the current billing month (a trip laid
 * out days back would, early in a month, leave the last month a delivery the demo never billed).
 */
async function deliveredSets(expiries: string[]): Promise<Prepared[]> {
  const adminRow = await db.selectFrom("users").select(["id", "session_version"]).where("email", "=", "admin@larkmoor.example").executeTakeFirstOrThrow();
  const admin = (await loadSessionUser(db, { userId: adminRow.id, sessionVersion: adminRow.session_version }))!;
  const site = await db.selectFrom("sites").select(["id", "organisation_id"]).where("name", "=", THEATRES).executeTakeFirstOrThrow();
  const type = await db
    .selectFrom("set_types")
    .select("id")
    .where("organisation_id", "=", site.organisation_id)
    .where("set_class", "!=", "loaner_set")
    .where("active", "=", 1)
    .orderBy("code")
    .executeTakeFirstOrThrow();
  const { sets } = await createSets(db, admin, { organisationId: site.organisation_id, setTypeId: type.id, homeSiteId: site.id, count: expiries.length });
  const start = new Date(Date.now() - TO_DELIVERED.length * 30 * 60_000);
  for (const [i, set] of sets.entries()) {
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
      at: start,
    });
    let minutes = 0;
    for (const event of TO_DELIVERED) {
      minutes += 30;
      await applyCycleEvent(db, { cycleId, event, station: event === "deliver" ? "clinic" : "receiving", userId: null, at: new Date(start.getTime() + minutes * 60_000) });
    }
    // Sterilisation records do not write the expiry yet: the label's date is set here.
    await db.updateTable("cycles").set({ expires_on: expiries[i]! }).where("id", "=", cycleId).execute();
  }
  return sets;
}

beforeAll(async () => {
  browser = await launchBrowser();
  db = openDatabase(path.join(inject("dataDir"), "steamlane.db"));
});
afterAll(async () => {
  await browser?.close();
  await db?.destroy();
});

describe("a set used for a procedure, on a phone", () => {
  it("clinic staff scan a delivered set, record its use, see refusals, send a nearly expired set back and change their e-mails", async () => {
    const today = localDateOf(new Date(), "Europe/London");
    const [fresh, expired, nearly] = await deliveredSets([addDays(today, 20), addDays(today, -1), addDays(today, 2)]);
    const { context, page } = await newPage(browser, PHONE);
    try {
      await signIn(page, "theatres@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      // The home card lists the set that expires in two days.
      await expect.poll(() => page.getByRole("heading", { name: "Sets nearing expiry" }).count()).toBe(1);
      await expect.poll(() => page.getByText(nearly!.serial).count()).toBeGreaterThan(0);
      await screenshot(page, "clinic-home-expiring-phone");

      await page.goto("/clinic/use");
      await expect.poll(() => page.getByRole("heading", { name: "Record a set used" }).count()).toBe(1);
      const scan = page.getByLabel("Scan the set's label");
      // The scan field has the focus, as a keyboard-wedge scanner needs: it types and sends Enter.
      await expect.poll(() => scan.evaluate((el) => el === document.activeElement)).toBe(true);
      await screenshot(page, "clinic-use-phone");
      await page.keyboard.type(`(8004)${fresh!.giai}`);
      await page.keyboard.press("Enter");
      await expect.poll(() => page.getByTestId("scanned-serial").textContent()).toBe(fresh!.serial);
      await expect.poll(() => page.getByTestId("scanned-expiry").textContent()).toMatch(/expires in 20 days/);
      await expect.poll(() => page.getByText("Never enter a patient's name").count()).toBe(1);
      await screenshot(page, "clinic-use-scanned-phone");

      // Nothing filled in: each field says what it needs.
      await page.getByRole("button", { name: "Record use" }).click();
      await expect.poll(() => page.getByText("Enter the theatre or room.").count()).toBe(1);
      await expect.poll(() => page.getByText("Check that the pack is intact and dry, then tick this.").count()).toBe(1);
      // A name instead of a case number is refused.
      await page.getByLabel("Theatre or room").fill("Theatre 3");
      await page.getByLabel("Case number").fill("Jane Doe");
      await page.getByLabel("the pack is intact and dry").check();
      await page.getByLabel("the indicator has changed colour").check();
      await page.getByRole("button", { name: "Record use" }).click();
      await expect.poll(() => page.getByText(/no spaces\): the case number, never a patient's name/).count()).toBe(1);
      await screenshot(page, "clinic-use-refused-name-phone");
      await page.getByLabel("Case number").fill("QM-2026/0777");
      await page.getByRole("button", { name: "Record use" }).click();
      await expect.poll(() => page.getByText(`Recorded: ${fresh!.serial} used in Theatre 3, case QM-2026/0777`).count()).toBe(1);
      const recent = page.getByTestId("recent-use").first();
      await expect.poll(() => recent.textContent()).toContain(fresh!.serial);
      await expect.poll(() => recent.textContent()).toContain("Theatre 3 · case QM-2026/0777");
      const row = await db
        .selectFrom("procedure_uses")
        .innerJoin("sets", "sets.id", "procedure_uses.set_id")
        .select(["procedure_uses.theatre", "procedure_uses.case_reference", "procedure_uses.pack_checked", "procedure_uses.indicator_checked"])
        .where("sets.serial", "=", fresh!.serial)
        .executeTakeFirstOrThrow();
      expect(row).toEqual({ theatre: "Theatre 3", case_reference: "QM-2026/0777", pack_checked: 1, indicator_checked: 1 });
      await expect.poll(() => scan.evaluate((el) => el === document.activeElement)).toBe(true);
      await screenshot(page, "clinic-use-recorded-phone");

      // The same set again, and an expired one: refused with the reason, no form offered.
      await scan.fill(fresh!.serial);
      await scan.press("Enter");
      await expect.poll(() => page.getByText(/was already used on .*\(Theatre 3, case QM-2026\/0777\)/).count()).toBe(1);
      expect(await page.getByRole("button", { name: "Record use" }).count()).toBe(0);
      await page.getByRole("button", { name: "Scan another set" }).click();
      await scan.fill(expired!.serial);
      await scan.press("Enter");
      await expect.poll(() => page.getByText(/expired on .*Do not use it: send it back for reprocessing/).count()).toBe(1);
      await screenshot(page, "clinic-use-expired-phone");
      // Another customer's set is not found.
      await page.getByRole("button", { name: "Scan another set" }).click();
      await scan.fill("ODS-000001");
      await scan.press("Enter");
      await expect.poll(() => page.getByText("No set with the code ODS-000001 is among your sets.").count()).toBe(1);

      // The nearing-expiry list: send the two-day set back with one click.
      await page.goto("/clinic/expiring");
      const item = page.getByTestId("expiring-set").filter({ hasText: nearly!.serial });
      await expect.poll(() => item.count()).toBe(1);
      await expect.poll(() => item.textContent()).toMatch(/Expires in 2 days/);
      await expect.poll(() => page.getByTestId("expiring-set").filter({ hasText: expired!.serial }).textContent()).toMatch(/Expired yesterday/);
      expect(await page.getByTestId("expiring-set").filter({ hasText: fresh!.serial }).count()).toBe(0);
      await screenshot(page, "clinic-expiring-phone");
      await item.getByRole("button", { name: `Send ${nearly!.serial} back for reprocessing` }).click();
      await expect.poll(() => item.getByText(/^Pickup$|QMH-P\d{6}/).count(), { timeout: 20_000 }).toBeGreaterThan(0);
      const reference = (await item.getByRole("link").textContent())!.trim();
      expect(reference).toMatch(/^QMH-P\d{6}$/);
      await screenshot(page, "clinic-expiring-sent-back-phone");
      const order = await db.selectFrom("orders").select(["status", "notes"]).where("reference", "=", reference).executeTakeFirstOrThrow();
      expect(order.status).toBe("booked");
      expect(order.notes).toMatch(/^Sent back for reprocessing: its sterile pack expires on/);

      // E-mail preferences: stop the weekly digest.
      await page.goto("/clinic/settings");
      const digest = page.getByLabel("Weekly list of our sets nearing their expiry date");
      await expect.poll(() => digest.isChecked()).toBe(true);
      await screenshot(page, "clinic-settings-phone");
      await digest.uncheck();
      await page.getByRole("button", { name: "Save preferences" }).click();
      await expect.poll(() => page.getByText("E-mail preferences saved").count()).toBe(1);
      await page.reload();
      await expect.poll(() => page.getByLabel("Weekly list of our sets nearing their expiry date").isChecked()).toBe(false);
      await expect.poll(() => page.getByLabel("Our sets have been delivered").isChecked()).toBe(true);
      const user = await db.selectFrom("users").select("mail_preferences").where("email", "=", "theatres@quillby.example").executeTakeFirstOrThrow();
      expect(parseMailPreferences(user.mail_preferences)).toMatchObject({ expiry_digest: false, delivered: true });
      await screenshot(page, "clinic-settings-saved-phone");
    } finally {
      await context.close();
    }
  });
});
