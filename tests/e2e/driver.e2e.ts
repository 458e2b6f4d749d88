import path from "node:path";
import type { Kysely } from "kysely";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { openDatabase } from "@/db/connection";
import { DEMO_PASSWORD } from "@/db/seed/people";
import type { Database } from "@/db/schema";
import { advanceCycles, type FreeSet, freeSetsAtOneSite, pickupInState, publishTodaysRun } from "../support/run-sheets";
import { expectPath, launchBrowser, newPage, PHONE, screenshot, signIn, waitForMail } from "./browser";

// The driver's run sheet on a phone and the dispatch station. The data modules guard themselves
// with `server-only`; this test calls the cycle store directly on the stack's database to bring
// sets to the van, as the earlier stations would, and plans and publishes today's run with the
// dispatch code, as the dispatcher would.
vi.mock("server-only", () => ({}));

const DRIVER = "driver@larkmoor.example";
const TECH = "tech@larkmoor.example";

let browser: Browser;
let db: Kysely<Database>;
let runId: number;
let stopIds: number[];
let first: { siteId: number; sets: FreeSet[]; deliverCycles: number[]; collectCycles: number[]; orderId: number };
let second: { siteId: number; sets: FreeSet[]; dispatchedCycle: number; releasedCycle: number };
let unready: FreeSet;

const userId = async (email: string) => (await db.selectFrom("users").select("id").where("email", "=", email).executeTakeFirstOrThrow()).id;
const stateOf = async (cycleId: number) => (await db.selectFrom("cycles").select("state").where("id", "=", cycleId).executeTakeFirstOrThrow()).state;

beforeAll(async () => {
  browser = await launchBrowser();
  db = openDatabase(path.join(inject("dataDir"), "steamlane.db"));
  const tech = await userId(TECH);
  const a = await freeSetsAtOneSite(db, 3);
  const b = await freeSetsAtOneSite(db, 3, [a.siteId]);
  // Sets go back once released: the day is planned and published first, then they are loaded.
  const out = await pickupInState(db, { organisationId: a.organisationId, siteId: a.siteId, setIds: [a.sets[0]!.id, a.sets[1]!.id], userId: tech, upTo: "released" });
  // Collected between 08:00 and 10:00: the first stop's window.
  const pickup = await pickupInState(db, { organisationId: a.organisationId, siteId: a.siteId, setIds: [a.sets[2]!.id], userId: tech, upTo: "booked", window: { fromMin: 8 * 60, untilMin: 10 * 60 } });
  const back = await pickupInState(db, { organisationId: b.organisationId, siteId: b.siteId, setIds: [b.sets[0]!.id], userId: tech, upTo: "released" });
  // One order at the second site: a set released, another still packed (not ready to load).
  const ready = await pickupInState(db, { organisationId: b.organisationId, siteId: b.siteId, setIds: [b.sets[1]!.id, b.sets[2]!.id], userId: tech, upTo: "packed" });
  await advanceCycles(db, { cycleIds: [ready.cycleIds[0]!], userId: tech, upTo: "released" });
  unready = b.sets[2]!;
  const plan = await publishTodaysRun(db, {
    driverId: await userId(DRIVER),
    vanName: "Van Kestrel",
    stops: [
      { siteId: a.siteId, kind: "both", deliverOrderIds: [out.orderId], collectOrderIds: [pickup.orderId] },
      { siteId: b.siteId, kind: "delivery", deliverOrderIds: [back.orderId, ready.orderId] },
    ],
  });
  await advanceCycles(db, { cycleIds: [...out.cycleIds, ...back.cycleIds], userId: tech, upTo: "dispatched" });
  runId = plan.runId;
  stopIds = plan.stopIds;
  first = { siteId: a.siteId, sets: a.sets, deliverCycles: out.cycleIds, collectCycles: pickup.cycleIds, orderId: out.orderId };
  second = { siteId: b.siteId, sets: b.sets, dispatchedCycle: back.cycleIds[0]!, releasedCycle: ready.cycleIds[0]! };
});
afterAll(async () => {
  await browser?.close();
  await db?.destroy();
});

const setRow = (page: Page, serial: string) => page.locator(`[data-testid="stop-set"][data-serial="${serial}"]`);

async function scan(page: Page, code: string) {
  const field = page.getByLabel("Scan", { exact: true });
  await field.fill(code);
  await field.press("Enter");
}

/** Signs in the box with the mouse: a loop and a stroke, as a finger would. */
async function sign(page: Page) {
  const pad = page.getByTestId("signature-pad");
  await pad.scrollIntoViewIfNeeded();
  const box = (await pad.boundingBox())!;
  await page.mouse.move(box.x + 30, box.y + box.height * 0.6);
  await page.mouse.down();
  for (let i = 1; i <= 24; i++) {
    await page.mouse.move(box.x + 30 + i * 10, box.y + box.height * (0.6 - 0.25 * Math.sin(i / 3)), { steps: 2 });
  }
  await page.mouse.up();
  await expect.poll(() => pad.getAttribute("data-signed")).toBe("yes");
}

describe("the driver's run sheet on a phone", () => {
  it("opens today's run, completes a stop with scans and a signature, and sends an offline scan once when back online", async () => {
    const { context, page } = await newPage(browser, PHONE);
    try {
      await signIn(page, DRIVER, DEMO_PASSWORD);
      await expectPath(page, "/driver");
      const stops = page.getByTestId("run-stop");
      await expect.poll(() => stops.count()).toBeGreaterThanOrEqual(2);
      const firstCard = page.locator(`a[href="/driver/runs/${runId}/stops/${stopIds[0]}"]`);
      await expect.poll(() => firstCard.textContent()).toContain(first.sets[0]!.serial);
      expect(await firstCard.textContent()).toContain("window 08:00–10:00");
      await screenshot(page, "driver-run-sheet");

      // Stop 1: one set scanned, one tapped, the pickup scanned by its GS1 identifier.
      await firstCard.click();
      await expectPath(page, `/driver/runs/${runId}/stops/${stopIds[0]}`);
      await scan(page, first.sets[0]!.serial);
      await expect.poll(() => setRow(page, first.sets[0]!.serial).getAttribute("data-status"), { timeout: 15_000 }).toBe("Scanned");
      await setRow(page, first.sets[1]!.serial).getByRole("button").click();
      await expect.poll(() => setRow(page, first.sets[1]!.serial).getAttribute("data-status"), { timeout: 15_000 }).toBe("Scanned");
      await scan(page, first.sets[2]!.giai);
      await expect.poll(() => setRow(page, first.sets[2]!.serial).getAttribute("data-status"), { timeout: 15_000 }).toBe("Scanned");
      // A set of the other stop is refused with where it belongs.
      await scan(page, second.sets[0]!.serial);
      await expect.poll(() => page.getByTestId("stop-notice").textContent(), { timeout: 15_000 }).toContain("belongs to stop 2");
      await screenshot(page, "driver-stop-scanned");

      await page.getByLabel("Receiver's name").fill("Tamsin Orrery");
      await sign(page);
      await screenshot(page, "driver-stop-signed");
      await page.getByTestId("sign-off").click();
      await expect.poll(() => page.getByTestId("stop-closed").textContent(), { timeout: 15_000 }).toContain("By Tamsin Orrery");
      await expect.poll(() => page.getByRole("img", { name: "Signature of Tamsin Orrery" }).evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0)).toBe(true);
      await screenshot(page, "driver-stop-served");
      expect(await Promise.all(first.deliverCycles.map(stateOf))).toEqual(["delivered", "delivered"]);
      expect(await stateOf(first.collectCycles[0]!)).toBe("collected");
      const stop = await db.selectFrom("route_stops").select(["status", "signature_file_id", "signed_by_name"]).where("id", "=", stopIds[0]!).executeTakeFirstOrThrow();
      expect(stop).toMatchObject({ status: "served", signed_by_name: "Tamsin Orrery" });
      const file = await db.selectFrom("files").select(["content_type", "purpose"]).where("id", "=", stop.signature_file_id!).executeTakeFirstOrThrow();
      expect(file).toEqual({ content_type: "image/png", purpose: "signature" });

      // The clinic hears that its sets were delivered.
      const order = await db.selectFrom("orders").select(["reference", "organisation_id"]).where("id", "=", first.orderId).executeTakeFirstOrThrow();
      const clinician = await db
        .selectFrom("users")
        .select("email")
        .where("organisation_id", "=", order.organisation_id)
        .where("status", "=", "active")
        .where((eb) => eb.or([eb("site_id", "is", null), eb("site_id", "=", first.siteId)]))
        .executeTakeFirstOrThrow();
      await waitForMail(clinician.email, new RegExp(`${order.reference}: delivered`));

      // Stop 2, on a weak connection: the scan waits on the phone and is sent once, when back online.
      await page.goto(`/driver/runs/${runId}/stops/${stopIds[1]}`);
      await expect.poll(() => setRow(page, second.sets[0]!.serial).getAttribute("data-status")).toBe("to_scan");
      const sent: string[] = [];
      page.on("requestfinished", (req) => {
        if (req.method() === "POST" && req.url().includes(`/stops/${stopIds[1]}/scans`)) sent.push(req.url());
      });
      await context.setOffline(true);
      await scan(page, second.sets[0]!.serial);
      await expect.poll(() => page.getByTestId("waiting-to-send").textContent()).toContain("Waiting to send (1)");
      expect(await setRow(page, second.sets[0]!.serial).getAttribute("data-status")).toBe("Waiting to send");
      await screenshot(page, "driver-offline-waiting");
      const none = await db.selectFrom("stop_scans").select("id").where("stop_id", "=", stopIds[1]!).execute();
      expect(none).toHaveLength(0);

      await context.setOffline(false);
      await expect.poll(() => page.getByTestId("waiting-to-send").count(), { timeout: 20_000 }).toBe(0);
      await expect.poll(() => setRow(page, second.sets[0]!.serial).getAttribute("data-status"), { timeout: 15_000 }).toBe("Scanned");
      await screenshot(page, "driver-back-online");
      const rows = await db.selectFrom("stop_scans").select("id").where("stop_id", "=", stopIds[1]!).execute();
      expect(rows).toHaveLength(1);
      expect(sent).toHaveLength(1);
      // Nothing delivered yet: the set moves when the receiver signs.
      expect(await stateOf(second.dispatchedCycle)).toBe("dispatched");
    } finally {
      await context.close();
    }
  });
});

describe("the dispatch station", () => {
  it("a technician loads a released set onto its van and is refused one that is not released", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, TECH, DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto("/unit/stations");
      await page.getByRole("link", { name: /Dispatch/ }).click();
      await expectPath(page, "/unit/stations/dispatch");
      await page.getByTestId("dispatch-run").filter({ hasText: "Van Kestrel" }).click();
      await expect.poll(() => page.getByTestId("dispatch-to-load").textContent()).toContain(second.sets[1]!.serial);
      await expect.poll(() => page.getByLabel("Load on Van Kestrel", { exact: true }).evaluate((el) => el === document.activeElement)).toBe(true);
      const field = page.getByLabel("Load on Van Kestrel", { exact: true });

      await field.fill(unready.serial);
      await field.press("Enter");
      await expect.poll(() => page.getByTestId("station-refusal").textContent(), { timeout: 15_000 }).toContain("it is packed and waiting for a steriliser load");
      await screenshot(page, "dispatch-refused");

      await field.fill(second.sets[1]!.serial);
      await field.press("Enter");
      await expect.poll(() => page.getByTestId("dispatch-serial").textContent(), { timeout: 15_000 }).toBe(second.sets[1]!.serial);
      await expect.poll(() => page.getByTestId("dispatch-to-load").textContent()).not.toContain(second.sets[1]!.serial);
      await screenshot(page, "dispatch-loaded");
      expect(await stateOf(second.releasedCycle)).toBe("dispatched");
    } finally {
      await context.close();
    }
  });
});
