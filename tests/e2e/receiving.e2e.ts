import path from "node:path";
import Database from "better-sqlite3";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { toLocalDateTimeText } from "@/lib/local-time";
import { expectPath, launchBrowser, newPage, PHONE, screenshot, signIn, waitForMail } from "./browser";

// The receiving station end to end: clinic staff book a pickup, a technician receives one of its
// sets and one nobody booked, finishes the order (the other set is reported missing), and the
// board counts them; the clinic sees the notices on its order page and by e-mail.

const DAY_CASE = "Quillby Moor General – Day Case Unit";
const NURSE = "daycase@quillby.example";
const TECH = "tech@larkmoor.example";

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** A local date-time text on the next weekday at least `days` from now, at the hour, in the unit's zone. */
function weekdayAt(days: number, hour: number): string {
  for (let d = days; ; d++) {
    const at = new Date(Date.now() + d * 86_400_000);
    const weekday = new Intl.DateTimeFormat("en-GB", { weekday: "short", timeZone: "Europe/London" }).format(at);
    if (weekday !== "Sat" && weekday !== "Sun") return `${toLocalDateTimeText(at, "Europe/London").slice(0, 10)}T${String(hour).padStart(2, "0")}:00`;
  }
}

/** The highest-serial set of the site with no open cycle (not a loaner), from the stack's database. */
function unbookedSetOf(siteName: string): string {
  const db = new Database(path.join(inject("dataDir"), "steamlane.db"), { readonly: true, fileMustExist: true });
  try {
    const row = db
      .prepare(
        `select s.serial from sets s join set_types t on t.id = s.set_type_id join sites si on si.id = s.home_site_id
         where si.name = ? and s.status = 'in_service' and t.set_class != 'loaner_set'
           and not exists (select 1 from cycles c where c.set_id = s.id and c.state not in ('delivered', 'cancelled'))
         order by s.serial desc limit 1`,
      )
      .get(siteName) as { serial: string } | undefined;
    if (!row) throw new Error(`No free set at ${siteName} in the demo database.`);
    return row.serial;
  } finally {
    db.close();
  }
}

async function scan(page: Page, code: string) {
  const field = page.locator("#station-scan");
  await expect.poll(() => field.evaluate((el) => el === document.activeElement)).toBe(true);
  await field.fill(code);
  await field.press("Enter");
}

async function boardCount(page: Page, state: string): Promise<number> {
  const res = await page.request.get("/api/board");
  expect(res.status()).toBe(200);
  const body = (await res.json()) as { columns: { state: string; count: number }[] };
  return body.columns.find((c) => c.state === state)!.count;
}

describe("the receiving station", () => {
  it("receives a booked set and an unbooked one, finishes the order reporting the missing set, and the board counts them", async () => {
    // 1. The day-case nurse books two sets.
    const clinic = await newPage(browser);
    let orderPath = "";
    let reference = "";
    let booked: string[] = [];
    try {
      await signIn(clinic.page, NURSE, DEMO_PASSWORD);
      await expectPath(clinic.page, "/clinic");
      await clinic.page.goto("/clinic/orders/new");
      const boxes = clinic.page.getByRole("checkbox", { name: /QMH-/ });
      await expect.poll(() => boxes.count()).toBeGreaterThan(2);
      await boxes.nth(0).check();
      await boxes.nth(1).check();
      await clinic.page.getByLabel("Collect from").fill(weekdayAt(1, 9));
      await clinic.page.getByLabel("Collect by").fill(weekdayAt(1, 11));
      await clinic.page.getByLabel("Needed back by").fill(weekdayAt(8, 17));
      await expect.poll(() => clinic.page.getByTestId("promised-return").textContent(), { timeout: 15_000 }).toMatch(/Back by/);
      await clinic.page.getByRole("button", { name: "Book pickup" }).click();
      await expect.poll(() => new URL(clinic.page.url()).pathname, { timeout: 20_000 }).toMatch(/^\/clinic\/orders\/\d+$/);
      orderPath = new URL(clinic.page.url()).pathname;
      reference = (await clinic.page.getByRole("heading", { level: 1 }).textContent())!.replace("Pickup ", "").trim();
      await expect.poll(() => clinic.page.getByTestId("order-set").count()).toBe(2);
      booked = (await clinic.page.getByTestId("order-set").allTextContents()).map((t) => /QMH-\d{6}/.exec(t)![0]);
    } finally {
      await clinic.context.close();
    }
    const stray = unbookedSetOf(DAY_CASE);

    // 2. A technician receives at the station.
    const { context, page } = await newPage(browser, { width: 1440, height: 960 });
    try {
      await signIn(page, TECH, DEMO_PASSWORD);
      await expectPath(page, "/unit");
      const receivedBefore = await boardCount(page, "received");
      await page.getByRole("link", { name: "Stations" }).first().click();
      await expectPath(page, "/unit/stations");
      for (const name of ["Receiving", "Washing", "Manual washing", "Packing"]) {
        await expect.poll(() => page.getByRole("link", { name: new RegExp(`^${name}`) }).count()).toBe(1);
      }
      await screenshot(page, "stations-chooser");
      await page.getByRole("link", { name: /^Receiving/ }).click();
      await expectPath(page, "/unit/stations/receiving");

      await scan(page, booked[0]!);
      await expect.poll(() => page.getByTestId("receiving-outcome").textContent()).toContain("Received");
      expect(await page.getByTestId("receiving-serial").textContent()).toBe(booked[0]);
      expect(await page.getByTestId("receiving-route").textContent()).toMatch(/^Next.*(Washer-disinfector|Manual washing|Ultrasonic first|Dismantle first)/);
      const order = page.getByTestId("receiving-order");
      await expect.poll(() => order.textContent()).toContain(`Pickup ${reference}`);
      expect(await order.textContent()).toContain(DAY_CASE);
      expect(await page.getByTestId("receiving-order-progress").textContent()).toBe("1 of 2 received");
      expect(await order.getByTestId("receiving-order-set").allTextContents()).toEqual(
        expect.arrayContaining([expect.stringMatching(new RegExp(`${booked[0]}.*Received$`)), expect.stringMatching(new RegExp(`${booked[1]}.*Expected$`))]),
      );
      await screenshot(page, "receiving-booked");

      // A set nobody booked, from the same site: received and flagged.
      await scan(page, stray);
      await expect.poll(() => page.getByTestId("receiving-outcome").textContent()).toContain("Received without a booking");
      expect(await page.getByTestId("receiving-unexpected").textContent()).toMatch(/not booked on any pickup/);
      await expect.poll(() => order.getByTestId("receiving-order-set").count()).toBe(3);
      expect(await order.textContent()).toMatch(new RegExp(`${stray}.*Came without a booking`));
      // It came heavily soiled.
      const heavy = page.getByTestId("heavy-soil-toggle");
      expect(await heavy.getAttribute("aria-pressed")).toBe("false");
      await heavy.click();
      await expect.poll(() => heavy.getAttribute("aria-pressed")).toBe("true");
      await screenshot(page, "receiving-unexpected");

      // Scanning the first set again is refused, saying when and by whom it was received.
      await scan(page, booked[0]!);
      await expect.poll(() => page.getByTestId("station-refusal").textContent()).toMatch(
        new RegExp(`${booked[0]} .* was already received at \\d{2}:\\d{2} by Sol Brackenbury\\. Cannot receive this set`),
      );
      await screenshot(page, "receiving-refused");

      // Finish: the second booked set is reported missing.
      await page.getByRole("button", { name: "Finish receiving this order" }).click();
      const dialog = page.getByRole("dialog");
      await expect.poll(() => dialog.textContent()).toContain(booked[1]!);
      await screenshot(page, "receiving-finish-dialog");
      await dialog.getByRole("button", { name: "Report missing and finish" }).click();
      await expect.poll(() => page.getByTestId("receiving-finished").textContent()).toContain(`1 reported missing to the clinic (${booked[1]})`);
      await expect.poll(() => page.getByTestId("receiving-order").count()).toBe(0);
      await screenshot(page, "receiving-finished");

      // The board: both received sets are counted.
      await page.getByRole("link", { name: "Unit board" }).first().click();
      await expectPath(page, "/unit/board");
      const received = page.getByTestId("board-count-received").getByTestId("board-count-value");
      await expect.poll(async () => Number(await received.textContent())).toBe(receivedBefore + 2);
      await expect.poll(() => page.getByTestId("board-updated").textContent()).toMatch(/Updated \d{2}:\d{2}/);
      await page.setViewportSize({ width: 1920, height: 1080 });
      await screenshot(page, "board");
    } finally {
      await context.close();
    }

    // 3. The clinic is told: by e-mail and on the order's page, readable on a phone.
    const missing = await waitForMail(NURSE, new RegExp(`${reference}: ${booked[1]} did not arrive`));
    expect(missing.text).toContain(`was not among the sets the unit received`);
    const unbooked = await waitForMail(NURSE, new RegExp(`${stray} arrived without a booking`));
    expect(unbooked.html).toContain(orderPath);
    const phone = await newPage(browser, PHONE);
    try {
      await signIn(phone.page, NURSE, DEMO_PASSWORD);
      await expectPath(phone.page, "/clinic");
      await phone.page.goto(orderPath);
      await expect.poll(() => phone.page.getByTestId("order-notice").count()).toBe(2);
      const text = await phone.page.getByTestId("order-notices").textContent();
      expect(text).toContain("Arrived without a booking");
      expect(text).toContain("Did not arrive");
      await screenshot(phone.page, "clinic-order-notices-phone");
    } finally {
      await phone.context.close();
    }
  });

  it("is not for clinic users: the station page is not found and its route answers 403", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, NURSE, DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.goto("/unit/stations/receiving");
      await expectPath(page, "/clinic");
      const res = await page.request.post("/api/stations/receiving/scan", {
        data: { code: "QMH-000001", clientEventId: crypto.randomUUID() },
        headers: { origin: inject("appUrl") },
      });
      expect(res.status()).toBe(403);
    } finally {
      await context.close();
    }
  });
});
