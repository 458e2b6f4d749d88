import * as catalog from "./resources/catalog";
import * as checkout from "./resources/checkout";
import type { Handler } from "./resources/common";
import * as creditNotes from "./resources/credit-notes";
import * as customers from "./resources/customers";
import * as events from "./resources/events";
import * as items from "./resources/invoice-items";
import * as invoices from "./resources/invoices";
import * as payments from "./resources/payments";
import * as refunds from "./resources/refunds";

// The part of Stripe's v1 API the fake serves.

export type Method = "GET" | "POST" | "DELETE";

interface Route {
  method: Method;
  segments: string[];
  handler: Handler;
}

const table: [Method, string, Handler][] = [
  ["POST", "/v1/customers", customers.createCustomer],
  ["GET", "/v1/customers", customers.listCustomers],
  ["GET", "/v1/customers/:id", customers.retrieveCustomer],
  ["POST", "/v1/customers/:id", customers.updateCustomer],
  ["DELETE", "/v1/customers/:id", customers.deleteCustomer],

  ["POST", "/v1/products", catalog.createProduct],
  ["GET", "/v1/products", catalog.listProducts],
  ["GET", "/v1/products/:id", catalog.retrieveProduct],
  ["POST", "/v1/prices", catalog.createPrice],
  ["GET", "/v1/prices", catalog.listPrices],
  ["GET", "/v1/prices/:id", catalog.retrievePrice],

  ["POST", "/v1/invoiceitems", items.createInvoiceItem],
  ["GET", "/v1/invoiceitems", items.listInvoiceItems],
  ["GET", "/v1/invoiceitems/:id", items.retrieveInvoiceItem],
  ["POST", "/v1/invoiceitems/:id", items.updateInvoiceItem],
  ["DELETE", "/v1/invoiceitems/:id", items.deleteInvoiceItem],

  ["POST", "/v1/invoices", invoices.createInvoice],
  ["GET", "/v1/invoices", invoices.listInvoices],
  ["GET", "/v1/invoices/:id", invoices.retrieveInvoice],
  ["POST", "/v1/invoices/:id", invoices.updateInvoice],
  ["DELETE", "/v1/invoices/:id", invoices.deleteInvoice],
  ["GET", "/v1/invoices/:id/lines", invoices.listInvoiceLines],
  ["POST", "/v1/invoices/:id/finalize", invoices.finalizeInvoice],
  ["POST", "/v1/invoices/:id/send", invoices.sendInvoice],
  ["POST", "/v1/invoices/:id/pay", invoices.payInvoice],
  ["POST", "/v1/invoices/:id/void", invoices.voidInvoice],
  ["POST", "/v1/invoices/:id/mark_uncollectible", invoices.markUncollectible],

  ["GET", "/v1/invoice_payments", payments.listInvoicePayments],
  ["GET", "/v1/invoice_payments/:id", payments.retrieveInvoicePayment],
  ["GET", "/v1/payment_intents", payments.listPaymentIntents],
  ["GET", "/v1/payment_intents/:id", payments.retrievePaymentIntent],
  ["GET", "/v1/charges", payments.listCharges],
  ["GET", "/v1/charges/:id", payments.retrieveCharge],
  ["GET", "/v1/payment_methods/:id", payments.retrievePaymentMethod],

  ["POST", "/v1/refunds", refunds.createRefund],
  ["GET", "/v1/refunds", refunds.listRefunds],
  ["GET", "/v1/refunds/:id", refunds.retrieveRefund],

  ["POST", "/v1/credit_notes", creditNotes.createCreditNote],
  ["GET", "/v1/credit_notes", creditNotes.listCreditNotes],
  ["GET", "/v1/credit_notes/:id", creditNotes.retrieveCreditNote],
  ["POST", "/v1/credit_notes/:id", creditNotes.updateCreditNote],
  ["POST", "/v1/credit_notes/:id/void", creditNotes.voidCreditNote],
  ["GET", "/v1/credit_notes/:id/lines", creditNotes.listCreditNoteLines],

  ["POST", "/v1/checkout/sessions", checkout.createCheckoutSession],
  ["GET", "/v1/checkout/sessions", checkout.listCheckoutSessions],
  ["GET", "/v1/checkout/sessions/:id", checkout.retrieveCheckoutSession],
  ["POST", "/v1/checkout/sessions/:id/expire", checkout.expireCheckoutSession],
  ["GET", "/v1/checkout/sessions/:id/line_items", checkout.listCheckoutLineItems],

  ["GET", "/v1/events", events.listEvents],
  ["GET", "/v1/events/:id", events.retrieveEvent],
];

const routes: Route[] = table.map(([method, pattern, handler]) => ({ method, segments: pattern.split("/").slice(1), handler }));

// Names that would otherwise be taken for ids (`/v1/invoices/search` is not invoice "search").
const RESERVED = new Set(["search", "create_preview", "preview", "upcoming"]);

/** The handler for a request and the values of its `:id` segments, or null when there is none. */
export function matchRoute(method: string, pathname: string): { handler: Handler; path: Record<string, string> } | null {
  const parts = pathname.split("/").slice(1).map(safeDecode);
  for (const route of routes) {
    if (route.method !== method || route.segments.length !== parts.length) continue;
    const path: Record<string, string> = {};
    let ok = true;
    for (let i = 0; i < parts.length && ok; i++) {
      const seg = route.segments[i];
      if (seg.startsWith(":")) {
        if (parts[i] === "" || RESERVED.has(parts[i])) ok = false;
        else path[seg.slice(1)] = parts[i];
      } else ok = seg === parts[i];
    }
    if (ok) return { handler: route.handler, path };
  }
  return null;
}

function safeDecode(segment: string): string {
  try {
    return decodeURIComponent(segment);
  } catch {
    return segment;
  }
}
