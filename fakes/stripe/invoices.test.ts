import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FakeStripe } from "./server";
import { control, openInvoice, payOnHostedPage, startTestFake } from "./test-helpers";

// The billing flow through the real SDK: customer → invoice items → invoice → finalize → pay on
// the hosted page with each of Stripe's published test cards (docs.stripe.com/testing:
// 4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 generic_decline, 4000 0000 0000 9995
// insufficient_funds, 4000 0000 0000 0069 expired_card).

let fake: FakeStripe;
let stripe: Stripe;

beforeAll(async () => {
  ({ fake, stripe } = await startTestFake());
});
afterAll(async () => {
  await fake.close();
});

async function eventTypesFor(objectId: string): Promise<string[]> {
  const events = await stripe.events.list({ limit: 100 });
  return events.data
    .filter((e) => (e.data.object as { id?: string }).id === objectId)
    .map((e) => e.type)
    .reverse();
}

describe("drafting an invoice", () => {
  it("collects pending items, totals the lines and keeps the draft unnumbered", async () => {
    const customer = await stripe.customers.create({ name: "Brackenford Day Surgery", email: "ap@brackenford.example", metadata: { org: "org_7" } });
    expect(customer.id).toMatch(/^cus_/);
    expect(customer.metadata).toEqual({ org: "org_7" });

    const product = await stripe.products.create({ name: "Processing of a standard set" });
    const price = await stripe.prices.create({ product: product.id, currency: "gbp", unit_amount: 1850 });
    const byPrice = await stripe.invoiceItems.create({ customer: customer.id, pricing: { price: price.id }, quantity: 3, description: "Standard sets" });
    const byAmount = await stripe.invoiceItems.create({ customer: customer.id, amount: 4000, currency: "gbp", description: "Express surcharge" });
    expect(byPrice.id).toMatch(/^ii_/);
    expect(byPrice.amount).toBe(5550);
    expect(byPrice.pricing?.price_details?.price).toBe(price.id);
    expect(byPrice.pricing?.unit_amount_decimal?.toString()).toBe("1850");
    expect(byPrice.invoice).toBeNull();

    const pending = await stripe.invoiceItems.list({ customer: customer.id, pending: true });
    expect(pending.data.map((i) => i.id)).toEqual([byAmount.id, byPrice.id]);

    const draft = await stripe.invoices.create({
      customer: customer.id,
      collection_method: "send_invoice",
      days_until_due: 14,
      auto_advance: false,
      metadata: { steamlane_invoice: "inv_2027_03_0042" },
      pending_invoice_items_behavior: "include",
    });
    expect(draft.id).toMatch(/^in_/);
    expect(draft.status).toBe("draft");
    expect(draft.number).toBeNull();
    expect(draft.hosted_invoice_url).toBeNull();
    expect(draft.currency).toBe("gbp");
    expect(draft.lines.data.map((l) => l.amount)).toEqual([5550, 4000]);
    expect(draft.lines.data[0].parent?.invoice_item_details?.invoice_item).toBe(byPrice.id);
    expect([draft.subtotal, draft.total, draft.amount_due, draft.amount_paid, draft.amount_remaining]).toEqual([9550, 9550, 9550, 0, 9550]);
    expect(draft.due_date).toBe(draft.created + 14 * 86_400);

    const lines = await stripe.invoices.listLineItems(draft.id, { limit: 1 });
    expect(lines.has_more).toBe(true);
    expect(lines.data[0].amount).toBe(5550);
  });

  it("excludes pending items by default and adds items to a draft explicitly", async () => {
    const customer = await stripe.customers.create({ name: "Ashwhistle Veterinary Clinic" });
    await stripe.invoiceItems.create({ customer: customer.id, amount: 999, currency: "eur" });
    const draft = await stripe.invoices.create({ customer: customer.id, currency: "eur" });
    expect(draft.lines.data).toHaveLength(0);
    expect(draft.collection_method).toBe("charge_automatically");
    const item = await stripe.invoiceItems.create({ customer: customer.id, invoice: draft.id, unit_amount_decimal: Stripe.Decimal.from("1250.5"), quantity: 3, currency: "eur" });
    // 1250.5 × 3 = 3751.5, rounded half away from zero to 3752 (common practice).
    expect(item.amount).toBe(3752);
    const updated = await stripe.invoices.retrieve(draft.id);
    expect(updated.total).toBe(3752);

    const deleted = await stripe.invoiceItems.del(item.id);
    expect(deleted.deleted).toBe(true);
    expect((await stripe.invoices.retrieve(draft.id)).total).toBe(0);
  });

  it("refuses send_invoice without payment terms, naming the parameter", async () => {
    const customer = await stripe.customers.create({ name: "Millbrake Clinic" });
    const err = await stripe.invoices.create({ customer: customer.id, collection_method: "send_invoice" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect((err as Stripe.errors.StripeError).param).toBe("days_until_due");
  });

  it("deletes a draft with its items", async () => {
    const customer = await stripe.customers.create({ name: "Oakwhistle Theatre Suite" });
    const draft = await stripe.invoices.create({ customer: customer.id });
    const item = await stripe.invoiceItems.create({ customer: customer.id, invoice: draft.id, amount: 100, currency: "eur" });
    await stripe.invoices.del(draft.id);
    await expect(stripe.invoiceItems.retrieve(item.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    await expect(stripe.invoices.retrieve(draft.id)).rejects.toMatchObject({ statusCode: 404, code: "resource_missing" });
  });
});

describe("finalizing", () => {
  it("numbers the invoice from the customer's prefix and sequence and opens a payment", async () => {
    const customer = await stripe.customers.create({ name: "Kestrelquay Surgery", invoice_prefix: "KLS" });
    await stripe.invoiceItems.create({ customer: customer.id, amount: 2000, currency: "gbp" });
    const first = await stripe.invoices.create({ customer: customer.id, collection_method: "send_invoice", days_until_due: 30, pending_invoice_items_behavior: "include" });
    const open = await stripe.invoices.finalizeInvoice(first.id, { expand: ["payments"] });
    expect(open.status).toBe("open");
    expect(open.number).toBe("KLS-0001");
    expect(open.hosted_invoice_url).toBe(`${fake.url}/hosted/invoices/${open.id}`);
    expect(open.invoice_pdf).toBe(`${fake.url}/hosted/invoices/${open.id}/pdf`);
    expect(open.status_transitions.finalized_at).not.toBeNull();
    expect(open.payments?.data).toHaveLength(1);
    expect(open.payments?.data[0]).toMatchObject({ object: "invoice_payment", is_default: true, status: "open", amount_requested: 2000, amount_paid: null });
    expect(open.payments?.data[0].id).toMatch(/^inpay_/);
    expect(open.payments?.data[0].payment.payment_intent).toMatch(/^pi_/);

    const second = await stripe.invoices.create({ customer: customer.id });
    expect((await stripe.invoices.finalizeInvoice(second.id)).number).toBe("KLS-0002");

    await expect(stripe.invoices.finalizeInvoice(first.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    await expect(stripe.invoiceItems.create({ customer: customer.id, invoice: first.id, amount: 1, currency: "gbp" })).rejects.toMatchObject({
      code: "invoice_not_editable",
    });

    const pdf = await fetch(open.invoice_pdf!);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    expect(Buffer.from(await pdf.arrayBuffer()).subarray(0, 5).toString()).toBe("%PDF-");
  });

  it("marks a zero invoice paid as it is finalized", async () => {
    const customer = await stripe.customers.create({ name: "Wrenquarry Practice" });
    const draft = await stripe.invoices.create({ customer: customer.id });
    const done = await stripe.invoices.finalizeInvoice(draft.id);
    expect(done.status).toBe("paid");
    expect(await eventTypesFor(done.id)).toEqual(["invoice.created", "invoice.finalized", "invoice.paid"]);
  });
});

describe("paying on the hosted invoice page", () => {
  it("shows the amount due on a page titled 'Test payment page'", async () => {
    const invoice = await openInvoice(stripe, 12_500, "gbp");
    const res = await fetch(invoice.hosted_invoice_url!);
    const html = await res.text();
    expect(res.status).toBe(200);
    expect(html).toContain("<title>Test payment page</title>");
    expect(html).toContain("£125.00");
    expect(html).toContain('name="card_number"');
  });

  const declines = [
    { number: "4000 0000 0000 0002", code: "card_declined", decline: "generic_decline", message: "Your card was declined." },
    { number: "4000 0000 0000 9995", code: "card_declined", decline: "insufficient_funds", message: "Your card has insufficient funds." },
    { number: "4000 0000 0000 0069", code: "expired_card", decline: "expired_card", message: "Your card has expired." },
  ];
  for (const d of declines) {
    it(`declines ${d.number} with ${d.decline}, leaves the invoice open and records invoice.payment_failed`, async () => {
      const invoice = await openInvoice(stripe);
      const { status, html } = await payOnHostedPage(invoice.hosted_invoice_url!, { number: d.number });
      expect(status).toBe(402);
      expect(html).toContain('data-outcome="declined"');
      expect(html).toContain(`data-decline-code="${d.decline}"`);
      expect(html).toContain(d.message.replace("'", "&#39;"));

      const after = await stripe.invoices.retrieve(invoice.id);
      expect(after.status).toBe("open");
      expect(after.attempt_count).toBe(1);
      expect(after.amount_remaining).toBe(12_500);
      expect(await eventTypesFor(invoice.id)).toContain("invoice.payment_failed");

      const payments = await stripe.invoicePayments.list({ invoice: invoice.id });
      const intent = await stripe.paymentIntents.retrieve(payments.data[0].payment.payment_intent as string);
      expect(intent.status).toBe("requires_payment_method");
      expect(intent.last_payment_error).toMatchObject({ type: "card_error", code: d.code, decline_code: d.decline });
      const charge = await stripe.charges.retrieve(intent.last_payment_error!.charge!);
      expect(charge).toMatchObject({ status: "failed", paid: false, failure_code: d.code, payment_intent: intent.id });
      expect(charge.outcome?.reason).toBe(d.decline);
    });
  }

  it("pays with 4242 4242 4242 4242 after a decline: invoice paid, invoice.paid and invoice.payment_succeeded", async () => {
    const invoice = await openInvoice(stripe, 7_300, "eur");
    await payOnHostedPage(invoice.hosted_invoice_url!, { number: "4000000000000002" });
    const { status, html } = await payOnHostedPage(invoice.hosted_invoice_url!, { number: "4242 4242 4242 4242" });
    expect(status).toBe(200);
    expect(html).toContain('data-outcome="paid"');
    expect(html).toContain('data-status="paid"');

    const paid = await stripe.invoices.retrieve(invoice.id, { expand: ["payments.data.payment.payment_intent", "customer"] });
    expect(paid.status).toBe("paid");
    expect([paid.amount_due, paid.amount_paid, paid.amount_remaining]).toEqual([7_300, 7_300, 0]);
    expect(paid.attempt_count).toBe(2);
    expect(paid.status_transitions.paid_at).not.toBeNull();
    expect((paid.customer as Stripe.Customer).name).toBe("Fernhollow Dental Practice");
    const payment = paid.payments!.data[0];
    expect(payment).toMatchObject({ status: "paid", amount_paid: 7_300 });
    const intent = payment.payment.payment_intent as Stripe.PaymentIntent;
    expect(intent).toMatchObject({ object: "payment_intent", status: "succeeded", amount_received: 7_300 });
    const charge = await stripe.charges.retrieve(intent.latest_charge as string);
    expect(charge).toMatchObject({ status: "succeeded", paid: true, amount: 7_300, currency: "eur" });
    expect(charge.payment_method_details?.card?.last4).toBe("4242");

    const types = await eventTypesFor(invoice.id);
    expect(types.slice(-2)).toEqual(["invoice.paid", "invoice.payment_succeeded"]);
    expect(types.filter((t) => t === "invoice.payment_failed")).toHaveLength(1);

    const again = await payOnHostedPage(invoice.hosted_invoice_url!, { number: "4242424242424242" });
    expect(again.status).toBe(409);
    expect(again.html).not.toContain('name="card_number"');
  });

  it("rejects a mistyped card number without charging", async () => {
    const invoice = await openInvoice(stripe);
    const { status, html } = await payOnHostedPage(invoice.hosted_invoice_url!, { number: "4242 4242 4242 4241" });
    expect(status).toBe(400);
    expect(html).toContain("Your card number is incorrect.");
    expect((await stripe.invoices.retrieve(invoice.id)).attempt_count).toBe(0);
  });

  it("offers a link back when metadata[return_url] is set", async () => {
    const invoice = await openInvoice(stripe);
    await stripe.invoices.update(invoice.id, { metadata: { return_url: "http://localhost:3000/billing/invoices/42" } });
    const { html } = await payOnHostedPage(invoice.hosted_invoice_url!, { number: "4242424242424242" });
    expect(html).toContain('href="http://localhost:3000/billing/invoices/42"');
  });

  it("pays through the JSON route for tests", async () => {
    const invoice = await openInvoice(stripe);
    const declined = await control<{ outcome: string; declineCode: string }>(fake, "POST", `/_fake/invoices/${invoice.id}/pay`, { number: "4000000000009995" });
    expect(declined.status).toBe(402);
    expect(declined.json).toMatchObject({ outcome: "declined", declineCode: "insufficient_funds" });
    const ok = await control<{ outcome: string; invoice: { status: string } }>(fake, "POST", `/_fake/invoices/${invoice.id}/pay`, { number: "4242424242424242" });
    expect(ok.status).toBe(200);
    expect(ok.json.invoice.status).toBe("paid");
  });
});

describe("paying and closing through the API", () => {
  it("raises the SDK's StripeCardError for a declining test payment method", async () => {
    const invoice = await openInvoice(stripe);
    const err = await stripe.invoices.pay(invoice.id, { payment_method: "pm_card_chargeDeclinedInsufficientFunds" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(err).toMatchObject({ statusCode: 402, code: "card_declined", decline_code: "insufficient_funds" });
    expect((err as Stripe.errors.StripeCardError).charge).toMatch(/^ch_/);
    const paid = await stripe.invoices.pay(invoice.id, { payment_method: "pm_card_visa" });
    expect(paid.status).toBe("paid");
  });

  it("records a payment made outside Stripe", async () => {
    const invoice = await openInvoice(stripe, 5_000);
    const paid = await stripe.invoices.pay(invoice.id, { paid_out_of_band: true });
    expect(paid.status).toBe("paid");
    expect([paid.amount_paid, paid.amount_paid_off_stripe, paid.amount_remaining]).toEqual([5_000, 5_000, 0]);
    const types = await eventTypesFor(invoice.id);
    expect(types).toContain("invoice.paid");
    expect(types).not.toContain("invoice.payment_succeeded");
    await expect(stripe.invoices.pay(invoice.id, { paid_out_of_band: true })).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it("voids an open invoice, cancels its payment intent and refuses to pay it", async () => {
    const invoice = await openInvoice(stripe);
    const voided = await stripe.invoices.voidInvoice(invoice.id);
    expect(voided.status).toBe("void");
    expect(voided.status_transitions.voided_at).not.toBeNull();
    const payments = await stripe.invoicePayments.list({ invoice: invoice.id });
    expect(payments.data[0].status).toBe("canceled");
    const intent = await stripe.paymentIntents.retrieve(payments.data[0].payment.payment_intent as string);
    expect(intent).toMatchObject({ status: "canceled", cancellation_reason: "void_invoice" });
    expect(await eventTypesFor(invoice.id)).toContain("invoice.voided");

    const page = await payOnHostedPage(invoice.hosted_invoice_url!, { number: "4242424242424242" });
    expect(page.status).toBe(409);
    await expect(stripe.invoices.voidInvoice(invoice.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it("marks an invoice uncollectible, which can still be paid", async () => {
    const invoice = await openInvoice(stripe);
    const bad = await stripe.invoices.markUncollectible(invoice.id);
    expect(bad.status).toBe("uncollectible");
    expect(bad.status_transitions.marked_uncollectible_at).not.toBeNull();
    const paid = await stripe.invoices.pay(invoice.id, { payment_method: "pm_card_visa" });
    expect(paid.status).toBe("paid");
  });

  it("sends an invoice (recording invoice.sent) and lists invoices by customer and status", async () => {
    const invoice = await openInvoice(stripe);
    await stripe.invoices.sendInvoice(invoice.id);
    expect(await eventTypesFor(invoice.id)).toContain("invoice.sent");
    const customer = invoice.customer as string;
    const open = await stripe.invoices.list({ customer, status: "open" });
    expect(open.data.map((i) => i.id)).toEqual([invoice.id]);
    expect((await stripe.invoices.list({ customer, status: "paid" })).data).toHaveLength(0);
  });

  it("lets a finalized invoice change its metadata only", async () => {
    const invoice = await openInvoice(stripe);
    const updated = await stripe.invoices.update(invoice.id, { metadata: { run: "2027-03" } });
    expect(updated.metadata).toEqual({ run: "2027-03" });
    await expect(stripe.invoices.update(invoice.id, { description: "changed" })).rejects.toMatchObject({ code: "invoice_not_editable" });
    const events = await stripe.events.list({ type: "invoice.updated", limit: 5 });
    const event = events.data.find((e) => (e.data.object as Stripe.Invoice).id === invoice.id)!;
    expect(event.data.previous_attributes).toEqual({ metadata: {} });
  });
});
