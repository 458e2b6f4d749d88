import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Kysely } from "kysely";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { openDatabase } from "@/db/connection";
import { DEMO_PASSWORD } from "@/db/seed/people";
import type { Database } from "@/db/schema";
import { recordToCsv } from "@/lib/cycles/csv";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { synthSterilizerRecord } from "@/lib/cycles/synth";
import { launchBrowser, newPage, screenshot, signIn, waitForMail } from "./browser";

// Sterilising, release and recall in Chromium: the technician scans a set into a load on the
// sterilising station and finishes it with its record; the quality lead sees the advisory notice
// and releases it; the set's label shows the load and its expiry; a load on a steriliser whose
// air-removal test of the day failed cannot be released; failing the released load e-mails the
// customer and the recall page lists the procedure that used the set.

vi.mock("server-only", () => ({}));

let browser: Browser;
let db: Kysely<Database>;
const TECH = "tech@larkmoor.example";
const QUALITY = "quality@larkmoor.example";
const stamp = Date.now().toString(36).toUpperCase().slice(-5);

beforeAll(async () => {
  browser = await launchBrowser();
  db = openDatabase(path.join(inject("dataDir"), "steamlane.db"));
});
afterAll(async () => {
  await browser?.close();
  await db?.destroy();
});

/** A steriliser of this test's own with a 134 °C program, so no other test's loads interfere. */
async function ownSteriliser(code: string): Promise<number> {
  const iso = new Date().toISOString();
  const { id } = await db.insertInto("machines").values({ kind: "steriliser", code, name: `Steriliser ${code}`, capacity_stu: 6, created_at: iso, updated_at: iso }).returning("id").executeTakeFirstOrThrow();
  const requirement = { kind: "steam", name: "134 °C, 3 min", sterilisationTempC: 134, bandWidthK: 3, minHoldSeconds: 180, saturationToleranceK: 2, airRemoval: "prevacuum" };
  await db.insertInto("programs").values({ machine_id: id, code: "P134", name: "134 °C 3 min", requirement: JSON.stringify(requirement) }).execute();
  return id;
}

/** A wrapped set of the Quillby hospital with no open cycle, brought to "packed". */
async function packedSet(): Promise<{ setId: number; serial: string; cycleId: number }> {
  const set = await db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("organisations", "organisations.id", "sets.organisation_id")
    .select(["sets.id", "sets.serial", "sets.organisation_id", "sets.home_site_id"])
    .where("organisations.short_code", "=", "QMH")
    .where("sets.status", "=", "in_service")
    .where("set_types.sterilisation_method", "=", "steam_134")
    .where("set_types.packaging", "=", "wrap")
    .where("set_types.size_stu", "<=", 1)
    .where((eb) => eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))))
    .orderBy("sets.serial", "desc")
    .executeTakeFirstOrThrow();
  const tech = await db.selectFrom("users").select("id").where("email", "=", TECH).executeTakeFirstOrThrow();
  const at = new Date(Date.now() - 3600_000);
  const cycleId = await db.transaction().execute(async (trx) => {
    const id = await openCycle(trx, { organisationId: set.organisation_id, siteId: set.home_site_id, setId: set.id, orderId: null, serviceLevel: "standard", heavySoil: false, outOfHours: false, loaner: false, neededBackBy: null, promisedAt: null, userId: tech.id, at });
    for (const [event, station] of [["receive", "receiving"], ["wash_passed", "washing"], ["pack", "packing"]] as const) {
      await applyCycleEvent(trx, { cycleId: id, event, station, userId: tech.id, at });
    }
    return id;
  });
  return { setId: set.id, serial: set.serial, cycleId };
}

/** Signs in and waits until the app has left the sign-in page for the person's home. */
async function signedIn(page: import("playwright-core").Page, email: string) {
  await signIn(page, email, DEMO_PASSWORD);
  await expect.poll(() => new URL(page.url()).pathname, { timeout: 20_000 }).not.toBe("/sign-in");
}

function recordFile(): string {
  const csv = recordToCsv(synthSterilizerRecord({ plateauTempC: 135, plateauSeconds: 240, stepSeconds: 10 }), { startedAt: new Date(Date.now() - 1800_000).toISOString(), decimals: 2 });
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "load-")), "load-record.csv");
  fs.writeFileSync(file, csv);
  return file;
}

async function recordAirTest(page: import("playwright-core").Page, machineId: number, result: "pass" | "fail") {
  await page.goto("/unit/steriliser-tests");
  await page.selectOption("#test-machine", String(machineId));
  await page.selectOption("#test-kind", "air_removal");
  await page.getByText(result === "pass" ? "Passed (uniform change)" : "Failed", { exact: true }).click();
  await page.getByRole("button", { name: "Record the test" }).click();
  await page.getByText(/Test recorded/).waitFor();
}

/** The technician runs a load with one set on the station, keyboard only for the scan. */
async function runLoad(code: string, serial: string): Promise<string> {
  const { context, page } = await newPage(browser);
  try {
    await signedIn(page, TECH);
    await page.goto("/unit/stations/sterilising");
    await page.getByTestId(`steriliser-${code}`).click();
    await page.getByRole("button", { name: `Open a load on ${code}` }).click();
    await page.locator("#station-scan").waitFor();
    await page.keyboard.type(serial);
    await page.keyboard.press("Enter");
    await page.getByTestId("scanned-set").waitFor();
    await screenshot(page, "sterilising-station-scanned");
    const number = (await page.getByTestId("load-number").textContent())!.trim();
    await page.getByRole("button", { name: "Start the load" }).click();
    await page.getByTestId("load-status").getByText("Running").waitFor();
    await page.setInputFiles("#load-record", recordFile());
    await page.getByText("Changed as expected", { exact: true }).click();
    await page.getByRole("button", { name: "Finish the load" }).click();
    await page.getByTestId("load-result").getByText(/meets the cycle's requirements/).waitFor();
    await screenshot(page, "sterilising-station-finished");
    return number;
  } finally {
    await context.close();
  }
}

describe("sterilising, release and recall", () => {
  it("runs a load, releases it, labels the set, refuses a release after a failed test, and recalls with e-mail", async () => {
    const good = `E${stamp}A`;
    const goodId = await ownSteriliser(good);
    const bad = `E${stamp}B`;
    const badId = await ownSteriliser(bad);
    const first = await packedSet();

    const q = await newPage(browser);
    await signedIn(q.page, QUALITY);
    await recordAirTest(q.page, goodId, "pass");
    await recordAirTest(q.page, badId, "pass");

    const loadNumber = await runLoad(good, first.serial);

    // Release, with the advisory notice and the checks beside their limits.
    await q.page.goto("/unit/release");
    const card = q.page.getByTestId(`release-load-${loadNumber}`);
    await card.waitFor();
    await expect(q.page.getByTestId("advisory-note").first().textContent()).resolves.toMatch(/advisory/);
    await expect(card.locator('[data-check="air_removal"]').getAttribute("data-status")).resolves.toBe("pass");
    await screenshot(q.page, "release-awaiting");
    await card.getByRole("button", { name: `Release load ${loadNumber}` }).click();
    await card.waitFor({ state: "detached" });

    // The label shows the load and the expiry: a wrapped tray in protected storage, 5 years (DIN 58953-8 guide value).
    const cycle = await db.selectFrom("cycles").select(["state", "expires_on"]).where("id", "=", first.cycleId).executeTakeFirstOrThrow();
    expect(cycle.state).toBe("released");
    const fiveYears = Number(new Date().getUTCFullYear()) + 5;
    expect(cycle.expires_on?.slice(0, 4)).toBe(String(fiveYears));
    await q.page.goto(`/unit/sets/${first.setId}/label`);
    await q.page.getByText(loadNumber).first().waitFor();
    await q.page.getByText(String(fiveYears)).first().waitFor();
    await screenshot(q.page, "release-label");

    // A load whose steriliser's repeat air-removal test of the day failed cannot be released.
    const second = await packedSet();
    const badLoad = await runLoad(bad, second.serial);
    await recordAirTest(q.page, badId, "fail");
    await q.page.goto("/unit/release");
    const badCard = q.page.getByTestId(`release-load-${badLoad}`);
    await badCard.getByTestId("release-blockers").getByText(/air-removal test on .* failed/).waitFor();
    await expect(badCard.getByRole("button", { name: `Release load ${badLoad}` }).isDisabled()).resolves.toBe(true);
    await screenshot(q.page, "release-refused");

    // The clinic used the released set; then the load fails after release: recall and e-mail.
    await applyCycleEvent(db, { cycleId: first.cycleId, event: "dispatch", station: "dispatch", userId: null, at: new Date() });
    await applyCycleEvent(db, { cycleId: first.cycleId, event: "deliver", station: "van", userId: null, at: new Date() });
    const c = await db.selectFrom("cycles").select(["organisation_id", "site_id"]).where("id", "=", first.cycleId).executeTakeFirstOrThrow();
    const caseRef = `CASE-${stamp}`;
    await db.insertInto("procedure_uses").values({ organisation_id: c.organisation_id, site_id: c.site_id, cycle_id: first.cycleId, set_id: first.setId, theatre: "Theatre 4", case_reference: caseRef, pack_checked: 1, indicator_checked: 1, recorded_by: null, used_at: new Date().toISOString() }).execute();
    const load = await db.selectFrom("steriliser_loads").select("id").where("number", "=", loadNumber).executeTakeFirstOrThrow();
    await q.page.goto(`/unit/loads/${load.id}`);
    await q.page.getByRole("button", { name: "Fail this released load and recall its sets…" }).click();
    await q.page.fill(`#fail-${load.id}`, "Biological indicator grew at the 48 h read-out.");
    await q.page.getByRole("button", { name: "Fail and recall" }).click();
    await q.page.waitForURL(/\/unit\/recalls\/\d+/);
    await q.page.getByTestId("recall-procedures").getByText(caseRef, { exact: false }).waitFor();
    await expect(q.page.getByTestId("advisory-note").first().textContent()).resolves.toMatch(/advisory/);
    await screenshot(q.page, "recall-page");
    const mail = await waitForMail("manager@quillby.example", new RegExp(`Recall R-${loadNumber}`));
    expect(mail.text ?? "").toContain(first.serial);
    await q.context.close();
  });
});
