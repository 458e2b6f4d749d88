import type { Ctx } from "./context";
import { invalidParam, invalidRequest } from "./errors";
import { listOf } from "./list";
import { renderPrice, renderProduct } from "./resources/catalog";
import { checkoutLineItems, renderCheckoutSession } from "./resources/checkout";
import { copy } from "./resources/common";
import { renderCreditNote } from "./resources/credit-notes";
import { renderCustomer } from "./resources/customers";
import { renderInvoiceItem } from "./resources/invoice-items";
import { invoicePaymentsList, renderInvoice } from "./resources/invoices";
import { chargeRefunds, renderCharge, renderInvoicePayment, renderPaymentIntent, renderPaymentMethod } from "./resources/payments";
import { renderRefund } from "./resources/refunds";

// `expand[]`: replaces ids along dotted paths with the objects they name (`customer`,
// `data.customer` on lists, `payments.data.payment.payment_intent`), and adds the fields
// Stripe shows only on request (an invoice's `payments`, a session's `line_items`, a
// charge's `refunds`). At most four levels deep, as in Stripe.

const PATH = /^[a-z_]+(\.[a-z_]+){0,3}$/;

// Checks the shape of the paths before the request runs.
export function readExpand(value: unknown): string[] {
  if (value === undefined) return [];
  const list = Array.isArray(value) ? value : typeof value === "object" && value !== null ? Object.values(value) : [value];
  return list.map((v, i) => {
    if (typeof v !== "string" || !PATH.test(v)) {
      throw invalidParam(`Invalid expand[${i}]: ${JSON.stringify(v)} is not a dotted path of at most four fields.`, `expand[${i}]`);
    }
    return v;
  });
}

export function applyExpand(ctx: Ctx, root: object, paths: string[]): object {
  for (const path of paths) expandNode(ctx, root, path.split("."), path);
  return root;
}

function expandNode(ctx: Ctx, node: unknown, segments: string[], full: string): unknown {
  if (segments.length === 0 || node === null || typeof node !== "object") return node;
  if (Array.isArray(node)) return node.map((n) => expandNode(ctx, n, segments, full));
  const obj = node as Record<string, unknown>;
  const [head, ...rest] = segments;
  let value = obj[head];
  if (value === undefined) {
    value = includable(ctx, obj, head);
    if (value === undefined) throw cannotExpand(full);
  } else if (typeof value === "string") {
    value = renderById(ctx, value);
    if (value === undefined) throw cannotExpand(full);
  } else if (value !== null && typeof value !== "object") {
    throw cannotExpand(full);
  }
  obj[head] = expandNode(ctx, value, rest, full);
  return obj;
}

function cannotExpand(path: string) {
  return invalidRequest(`This property cannot be expanded (${path}).`, { param: "expand" });
}

function includable(ctx: Ctx, obj: Record<string, unknown>, field: string): unknown {
  const id = typeof obj.id === "string" ? obj.id : "";
  if (obj.object === "invoice" && field === "payments") {
    const row = ctx.state.invoices.get(id);
    return row ? invoicePaymentsList(ctx, row) : undefined;
  }
  if (obj.object === "checkout.session" && field === "line_items") {
    const row = ctx.state.checkoutSessions.get(id);
    return row ? checkoutLineItems(row) : undefined;
  }
  if (obj.object === "charge" && field === "refunds") {
    return listOf(chargeRefunds(ctx, id), `/v1/charges/${id}/refunds`);
  }
  return undefined;
}

// The object an id names, rendered as the API shows it; undefined for anything else.
export function renderById(ctx: Ctx, id: string): object | undefined {
  const s = ctx.state;
  const prefix = id.slice(0, id.indexOf("_") + 1);
  switch (prefix) {
    case "cus_": {
      const row = s.customers.get(id);
      return row && renderCustomer(row);
    }
    case "in_": {
      const row = s.invoices.get(id);
      return row && renderInvoice(ctx, row);
    }
    case "ii_": {
      const row = s.invoiceItems.get(id);
      return row && renderInvoiceItem(row);
    }
    case "inpay_": {
      const row = s.invoicePayments.get(id);
      return row && renderInvoicePayment(row);
    }
    case "pi_": {
      const row = s.paymentIntents.get(id);
      return row && renderPaymentIntent(row);
    }
    case "ch_": {
      const row = s.charges.get(id);
      return row && renderCharge(row);
    }
    case "pm_": {
      const row = s.paymentMethods.get(id);
      return row && renderPaymentMethod(row);
    }
    case "re_": {
      const row = s.refunds.get(id);
      return row && renderRefund(row);
    }
    case "cn_": {
      const row = s.creditNotes.get(id);
      return row && renderCreditNote(ctx, row);
    }
    case "cs_": {
      const row = s.checkoutSessions.get(id);
      return row && renderCheckoutSession(ctx, row);
    }
    case "price_": {
      const row = s.prices.get(id);
      return row && renderPrice(row);
    }
    case "prod_": {
      const row = s.products.get(id);
      return row && renderProduct(row);
    }
    case "evt_": {
      const row = s.events.get(id);
      return row && copy(row.obj);
    }
    default:
      return undefined;
  }
}
