import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import type { Kysely } from "kysely";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { openDatabase } from "@/db/connection";
import type { Database } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { loadSessionUser } from "@/lib/auth/session-user";
import type { CycleEvent } from "@/lib/cycles/lifecycle";
import { applyCycleEvent, type Station } from "@/lib/cycles/store";
import { resetServerEnvCache } from "@/lib/env";
import { toLocalDateTimeText } from "@/lib/local-time";
import { bookingSchema } from "@/lib/orders/schemas";
import { bookPickup } from "@/lib/orders/service";
import { expectPath, formError, launchBrowser, newPage, PHONE, screenshot, signIn, waitForMail } from "./browser";

// The data modules guard against client bundles; this test process uses them directly.
vi.mock("server-only", () => ({}));

let browser: Browser;
let db: Kysely<Database>;
const TO_DELIVERED: [CycleEvent, Station][] = [
  ["collect", "van"],
  ["receive", "receiving"],
  ["wash_passed", "washing"],
  ["pack", "packing"],
  ["sterilise", "sterilising"],
  ["release", "release"],
  ["dispatch", "dispatch"],
  ["deliver", "van"],
];

/** A PNG of the given size: a grey field with a diagonal orange band, like a photo of a bent tip. */
function testPng(width: number, height: number): Buffer {
  const raw = Buffer.alloc((width * 3 + 1) * height);
  for (let y = 0; y < height; y++) {
    const row = y * (width * 3 + 1);
    raw[row] = 0; // no filter
    for (let x = 0; x < width; x++) {
      const band = Math.abs(x - y * (width / height)) < 10;
      const [r, g, b] = band ? [224, 120, 40] : [120 + ((x * 5) % 40), 130, 140];
      raw.set([r, g, b], row + 1 + x * 3);
    }
  }
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, "ascii"), data]);
    const length = Buffer.alloc(4);
    length.writeUInt32BE(data.length);
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(zlib.crc32(body) >>> 0);
    return Buffer.concat([length, body, crc]);
  };
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  header.set([8, 2, 0, 0, 0], 8); // 8-bit RGB, deflate, no filter method, no interlace
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk("IHDR", header),
    chunk("IDAT", zlib.deflateSync(raw)),
    chunk("IEND", Buffer.alloc(0)),
  ]);
}

/** Books a pickup of one free set at the main theatres and takes it through to delivered. */
async function deliveredOrder(): Promise<{ orderId: number; reference: string; serial: string }> {
  const row = await db.selectFrom("users").select(["id", "session_version"]).where("email", "=", "theatres@quillby.example").executeTakeFirstOrThrow();
  const staff = (await loadSessionUser(db, { userId: row.id, sessionVersion: row.session_version }))!;
  const set = await db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial"])
    .where("sets.home_site_id", "=", staff.siteId!)
    .where("sets.status", "=", "in_service")
    .where("set_types.set_class", "!=", "loaner_set")
    .where((eb) => eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))))
    .orderBy("sets.serial", "desc")
    .executeTakeFirstOrThrow();
  const day = (offset: number, hour: number) =>
    `${toLocalDateTimeText(new Date(Date.now() + offset * 86_400_000), "Europe/London").slice(0, 10)}T${String(hour).padStart(2, "0")}:00`;
  const { orderId, reference } = await bookPickup(
    db,
    staff,
    bookingSchema.parse({
      siteId: staff.siteId,
      setIds: [set.id],
      extras: [],
      collectionFrom: day(1, 9),
      collectionUntil: day(1, 12),
      neededBackBy: day(8, 17),
      serviceLevel: "standard",
      heavySoil: false,
      notes: "",
    }),
  );
  const cycle = await db.selectFrom("cycles").select("id").where("order_id", "=", orderId).executeTakeFirstOrThrow();
  for (const [event, station] of TO_DELIVERED) await applyCycleEvent(db, { cycleId: cycle.id, event, station, userId: null, at: new Date() });
  return { orderId, reference, serial: set.serial };
}

beforeAll(async () => {
  browser = await launchBrowser();
  db = openDatabase(path.join(inject("dataDir"), "steamlane.db"));
  // Links in the order e-mails queued here point at the stack under test.
  process.env.APP_URL = inject("appUrl");
  resetServerEnvCache();
});
afterAll(async () => {
  await browser?.close();
  await db?.destroy();
});

describe("a problem with a delivered set", () => {
  it("clinic staff report a damaged instrument with a photo, a technician answers in the queue, the clinic gets the answer", async () => {
    const order = await deliveredOrder();
    const photoFile = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-photo-")), "bent-tip.png");
    fs.writeFileSync(photoFile, testPng(240, 160));
    const description = `An instrument tip in ${order.serial} is bent <about 2 mm>; found at the set check & kept aside.`;
    let problemId = 0;

    // The clinic reports it from the order page.
    const clinic = await newPage(browser);
    try {
      await signIn(clinic.page, "theatres@quillby.example", DEMO_PASSWORD);
      await expectPath(clinic.page, "/clinic");
      await clinic.page.goto(`/clinic/orders/${order.orderId}`);
      await expect.poll(() => clinic.page.getByRole("heading", { name: "Problems reported (0)" }).count()).toBe(1);
      await clinic.page.getByRole("button", { name: "Report a problem" }).click();
      const dialog = clinic.page.getByRole("dialog");
      await expect.poll(() => dialog.getByLabel("What is wrong?").inputValue()).toBe("damaged_instrument");
      await expect.poll(() => dialog.getByLabel("Which set?").locator("option:checked").textContent()).toContain(order.serial);
      // Too short: the form says what to fix and sends nothing.
      await dialog.getByLabel("What did you find?").fill("bent");
      await dialog.getByRole("button", { name: "Send to the unit" }).click();
      await expect.poll(() => dialog.getByText(/Describe the problem in at least 10 characters/).count()).toBe(1);
      // A file that is not an image is refused by the upload.
      const notImage = path.join(path.dirname(photoFile), "notes.png");
      fs.writeFileSync(notImage, "this is not an image");
      await dialog.getByLabel("Photo (optional)").setInputFiles(notImage);
      await expect.poll(() => dialog.getByText(/must be a PNG image, JPEG image; this one is not/).count()).toBe(1);
      await dialog.getByLabel("Photo (optional)").setInputFiles(photoFile);
      await expect.poll(() => dialog.getByTestId("photo-name").textContent()).toBe("bent-tip.png");
      await dialog.getByLabel("What did you find?").fill(description);
      await screenshot(clinic.page, "problem-report-dialog");
      await dialog.getByRole("button", { name: "Send to the unit" }).click();
      await expect.poll(() => clinic.page.getByRole("dialog").count()).toBe(0);
      const toast = clinic.page.getByText(/^Problem \d+ reported to the unit$/);
      await expect.poll(() => toast.count()).toBe(1);
      problemId = Number(/Problem (\d+)/.exec((await toast.textContent()) ?? "")![1]);
      const item = clinic.page.getByTestId("order-problem");
      await expect.poll(() => item.count()).toBe(1);
      await expect.poll(() => item.textContent()).toContain("Waiting for the unit");
      await expect.poll(() => item.textContent()).toContain("with a photo");
      await screenshot(clinic.page, "problem-order-page-open");
    } finally {
      await clinic.context.close();
    }
    const stored = await db.selectFrom("problems").selectAll().where("id", "=", problemId).executeTakeFirstOrThrow();
    expect(stored).toMatchObject({ kind: "damaged_instrument", status: "open", order_id: order.orderId, description });
    expect(stored.photo_file_id).not.toBeNull();

    // The technician finds it in the queue and answers it.
    const answer = `Thank you. We collect the set on today's round, replace the instrument & check the set again <packing station 2>.`;
    const unit = await newPage(browser);
    try {
      await signIn(unit.page, "tech@larkmoor.example", DEMO_PASSWORD);
      await expectPath(unit.page, "/unit");
      await unit.page.goto("/unit/problems");
      await expect.poll(() => unit.page.getByRole("heading", { name: "Problems queue" }).count()).toBe(1);
      await unit.page.getByLabel("Search problems").fill(order.reference);
      const link = unit.page.getByRole("link", { name: `Problem ${problemId}`, exact: true });
      await expect.poll(() => link.count()).toBe(1);
      await screenshot(unit.page, "problem-queue");
      await unit.page.getByLabel("Search problems").fill("");
      await expect.poll(() => unit.page.getByRole("link", { name: /^Problem \d+$/ }).count()).toBeGreaterThan(1);
      await screenshot(unit.page, "problem-queue-all-open");
      await link.click();
      await expectPath(unit.page, `/unit/problems/${problemId}`);
      await expect.poll(() => unit.page.getByTestId("problem-description").textContent()).toBe(description);
      // The photo loads (an image with its real size), the contents list and the trip's history show.
      await expect
        .poll(() => unit.page.getByTestId("problem-photo").evaluate((img) => (img as HTMLImageElement).complete && (img as HTMLImageElement).naturalWidth))
        .toBe(240);
      await expect.poll(() => unit.page.getByTestId("problem-contents").locator("li").count()).toBeGreaterThan(0);
      await expect.poll(() => unit.page.getByTestId("problem-history").locator("tr").count()).toBe(1 + TO_DELIVERED.length);
      await expect.poll(() => unit.page.getByText(/decided under the unit's validated procedures/).count()).toBe(1);
      await unit.page.getByLabel("Your answer to the clinic").fill("ok");
      await unit.page.getByRole("button", { name: "Send the answer" }).click();
      await expect.poll(() => unit.page.getByText("Write an answer of at least 5 characters.").count()).toBe(1);
      await screenshot(unit.page, "problem-unit-detail");
      await unit.page.getByLabel("Your answer to the clinic").fill(answer);
      await unit.page.getByRole("button", { name: "Send the answer" }).click();
      await expect.poll(() => unit.page.getByTestId("problem-answer").textContent()).toContain(answer);
      await expect.poll(() => unit.page.getByLabel("Your answer to the clinic").count()).toBe(0);
      await screenshot(unit.page, "problem-unit-answered");
      expect(await formError(unit.page).count()).toBe(0);
    } finally {
      await unit.context.close();
    }

    // The answer e-mail reaches the clinic nurse, escaped in its HTML.
    const mail = await waitForMail("theatres@quillby.example", new RegExp(`^Problem ${problemId} answered \\(${order.reference}\\)`));
    expect(mail.text).toContain(answer);
    expect(mail.text).toContain(`/clinic/problems/${problemId}`);
    expect(mail.html).toContain("&lt;packing station 2&gt;");
    expect(mail.html).not.toContain("<packing station 2>");

    // The clinic sees the answer on the order page and on the problem, on a phone too.
    const back = await newPage(browser, PHONE);
    try {
      await signIn(back.page, "theatres@quillby.example", DEMO_PASSWORD);
      await expectPath(back.page, "/clinic");
      await back.page.goto(`/clinic/orders/${order.orderId}`);
      await expect.poll(() => back.page.getByTestId("order-problem-answer").textContent()).toContain(answer);
      await expect.poll(() => back.page.getByTestId("order-problem").textContent()).toContain("Answered");
      await screenshot(back.page, "problem-order-page-answered-phone");
      await back.page.getByRole("link", { name: `Problem ${problemId}` }).click();
      await expectPath(back.page, `/clinic/problems/${problemId}`);
      await expect.poll(() => back.page.getByTestId("problem-answer").textContent()).toContain(answer);
      await expect.poll(() => back.page.getByTestId("problem-history").count()).toBe(0);
      await expect
        .poll(() => back.page.getByTestId("problem-photo").evaluate((img) => (img as HTMLImageElement).complete && (img as HTMLImageElement).naturalWidth))
        .toBe(240);
      await screenshot(back.page, "problem-clinic-detail-phone");
      await back.page.goto("/clinic/problems");
      await expect.poll(() => back.page.getByRole("link", { name: `Problem ${problemId}`, exact: true }).count()).toBe(1);
      await screenshot(back.page, "problem-clinic-list-phone");
    } finally {
      await back.context.close();
    }

    // Another customer cannot open it.
    const other = await newPage(browser);
    try {
      await signIn(other.page, "manager@otterwick.example", DEMO_PASSWORD);
      await expectPath(other.page, "/clinic");
      await other.page.goto(`/clinic/problems/${problemId}`);
      await expect.poll(() => other.page.getByText("There is nothing here for you").count()).toBe(1);
    } finally {
      await other.context.close();
    }
  });
});
