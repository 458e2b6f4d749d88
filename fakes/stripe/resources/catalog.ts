import type { Ctx } from "../context";
import { invalidParam } from "../errors";
import { paginate, readListQuery } from "../list";
import { missing, normaliseDecimal, type Params } from "../params";
import { newestFirst, newId, type PriceObject, type ProductObject, type Row } from "../state";
import { copy, newMetadata, readCurrency, rowOf } from "./common";

// Products and one-time prices: just enough for `pricing[price]` on invoice items and
// `line_items[][price]` on Checkout sessions.

export function renderProduct(row: Row<ProductObject>): ProductObject {
  return copy(row.obj);
}

export function renderPrice(row: Row<PriceObject>): PriceObject {
  return copy(row.obj);
}

function newProduct(ctx: Ctx, name: string, description: string | null, metadata: Record<string, string>): Row<ProductObject> {
  const obj: ProductObject = {
    id: newId("prod", 14),
    object: "product",
    active: true,
    created: ctx.now,
    default_price: null,
    description,
    images: [],
    livemode: false,
    marketing_features: [],
    metadata,
    name,
    package_dimensions: null,
    shippable: null,
    statement_descriptor: null,
    tax_code: null,
    tax_details: null,
    type: "service",
    unit_label: null,
    updated: ctx.now,
    url: null,
  };
  return ctx.state.add(ctx.state.products, { obj });
}

// POST /v1/products
export function createProduct(ctx: Ctx, p: Params): object {
  const name = p.requiredString("name", { maxLength: 250 });
  const description = p.string("description") ?? null;
  const metadata = newMetadata(p.metadata());
  p.ignore("active");
  p.done();
  const out = renderProduct(newProduct(ctx, name, description, metadata));
  ctx.emit("product.created", out);
  return out;
}

// GET /v1/products/:id
export function retrieveProduct(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderProduct(rowOf(ctx.state.products, path.id, "product"));
}

// GET /v1/products
export function listProducts(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const active = p.boolean("active");
  p.done();
  const rows = newestFirst(ctx.state.products.values()).filter((r) => active === undefined || r.obj.active === active);
  return paginate(rows.map(renderProduct), q, "/v1/products");
}

interface PriceInput {
  currency: string;
  product: string;
  unitAmountDecimal: string;
  active: boolean;
  nickname: string | null;
  lookupKey: string | null;
  metadata: Record<string, string>;
}

function newPrice(ctx: Ctx, input: PriceInput): Row<PriceObject> {
  const whole = /^-?\d+$/.test(input.unitAmountDecimal) ? Number(input.unitAmountDecimal) : null;
  const obj: PriceObject = {
    id: newId("price", 24),
    object: "price",
    active: input.active,
    billing_scheme: "per_unit",
    created: ctx.now,
    currency: input.currency,
    custom_unit_amount: null,
    livemode: false,
    lookup_key: input.lookupKey,
    metadata: input.metadata,
    nickname: input.nickname,
    product: input.product,
    recurring: null,
    tax_behavior: "unspecified",
    tiers_mode: null,
    transform_quantity: null,
    type: "one_time",
    unit_amount: whole,
    unit_amount_decimal: input.unitAmountDecimal,
  };
  return ctx.state.add(ctx.state.prices, { obj });
}

// Reads `unit_amount` or `unit_amount_decimal` (one of them is required).
function readUnitAmount(p: Params): string {
  const amount = p.integer("unit_amount", { min: 0 });
  const decimal = p.decimal("unit_amount_decimal");
  if (amount !== undefined && decimal !== undefined) {
    throw invalidParam("You may only specify one of these parameters: unit_amount, unit_amount_decimal.", p.nameOf("unit_amount"));
  }
  if (amount !== undefined) return String(amount);
  if (decimal !== undefined) {
    if (decimal.startsWith("-")) throw invalidParam("Invalid unit_amount_decimal: must not be negative.", p.nameOf("unit_amount_decimal"));
    return decimal;
  }
  throw missing(p.nameOf("unit_amount"));
}

// POST /v1/prices (one-time prices only)
export function createPrice(ctx: Ctx, p: Params): object {
  const currency = readCurrency(p);
  if (!currency) throw missing("currency");
  const unitAmountDecimal = readUnitAmount(p);
  if (p.has("recurring")) {
    throw invalidParam("This local fake supports one-time prices only; leave out recurring.", "recurring");
  }
  const product = readProductRef(ctx, p);
  const active = p.boolean("active") ?? true;
  const nickname = p.string("nickname") ?? null;
  const lookupKey = p.string("lookup_key", { maxLength: 200 }) ?? null;
  const metadata = newMetadata(p.metadata());
  p.ignore("tax_behavior");
  p.done();
  const row = newPrice(ctx, { currency, product: productId(ctx, product), unitAmountDecimal, active, nickname, lookupKey, metadata });
  const out = renderPrice(row);
  ctx.emit("price.created", out);
  return out;
}

export type ProductRef = { id: string } | { name: string; description: string | null; metadata: Record<string, string> };

// `product` (an existing id) or `product_data` (a product to create), read but not yet created.
function readProductRef(ctx: Ctx, p: Params, allowProductData = true): ProductRef {
  const product = p.id("product", ["prod_"]);
  const productData = allowProductData ? p.object("product_data") : undefined;
  if (product && productData) throw invalidParam("You may only specify one of these parameters: product, product_data.", p.nameOf("product"));
  if (product) {
    rowOf(ctx.state.products, product, "product", p.nameOf("product"));
    return { id: product };
  }
  if (productData) {
    const name = productData.requiredString("name", { maxLength: 250 });
    const description = productData.string("description") ?? null;
    const metadata = newMetadata(productData.metadata());
    productData.done();
    return { name, description, metadata };
  }
  throw missing(p.nameOf("product"));
}

function productId(ctx: Ctx, ref: ProductRef): string {
  return "id" in ref ? ref.id : newProduct(ctx, ref.name, ref.description, ref.metadata).obj.id;
}

// GET /v1/prices/:id
export function retrievePrice(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderPrice(rowOf(ctx.state.prices, path.id, "price"));
}

// GET /v1/prices
export function listPrices(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const product = p.string("product");
  const active = p.boolean("active");
  const currency = readCurrency(p);
  p.done();
  const rows = newestFirst(ctx.state.prices.values()).filter(
    (r) =>
      (product === undefined || r.obj.product === product) &&
      (active === undefined || r.obj.active === active) &&
      (currency === undefined || r.obj.currency === currency),
  );
  return paginate(rows.map(renderPrice), q, "/v1/prices");
}

/** A `price_data` hash, checked but not yet stored. */
export interface PriceData {
  currency: string;
  product: ProductRef;
  unitAmountDecimal: string;
}

// Reads `price_data` (currency, product or product_data, unit_amount or unit_amount_decimal).
export function readPriceData(ctx: Ctx, p: Params, options: { allowProductData: boolean }): PriceData {
  const currency = readCurrency(p);
  if (!currency) throw missing(p.nameOf("currency"));
  const product = readProductRef(ctx, p, options.allowProductData);
  const unitAmountDecimal = readUnitAmount(p);
  p.ignore("tax_behavior");
  p.done();
  return { currency, product, unitAmountDecimal };
}

// Like Stripe, `price_data` becomes an inactive price of its own that the item refers to.
export function storeInlinePrice(ctx: Ctx, data: PriceData): Row<PriceObject> {
  return newPrice(ctx, {
    currency: data.currency,
    product: productId(ctx, data.product),
    unitAmountDecimal: normaliseDecimal(data.unitAmountDecimal),
    active: false,
    nickname: null,
    lookupKey: null,
    metadata: {},
  });
}
