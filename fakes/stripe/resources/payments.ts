import type Stripe from "stripe";
import { cardForTestPaymentMethod, checkCard, type CardInput, type CheckedCard, type Decline } from "../cards";
import type { Ctx } from "../context";
import { FakeStripeError, invalidParam } from "../errors";
import { paginate, readListQuery } from "../list";
import { inRange, type Params } from "../params";
import {
  newestFirst,
  newId,
  randomCode,
  type ChargeObject,
  type InvoicePaymentObject,
  type PaymentIntentObject,
  type PaymentMethodObject,
  type PaymentMethodRow,
  type RefundObject,
  type Row,
} from "../state";
import { copy, rowOf } from "./common";

// Payment intents, charges, payment methods and invoice payments: the card payments behind
// invoices and Checkout sessions. Intents are confirmed only by the fake itself (the hosted
// pages, `invoices.pay` with a test payment method, the /_fake/ pay routes).

export function renderPaymentIntent(row: Row<PaymentIntentObject>): PaymentIntentObject {
  return copy(row.obj);
}

export function renderPaymentMethod(row: Row<PaymentMethodObject>): PaymentMethodObject {
  return copy(row.obj);
}

export function renderInvoicePayment(row: Row<InvoicePaymentObject>): InvoicePaymentObject {
  return copy(row.obj);
}

// A charge; its refunds are listed only when asked for (expand[]=refunds).
export function renderCharge(row: Row<ChargeObject>): ChargeObject {
  return copy(row.obj);
}

export function chargeRefunds(ctx: Ctx, chargeId: string): RefundObject[] {
  return newestFirst(ctx.state.refunds.values())
    .filter((r) => r.obj.charge === chargeId)
    .map((r) => copy(r.obj));
}

interface IntentInput {
  amount: number;
  currency: string;
  customer: string | null;
  description: string | null;
  metadata: Stripe.Metadata;
}

export function createPaymentIntent(ctx: Ctx, input: IntentInput): Row<PaymentIntentObject> {
  const id = newId("pi");
  const obj: PaymentIntentObject = {
    id,
    object: "payment_intent",
    allowed_payment_method_types: null,
    amount: input.amount,
    amount_capturable: 0,
    amount_received: 0,
    application: null,
    application_fee_amount: null,
    automatic_payment_methods: null,
    canceled_at: null,
    cancellation_reason: null,
    capture_method: "automatic",
    client_secret: `${id}_secret_${randomCode(24)}`,
    confirmation_method: "automatic",
    created: ctx.now,
    currency: input.currency,
    customer: input.customer,
    customer_account: null,
    description: input.description,
    excluded_payment_method_types: null,
    last_payment_error: null,
    latest_charge: null,
    livemode: false,
    managed_payments: null,
    metadata: input.metadata,
    next_action: null,
    on_behalf_of: null,
    payment_method: null,
    payment_method_configuration_details: null,
    payment_method_options: null,
    payment_method_types: ["card"],
    payment_record: null,
    processing: null,
    receipt_email: null,
    review: null,
    setup_future_usage: null,
    shipping: null,
    source: null,
    statement_descriptor: null,
    statement_descriptor_suffix: null,
    status: "requires_payment_method",
    transfer_data: null,
    transfer_group: null,
  };
  const row = ctx.state.add(ctx.state.paymentIntents, { obj });
  ctx.emit("payment_intent.created", renderPaymentIntent(row));
  return row;
}

export function cancelPaymentIntent(ctx: Ctx, row: Row<PaymentIntentObject>, reason: Stripe.PaymentIntent.CancellationReason): void {
  if (row.obj.status === "succeeded" || row.obj.status === "canceled") return;
  row.obj.status = "canceled";
  row.obj.canceled_at = ctx.now;
  row.obj.cancellation_reason = reason;
  ctx.emit("payment_intent.canceled", renderPaymentIntent(row));
}

export function createInvoicePayment(ctx: Ctx, invoiceId: string, intent: Row<PaymentIntentObject>): Row<InvoicePaymentObject> {
  const obj: InvoicePaymentObject = {
    id: newId("inpay"),
    object: "invoice_payment",
    amount_paid: null,
    amount_requested: intent.obj.amount,
    created: ctx.now,
    currency: intent.obj.currency,
    invoice: invoiceId,
    is_default: true,
    livemode: false,
    payment: { type: "payment_intent", payment_intent: intent.obj.id },
    status: "open",
    status_transitions: { canceled_at: null, paid_at: null },
  };
  return ctx.state.add(ctx.state.invoicePayments, { obj });
}

/** How a payment is made: a card as typed into a form, or a payment method id. */
export type PaymentSource = { card: CardInput } | { paymentMethod: string };

/** The result of one card attempt on a payment intent. */
export type Attempt =
  | { ok: true; charge: Row<ChargeObject> }
  | { ok: false; error: FakeStripeError; charge: Row<ChargeObject> | null };

// The payment method for a source: a new card, a test id such as pm_card_visa, or a stored one.
function paymentMethodFor(ctx: Ctx, source: PaymentSource, customer: string | null): { pm: PaymentMethodRow; card: CheckedCard } | { error: FakeStripeError } {
  const now = new Date(ctx.now * 1000);
  let card: CheckedCard | null;
  if ("card" in source) {
    const checked = checkCard(source.card, now);
    if ("problem" in checked) {
      return {
        error: new FakeStripeError(402, {
          type: "card_error",
          code: checked.problem.code,
          message: checked.problem.message,
          param: checked.problem.param,
        }),
      };
    }
    card = checked.card;
  } else {
    const stored = ctx.state.paymentMethods.get(source.paymentMethod);
    if (stored) return { pm: stored, card: cardOfStored(stored) };
    card = cardForTestPaymentMethod(source.paymentMethod, now);
    if (!card) {
      return {
        error: invalidParam(
          `No such PaymentMethod: '${source.paymentMethod}'. Use a test payment method such as pm_card_visa or pm_card_chargeDeclined.`,
          "payment_method",
          "resource_missing",
        ),
      };
    }
  }
  const obj: PaymentMethodObject = {
    id: newId("pm"),
    object: "payment_method",
    allow_redisplay: "unspecified",
    billing_details: { address: null, email: null, name: null, phone: null, tax_id: null },
    card: {
      brand: card.brand,
      checks: { address_line1_check: null, address_postal_code_check: null, cvc_check: "pass" },
      country: "US",
      display_brand: card.brand,
      exp_month: card.expMonth,
      exp_year: card.expYear,
      fingerprint: card.fingerprint,
      funding: card.funding,
      generated_from: null,
      last4: card.last4,
      networks: { available: [card.brand], preferred: null },
      regulated_status: "unregulated",
      three_d_secure_usage: { supported: true },
      wallet: null,
    },
    created: ctx.now,
    customer,
    customer_account: null,
    livemode: false,
    metadata: {},
    type: "card",
  };
  const pm = ctx.state.add<PaymentMethodObject, PaymentMethodRow>(ctx.state.paymentMethods, { obj, decline: card.decline });
  return { pm, card };
}

// A stored card charges again as it did at first.
function cardOfStored(pm: PaymentMethodRow): CheckedCard {
  const c = pm.obj.card!;
  return {
    number: "",
    brand: ["visa", "mastercard", "amex"].includes(c.brand) ? (c.brand as CheckedCard["brand"]) : "unknown",
    funding: c.funding === "debit" ? "debit" : "credit",
    last4: c.last4,
    expMonth: c.exp_month,
    expYear: c.exp_year,
    fingerprint: c.fingerprint ?? "",
    decline: pm.decline,
  };
}

function outcomeFor(decline: Decline | null): Stripe.Charge.Outcome {
  if (!decline) {
    return {
      advice_code: null,
      network_advice_code: null,
      network_decline_code: null,
      network_status: "approved_by_network",
      reason: null,
      risk_level: "normal",
      risk_score: 20,
      seller_message: "Payment complete.",
      type: "authorized",
    };
  }
  return {
    advice_code: decline.declineCode === "insufficient_funds" ? "try_again_later" : "do_not_try_again",
    network_advice_code: null,
    network_decline_code: null,
    network_status: "declined_by_network",
    reason: decline.declineCode,
    risk_level: "normal",
    risk_score: 20,
    seller_message: decline.sellerMessage,
    type: "issuer_declined",
  };
}

function newCharge(ctx: Ctx, intent: Row<PaymentIntentObject>, pm: Row<PaymentMethodObject>, card: CheckedCard): Row<ChargeObject> {
  const ok = card.decline === null;
  const pi = intent.obj;
  const obj: ChargeObject = {
    id: newId("ch"),
    object: "charge",
    amount: pi.amount,
    amount_captured: ok ? pi.amount : 0,
    amount_refunded: 0,
    application: null,
    application_fee: null,
    application_fee_amount: null,
    balance_transaction: null,
    billing_details: { address: null, email: null, name: null, phone: null, tax_id: null },
    calculated_statement_descriptor: ctx.config.accountName.toUpperCase().slice(0, 22),
    captured: ok,
    created: ctx.now,
    currency: pi.currency,
    customer: typeof pi.customer === "string" ? pi.customer : null,
    description: pi.description,
    disputed: false,
    failure_balance_transaction: null,
    failure_code: ok ? null : card.decline!.code,
    failure_message: ok ? null : card.decline!.message,
    fraud_details: {},
    livemode: false,
    metadata: { ...pi.metadata },
    on_behalf_of: null,
    outcome: outcomeFor(card.decline),
    paid: ok,
    payment_intent: pi.id,
    payment_method: pm.obj.id,
    payment_method_details: {
      type: "card",
      card: {
        amount_authorized: ok ? pi.amount : null,
        authorization_code: ok ? randomCode(6) : null,
        brand: card.brand,
        checks: { address_line1_check: null, address_postal_code_check: null, cvc_check: "pass" },
        country: "US",
        exp_month: card.expMonth,
        exp_year: card.expYear,
        fingerprint: card.fingerprint,
        funding: card.funding,
        last4: card.last4,
        network: card.brand,
        three_d_secure: null,
        wallet: null,
      } as Stripe.Charge.PaymentMethodDetails.Card,
    },
    receipt_email: null,
    receipt_number: null,
    receipt_url: null,
    refunded: false,
    review: null,
    shipping: null,
    source: null,
    source_transfer: null,
    statement_descriptor: null,
    statement_descriptor_suffix: null,
    status: ok ? "succeeded" : "failed",
    transfer_data: null,
    transfer_group: null,
  };
  return ctx.state.add(ctx.state.charges, { obj });
}

/**
 * One card attempt on a payment intent. A decline leaves the intent waiting for another
 * payment method with `last_payment_error` set, and answers like Stripe: a 402 card_error
 * naming the charge and the decline code.
 */
export function attemptPayment(ctx: Ctx, intent: Row<PaymentIntentObject>, source: PaymentSource): Attempt {
  const found = paymentMethodFor(ctx, source, typeof intent.obj.customer === "string" ? intent.obj.customer : null);
  if ("error" in found) return { ok: false, error: found.error, charge: null };
  const { pm, card } = found;
  const charge = newCharge(ctx, intent, pm, card);
  const pi = intent.obj;
  pi.latest_charge = charge.obj.id;
  pi.payment_method = pm.obj.id;
  if (card.decline === null) {
    pi.status = "succeeded";
    pi.amount_received = pi.amount;
    pi.last_payment_error = null;
    ctx.emit("charge.succeeded", renderCharge(charge));
    ctx.emit("payment_intent.succeeded", renderPaymentIntent(intent));
    return { ok: true, charge };
  }
  const d = card.decline;
  pi.status = "requires_payment_method";
  pi.payment_method = null;
  pi.last_payment_error = {
    type: "card_error",
    code: d.code as Stripe.PaymentIntent.LastPaymentError.Code,
    decline_code: d.declineCode ?? undefined,
    message: d.message,
    charge: charge.obj.id,
    payment_method: renderPaymentMethod(pm),
  };
  ctx.emit("charge.failed", renderCharge(charge));
  ctx.emit("payment_intent.payment_failed", renderPaymentIntent(intent));
  const body = {
    type: "card_error" as const,
    code: d.code,
    message: d.message,
    charge: charge.obj.id,
    payment_intent: renderPaymentIntent(intent),
    payment_method: renderPaymentMethod(pm),
    ...(d.declineCode ? { decline_code: d.declineCode } : {}),
  };
  return { ok: false, error: new FakeStripeError(402, body), charge };
}

// GET /v1/payment_intents/:id
export function retrievePaymentIntent(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.ignore("client_secret");
  p.done();
  return renderPaymentIntent(rowOf(ctx.state.paymentIntents, path.id, "payment_intent"));
}

// GET /v1/payment_intents
export function listPaymentIntents(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const customer = p.string("customer");
  const created = p.range("created");
  p.done();
  const rows = newestFirst(ctx.state.paymentIntents.values()).filter(
    (r) => (customer === undefined || r.obj.customer === customer) && inRange(r.obj.created, created),
  );
  return paginate(rows.map(renderPaymentIntent), q, "/v1/payment_intents");
}

// GET /v1/charges/:id
export function retrieveCharge(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderCharge(rowOf(ctx.state.charges, path.id, "charge"));
}

// GET /v1/charges
export function listCharges(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const customer = p.string("customer");
  const paymentIntent = p.string("payment_intent");
  const created = p.range("created");
  p.done();
  const rows = newestFirst(ctx.state.charges.values()).filter(
    (r) =>
      (customer === undefined || r.obj.customer === customer) &&
      (paymentIntent === undefined || r.obj.payment_intent === paymentIntent) &&
      inRange(r.obj.created, created),
  );
  return paginate(rows.map(renderCharge), q, "/v1/charges");
}

// GET /v1/payment_methods/:id
export function retrievePaymentMethod(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderPaymentMethod(rowOf(ctx.state.paymentMethods, path.id, "PaymentMethod"));
}

// GET /v1/invoice_payments/:id
export function retrieveInvoicePayment(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderInvoicePayment(rowOf(ctx.state.invoicePayments, path.id, "invoice payment"));
}

// GET /v1/invoice_payments?invoice=…
export function listInvoicePayments(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const invoice = p.string("invoice");
  const status = p.enumOf("status", ["canceled", "open", "paid"] as const);
  const payment = p.object("payment");
  const paymentIntent = payment?.string("payment_intent");
  const paymentType = payment?.enumOf("type", ["payment_intent", "payment_record"] as const);
  payment?.done();
  const created = p.range("created");
  p.done();
  const rows = newestFirst(ctx.state.invoicePayments.values()).filter(
    (r) =>
      (invoice === undefined || r.obj.invoice === invoice) &&
      (status === undefined || r.obj.status === status) &&
      (paymentIntent === undefined || r.obj.payment.payment_intent === paymentIntent) &&
      (paymentType === undefined || r.obj.payment.type === paymentType) &&
      inRange(r.obj.created, created),
  );
  return paginate(rows.map(renderInvoicePayment), q, "/v1/invoice_payments");
}
