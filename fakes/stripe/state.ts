import { randomBytes } from "node:crypto";
import type Stripe from "stripe";
import type { Decline } from "./cards";

// The fake's whole state: one map per resource, each row the object as the API shows it plus
// the few facts the API does not show. Plain JSON throughout, so it can be written to a file.

export interface Row<T> {
  /** Creation order across all resources; breaks ties between objects created in one second. */
  seq: number;
  obj: T;
}

// On the wire Stripe sends decimals as strings; the SDK turns them into its Decimal class.
export interface WirePricing {
  type: "price_details";
  price_details?: { price: string; product: string };
  unit_amount_decimal: string | null;
}

export type CustomerObject = Stripe.Customer;
export interface CustomerRow extends Row<CustomerObject> {
  deleted?: true;
}
export type ProductObject = Stripe.Product;
export type PriceObject = Omit<Stripe.Price, "unit_amount_decimal"> & { unit_amount_decimal: string | null };
export type InvoiceItemObject = Omit<Stripe.InvoiceItem, "quantity_decimal" | "pricing"> & {
  quantity_decimal: string;
  pricing: WirePricing | null;
};
export type InvoiceLineObject = Omit<Stripe.InvoiceLineItem, "quantity_decimal" | "pricing"> & {
  quantity_decimal: string | null;
  pricing: WirePricing | null;
};
/** An invoice without its computed parts (lines, payments, hosted links). */
export type InvoiceCore = Omit<Stripe.Invoice, "lines" | "payments" | "hosted_invoice_url" | "invoice_pdf">;
export interface InvoiceRow extends Row<InvoiceCore> {
  daysUntilDue: number | null;
  /** Invoice items on this invoice, in the order they were added. */
  itemIds: string[];
  /** The payment intent made at finalization, which every card attempt uses. */
  paymentIntentId: string | null;
  invoicePaymentIds: string[];
}
export type InvoicePaymentObject = Stripe.InvoicePayment;
export type PaymentIntentObject = Stripe.PaymentIntent;
export type ChargeObject = Omit<Stripe.Charge, "refunds">;
export type PaymentMethodObject = Stripe.PaymentMethod;
export interface PaymentMethodRow extends Row<PaymentMethodObject> {
  /** What charging this card does; the card number itself is never kept. */
  decline: Decline | null;
}
export type RefundObject = Stripe.Refund;
export type CreditNoteLineObject = Omit<Stripe.CreditNoteLineItem, "unit_amount_decimal"> & { unit_amount_decimal: string | null };
export type CreditNoteCore = Omit<Stripe.CreditNote, "lines" | "pdf">;
export interface CreditNoteRow extends Row<CreditNoteCore> {
  lines: CreditNoteLineObject[];
  /** The part credited to the customer balance (credit_amount), undone by voiding. */
  creditAmount: number;
}
export type CheckoutLineObject = Omit<Stripe.LineItem, "price"> & { price: PriceObject | null };
export type CheckoutSessionCore = Omit<Stripe.Checkout.Session, "line_items" | "url">;
export interface CheckoutSessionRow extends Row<CheckoutSessionCore> {
  lineItems: CheckoutLineObject[];
  /** payment_intent_data given at creation, for the payment intent made when paying. */
  intentData: { description: string | null; metadata: Record<string, string> };
}

export interface EventObject {
  id: string;
  object: "event";
  api_version: string;
  created: number;
  data: { object: Record<string, unknown>; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
}

export class FakeState {
  seq = 0;
  readonly customers = new Map<string, CustomerRow>();
  readonly products = new Map<string, Row<ProductObject>>();
  readonly prices = new Map<string, Row<PriceObject>>();
  readonly invoiceItems = new Map<string, Row<InvoiceItemObject>>();
  readonly invoices = new Map<string, InvoiceRow>();
  readonly invoicePayments = new Map<string, Row<InvoicePaymentObject>>();
  readonly paymentIntents = new Map<string, Row<PaymentIntentObject>>();
  readonly charges = new Map<string, Row<ChargeObject>>();
  readonly paymentMethods = new Map<string, PaymentMethodRow>();
  readonly refunds = new Map<string, Row<RefundObject>>();
  readonly creditNotes = new Map<string, CreditNoteRow>();
  readonly checkoutSessions = new Map<string, CheckoutSessionRow>();
  readonly events = new Map<string, Row<EventObject>>();

  nextSeq(): number {
    this.seq += 1;
    return this.seq;
  }

  // Stores a new object under its id and returns its row.
  add<T extends { id: string }, R extends Row<T>>(map: Map<string, R>, row: Omit<R, "seq">): R {
    const full = { ...row, seq: this.nextSeq() } as R;
    map.set(full.obj.id, full);
    return full;
  }

  toJSON(): StateSnapshot {
    const out: Record<string, unknown[]> = {};
    for (const name of COLLECTIONS) out[name] = [...this[name].values()];
    return { seq: this.seq, collections: out as StateSnapshot["collections"] };
  }

  static fromJSON(snapshot: StateSnapshot): FakeState {
    const s = new FakeState();
    s.seq = snapshot.seq;
    for (const name of COLLECTIONS) {
      const rows = (snapshot.collections[name] ?? []) as Row<{ id: string }>[];
      const map = s[name] as unknown as Map<string, Row<{ id: string }>>;
      for (const row of rows) map.set(row.obj.id, row);
    }
    return s;
  }
}

const COLLECTIONS = [
  "customers",
  "products",
  "prices",
  "invoiceItems",
  "invoices",
  "invoicePayments",
  "paymentIntents",
  "charges",
  "paymentMethods",
  "refunds",
  "creditNotes",
  "checkoutSessions",
  "events",
] as const;

type CollectionName = (typeof COLLECTIONS)[number];

export interface StateSnapshot {
  seq: number;
  collections: { [K in CollectionName]?: unknown[] };
}

const BASE62 = "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz";

// A Stripe-like id: the resource's prefix and 24 random letters and digits.
export function newId(prefix: string, length = 24): string {
  const bytes = randomBytes(length);
  let s = "";
  for (const b of bytes) s += BASE62[b % 62];
  return `${prefix}_${s}`;
}

// Random upper-case letters and digits (invoice prefixes, receipt numbers).
export function randomCode(length: number): string {
  const alphabet = "ABCDEFGHJKLMNPQRSTUVWXYZ0123456789";
  const bytes = randomBytes(length);
  let s = "";
  for (const b of bytes) s += alphabet[b % alphabet.length];
  return s;
}

// Rows newest first, ties broken by creation order: the order of Stripe's list endpoints.
export function newestFirst<T>(
  rows: Iterable<Row<T>>,
  timeOf: (obj: T) => number = (obj) => (obj as { created: number }).created,
): Row<T>[] {
  return [...rows].sort((a, b) => timeOf(b.obj) - timeOf(a.obj) || b.seq - a.seq);
}
