import fs from "node:fs";
import path from "node:path";
import type { Kysely } from "kysely";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { closeDb, getDb } from "@/db";
import type { Database } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { ensureStripeInvoice } from "@/lib/billing/payments";
import { resetServerEnvCache } from "@/lib/env";
import { resetStripeClient } from "@/lib/stripe";
import { expectPath, launchBrowser, newPage, PHONE, screenshot, signIn, waitForMail } from "./browser";

// A clinic manager pays an open invoice online on the payment service's hosted page and sees it
// paid when the webhook arrives, with the receipt in the mail catcher; another clinic's declined
// card leaves its invoice open with the reason; finance downloads the CSV, UBL and PDF.
//
// The demo's invoices are issued without a copy in the payment service. The copies are made here
// through the same function the "Pay online" button uses, against the stack's own database and
// its local payment service, so the invoice pages already carry their payment links.

vi.mock("server-only", () => ({}));

let browser: Browser;
let db: Kysely<Database>;

/** The newest open invoice of a customer, with its copy in the stack's payment service. */
async function openInvoiceOf(shortCode: string): Promise<{ id: number; number: string }> {
  const row = await db
    .selectFrom("invoices")
    .innerJoin("organisations", "organisations.id", "invoices.organisation_id")
    .select(["invoices.id", "invoices.number"])
    .where("organisations.short_code", "=", shortCode)
    .where("invoices.status", "=", "open")
    .where("invoices.amount_due_minor", ">", 0)
    .orderBy("invoices.issue_date", "desc")
    .orderBy("invoices.id", "desc")
    .executeTakeFirstOrThrow();
  const copy = await ensureStripeInvoice(db, row.id);
  expect(copy.hostedInvoiceUrl).toMatch(/\/hosted\/invoices\/in_/);
  return row;
}

beforeAll(async () => {
  browser = await launchBrowser();
  const stripe = new URL(inject("stripeUrl"));
  Object.assign(process.env, {
    STEAMLANE_DATA_DIR: inject("dataDir"),
    APP_URL: inject("appUrl"),
    STRIPE_SECRET_KEY: "sk_test_steamlane_local",
    STRIPE_API_HOST: stripe.hostname,
    STRIPE_API_PORT: stripe.port,
    STRIPE_API_PROTOCOL: "http",
  });
  delete process.env.DATABASE_PATH;
  resetServerEnvCache();
  resetStripeClient();
  await closeDb();
  db = getDb();
  expect(fs.existsSync(path.join(inject("dataDir"), "steamlane.db"))).toBe(true);
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
  resetStripeClient();
});

async function payOnHostedPage(popup: Page, card: string) {
  await popup.waitForLoadState("domcontentloaded");
  await popup.getByLabel("Card number").fill(card);
  await popup.getByLabel("Expiry (MM/YY)").fill("12/34");
  await popup.getByLabel("Security code").fill("123");
  await popup.getByRole("button", { name: /^Pay / }).click();
  await expect.poll(() => popup.locator("#payment-result").count(), { timeout: 20_000 }).toBe(1);
  return popup.locator("#payment-result").getAttribute("data-outcome");
}

describe("paying an invoice online", () => {
  it("a clinic manager pays with the test card, sees the invoice paid and gets the receipt", async () => {
    const invoice = await openInvoiceOf("QMH");
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "manager@quillby.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.getByRole("link", { name: "Invoices" }).first().click();
      await expectPath(page, "/clinic/invoices");
      await expect.poll(() => page.getByRole("link", { name: invoice.number }).count(), { timeout: 20_000 }).toBe(1);
      await screenshot(page, "payments-clinic-invoices");
      await page.getByRole("link", { name: invoice.number }).click();
      await expectPath(page, `/clinic/invoices/${invoice.id}`);
      await expect.poll(() => page.getByTestId("invoice-status").textContent()).toContain("Open");
      expect(await page.getByTestId("invoice-line").count()).toBeGreaterThan(0);
      await screenshot(page, "payments-clinic-invoice-open");

      const [popup] = await Promise.all([context.waitForEvent("page"), page.getByTestId("pay-online").click()]);
      await expect.poll(() => popup.getByRole("heading", { name: "Test payment page" }).count(), { timeout: 20_000 }).toBe(1);
      expect(await payOnHostedPage(popup, "4242 4242 4242 4242")).toBe("paid");
      await screenshot(popup, "payments-hosted-page-paid");
      await popup.close();

      // Back on our page: it refreshes itself once the webhook has marked the invoice paid.
      await page.bringToFront();
      await expect.poll(() => page.getByTestId("invoice-status").textContent(), { timeout: 30_000 }).toContain("Paid");
      await expect.poll(() => page.getByTestId("amount-due").textContent()).toBe("£0.00");
      expect(await page.getByTestId("pay-online").count()).toBe(0);
      await screenshot(page, "payments-clinic-invoice-paid");

      const receipt = await waitForMail("manager@quillby.example", new RegExp(`Payment received for invoice ${invoice.number}`));
      expect(receipt.text).toContain("Nothing more is due");
      expect(receipt.html).toContain(invoice.number);
    } finally {
      await context.close();
    }
  });

  it("another clinic's declined card leaves its invoice open and the page says why (phone width)", async () => {
    const invoice = await openInvoiceOf("ODS");
    const { context, page } = await newPage(browser, PHONE);
    try {
      await signIn(page, "manager@otterwick.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.goto(`/clinic/invoices/${invoice.id}`);
      await expect.poll(() => page.getByTestId("invoice-status").textContent(), { timeout: 20_000 }).toContain("Open");
      const [popup] = await Promise.all([context.waitForEvent("page"), page.getByTestId("pay-online").click()]);
      expect(await payOnHostedPage(popup, "4000 0000 0000 0002")).toBe("declined");
      await screenshot(popup, "payments-hosted-page-declined");
      await popup.close();
      await page.bringToFront();
      await expect.poll(() => page.getByTestId("payment-error").textContent(), { timeout: 30_000 }).toMatch(/declined/i);
      expect(await page.getByTestId("invoice-status").textContent()).toContain("Open");
      expect(await page.getByTestId("pay-online").count()).toBe(1);
      await screenshot(page, "payments-clinic-invoice-declined");

      // Another clinic's invoice is not there for this manager.
      const other = await db.selectFrom("invoices").innerJoin("organisations", "organisations.id", "invoices.organisation_id").select("invoices.id").where("organisations.short_code", "=", "QMH").executeTakeFirstOrThrow();
      await page.goto(`/clinic/invoices/${other.id}`);
      await expect.poll(() => page.getByText("There is nothing here for you").count()).toBe(1);
    } finally {
      await context.close();
    }
  });
});

describe("finance's exports", () => {
  it("finance downloads the invoices as CSV, and an invoice as UBL and PDF", async () => {
    const paid = await db.selectFrom("invoices").select(["id", "number"]).where("status", "=", "paid").where("stripe_invoice_id", "is not", null).orderBy("id", "desc").executeTakeFirstOrThrow();
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "finance@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.goto("/unit/billing/invoices");
      await expect.poll(() => page.getByRole("link", { name: paid.number }).count(), { timeout: 20_000 }).toBe(1);
      await expect.poll(() => page.getByTestId("invoice-totals").count(), { timeout: 20_000 }).toBe(1);
      await screenshot(page, "payments-finance-invoices");

      const [csv] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Invoices (CSV)" }).click()]);
      expect(csv.suggestedFilename()).toMatch(/^invoice-headers-\d{4}-\d{2}-\d{2}\.csv$/);
      const csvText = fs.readFileSync((await csv.path())!, "utf8");
      expect(csvText.replace(/^\uFEFF/, "").split("\r\n")[0]).toMatch(/^invoice_number,customer,status/);
      expect(csvText).toContain(paid.number);

      await page.getByRole("link", { name: paid.number }).click();
      await expectPath(page, `/unit/billing/invoices/${paid.id}`);
      await expect.poll(() => page.getByTestId("invoice-status").textContent(), { timeout: 20_000 }).toContain("Paid");
      await page.locator("table").getByText(/^\d+ sets?/).first().click();
      await screenshot(page, "payments-finance-invoice");

      const [ubl] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "UBL (XML)" }).first().click()]);
      expect(ubl.suggestedFilename()).toBe(`${paid.number}.xml`);
      const xml = fs.readFileSync((await ubl.path())!, "utf8");
      expect(xml).toContain("<cbc:ID>" + paid.number + "</cbc:ID>");
      expect(xml).toContain("urn:oasis:names:specification:ubl:schema:xsd:Invoice-2");

      const [pdf] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "PDF" }).click()]);
      expect(pdf.suggestedFilename()).toBe(`${paid.number}.pdf`);
      expect(fs.readFileSync((await pdf.path())!).subarray(0, 5).toString("latin1")).toBe("%PDF-");

      // A credit note for a dispute on an open invoice lowers what is due.
      const open = await db.selectFrom("invoices").select(["id", "number", "amount_due_minor"]).where("status", "=", "open").where("amount_due_minor", ">", 2000).orderBy("id").executeTakeFirstOrThrow();
      await page.goto(`/unit/billing/invoices/${open.id}`);
      await page.getByRole("button", { name: "Credit note" }).click();
      await page.getByLabel("What to credit").selectOption("amount");
      await page.getByLabel("Amount before VAT (GBP)").fill("10.00");
      await page.getByLabel("Line on the credit note").fill("Goodwill credit");
      await page.getByLabel("Reason").fill("Tray returned with a torn wrap");
      await screenshot(page, "payments-finance-credit-note");
      await page.getByRole("button", { name: "Create credit note" }).click();
      await expect.poll(() => page.getByTestId("credit-note").count(), { timeout: 20_000 }).toBe(1);
      // 10.00 + 20 % VAT = 12.00 less to pay.
      const after = await db.selectFrom("invoices").select("amount_due_minor").where("id", "=", open.id).executeTakeFirstOrThrow();
      expect(after.amount_due_minor).toBe(open.amount_due_minor - 1200);

      await page.goto("/unit/billing/settings");
      await expect.poll(() => page.getByLabel("Reminder 1: days after the due date").inputValue()).toBe("7");
      expect(await page.getByLabel("VAT number").inputValue()).toBe("GB000000000");
      await screenshot(page, "payments-billing-settings");
    } finally {
      await context.close();
    }
  });
});
