import type { Ctx } from "../context";
import { badState, invalidParam } from "../errors";
import { listOf, paginate, readListQuery, type ApiList } from "../list";
import { amountFromDecimal } from "../money";
import { inRange, missing, type Params } from "../params";
import {
  newestFirst,
  newId,
  type CheckoutLineObject,
  type CheckoutSessionCore,
  type CheckoutSessionRow,
  type PriceObject,
  type Row,
} from "../state";
import { readPriceData, renderPrice, storeInlinePrice, type PriceData } from "./catalog";
import { copy, newMetadata, readCurrency, rowOf } from "./common";
import { liveCustomer } from "./customers";
import { attemptPayment, createPaymentIntent, type Attempt, type PaymentSource } from "./payments";

// POST/GET /v1/checkout/sessions, GET /v1/checkout/sessions/:id, POST …/:id/expire,
// GET …/:id/line_items. Minimal: mode=payment with line_items; the session's `url` is the
// fake's hosted checkout page, and paying there completes it (checkout.session.completed).

export type CheckoutSessionWire = CheckoutSessionCore & { url: string | null };

export function renderCheckoutSession(ctx: Ctx, row: CheckoutSessionRow): CheckoutSessionWire {
  return { ...copy(row.obj), url: row.obj.status === "open" ? ctx.link(`/hosted/checkout/${row.obj.id}`) : null };
}

// The session's line items, for `expand[]=line_items`.
export function checkoutLineItems(row: CheckoutSessionRow): ApiList<CheckoutLineObject> {
  return listOf(row.lineItems.map(copy), `/v1/checkout/sessions/${row.obj.id}/line_items`);
}

type LineInput = { price: string; quantity: number } | { data: PriceData; quantity: number };

const DAY = 86_400;

// POST /v1/checkout/sessions
export function createCheckoutSession(ctx: Ctx, p: Params): object {
  const mode = p.enumOf("mode", ["payment", "setup", "subscription"] as const);
  if (!mode) throw missing("mode");
  if (mode !== "payment") throw invalidParam("This local fake supports mode=payment only.", "mode");
  const lineParams = p.objectArray("line_items");
  if (!lineParams || lineParams.length === 0) throw missing("line_items");
  const inputs: LineInput[] = lineParams.map((lp, i) => {
    const price = lp.id("price", ["price_"]);
    const priceData = lp.object("price_data");
    const quantity = lp.integer("quantity", { min: 1 });
    lp.ignore("adjustable_quantity", "metadata");
    if (lp.has("tax_rates")) throw invalidParam("This local fake has no tax rates.", `line_items[${i}][tax_rates]`);
    lp.done();
    if (quantity === undefined) throw missing(`line_items[${i}][quantity]`);
    if (price && priceData) throw invalidParam("You may only specify one of these parameters: price, price_data.", `line_items[${i}][price]`);
    if (price) {
      rowOf(ctx.state.prices, price, "price", `line_items[${i}][price]`);
      return { price, quantity };
    }
    if (priceData) return { data: readPriceData(ctx, priceData, { allowProductData: true }), quantity };
    throw missing(`line_items[${i}][price]`);
  });
  const customerId = p.id("customer", ["cus_"]);
  const customerEmail = p.string("customer_email", { maxLength: 512 });
  const clientReference = p.string("client_reference_id", { maxLength: 200 }) ?? null;
  const successUrl = p.string("success_url", { maxLength: 5000 }) ?? null;
  const cancelUrl = p.string("cancel_url", { maxLength: 5000 }) ?? null;
  const metadata = newMetadata(p.metadata());
  const currency = readCurrency(p);
  const expiresAt = p.integer("expires_at");
  const methodTypes = p.stringArray("payment_method_types");
  const intentData = p.object("payment_intent_data");
  const intentDescription = intentData?.string("description") ?? null;
  const intentMetadata = newMetadata(intentData?.metadata());
  intentData?.ignore("receipt_email", "statement_descriptor", "statement_descriptor_suffix");
  intentData?.done();
  p.ignore("locale", "submit_type", "billing_address_collection", "customer_creation", "ui_mode", "allow_promotion_codes");
  p.done();
  if (customerId && customerEmail) {
    throw invalidParam("You may only specify one of these parameters: customer, customer_email.", "customer_email", "parameters_exclusive");
  }
  if (methodTypes && methodTypes.some((t) => t !== "card")) {
    throw invalidParam("This local fake takes card payments only; use payment_method_types[]=card.", "payment_method_types");
  }
  if (expiresAt !== undefined && (expiresAt < ctx.now + 1800 || expiresAt > ctx.now + DAY)) {
    throw invalidParam("expires_at must be between 30 minutes and 24 hours from now.", "expires_at");
  }
  const customer = customerId ? liveCustomer(ctx, customerId) : undefined;

  const prices: Row<PriceObject>[] = inputs.map((input) =>
    "price" in input ? ctx.state.prices.get(input.price)! : storeInlinePrice(ctx, input.data),
  );
  const lineCurrency = prices[0].obj.currency;
  if (prices.some((pr) => pr.obj.currency !== lineCurrency)) {
    throw invalidParam("All line_items must have prices in the same currency.", "line_items");
  }
  if (currency && currency !== lineCurrency) {
    throw invalidParam(`currency (${currency}) differs from the line items' (${lineCurrency}).`, "currency");
  }
  const lineItems: CheckoutLineObject[] = inputs.map((input, i) => {
    const price = prices[i].obj;
    const product = ctx.state.products.get(price.product as string);
    const amount = amountFromDecimal(price.unit_amount_decimal ?? "0", input.quantity);
    return {
      id: newId("li"),
      object: "item",
      adjustable_quantity: null,
      amount_discount: 0,
      amount_subtotal: amount,
      amount_tax: 0,
      amount_total: amount,
      currency: lineCurrency,
      description: product?.obj.name ?? null,
      discounts: [],
      metadata: {},
      price: renderPrice(prices[i]),
      quantity: input.quantity,
      taxes: [],
    };
  });
  const total = lineItems.reduce((s, l) => s + l.amount_total, 0);
  const id = newId("cs_test", 58);
  const obj: CheckoutSessionCore = {
    id,
    object: "checkout.session",
    adaptive_pricing: null,
    after_expiration: null,
    allow_promotion_codes: null,
    allowed_payment_method_types: null,
    amount_subtotal: total,
    amount_total: total,
    automatic_tax: { enabled: false, liability: null, provider: null, status: null },
    billing_address_collection: null,
    cancel_url: cancelUrl,
    client_reference_id: clientReference,
    client_secret: null,
    collected_information: null,
    consent: null,
    consent_collection: null,
    created: ctx.now,
    currency: lineCurrency,
    currency_conversion: null,
    custom_fields: [],
    custom_text: { after_submit: null, shipping_address: null, submit: null, terms_of_service_acceptance: null },
    customer: customerId ?? null,
    customer_account: null,
    customer_creation: customerId ? null : "if_required",
    customer_details: null,
    customer_email: customerEmail ?? customer?.obj.email ?? null,
    discounts: [],
    expires_at: expiresAt ?? ctx.now + DAY,
    integration_identifier: null,
    invoice: null,
    invoice_creation: null,
    livemode: false,
    locale: null,
    managed_payments: null,
    metadata,
    mode: "payment",
    origin_context: null,
    payment_intent: null,
    payment_link: null,
    payment_method_collection: "if_required",
    payment_method_configuration_details: null,
    payment_method_options: {},
    payment_method_types: ["card"],
    payment_status: "unpaid",
    permissions: null,
    recovered_from: null,
    saved_payment_method_options: null,
    setup_intent: null,
    shipping_address_collection: null,
    shipping_cost: null,
    shipping_options: [],
    status: "open",
    submit_type: null,
    subscription: null,
    success_url: successUrl,
    total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
    ui_mode: "hosted_page",
    wallet_options: null,
  };
  const row = ctx.state.add<CheckoutSessionCore, CheckoutSessionRow>(ctx.state.checkoutSessions, {
    obj,
    lineItems,
    intentData: { description: intentDescription, metadata: intentMetadata },
  });
  return renderCheckoutSession(ctx, row);
}

/**
 * Pays an open session with a card: success completes it (payment_status paid,
 * checkout.session.completed); a decline leaves it open for another try.
 */
export function completeCheckoutSession(ctx: Ctx, row: CheckoutSessionRow, source: PaymentSource): Attempt {
  const o = row.obj;
  if (o.status !== "open") return { ok: false, error: badState(`Checkout session ${o.id} is ${o.status}.`), charge: null };
  if (ctx.now >= o.expires_at) return { ok: false, error: badState(`Checkout session ${o.id} has expired.`), charge: null };
  let intent = typeof o.payment_intent === "string" ? ctx.state.paymentIntents.get(o.payment_intent) : undefined;
  if (!intent) {
    intent = createPaymentIntent(ctx, {
      amount: o.amount_total ?? 0,
      currency: o.currency ?? ctx.config.defaultCurrency,
      customer: typeof o.customer === "string" ? o.customer : null,
      description: row.intentData.description,
      metadata: { ...row.intentData.metadata },
    });
    o.payment_intent = intent.obj.id;
  }
  const attempt = attemptPayment(ctx, intent, source);
  if (!attempt.ok) return attempt;
  const customer = typeof o.customer === "string" ? ctx.state.customers.get(o.customer) : undefined;
  o.status = "complete";
  o.payment_status = "paid";
  o.customer_details = {
    address: customer?.obj.address ?? null,
    business_name: null,
    email: o.customer_email ?? customer?.obj.email ?? null,
    individual_name: null,
    name: customer?.obj.name ?? null,
    phone: customer?.obj.phone ?? null,
    tax_exempt: "none",
    tax_ids: [],
  };
  ctx.emit("checkout.session.completed", renderCheckoutSession(ctx, row));
  return attempt;
}

// Where the payer goes after paying: success_url with {CHECKOUT_SESSION_ID} filled in (Stripe's template variable).
export function successLink(row: CheckoutSessionRow): string | null {
  return row.obj.success_url ? row.obj.success_url.replaceAll("{CHECKOUT_SESSION_ID}", row.obj.id) : null;
}

// GET /v1/checkout/sessions/:id
export function retrieveCheckoutSession(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderCheckoutSession(ctx, rowOf(ctx.state.checkoutSessions, path.id, "checkout.session"));
}

// POST /v1/checkout/sessions/:id/expire
export function expireCheckoutSession(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  const row = rowOf(ctx.state.checkoutSessions, path.id, "checkout.session");
  if (row.obj.status !== "open") throw badState(`Only open sessions can be expired; checkout session ${row.obj.id} is ${row.obj.status}.`);
  row.obj.status = "expired";
  const out = renderCheckoutSession(ctx, row);
  ctx.emit("checkout.session.expired", out);
  return out;
}

// GET /v1/checkout/sessions (customer, payment_intent, status, created)
export function listCheckoutSessions(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const customer = p.string("customer");
  const intent = p.string("payment_intent");
  const status = p.enumOf("status", ["open", "complete", "expired"] as const);
  const created = p.range("created");
  p.done();
  const rows = newestFirst(ctx.state.checkoutSessions.values()).filter(
    (r) =>
      (customer === undefined || r.obj.customer === customer) &&
      (intent === undefined || r.obj.payment_intent === intent) &&
      (status === undefined || r.obj.status === status) &&
      inRange(r.obj.created, created),
  );
  return paginate(
    rows.map((r) => renderCheckoutSession(ctx, r as CheckoutSessionRow)),
    q,
    "/v1/checkout/sessions",
  );
}

// GET /v1/checkout/sessions/:id/line_items
export function listCheckoutLineItems(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const q = readListQuery(p);
  p.done();
  const row = rowOf(ctx.state.checkoutSessions, path.id, "checkout.session");
  return paginate(row.lineItems.map(copy), q, `/v1/checkout/sessions/${row.obj.id}/line_items`);
}
