import type { Ctx } from "../context";
import { badState, invalidParam } from "../errors";
import { paginate, readListQuery } from "../list";
import { amountFromDecimal } from "../money";
import { inRange, missing, type Params } from "../params";
import { newestFirst, newId, type InvoiceItemObject, type InvoiceRow, type Row, type WirePricing } from "../state";
import { readPriceData, storeInlinePrice, type PriceData } from "./catalog";
import { copy, mergeMetadata, newMetadata, readCurrency, rowOf } from "./common";
import { liveCustomer } from "./customers";
import { recomputeTotals } from "./invoice-math";

// POST/GET /v1/invoiceitems, GET/POST/DELETE /v1/invoiceitems/:id
// An item is priced in one of four ways: `amount` (+ `currency`), `pricing[price]` + `quantity`,
// `price_data` + `quantity`, or `unit_amount_decimal` (+ `currency`) + `quantity`.

export function renderInvoiceItem(row: Row<InvoiceItemObject>): InvoiceItemObject {
  return copy(row.obj);
}

type Pricing =
  | { kind: "amount"; amount: number; currency?: string }
  | { kind: "price"; price: string; quantity: number }
  | { kind: "price_data"; data: PriceData; quantity: number }
  | { kind: "unit"; unitAmountDecimal: string; quantity: number; currency?: string };

const PRICING_HELP =
  "Price an invoice item with amount (and currency), pricing[price] with quantity, price_data with quantity, or unit_amount_decimal with quantity.";

function readPricing(ctx: Ctx, p: Params): Pricing {
  const amount = p.integer("amount");
  const currency = readCurrency(p);
  const pricing = p.object("pricing");
  const price = pricing?.id("price", ["price_"]);
  pricing?.done();
  const priceDataParams = p.object("price_data");
  const unit = p.decimal("unit_amount_decimal");
  const quantity = p.integer("quantity", { min: 0 });
  const given = [amount !== undefined, price !== undefined, priceDataParams !== undefined, unit !== undefined].filter(Boolean).length;
  if (given === 0) throw missing("amount");
  if (given > 1) throw invalidParam(`You may only specify one way of pricing. ${PRICING_HELP}`, "amount", "parameters_exclusive");
  if (amount !== undefined) {
    if (quantity !== undefined && quantity !== 1) {
      throw invalidParam(`quantity cannot be combined with amount (amount is the line's total). ${PRICING_HELP}`, "quantity", "parameters_exclusive");
    }
    return { kind: "amount", amount, currency };
  }
  if (price !== undefined) {
    if (currency !== undefined) throw invalidParam("currency comes from the price; leave it out with pricing[price].", "currency");
    const row = rowOf(ctx.state.prices, price, "price", "pricing[price]");
    if (row.obj.type !== "one_time") throw invalidParam(`The price ${price} is not a one-time price.`, "pricing[price]");
    return { kind: "price", price, quantity: quantity ?? 1 };
  }
  if (priceDataParams !== undefined) {
    if (currency !== undefined) throw invalidParam("currency goes inside price_data.", "currency");
    return { kind: "price_data", data: readPriceData(ctx, priceDataParams, { allowProductData: false }), quantity: quantity ?? 1 };
  }
  return { kind: "unit", unitAmountDecimal: unit!, quantity: quantity ?? 1, currency };
}

function readPeriod(p: Params, now: number): { start: number; end: number } {
  const period = p.object("period");
  if (!period) return { start: now, end: now };
  const start = period.requiredInteger("start", { min: 0 });
  const end = period.requiredInteger("end", { min: 0 });
  period.done();
  if (end < start) throw invalidParam("period[end] must not be before period[start].", "period[end]");
  return { start, end };
}

// POST /v1/invoiceitems
export function createInvoiceItem(ctx: Ctx, p: Params): object {
  const customerId = p.id("customer", ["cus_"]);
  const invoiceId = p.id("invoice", ["in_"]);
  const description = p.string("description") ?? null;
  const metadata = newMetadata(p.metadata());
  const discountable = p.boolean("discountable");
  const taxRates = p.stringArray("tax_rates");
  if (taxRates && taxRates.length > 0) throw invalidParam("This local fake has no tax rates; leave out tax_rates.", "tax_rates");
  const pricing = readPricing(ctx, p);
  const period = readPeriod(p, ctx.now);
  p.done();

  let invoice: InvoiceRow | undefined;
  if (invoiceId) {
    invoice = rowOf(ctx.state.invoices, invoiceId, "invoice", "invoice");
    if (invoice.obj.status !== "draft") {
      throw badState(`You can only add invoice items to draft invoices; invoice ${invoiceId} is ${invoice.obj.status}.`, "invoice_not_editable");
    }
    if (customerId && customerId !== invoice.obj.customer) {
      throw invalidParam(`The invoice ${invoiceId} belongs to another customer than ${customerId}.`, "customer");
    }
  }
  const customer = customerId ?? (invoice?.obj.customer as string | undefined);
  if (!customer) throw missing("customer");
  const customerRow = liveCustomer(ctx, customer);

  let amount: number;
  let quantity: number;
  let currency: string;
  let wirePricing: WirePricing | null;
  const fallbackCurrency = invoice?.obj.currency ?? customerRow.obj.currency ?? ctx.config.defaultCurrency;
  switch (pricing.kind) {
    case "amount":
      amount = pricing.amount;
      quantity = 1;
      currency = pricing.currency ?? fallbackCurrency;
      wirePricing = { type: "price_details", unit_amount_decimal: String(pricing.amount) };
      break;
    case "unit":
      amount = amountFromDecimal(pricing.unitAmountDecimal, pricing.quantity);
      quantity = pricing.quantity;
      currency = pricing.currency ?? fallbackCurrency;
      wirePricing = { type: "price_details", unit_amount_decimal: pricing.unitAmountDecimal };
      break;
    case "price":
    case "price_data": {
      const price = pricing.kind === "price" ? ctx.state.prices.get(pricing.price)! : storeInlinePrice(ctx, pricing.data);
      amount = amountFromDecimal(price.obj.unit_amount_decimal ?? "0", pricing.quantity);
      quantity = pricing.quantity;
      currency = price.obj.currency;
      wirePricing = {
        type: "price_details",
        price_details: { price: price.obj.id, product: price.obj.product as string },
        unit_amount_decimal: price.obj.unit_amount_decimal,
      };
      break;
    }
  }
  if (invoice && currency !== invoice.obj.currency) {
    throw invalidParam(`The item's currency (${currency}) differs from the invoice's (${invoice.obj.currency}).`, "currency");
  }

  const obj: InvoiceItemObject = {
    id: newId("ii"),
    object: "invoiceitem",
    amount,
    currency,
    customer,
    customer_account: null,
    date: ctx.now,
    description,
    discountable: discountable ?? amount >= 0,
    discounts: [],
    invoice: invoice ? invoice.obj.id : null,
    livemode: false,
    metadata,
    net_amount: amount,
    parent: null,
    period,
    pricing: wirePricing,
    proration: false,
    quantity,
    quantity_decimal: String(quantity),
    tax_rates: [],
    test_clock: null,
  };
  const row = ctx.state.add(ctx.state.invoiceItems, { obj });
  if (invoice) {
    invoice.itemIds.push(obj.id);
    recomputeTotals(ctx.state, invoice);
  }
  const out = renderInvoiceItem(row);
  ctx.emit("invoiceitem.created", out);
  return out;
}

// The item, if it may still change: pending, or on a draft invoice.
function editableItem(ctx: Ctx, id: string): { row: Row<InvoiceItemObject>; invoice: InvoiceRow | undefined } {
  const row = rowOf(ctx.state.invoiceItems, id, "invoiceitem");
  const invoice = row.obj.invoice ? ctx.state.invoices.get(row.obj.invoice as string) : undefined;
  if (invoice && invoice.obj.status !== "draft") {
    throw badState(
      `The invoice item ${id} is on invoice ${invoice.obj.id}, which is ${invoice.obj.status}; only items of draft invoices can change.`,
      "invoice_not_editable",
    );
  }
  return { row, invoice };
}

// POST /v1/invoiceitems/:id (description, metadata, amount, quantity, period)
export function updateInvoiceItem(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const description = p.emptyableString("description");
  const metadata = p.metadata();
  const amount = p.integer("amount");
  const quantity = p.integer("quantity", { min: 0 });
  const periodGiven = p.has("period");
  const period = periodGiven ? readPeriod(p, ctx.now) : undefined;
  p.done();
  const { row, invoice } = editableItem(ctx, path.id);
  const o = row.obj;
  if (amount !== undefined) {
    if (o.pricing?.price_details || o.quantity !== 1 || (quantity !== undefined && quantity !== 1)) {
      throw invalidParam("This item is priced per unit (a price or a quantity); change quantity instead of amount.", "amount");
    }
    o.amount = amount;
    o.net_amount = amount;
    o.pricing = { type: "price_details", unit_amount_decimal: String(amount) };
  } else if (quantity !== undefined) {
    o.quantity = quantity;
    o.quantity_decimal = String(quantity);
    o.amount = amountFromDecimal(o.pricing?.unit_amount_decimal ?? String(o.amount), quantity);
    o.net_amount = o.amount;
  }
  if (description !== undefined) o.description = description;
  if (period) o.period = period;
  o.metadata = mergeMetadata(o.metadata, metadata);
  if (invoice) recomputeTotals(ctx.state, invoice);
  return renderInvoiceItem(row);
}

// DELETE /v1/invoiceitems/:id
export function deleteInvoiceItem(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  const { row, invoice } = editableItem(ctx, path.id);
  const last = renderInvoiceItem(row);
  ctx.state.invoiceItems.delete(row.obj.id);
  if (invoice) {
    invoice.itemIds = invoice.itemIds.filter((id) => id !== row.obj.id);
    recomputeTotals(ctx.state, invoice);
  }
  ctx.emit("invoiceitem.deleted", last);
  return { id: row.obj.id, object: "invoiceitem", deleted: true };
}

// GET /v1/invoiceitems/:id
export function retrieveInvoiceItem(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderInvoiceItem(rowOf(ctx.state.invoiceItems, path.id, "invoiceitem"));
}

// GET /v1/invoiceitems (customer, invoice, pending, created)
export function listInvoiceItems(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const customer = p.string("customer");
  const invoice = p.string("invoice");
  const pending = p.boolean("pending");
  const created = p.range("created");
  p.done();
  const rows = newestFirst(ctx.state.invoiceItems.values(), (o) => o.date).filter(
    (r) =>
      (customer === undefined || r.obj.customer === customer) &&
      (invoice === undefined || r.obj.invoice === invoice) &&
      (pending === undefined || (r.obj.invoice === null) === pending) &&
      inRange(r.obj.date, created),
  );
  return paginate(rows.map(renderInvoiceItem), q, "/v1/invoiceitems");
}
