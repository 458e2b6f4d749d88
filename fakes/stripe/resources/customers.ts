import { previousAttributes, type Ctx } from "../context";
import { invalidParam } from "../errors";
import { paginate, readListQuery } from "../list";
import { inRange, type Params } from "../params";
import { newestFirst, newId, randomCode, type CustomerObject, type CustomerRow } from "../state";
import { copy, mergeMetadata, newMetadata, readAddress, rowOf } from "./common";

// POST/GET /v1/customers, GET/POST/DELETE /v1/customers/:id

export function renderCustomer(row: CustomerRow): CustomerObject | { id: string; object: "customer"; deleted: true } {
  if (row.deleted) return { id: row.obj.id, object: "customer", deleted: true };
  return copy(row.obj);
}

// The customer row for an id given as a parameter; deleted customers count as missing.
export function liveCustomer(ctx: Ctx, id: string, param = "customer"): CustomerRow {
  const row = rowOf(ctx.state.customers, id, "customer", param);
  if (row.deleted) throw invalidParam(`Customer '${id}' has been deleted.`, param, "resource_missing");
  return row;
}

export function createCustomer(ctx: Ctx, p: Params): object {
  const prefix = p.string("invoice_prefix");
  if (prefix !== undefined && !/^[A-Z0-9]{3,12}$/.test(prefix)) {
    throw invalidParam("Invalid invoice_prefix: use 3 to 12 upper-case letters or digits.", "invoice_prefix");
  }
  const obj: CustomerObject = {
    id: newId("cus", 14),
    object: "customer",
    address: readAddress(p) ?? null,
    balance: p.integer("balance") ?? 0,
    created: ctx.now,
    currency: null,
    default_source: null,
    delinquent: false,
    description: p.string("description") ?? null,
    discount: null,
    email: p.string("email", { maxLength: 512 }) ?? null,
    invoice_prefix: prefix ?? randomCode(8),
    invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
    livemode: false,
    metadata: newMetadata(p.metadata()),
    name: p.string("name", { maxLength: 256 }) ?? null,
    next_invoice_sequence: p.integer("next_invoice_sequence", { min: 1 }) ?? 1,
    phone: p.string("phone", { maxLength: 20 }) ?? null,
    preferred_locales: p.stringArray("preferred_locales") ?? [],
    shipping: null,
    tax_exempt: p.enumOf("tax_exempt", ["none", "exempt", "reverse"] as const) ?? "none",
    test_clock: null,
  };
  p.done();
  const row = ctx.state.add(ctx.state.customers, { obj });
  const out = renderCustomer(row);
  ctx.emit("customer.created", out);
  return out;
}

export function retrieveCustomer(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderCustomer(rowOf(ctx.state.customers, path.id, "customer"));
}

export function updateCustomer(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const row = liveCustomer(ctx, path.id, "id");
  const before = renderCustomer(row);
  const o = row.obj;
  const address = readAddress(p);
  if (address !== undefined) o.address = address;
  const description = p.emptyableString("description");
  if (description !== undefined) o.description = description;
  const email = p.emptyableString("email", { maxLength: 512 });
  if (email !== undefined) o.email = email;
  const name = p.emptyableString("name", { maxLength: 256 });
  if (name !== undefined) o.name = name;
  const phone = p.emptyableString("phone", { maxLength: 20 });
  if (phone !== undefined) o.phone = phone;
  const balance = p.integer("balance");
  if (balance !== undefined) o.balance = balance;
  const prefix = p.string("invoice_prefix");
  if (prefix !== undefined) {
    if (!/^[A-Z0-9]{3,12}$/.test(prefix)) throw invalidParam("Invalid invoice_prefix: use 3 to 12 upper-case letters or digits.", "invoice_prefix");
    o.invoice_prefix = prefix;
  }
  const seq = p.integer("next_invoice_sequence", { min: 1 });
  if (seq !== undefined) o.next_invoice_sequence = seq;
  const locales = p.stringArray("preferred_locales");
  if (locales !== undefined) o.preferred_locales = locales;
  const taxExempt = p.enumOf("tax_exempt", ["none", "exempt", "reverse"] as const);
  if (taxExempt !== undefined) o.tax_exempt = taxExempt;
  o.metadata = mergeMetadata(o.metadata, p.metadata());
  p.done();
  const out = renderCustomer(row);
  const previous = previousAttributes(before, out);
  if (Object.keys(previous).length > 0) ctx.emit("customer.updated", out, previous);
  return out;
}

export function deleteCustomer(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  const row = liveCustomer(ctx, path.id, "id");
  const last = renderCustomer(row);
  row.deleted = true;
  ctx.emit("customer.deleted", last);
  return renderCustomer(row);
}

export function listCustomers(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const email = p.string("email");
  const created = p.range("created");
  p.done();
  const rows = newestFirst([...ctx.state.customers.values()].filter((r) => !r.deleted)).filter(
    (r) => (email === undefined || r.obj.email === email) && inRange(r.obj.created, created),
  );
  return paginate(rows.map((r) => renderCustomer(r) as CustomerObject), q, "/v1/customers");
}
