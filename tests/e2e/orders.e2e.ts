import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { toLocalDateTimeText } from "@/lib/local-time";
import { expectPath, formError, launchBrowser, newPage, screenshot, signIn, waitForMail } from "./browser";

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** A local date-time text `days` from now at the given hour, in the unit's zone. */
function localAt(days: number, hour: number): string {
  const date = toLocalDateTimeText(new Date(Date.now() + days * 86_400_000), "Europe/London").slice(0, 10);
  return `${date}T${String(hour).padStart(2, "0")}:00`;
}

describe("booking a pickup", () => {
  it("clinic staff book a pickup, get the confirmation e-mail, follow it; another customer cannot open it", async () => {
    const { context, page } = await newPage(browser);
    let orderPath = "";
    try {
      await signIn(page, "theatres@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.getByRole("link", { name: "Pickups and returns" }).first().click();
      await expectPath(page, "/clinic/orders");
      await page.getByRole("link", { name: "Book a pickup" }).click();
      await expectPath(page, "/clinic/orders/new");

      // Two sets from the site's list.
      const boxes = page.getByRole("checkbox", { name: /QMH-/ });
      await expect.poll(() => boxes.count()).toBeGreaterThan(2);
      await boxes.nth(0).check();
      await boxes.nth(1).check();
      await page.getByLabel("Collect from").fill(localAt(1, 9));
      await page.getByLabel("Collect by").fill(localAt(1, 11));

      // A needed-back-by time that cannot be met: the booking says why and what would work.
      await page.getByLabel("Needed back by").fill(localAt(1, 12));
      await expect.poll(() => page.getByTestId("booking-problems").textContent(), { timeout: 15_000 }).toMatch(/after you need them|cannot be back before/);
      await page.getByRole("button", { name: "Book pickup" }).click();
      await expect.poll(() => formError(page).textContent()).toBeTruthy();
      expect(new URL(page.url()).pathname).toBe("/clinic/orders/new");
      await screenshot(page, "booking-refused");

      await page.getByLabel("Needed back by").fill(localAt(8, 17));
      await expect.poll(() => page.getByTestId("promised-return").textContent(), { timeout: 15_000 }).toMatch(/Back by/);
      await expect.poll(() => page.getByTestId("booking-problems").count()).toBe(0);
      await screenshot(page, "booking-form");
      await page.getByRole("button", { name: "Book pickup" }).click();
      await expect.poll(() => new URL(page.url()).pathname, { timeout: 20_000 }).toMatch(/^\/clinic\/orders\/\d+$/);
      orderPath = new URL(page.url()).pathname;
      const heading = await page.getByRole("heading", { level: 1 }).textContent();
      const reference = heading!.replace("Pickup ", "").trim();
      expect(reference).toMatch(/^QMH-P\d{6}$/);
      await expect.poll(() => page.getByTestId("order-set").count()).toBe(2);
      await expect.poll(() => page.getByText("Pickup booked").count()).toBeGreaterThan(0);
      await screenshot(page, "order-page");

      const mail = await waitForMail("theatres@quillby.example", new RegExp(`Pickup ${reference} booked`));
      expect(mail.text).toContain("promised back by");
      expect(mail.html).toContain(reference);

      // The list shows it too.
      await page.goto("/clinic/orders");
      await expect.poll(() => page.getByRole("link", { name: reference }).count()).toBe(1);
    } finally {
      await context.close();
    }

    const other = await newPage(browser);
    try {
      await signIn(other.page, "manager@otterwick.example", DEMO_PASSWORD);
      await expectPath(other.page, "/clinic");
      await other.page.goto(orderPath);
      await expect.poll(() => other.page.getByText("There is nothing here for you").count()).toBe(1);
      await screenshot(other.page, "order-other-customer");
    } finally {
      await other.context.close();
    }
  });
});
