import "server-only";
import type { Kysely, Transaction } from "kysely";
import type Stripe from "stripe";
import type { Database, InvoiceStatus } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { serverEnv } from "@/lib/env";
import { formatDate } from "@/lib/format";
import { paymentReceiptMail } from "@/lib/mail/billing-templates";
import { enqueueMail } from "@/lib/mail/outbox";
import { stripeClient } from "@/lib/stripe";
import { billingRecipients, METADATA } from "./payments";

// What the payment service tells us, one verified event at a time (the route checks the
// signature). Each event is processed once: its id goes into webhook_events in the same
// transaction as its effects, so a repeated delivery is acknowledged and changes nothing, and a
// failure part-way leaves no trace (the service delivers it again).
//
// Events may come late or out of order, and the copy inside an event is a snapshot of its time:
// every handler re-reads the invoice (and its payments) from the service before it opens the
// transaction, and applies only moves forward — an open invoice may become paid, void or
// uncollectible, an uncollectible one may still be paid, and a paid or void invoice never
// changes again. A payment failure that arrives after the payment succeeded changes nothing.

type Executor = Kysely<Database> | Transaction<Database>;

/** What the service says now, read when the event is handled. */
export interface InvoiceState {
  invoice: Stripe.Invoice;
  payments: Stripe.InvoicePayment[];
}

export type WebhookOutcome =
  | { result: "processed"; eventId: string; type: string; invoiceId?: number; change?: string }
  | { result: "duplicate"; eventId: string; type: string }
  | { result: "ignored"; eventId: string; type: string; reason: string };

interface HandlerContext {
  trx: Transaction<Database>;
  event: Stripe.Event;
  state: InvoiceState;
  invoice: OurInvoice;
  now: Date;
}

type HandlerResult = { change: string };
type Handler = (ctx: HandlerContext) => Promise<HandlerResult>;

interface OurInvoice {
  id: number;
  number: string;
  organisation_id: number;
  status: InvoiceStatus;
  currency: string;
  total_minor: number;
  amount_credited_minor: number;
  stripe_invoice_id: string | null;
}

// ---- reading the service's state ----

/** The invoice id an event is about, or null when it is not about an invoice. */
function invoiceIdOf(event: Stripe.Event): string | null {
  const object = event.data.object as { object?: string; id?: string };
  return object?.object === "invoice" && typeof object.id === "string" ? object.id : null;
}

/** The invoice and its payments as the service has them now. */
export async function readInvoiceState(stripeInvoiceId: string): Promise<InvoiceState> {
  const stripe = stripeClient();
  const invoice = await stripe.invoices.retrieve(stripeInvoiceId);
  const payments = await stripe.invoicePayments
    .list({ invoice: stripeInvoiceId, limit: 100, expand: ["data.payment.payment_intent"] })
    .autoPagingToArray({ limit: 1000 });
  return { invoice, payments };
}

async function findOurInvoice(db: Executor, stripeInvoice: Stripe.Invoice): Promise<OurInvoice | undefined> {
  const columns = ["id", "number", "organisation_id", "status", "currency", "total_minor", "amount_credited_minor", "stripe_invoice_id"] as const;
  const byId = await db.selectFrom("invoices").select(columns).where("stripe_invoice_id", "=", stripeInvoice.id!).executeTakeFirst();
  if (byId) return byId;
  // The event can arrive before the copy's id was stored (the reply to our own call is still on
  // its way): the metadata we gave the copy names our invoice.
  const ours = Number(stripeInvoice.metadata?.[METADATA.invoiceId]);
  if (!Number.isSafeInteger(ours) || ours <= 0) return undefined;
  const byMetadata = await db.selectFrom("invoices").select(columns).where("id", "=", ours).executeTakeFirst();
  if (!byMetadata || (byMetadata.stripe_invoice_id && byMetadata.stripe_invoice_id !== stripeInvoice.id)) return undefined;
  return byMetadata;
}

// ---- moving forward only ----

const FINAL: ReadonlySet<InvoiceStatus> = new Set(["paid", "void"]);

/** True when our invoice may move from `from` to `to`. */
export function mayMove(from: InvoiceStatus, to: InvoiceStatus): boolean {
  if (from === to || FINAL.has(from)) return false;
  if (to === "draft") return false;
  if (from === "uncollectible") return to === "paid";
  if (to === "open") return from === "draft";
  return true;
}

const unix = (seconds: number | null | undefined) => (seconds ? new Date(seconds * 1000).toISOString() : null);

/** Records the invoice's paid payments (once each, by the service's id). Returns how many were new. */
async function recordPayments(trx: Transaction<Database>, invoiceId: number, payments: Stripe.InvoicePayment[], now: Date): Promise<number> {
  let added = 0;
  for (const payment of payments) {
    if (payment.status !== "paid" || !payment.amount_paid) continue;
    const inserted = await trx
      .insertInto("payments")
      .values({
        invoice_id: invoiceId,
        stripe_payment_id: payment.id,
        amount_minor: payment.amount_paid,
        currency: payment.currency.toUpperCase(),
        status: payment.status,
        paid_at: unix(payment.status_transitions?.paid_at),
        created_at: now.toISOString(),
      })
      .onConflict((oc) => oc.column("stripe_payment_id").doNothing())
      .returning("id")
      .executeTakeFirst();
    if (inserted) added++;
  }
  return added;
}

/** What the service last said about a failed card attempt, in words for the payer. */
export function declineReason(payments: Stripe.InvoicePayment[]): string | null {
  const intents = payments
    .map((p) => p.payment?.payment_intent)
    .filter((pi): pi is Stripe.PaymentIntent => typeof pi === "object" && pi !== null && "last_payment_error" in pi);
  const failed = intents.filter((pi) => pi.last_payment_error).sort((a, b) => b.created - a.created)[0];
  const error = failed?.last_payment_error;
  if (!error) return null;
  const message = error.message?.trim() || "The card payment was declined.";
  const code = error.decline_code ?? error.code;
  return code ? `${message} (${code.replaceAll("_", " ")})` : message;
}

/** Copies the service's page address, number and amounts, whatever the status. */
async function syncCopy(trx: Transaction<Database>, invoice: OurInvoice, remote: Stripe.Invoice, now: Date): Promise<void> {
  await trx
    .updateTable("invoices")
    .set({
      stripe_invoice_id: remote.id!,
      ...(remote.hosted_invoice_url ? { hosted_invoice_url: remote.hosted_invoice_url } : {}),
      ...(remote.number ? { stripe_number: remote.number } : {}),
      updated_at: now.toISOString(),
    })
    .where("id", "=", invoice.id)
    .execute();
}

async function moveStatus(trx: Transaction<Database>, invoice: OurInvoice, to: InvoiceStatus, event: Stripe.Event, now: Date): Promise<boolean> {
  if (!mayMove(invoice.status, to)) return false;
  await trx.updateTable("invoices").set({ status: to, updated_at: now.toISOString() }).where("id", "=", invoice.id).execute();
  await recordAudit(
    trx,
    {
      actorUserId: null,
      organisationId: invoice.organisation_id,
      action: `invoice.${to}`,
      entity: "invoice",
      entityId: invoice.id,
      details: { from: invoice.status, to, event: event.id, eventType: event.type },
    },
    now,
  );
  invoice.status = to;
  return true;
}

// ---- the handlers, one per kind of event ----

/** invoice.paid, invoice.payment_succeeded: record the payments, mark ours paid, send the receipt once. */
const onPaid: Handler = async ({ trx, event, state, invoice, now }) => {
  const remote = state.invoice;
  await syncCopy(trx, invoice, remote, now);
  const added = await recordPayments(trx, invoice.id, state.payments, now);
  if (remote.status !== "paid") return { change: added > 0 ? `recorded ${added} payment(s); the invoice is ${remote.status} there` : "nothing: not paid there" };
  if (invoice.status === "void") return { change: "nothing: our invoice is void" };
  const wasPaid = invoice.status === "paid";
  const paidAt = unix(remote.status_transitions?.paid_at) ?? now.toISOString();
  await trx
    .updateTable("invoices")
    .set({
      amount_paid_minor: remote.amount_paid,
      amount_due_minor: Math.max(0, invoice.total_minor - invoice.amount_credited_minor - remote.amount_paid),
      last_payment_error: null,
      ...(wasPaid ? {} : { paid_at: paidAt }),
      updated_at: now.toISOString(),
    })
    .where("id", "=", invoice.id)
    .execute();
  await moveStatus(trx, invoice, "paid", event, now);
  if (remote.amount_paid > 0) await queueReceipt(trx, invoice, remote.amount_paid, paidAt, now);
  return { change: wasPaid ? "already paid" : "paid" };
};

/** invoice.payment_failed: keep it open and store why, unless it has been paid since. */
const onPaymentFailed: Handler = async (ctx) => {
  const { trx, state, invoice, now } = ctx;
  if (state.invoice.status === "paid") return onPaid(ctx);
  await syncCopy(trx, invoice, state.invoice, now);
  if (FINAL.has(invoice.status)) return { change: `nothing: the invoice is ${invoice.status}` };
  const reason = declineReason(state.payments) ?? "The card payment was declined.";
  await trx.updateTable("invoices").set({ last_payment_error: reason, updated_at: now.toISOString() }).where("id", "=", invoice.id).execute();
  return { change: `payment failed: ${reason}` };
};

/** invoice.voided: void, unless it was paid. */
const onVoided: Handler = async ({ trx, event, state, invoice, now }) => {
  await syncCopy(trx, invoice, state.invoice, now);
  if (state.invoice.status !== "void") return { change: `nothing: the invoice is ${state.invoice.status} there` };
  return { change: (await moveStatus(trx, invoice, "void", event, now)) ? "void" : `nothing: the invoice is ${invoice.status}` };
};

/** invoice.marked_uncollectible: written off, unless paid or void meanwhile. */
const onMarkedUncollectible: Handler = async ({ trx, event, state, invoice, now }) => {
  await syncCopy(trx, invoice, state.invoice, now);
  if (state.invoice.status !== "uncollectible") return { change: `nothing: the invoice is ${state.invoice.status} there` };
  return { change: (await moveStatus(trx, invoice, "uncollectible", event, now)) ? "uncollectible" : `nothing: the invoice is ${invoice.status}` };
};

/** invoice.finalized, invoice.updated: the page address and number; a paid invoice goes through onPaid. */
const onFinalizedOrUpdated: Handler = async (ctx) => {
  if (ctx.state.invoice.status === "paid") return onPaid(ctx);
  await syncCopy(ctx.trx, ctx.invoice, ctx.state.invoice, ctx.now);
  return { change: "copied the payment page and number" };
};

export const HANDLERS: Readonly<Partial<Record<string, Handler>>> = {
  "invoice.paid": onPaid,
  "invoice.payment_succeeded": onPaid,
  "invoice.payment_failed": onPaymentFailed,
  "invoice.voided": onVoided,
  "invoice.marked_uncollectible": onMarkedUncollectible,
  "invoice.finalized": onFinalizedOrUpdated,
  "invoice.updated": onFinalizedOrUpdated,
};

async function queueReceipt(trx: Transaction<Database>, invoice: OurInvoice, amountPaidMinor: number, paidAt: string, now: Date): Promise<void> {
  const env = serverEnv();
  const org = await trx.selectFrom("organisations").select("name").where("id", "=", invoice.organisation_id).executeTakeFirstOrThrow();
  for (const recipient of await billingRecipients(trx, invoice.organisation_id)) {
    const mail = paymentReceiptMail({
      recipientName: recipient.name,
      organisationName: org.name,
      invoiceNumber: invoice.number,
      amountPaidMinor,
      currency: invoice.currency,
      paidOn: formatDate(paidAt, env.UNIT_TIME_ZONE),
      link: `${env.APP_URL}/clinic/invoices/${invoice.id}`,
    });
    await enqueueMail(
      trx,
      {
        template: "billing.receipt",
        to: recipient.email,
        organisationId: invoice.organisation_id,
        dedupeKey: `invoice_receipt:${invoice.id}:${recipient.email.toLowerCase()}`,
        ...mail,
      },
      now,
    );
  }
}

// ---- the entry point ----

/** Marks the event as seen (first come, first served); false when it was seen before. */
async function claimEvent(trx: Transaction<Database>, event: Stripe.Event, now: Date): Promise<boolean> {
  const claimed = await trx
    .insertInto("webhook_events")
    .values({ id: event.id, type: event.type, received_at: now.toISOString(), processed_at: null })
    .onConflict((oc) => oc.column("id").doNothing())
    .returning("id")
    .executeTakeFirst();
  return claimed !== undefined;
}

async function markProcessed(trx: Transaction<Database>, eventId: string, now: Date): Promise<void> {
  await trx.updateTable("webhook_events").set({ processed_at: now.toISOString() }).where("id", "=", eventId).execute();
}

/**
 * Handles one verified event. The service's current state is read before the transaction opens
 * (no network call holds the database's write lock); the event id, the effects and the e-mails
 * are then written together.
 */
export async function handleStripeEvent(db: Kysely<Database>, event: Stripe.Event, now = new Date()): Promise<WebhookOutcome> {
  const seen = await db.selectFrom("webhook_events").select("id").where("id", "=", event.id).executeTakeFirst();
  if (seen) return { result: "duplicate", eventId: event.id, type: event.type };

  const handler = HANDLERS[event.type];
  const stripeInvoiceId = handler ? invoiceIdOf(event) : null;
  const state = stripeInvoiceId ? await readInvoiceState(stripeInvoiceId) : null;

  return db.transaction().execute(async (trx): Promise<WebhookOutcome> => {
    if (!(await claimEvent(trx, event, now))) return { result: "duplicate", eventId: event.id, type: event.type };
    if (!handler || !state) {
      await markProcessed(trx, event.id, now);
      return { result: "ignored", eventId: event.id, type: event.type, reason: handler ? "not about an invoice" : "not an event we act on" };
    }
    const invoice = await findOurInvoice(trx, state.invoice);
    if (!invoice) {
      await markProcessed(trx, event.id, now);
      return { result: "ignored", eventId: event.id, type: event.type, reason: "not one of our invoices" };
    }
    const { change } = await handler({ trx, event, state, invoice, now });
    await markProcessed(trx, event.id, now);
    return { result: "processed", eventId: event.id, type: event.type, invoiceId: invoice.id, change };
  });
}
