import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FakeStripe } from "./server";
import { control, payOnHostedPage, sdkFor, startReceiver, startTestFake } from "./test-helpers";

// Checkout sessions (mode=payment) and keeping state in a data file across restarts.

const SECRET = "whsec_test_checkout_0123456789";

describe("Checkout sessions", () => {
  let fake: FakeStripe;
  let stripe: Stripe;
  let receiver: Awaited<ReturnType<typeof startReceiver>>;

  beforeAll(async () => {
    receiver = await startReceiver();
    ({ fake, stripe } = await startTestFake({ webhookUrl: receiver.url, webhookSecret: SECRET }));
  });
  afterAll(async () => {
    await fake.close();
    await receiver.close();
  });

  it("creates a session with a hosted page; paying there completes it and sends checkout.session.completed", async () => {
    const session = await stripe.checkout.sessions.create({
      mode: "payment",
      line_items: [
        { price_data: { currency: "gbp", unit_amount: 2_000, product_data: { name: "Loaner set handling" } }, quantity: 2 },
        { price_data: { currency: "gbp", unit_amount: 550, product_data: { name: "Courier surcharge" } }, quantity: 1 },
      ],
      success_url: "http://localhost:3000/billing/paid?session={CHECKOUT_SESSION_ID}",
      cancel_url: "http://localhost:3000/billing",
      client_reference_id: "org_12",
      metadata: { purpose: "one-off" },
    });
    expect(session.id).toMatch(/^cs_/);
    expect(session).toMatchObject({ status: "open", payment_status: "unpaid", amount_total: 4_550, currency: "gbp", payment_intent: null });
    expect(session.url).toBe(`${fake.url}/hosted/checkout/${session.id}`);

    const items = await stripe.checkout.sessions.listLineItems(session.id);
    expect(items.data.map((i) => [i.description, i.quantity, i.amount_total])).toEqual([
      ["Loaner set handling", 2, 4_000],
      ["Courier surcharge", 1, 550],
    ]);

    const page = await (await fetch(session.url!)).text();
    expect(page).toContain("<title>Test payment page</title>");
    expect(page).toContain("£45.50");

    const declined = await payOnHostedPage(session.url!, { number: "4000000000000002" });
    expect(declined.status).toBe(402);
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe("open");

    const paid = await payOnHostedPage(session.url!, { number: "4242424242424242" });
    expect(paid.status).toBe(200);
    expect(paid.html).toContain(`href="http://localhost:3000/billing/paid?session=${session.id}"`);

    const done = await stripe.checkout.sessions.retrieve(session.id, { expand: ["payment_intent", "line_items"] });
    expect(done).toMatchObject({ status: "complete", payment_status: "paid", url: null });
    expect((done.payment_intent as Stripe.PaymentIntent).status).toBe("succeeded");
    expect(done.line_items?.data).toHaveLength(2);

    await fake.webhooksIdle();
    const completed = receiver.received
      .map((r) => new Stripe("sk_test_x").webhooks.constructEvent(r.body, r.signature, SECRET))
      .find((e) => e.type === "checkout.session.completed");
    expect((completed?.data.object as Stripe.Checkout.Session).id).toBe(session.id);
  });

  it("expires an open session and completes through the JSON route", async () => {
    const make = () =>
      stripe.checkout.sessions.create({ mode: "payment", line_items: [{ price_data: { currency: "eur", unit_amount: 900, product_data: { name: "Sterile wrap" } }, quantity: 1 }] });
    const expired = await stripe.checkout.sessions.expire((await make()).id);
    expect(expired.status).toBe("expired");
    const viaControl = await control<{ outcome: string; session: { status: string } }>(fake, "POST", `/_fake/checkout/sessions/${(await make()).id}/complete`, {
      number: "4242424242424242",
    });
    expect(viaControl.status).toBe(200);
    expect(viaControl.json.session.status).toBe("complete");
  });

  it("refuses modes other than payment", async () => {
    await expect(stripe.checkout.sessions.create({ mode: "subscription", line_items: [{ price: "price_x", quantity: 1 }] })).rejects.toMatchObject({
      param: "mode",
    });
  });
});

describe("the data file", () => {
  it("keeps customers, invoices, events and idempotency keys across a restart", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fake-stripe-"));
    const dataFile = path.join(dir, "state.json");
    try {
      const first = await startTestFake({ dataFile });
      const customer = await first.stripe.customers.create({ name: "Hollins Row Clinic" }, { idempotencyKey: "persist-1" });
      await first.stripe.invoiceItems.create({ customer: customer.id, amount: 1_000, currency: "eur" });
      const draft = await first.stripe.invoices.create({ customer: customer.id, pending_invoice_items_behavior: "include" });
      const invoice = await first.stripe.invoices.finalizeInvoice(draft.id);
      await first.fake.close();

      const second = await startTestFake({ dataFile });
      try {
        const stripe = sdkFor(second.fake);
        const again = await stripe.invoices.retrieve(invoice.id);
        expect([again.status, again.number, again.total]).toEqual(["open", invoice.number, 1_000]);
        expect(again.hosted_invoice_url).toBe(`${second.fake.url}/hosted/invoices/${invoice.id}`);
        const replay = await stripe.customers.create({ name: "Hollins Row Clinic" }, { idempotencyKey: "persist-1" });
        expect(replay.id).toBe(customer.id);
        expect(replay.lastResponse.headers["idempotent-replayed"]).toBe("true");
        expect((await stripe.events.list({ limit: 100 })).data.map((e) => e.type)).toContain("invoice.finalized");
        const paid = await stripe.invoices.pay(invoice.id, { payment_method: "pm_card_visa" });
        expect(paid.status).toBe("paid");
      } finally {
        await second.fake.close();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });

  it("refuses a file that is not its own, saying which", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fake-stripe-"));
    const dataFile = path.join(dir, "other.json");
    fs.writeFileSync(dataFile, JSON.stringify({ hello: "world" }));
    try {
      await expect(startTestFake({ dataFile })).rejects.toThrow(/not a fake Stripe data file/);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
