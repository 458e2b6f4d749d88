import type Stripe from "stripe";
import { previousAttributes, type Ctx } from "../context";
import { badState, invalidParam, invalidRequest, noSuch } from "../errors";
import { listOf, paginate, readListQuery, type ApiList } from "../list";
import { inRange, missing, type Params } from "../params";
import { newestFirst, newId, type InvoiceCore, type InvoiceLineObject, type InvoicePaymentObject, type InvoiceRow } from "../state";
import { copy, mergeMetadata, newMetadata, readCurrency, rowOf } from "./common";
import { liveCustomer, renderCustomer } from "./customers";
import { invoiceLines, recomputeTotals } from "./invoice-math";
import {
  attemptPayment,
  cancelPaymentIntent,
  createInvoicePayment,
  createPaymentIntent,
  renderInvoicePayment,
  type Attempt,
  type PaymentSource,
} from "./payments";

// POST/GET /v1/invoices, GET/POST/DELETE /v1/invoices/:id, and the actions finalize, send, pay,
// void and mark_uncollectible. Totals follow from the lines (see invoice-math.ts); every card
// attempt goes through the payment intent made at finalization, listed as an invoice payment.

export type InvoiceWire = InvoiceCore & {
  hosted_invoice_url: string | null;
  invoice_pdf: string | null;
  lines: ApiList<InvoiceLineObject>;
};

const EMBEDDED_LINES = 10;

export function renderInvoice(ctx: Ctx, row: InvoiceRow): InvoiceWire {
  const o = copy(row.obj);
  const lines = invoiceLines(ctx.state, row);
  const finalized = o.status !== "draft";
  return {
    ...o,
    hosted_invoice_url: finalized ? ctx.link(`/hosted/invoices/${o.id}`) : null,
    invoice_pdf: finalized ? ctx.link(`/hosted/invoices/${o.id}/pdf`) : null,
    lines: listOf(lines.slice(0, EMBEDDED_LINES), `/v1/invoices/${o.id}/lines`, lines.length > EMBEDDED_LINES),
  };
}

// The invoice's payments, for `expand[]=payments`.
export function invoicePaymentsList(ctx: Ctx, row: InvoiceRow): ApiList<InvoicePaymentObject> {
  const payments = row.invoicePaymentIds
    .map((id) => ctx.state.invoicePayments.get(id))
    .filter((r) => r !== undefined)
    .map(renderInvoicePayment);
  return listOf(payments, `/v1/invoice_payments?invoice=${row.obj.id}`);
}

function customFields(p: Params): Stripe.Invoice.CustomField[] | null | undefined {
  if (p.isBlank("custom_fields")) {
    p.ignore("custom_fields");
    return null;
  }
  const list = p.objectArray("custom_fields");
  if (!list) return undefined;
  if (list.length > 4) throw invalidParam("At most 4 custom_fields are allowed.", "custom_fields");
  return list.map((f) => {
    const field = { name: f.requiredString("name", { maxLength: 40 }), value: f.requiredString("value", { maxLength: 140 }) };
    f.done();
    return field;
  });
}

function paymentMethodTypes(p: Params): string[] | null | undefined {
  const settings = p.object("payment_settings");
  if (!settings) return undefined;
  const types = settings.stringArray("payment_method_types");
  settings.ignore("payment_method_options", "default_mandate");
  settings.done();
  if (types && types.some((t) => t !== "card")) {
    throw invalidParam("This local fake takes card payments only; use payment_settings[payment_method_types][]=card.", "payment_settings[payment_method_types]");
  }
  return types ?? null;
}

function refuseAutomaticTax(p: Params): void {
  const tax = p.object("automatic_tax");
  if (!tax) return;
  const enabled = tax.boolean("enabled");
  tax.ignore("liability");
  tax.done();
  if (enabled) throw invalidParam("This local fake computes no taxes; automatic_tax[enabled] must be false.", "automatic_tax[enabled]");
}

const DAY = 86_400;

// POST /v1/invoices
export function createInvoice(ctx: Ctx, p: Params): object {
  const customerId = p.id("customer", ["cus_"]);
  if (!customerId) throw missing("customer");
  const collection = p.enumOf("collection_method", ["charge_automatically", "send_invoice"] as const) ?? "charge_automatically";
  const daysUntilDue = p.integer("days_until_due", { min: 0, max: 3650 });
  const dueDate = p.integer("due_date", { min: 0 });
  const autoAdvance = p.boolean("auto_advance") ?? false;
  const currency = readCurrency(p);
  const description = p.string("description", { maxLength: 1500 }) ?? null;
  const footer = p.string("footer", { maxLength: 5000 }) ?? null;
  const metadata = newMetadata(p.metadata());
  const behaviour = p.enumOf("pending_invoice_items_behavior", ["exclude", "include"] as const) ?? "exclude";
  const number = p.string("number", { maxLength: 26 });
  const statementDescriptor = p.string("statement_descriptor", { maxLength: 22 }) ?? null;
  const fields = customFields(p) ?? null;
  const pmTypes = paymentMethodTypes(p) ?? null;
  const effectiveAt = p.integer("effective_at", { min: 0 }) ?? null;
  refuseAutomaticTax(p);
  p.done();
  checkTerms(collection, daysUntilDue, dueDate);
  const customer = liveCustomer(ctx, customerId);

  const pending = [...ctx.state.invoiceItems.values()]
    .filter((r) => r.obj.customer === customerId && r.obj.invoice === null)
    .sort((a, b) => a.seq - b.seq);
  const invoiceCurrency =
    currency ?? customer.obj.currency ?? (behaviour === "include" ? pending[0]?.obj.currency : undefined) ?? ctx.config.defaultCurrency;
  const included = behaviour === "include" ? pending.filter((r) => r.obj.currency === invoiceCurrency) : [];

  const c = customer.obj;
  const obj: InvoiceCore = {
    id: newId("in"),
    object: "invoice",
    account_country: null,
    account_name: ctx.config.accountName,
    account_tax_ids: null,
    amount_due: 0,
    amount_overpaid: 0,
    amount_paid: 0,
    amount_paid_off_stripe: 0,
    amount_remaining: 0,
    amount_shipping: 0,
    application: null,
    attempt_count: 0,
    attempted: false,
    auto_advance: autoAdvance,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null, provider: null, status: null },
    automatically_finalizes_at: autoAdvance ? ctx.now + 3600 : null,
    billing_reason: "manual",
    collection_method: collection,
    created: ctx.now,
    currency: invoiceCurrency,
    custom_fields: fields,
    customer: customerId,
    customer_account: null,
    customer_address: c.address ?? null,
    customer_email: c.email,
    customer_name: c.name ?? null,
    customer_phone: c.phone ?? null,
    customer_shipping: null,
    customer_tax_exempt: c.tax_exempt ?? "none",
    customer_tax_ids: [],
    default_payment_method: null,
    default_source: null,
    default_tax_rates: [],
    description,
    discounts: [],
    due_date: collection === "send_invoice" ? (dueDate ?? ctx.now + (daysUntilDue ?? 0) * DAY) : null,
    effective_at: effectiveAt,
    ending_balance: null,
    footer,
    from_invoice: null,
    issuer: { type: "self" },
    last_finalization_error: null,
    latest_revision: null,
    livemode: false,
    metadata,
    next_payment_attempt: null,
    number: number ?? null,
    on_behalf_of: null,
    parent: null,
    payment_settings: { default_mandate: null, payment_method_options: null, payment_method_types: pmTypes as Stripe.Invoice.PaymentSettings["payment_method_types"] },
    period_end: ctx.now,
    period_start: ctx.now,
    post_payment_credit_notes_amount: 0,
    pre_payment_credit_notes_amount: 0,
    receipt_number: null,
    rendering: null,
    shipping_cost: null,
    shipping_details: null,
    starting_balance: 0,
    statement_descriptor: statementDescriptor,
    status: "draft",
    status_transitions: { finalized_at: null, marked_uncollectible_at: null, paid_at: null, voided_at: null },
    subtotal: 0,
    subtotal_excluding_tax: 0,
    test_clock: null,
    total: 0,
    total_discount_amounts: [],
    total_excluding_tax: 0,
    total_pretax_credit_amounts: [],
    total_taxes: [],
    webhooks_delivered_at: null,
  };
  const row = ctx.state.add<InvoiceCore, InvoiceRow>(ctx.state.invoices, {
    obj,
    daysUntilDue: daysUntilDue ?? null,
    itemIds: included.map((r) => r.obj.id),
    paymentIntentId: null,
    invoicePaymentIds: [],
  });
  for (const item of included) item.obj.invoice = obj.id;
  recomputeTotals(ctx.state, row);
  const out = renderInvoice(ctx, row);
  ctx.emit("invoice.created", out);
  return out;
}

// Stripe's payment terms: send_invoice needs a due date, charge_automatically takes none.
function checkTerms(collection: string, daysUntilDue: number | undefined, dueDate: number | undefined): void {
  if (daysUntilDue !== undefined && dueDate !== undefined) {
    throw invalidParam("You may only specify one of these parameters: days_until_due, due_date.", "due_date", "parameters_exclusive");
  }
  if (collection !== "send_invoice" && (daysUntilDue !== undefined || dueDate !== undefined)) {
    throw invalidParam(
      "days_until_due and due_date apply only to invoices with collection_method=send_invoice.",
      daysUntilDue !== undefined ? "days_until_due" : "due_date",
    );
  }
  if (collection === "send_invoice" && daysUntilDue === undefined && dueDate === undefined) {
    throw invalidParam("An invoice with collection_method=send_invoice needs days_until_due or due_date.", "days_until_due", "parameter_missing");
  }
}

// GET /v1/invoices/:id
export function retrieveInvoice(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderInvoice(ctx, rowOf(ctx.state.invoices, path.id, "invoice"));
}

// POST /v1/invoices/:id — drafts change freely; finalized invoices only their metadata and auto_advance.
export function updateInvoice(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const row = rowOf(ctx.state.invoices, path.id, "invoice");
  const o = row.obj;
  const autoAdvance = p.boolean("auto_advance");
  const metadata = p.metadata();
  const collection = p.enumOf("collection_method", ["charge_automatically", "send_invoice"] as const);
  const daysUntilDue = p.integer("days_until_due", { min: 0, max: 3650 });
  const dueDate = p.integer("due_date", { min: 0 });
  const description = p.emptyableString("description", { maxLength: 1500 });
  const footer = p.emptyableString("footer", { maxLength: 5000 });
  const number = p.emptyableString("number", { maxLength: 26 });
  const statementDescriptor = p.emptyableString("statement_descriptor", { maxLength: 22 });
  const fields = customFields(p);
  const pmTypes = paymentMethodTypes(p);
  const effectiveAt = p.integer("effective_at", { min: 0 });
  refuseAutomaticTax(p);
  p.done();
  const draftOnly = { collection, daysUntilDue, dueDate, description, footer, number, statementDescriptor, fields, pmTypes, effectiveAt };
  const changed = Object.entries(draftOnly).find(([, v]) => v !== undefined);
  if (o.status !== "draft" && changed) {
    throw badState(`Invoice ${o.id} is ${o.status}; once finalized only metadata and auto_advance can change.`, "invoice_not_editable");
  }
  const before = renderInvoice(ctx, row);
  if (collection !== undefined || daysUntilDue !== undefined || dueDate !== undefined) {
    const method = collection ?? o.collection_method;
    const days = daysUntilDue ?? (dueDate === undefined && method === "send_invoice" ? (row.daysUntilDue ?? undefined) : undefined);
    const date = dueDate ?? (days === undefined && method === "send_invoice" && o.due_date !== null ? o.due_date : undefined);
    checkTerms(method, days, date);
    o.collection_method = method;
    row.daysUntilDue = days ?? null;
    o.due_date = method === "send_invoice" ? (date ?? o.created + (days ?? 0) * DAY) : null;
  }
  if (autoAdvance !== undefined) {
    o.auto_advance = autoAdvance;
    if (o.status === "draft") o.automatically_finalizes_at = autoAdvance ? o.created + 3600 : null;
  }
  if (description !== undefined) o.description = description;
  if (footer !== undefined) o.footer = footer;
  if (number !== undefined) o.number = number;
  if (statementDescriptor !== undefined) o.statement_descriptor = statementDescriptor;
  if (fields !== undefined) o.custom_fields = fields;
  if (pmTypes !== undefined) o.payment_settings.payment_method_types = pmTypes as Stripe.Invoice.PaymentSettings["payment_method_types"];
  if (effectiveAt !== undefined) o.effective_at = effectiveAt;
  o.metadata = mergeMetadata(o.metadata, metadata);
  const out = renderInvoice(ctx, row);
  const previous = previousAttributes(before, out);
  if (Object.keys(previous).length > 0) ctx.emit("invoice.updated", out, previous);
  return out;
}

// DELETE /v1/invoices/:id — drafts only; their invoice items are deleted with them.
export function deleteInvoice(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  const row = rowOf(ctx.state.invoices, path.id, "invoice");
  if (row.obj.status !== "draft") {
    throw badState(`Invoice ${row.obj.id} is ${row.obj.status}; only drafts can be deleted (void a finalized invoice instead).`);
  }
  const last = renderInvoice(ctx, row);
  for (const id of row.itemIds) ctx.state.invoiceItems.delete(id);
  ctx.state.invoices.delete(row.obj.id);
  ctx.emit("invoice.deleted", last);
  return { id: row.obj.id, object: "invoice", deleted: true };
}

// GET /v1/invoices (customer, status, collection_method, created, due_date)
export function listInvoices(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const customer = p.string("customer");
  const status = p.enumOf("status", ["draft", "open", "paid", "uncollectible", "void"] as const);
  const collection = p.enumOf("collection_method", ["charge_automatically", "send_invoice"] as const);
  const created = p.range("created");
  const due = p.range("due_date");
  p.done();
  const rows = newestFirst(ctx.state.invoices.values()).filter(
    (r) =>
      (customer === undefined || r.obj.customer === customer) &&
      (status === undefined || r.obj.status === status) &&
      (collection === undefined || r.obj.collection_method === collection) &&
      inRange(r.obj.created, created) &&
      (due === undefined || (r.obj.due_date !== null && inRange(r.obj.due_date, due))),
  );
  return paginate(
    rows.map((r) => renderInvoice(ctx, r as InvoiceRow)),
    q,
    "/v1/invoices",
  );
}

// GET /v1/invoices/:id/lines — in the order the lines were added.
export function listInvoiceLines(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const q = readListQuery(p);
  p.done();
  const row = rowOf(ctx.state.invoices, path.id, "invoice");
  return paginate(invoiceLines(ctx.state, row), q, `/v1/invoices/${row.obj.id}/lines`);
}

/**
 * Draft → open: assigns the number (the customer's prefix and sequence, "ABCD1234-0001"),
 * applies the customer balance, makes the payment intent, and pays a zero invoice at once.
 */
export function finalize(ctx: Ctx, row: InvoiceRow, autoAdvance?: boolean): void {
  const o = row.obj;
  const customer = ctx.state.customers.get(o.customer as string);
  if (autoAdvance !== undefined) o.auto_advance = autoAdvance;
  if (customer) {
    const c = customer.obj;
    const customerBefore = renderCustomer(customer);
    o.customer_address = c.address ?? null;
    o.customer_email = c.email;
    o.customer_name = c.name ?? null;
    o.customer_phone = c.phone ?? null;
    o.customer_tax_exempt = c.tax_exempt ?? "none";
    if (!o.number) {
      o.number = `${c.invoice_prefix}-${String(c.next_invoice_sequence ?? 1).padStart(4, "0")}`;
      c.next_invoice_sequence = (c.next_invoice_sequence ?? 1) + 1;
    }
    if (!c.currency) c.currency = o.currency;
    recomputeTotals(ctx.state, row);
    o.starting_balance = c.balance;
    o.ending_balance = Math.min(0, o.total + o.starting_balance);
    c.balance = o.ending_balance;
    const customerAfter = renderCustomer(customer);
    const changed = previousAttributes(customerBefore, customerAfter);
    if (Object.keys(changed).length > 0) ctx.emit("customer.updated", customerAfter, changed);
  } else {
    o.ending_balance = 0;
  }
  o.status = "open";
  o.status_transitions.finalized_at = ctx.now;
  o.effective_at = o.effective_at ?? ctx.now;
  o.automatically_finalizes_at = null;
  o.webhooks_delivered_at = o.webhooks_delivered_at ?? ctx.now;
  recomputeTotals(ctx.state, row);
  if (o.amount_remaining > 0) openPaymentIntent(ctx, row);
  ctx.emit("invoice.finalized", renderInvoice(ctx, row));
  if (o.amount_remaining === 0) markPaid(ctx, row, false);
  else if (o.collection_method === "send_invoice" && o.auto_advance) ctx.emit("invoice.sent", renderInvoice(ctx, row));
}

// A fresh payment intent (and its invoice payment) for what is left to pay.
function openPaymentIntent(ctx: Ctx, row: InvoiceRow) {
  const o = row.obj;
  const intent = createPaymentIntent(ctx, {
    amount: o.amount_remaining,
    currency: o.currency,
    customer: o.customer as string,
    description: o.number ? `Payment for Invoice ${o.number}` : "Payment for Invoice",
    metadata: {},
  });
  row.paymentIntentId = intent.obj.id;
  const payment = createInvoicePayment(ctx, o.id, intent);
  row.invoicePaymentIds.push(payment.obj.id);
  return intent;
}

function defaultPayment(ctx: Ctx, row: InvoiceRow) {
  const intentId = row.paymentIntentId;
  if (!intentId) return undefined;
  for (const id of row.invoicePaymentIds) {
    const payment = ctx.state.invoicePayments.get(id);
    if (payment && payment.obj.payment.payment_intent === intentId) return payment;
  }
  return undefined;
}

/** Keeps the open payment intent at the amount still due (after a credit note), or cancels it at zero. */
export function syncPaymentIntent(ctx: Ctx, row: InvoiceRow): void {
  const intent = row.paymentIntentId ? ctx.state.paymentIntents.get(row.paymentIntentId) : undefined;
  if (!intent || intent.obj.status !== "requires_payment_method") return;
  const payment = defaultPayment(ctx, row);
  if (row.obj.amount_remaining > 0) {
    intent.obj.amount = row.obj.amount_remaining;
    if (payment) payment.obj.amount_requested = row.obj.amount_remaining;
    return;
  }
  cancelPaymentIntent(ctx, intent, "automatic");
  if (payment) {
    payment.obj.status = "canceled";
    payment.obj.status_transitions.canceled_at = ctx.now;
  }
}

/** Marks the invoice paid; `byPayment` adds invoice.payment_succeeded to invoice.paid. */
export function markPaid(ctx: Ctx, row: InvoiceRow, byPayment: boolean): void {
  row.obj.status = "paid";
  row.obj.status_transitions.paid_at = ctx.now;
  const out = renderInvoice(ctx, row);
  ctx.emit("invoice.paid", out);
  if (byPayment) ctx.emit("invoice.payment_succeeded", out);
}

/**
 * One card attempt on an open (or uncollectible) invoice, for the whole amount remaining.
 * Success pays the invoice; a decline leaves it open, counts the attempt and records
 * invoice.payment_failed.
 */
export function payInvoiceWithCard(ctx: Ctx, row: InvoiceRow, source: PaymentSource): Attempt {
  const o = row.obj;
  if (o.status !== "open" && o.status !== "uncollectible") {
    return { ok: false, error: notPayable(o), charge: null };
  }
  let intent = row.paymentIntentId ? ctx.state.paymentIntents.get(row.paymentIntentId) : undefined;
  if (!intent || intent.obj.status !== "requires_payment_method") intent = openPaymentIntent(ctx, row);
  syncPaymentIntent(ctx, row);
  const attempt = attemptPayment(ctx, intent, source);
  if (!attempt.ok) {
    if (attempt.charge) {
      o.attempt_count += 1;
      o.attempted = true;
      ctx.emit("invoice.payment_failed", renderInvoice(ctx, row));
    }
    return attempt;
  }
  o.attempt_count += 1;
  o.attempted = true;
  const payment = defaultPayment(ctx, row);
  if (payment) {
    payment.obj.status = "paid";
    payment.obj.amount_paid = intent.obj.amount;
    payment.obj.status_transitions.paid_at = ctx.now;
    ctx.emit("invoice_payment.paid", renderInvoicePayment(payment));
  }
  o.amount_paid += intent.obj.amount;
  recomputeTotals(ctx.state, row);
  markPaid(ctx, row, true);
  return attempt;
}

function notPayable(o: InvoiceCore) {
  switch (o.status) {
    case "paid":
      return badState(`Invoice ${o.id} is already paid.`);
    case "void":
      return badState(`Invoice ${o.id} has been voided and can no longer be paid.`);
    case "draft":
      return badState(`Invoice ${o.id} is a draft; finalize it before paying.`);
    default:
      return badState(`Invoice ${o.id} is ${o.status} and cannot be paid.`);
  }
}

// POST /v1/invoices/:id/finalize
export function finalizeInvoice(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const autoAdvance = p.boolean("auto_advance");
  p.done();
  const row = rowOf(ctx.state.invoices, path.id, "invoice");
  if (row.obj.status !== "draft") {
    throw badState(`This invoice is already finalized (${row.obj.status}); only draft invoices can be finalized.`);
  }
  finalize(ctx, row, autoAdvance);
  return renderInvoice(ctx, row);
}

// POST /v1/invoices/:id/send — records invoice.sent (the fake sends no e-mail).
export function sendInvoice(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  const row = rowOf(ctx.state.invoices, path.id, "invoice");
  const o = row.obj;
  if (o.collection_method !== "send_invoice") {
    throw badState("You can only manually send an invoice if its collection method is 'send_invoice'.");
  }
  if (o.status === "void" || o.status === "uncollectible") throw badState(`Invoice ${o.id} is ${o.status} and cannot be sent.`);
  if (o.status === "draft") finalize(ctx, row);
  ctx.emit("invoice.sent", renderInvoice(ctx, row));
  return renderInvoice(ctx, row);
}

// POST /v1/invoices/:id/pay — paid_out_of_band=true, or payment_method (e.g. pm_card_visa).
export function payInvoice(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const outOfBand = p.boolean("paid_out_of_band") ?? false;
  const paymentMethod = p.string("payment_method");
  p.ignore("forgive", "off_session", "mandate");
  if (p.has("source")) throw invalidParam("This local fake has no sources; pass payment_method (e.g. pm_card_visa).", "source");
  p.done();
  if (outOfBand && paymentMethod) {
    throw invalidParam("You may only specify one of these parameters: paid_out_of_band, payment_method.", "payment_method", "parameters_exclusive");
  }
  const row = rowOf(ctx.state.invoices, path.id, "invoice");
  if (row.obj.status === "draft") {
    finalize(ctx, row);
    // A zero invoice is paid by finalizing it.
    if (row.obj.status === "paid") return renderInvoice(ctx, row);
  }
  if (row.obj.status !== "open" && row.obj.status !== "uncollectible") throw notPayable(row.obj);
  if (outOfBand) {
    payOutOfBand(ctx, row);
    return renderInvoice(ctx, row);
  }
  if (!paymentMethod) {
    throw invalidRequest(
      "This invoice's customer has no payment method to charge: pass payment_method (a test id such as pm_card_visa), paid_out_of_band=true, or pay on the hosted_invoice_url page.",
      { param: "payment_method", code: "invoice_no_payment_method" },
    );
  }
  const attempt = payInvoiceWithCard(ctx, row, { paymentMethod });
  if (!attempt.ok) throw attempt.error;
  return renderInvoice(ctx, row);
}

// Recorded as paid outside Stripe: no charge; the remaining amount counts as paid off Stripe.
function payOutOfBand(ctx: Ctx, row: InvoiceRow): void {
  const o = row.obj;
  const amount = o.amount_remaining;
  o.amount_paid += amount;
  o.amount_paid_off_stripe = (o.amount_paid_off_stripe ?? 0) + amount;
  const intent = row.paymentIntentId ? ctx.state.paymentIntents.get(row.paymentIntentId) : undefined;
  const payment = defaultPayment(ctx, row);
  if (intent) cancelPaymentIntent(ctx, intent, "automatic");
  if (payment && payment.obj.status === "open") {
    payment.obj.status = "canceled";
    payment.obj.status_transitions.canceled_at = ctx.now;
  }
  recomputeTotals(ctx.state, row);
  markPaid(ctx, row, false);
}

// POST /v1/invoices/:id/void
export function voidInvoice(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  const row = rowOf(ctx.state.invoices, path.id, "invoice");
  const o = row.obj;
  if (o.status === "draft") throw badState(`Invoice ${o.id} is a draft; delete it instead of voiding it.`);
  if (o.status === "paid") throw badState(`Invoice ${o.id} is paid and cannot be voided; issue a credit note instead.`);
  if (o.status === "void") throw badState(`Invoice ${o.id} is already void.`);
  o.status = "void";
  o.status_transitions.voided_at = ctx.now;
  const intent = row.paymentIntentId ? ctx.state.paymentIntents.get(row.paymentIntentId) : undefined;
  const payment = defaultPayment(ctx, row);
  if (intent) cancelPaymentIntent(ctx, intent, "void_invoice");
  if (payment && payment.obj.status === "open") {
    payment.obj.status = "canceled";
    payment.obj.status_transitions.canceled_at = ctx.now;
  }
  const out = renderInvoice(ctx, row);
  ctx.emit("invoice.voided", out);
  return out;
}

// POST /v1/invoices/:id/mark_uncollectible
export function markUncollectible(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  const row = rowOf(ctx.state.invoices, path.id, "invoice");
  const o = row.obj;
  if (o.status !== "open") throw badState(`Invoice ${o.id} is ${o.status}; only open invoices can be marked uncollectible.`);
  o.status = "uncollectible";
  o.status_transitions.marked_uncollectible_at = ctx.now;
  const out = renderInvoice(ctx, row);
  ctx.emit("invoice.marked_uncollectible", out);
  return out;
}

// The invoice row for the hosted page and the /_fake/ pay route (404 in Stripe's words).
export function invoiceRowOf(ctx: Ctx, id: string): InvoiceRow {
  const row = ctx.state.invoices.get(id);
  if (!row) throw noSuch("invoice", id);
  return row;
}
