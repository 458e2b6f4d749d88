import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FakeStripe } from "./server";
import { openInvoice, startTestFake } from "./test-helpers";

// Credit notes and refunds, following Stripe's credit-note rules as its API reference states
// them: a credit first reduces amount_remaining (and amount_due) — the pre-payment part; the
// rest must be refunded, credited to the customer balance or recorded out of band.

let fake: FakeStripe;
let stripe: Stripe;

beforeAll(async () => {
  ({ fake, stripe } = await startTestFake());
});
afterAll(async () => {
  await fake.close();
});

describe("credit notes on an open invoice", () => {
  it("reduce the amount due; voiding the credit note restores it", async () => {
    const invoice = await openInvoice(stripe, 10_000);
    const note = await stripe.creditNotes.create({ invoice: invoice.id, amount: 2_500, reason: "order_change", memo: "Two sets returned unprocessed" });
    expect(note.id).toMatch(/^cn_/);
    expect(note).toMatchObject({ status: "issued", type: "pre_payment", total: 2_500, pre_payment_amount: 2_500, post_payment_amount: 0 });
    expect(note.number).toBe(`${invoice.number}-CN-01`);
    expect(note.pdf).toBe(`${fake.url}/hosted/credit_notes/${note.id}/pdf`);

    const reduced = await stripe.invoices.retrieve(invoice.id, { expand: ["payments.data.payment.payment_intent"] });
    expect([reduced.total, reduced.amount_due, reduced.amount_remaining, reduced.pre_payment_credit_notes_amount]).toEqual([10_000, 7_500, 7_500, 2_500]);
    expect(reduced.status).toBe("open");
    expect((reduced.payments!.data[0].payment.payment_intent as Stripe.PaymentIntent).amount).toBe(7_500);
    const page = await (await fetch(invoice.hosted_invoice_url!)).text();
    expect(page).toContain("£75.00");

    const updated = (await stripe.events.list({ type: "invoice.updated", limit: 1 })).data[0];
    expect(updated.data.previous_attributes).toMatchObject({ amount_due: 10_000, amount_remaining: 10_000, pre_payment_credit_notes_amount: 0 });

    const voided = await stripe.creditNotes.voidCreditNote(note.id);
    expect(voided.status).toBe("void");
    expect(voided.voided_at).not.toBeNull();
    const restored = await stripe.invoices.retrieve(invoice.id);
    expect([restored.amount_due, restored.amount_remaining]).toEqual([10_000, 10_000]);
  });

  it("credit individual lines by quantity and mark the invoice paid once nothing is left", async () => {
    const customer = await stripe.customers.create({ name: "Coldwhinny Clinic" });
    const price = await stripe.prices.create({ currency: "eur", unit_amount: 1_200, product_data: { name: "Dental tray" } });
    await stripe.invoiceItems.create({ customer: customer.id, pricing: { price: price.id }, quantity: 5 });
    const draft = await stripe.invoices.create({ customer: customer.id, pending_invoice_items_behavior: "include" });
    const invoice = await stripe.invoices.finalizeInvoice(draft.id);
    const line = invoice.lines.data[0];

    const partial = await stripe.creditNotes.create({ invoice: invoice.id, lines: [{ type: "invoice_line_item", invoice_line_item: line.id, quantity: 2 }] });
    expect(partial.total).toBe(2_400);
    expect(partial.lines.data[0]).toMatchObject({ type: "invoice_line_item", invoice_line_item: line.id, quantity: 2, amount: 2_400 });

    await expect(
      stripe.creditNotes.create({ invoice: invoice.id, lines: [{ type: "invoice_line_item", invoice_line_item: line.id, quantity: 4 }] }),
    ).rejects.toMatchObject({ param: "lines[0][amount]" });

    const rest = await stripe.creditNotes.create({ invoice: invoice.id, lines: [{ type: "invoice_line_item", invoice_line_item: line.id, quantity: 3 }] });
    expect(rest.number).toBe(`${invoice.number}-CN-02`);
    const settled = await stripe.invoices.retrieve(invoice.id);
    expect(settled.status).toBe("paid");
    expect([settled.amount_due, settled.amount_paid, settled.amount_remaining]).toEqual([0, 0, 0]);

    const notes = await stripe.creditNotes.list({ invoice: invoice.id });
    expect(notes.data.map((n) => n.id)).toEqual([rest.id, partial.id]);
    await expect(stripe.creditNotes.create({ invoice: invoice.id, amount: 1 })).rejects.toMatchObject({ code: "credit_note_amount_too_large" });
  });

  it("refuse a draft invoice and say what to fix", async () => {
    const customer = await stripe.customers.create({ name: "Pinquarry Clinic" });
    const draft = await stripe.invoices.create({ customer: customer.id });
    await expect(stripe.creditNotes.create({ invoice: draft.id, amount: 100 })).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    await expect(stripe.creditNotes.create({ invoice: "in_nope", amount: 100 })).rejects.toMatchObject({ statusCode: 404 });
  });
});

describe("credit notes on a paid invoice", () => {
  it("need the post-payment part settled, and refund the card payment with refund_amount", async () => {
    const invoice = await openInvoice(stripe, 8_000);
    const paid = await stripe.invoices.pay(invoice.id, { payment_method: "pm_card_visa", expand: ["payments"] });
    const intentId = paid.payments!.data[0].payment.payment_intent as string;

    const unsettled = await stripe.creditNotes.create({ invoice: invoice.id, amount: 3_000 }).catch((e: unknown) => e);
    expect(unsettled).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect((unsettled as Error).message).toContain("must add up to 3000");

    const note = await stripe.creditNotes.create({ invoice: invoice.id, amount: 3_000, refund_amount: 3_000 });
    expect(note).toMatchObject({ type: "post_payment", pre_payment_amount: 0, post_payment_amount: 3_000 });
    expect(note.refunds).toHaveLength(1);
    const refund = await stripe.refunds.retrieve(note.refunds[0].refund as string);
    expect(refund).toMatchObject({ amount: 3_000, status: "succeeded", payment_intent: intentId });
    const charge = await stripe.charges.retrieve(refund.charge as string);
    expect([charge.amount, charge.amount_refunded, charge.refunded]).toEqual([8_000, 3_000, false]);
    const after = await stripe.invoices.retrieve(invoice.id);
    expect(after.post_payment_credit_notes_amount).toBe(3_000);
    expect(after.status).toBe("paid");

    await expect(stripe.creditNotes.voidCreditNote(note.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it("credit the customer balance, applied to the customer's next invoice", async () => {
    const invoice = await openInvoice(stripe, 6_000);
    await stripe.invoices.pay(invoice.id, { paid_out_of_band: true });
    await stripe.creditNotes.create({ invoice: invoice.id, amount: 1_000, credit_amount: 1_000 });
    const customerId = invoice.customer as string;
    expect((await stripe.customers.retrieve(customerId)) as Stripe.Customer).toMatchObject({ balance: -1_000 });

    await stripe.invoiceItems.create({ customer: customerId, amount: 2_500, currency: "gbp" });
    const next = await stripe.invoices.create({ customer: customerId, collection_method: "send_invoice", days_until_due: 7, pending_invoice_items_behavior: "include" });
    const open = await stripe.invoices.finalizeInvoice(next.id);
    expect([open.total, open.starting_balance, open.ending_balance, open.amount_due]).toEqual([2_500, -1_000, 0, 1_500]);
    expect((await stripe.customers.retrieve(customerId)) as Stripe.Customer).toMatchObject({ balance: 0 });
  });
});

describe("refunds", () => {
  it("refund part of a payment, then the rest, and no more", async () => {
    const invoice = await openInvoice(stripe, 5_000);
    const paid = await stripe.invoices.pay(invoice.id, { payment_method: "pm_card_mastercard", expand: ["payments"] });
    const intent = paid.payments!.data[0].payment.payment_intent as string;
    const part = await stripe.refunds.create({ payment_intent: intent, amount: 1_500, reason: "requested_by_customer" });
    expect(part.id).toMatch(/^re_/);
    expect(part).toMatchObject({ amount: 1_500, status: "succeeded", reason: "requested_by_customer" });
    await expect(stripe.refunds.create({ payment_intent: intent, amount: 4_000 })).rejects.toMatchObject({ code: "amount_too_large", param: "amount" });
    const rest = await stripe.refunds.create({ charge: part.charge as string });
    expect(rest.amount).toBe(3_500);
    const charge = await stripe.charges.retrieve(part.charge as string, { expand: ["refunds"] });
    expect(charge.refunded).toBe(true);
    expect(charge.refunds?.data.map((r) => r.amount).sort()).toEqual([1_500, 3_500]);
    await expect(stripe.refunds.create({ charge: charge.id })).rejects.toMatchObject({ code: "charge_already_refunded" });
    expect((await stripe.refunds.list({ payment_intent: intent })).data).toHaveLength(2);
    // Refunds made outside credit notes leave nothing to credit on the invoice.
    await expect(stripe.creditNotes.create({ invoice: invoice.id, amount: 1, out_of_band_amount: 1 })).rejects.toMatchObject({
      code: "credit_note_amount_too_large",
    });
  });
});
