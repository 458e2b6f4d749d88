import "server-only";
import type { Kysely, Transaction } from "kysely";
import type Stripe from "stripe";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { computeCreditNote, type CreditRequest } from "@/lib/pricing/credit-note";
import { PricingError } from "@/lib/pricing/errors";
import { formatMinor } from "@/lib/pricing/money";
import { stripeClient } from "@/lib/stripe";
import { creditNoteDocumentFor, invoiceDocumentFor } from "./exports-document";
import { billingToday, findInvoiceInScope, invoiceLineRows } from "./invoices";
import { creditNoteNumber } from "./numbering";
import { ensureStripeInvoice, paymentServiceError } from "./payments";

// Credit notes for disputes, computed by the pricing engine (lines of the invoice, cycles of a
// line, or an amount; never more than was invoiced, counting earlier credit notes), mirrored in
// the payment service, stored and audited.
//
// Decisions:
// - What is still to pay is reduced first (Stripe's own rule for credit notes): on an open
//   invoice the credit lowers the amount due, ours and the payment service's alike; if that
//   brings it to zero, the invoice is settled.
// - A credit beyond what is still to pay (on a paid invoice) is refunded to the card that paid,
//   when the invoice was paid online; finance may instead choose "outside the payment service"
//   (repaid by bank transfer, or set off against a later invoice by hand). We never credit the
//   customer's balance in the payment service: it would silently lower the next invoice's amount
//   there and leave our invoice and its copy disagreeing.
// - An invoice paid outside the payment service that has no copy there gets its credit note here
//   only, settled outside the payment service.
// - The payment service is called before our transaction, with an idempotency key from our credit
//   note's number, so a retry after a failure replays the same credit rather than making another.

export type Settlement = "refund" | "out_of_band";

export type CreditNoteRequest =
  | { kind: "lines"; lines: { lineId: number; quantity?: number; cycleIds?: number[] }[]; reason: string; settlement?: Settlement }
  | { kind: "amount"; amountMinor: number; description: string; reason: string; settlement?: Settlement };

export interface CreatedCreditNote {
  id: number;
  number: string;
  totalMinor: number;
  settlement: "amount_due" | "refund" | "out_of_band";
  amountDueMinor: number;
}

function asAppError(error: unknown): never {
  if (error instanceof PricingError) {
    throw new AppError("validation", error.message.charAt(0).toUpperCase() + error.message.slice(1) + ".", { "": [error.message] });
  }
  throw error;
}

/** The number of the n-th credit note against an invoice: LSS-CN-2026-11-QMH-1 for LSS-2026-11-QMH. */
export function creditNoteNumberFor(invoiceNumber: string, n: number): string {
  try {
    return creditNoteNumber(invoiceNumber, n);
  } catch {
    // An invoice numbered outside our scheme (imported): its number with the sequence appended.
    return `${invoiceNumber}-CN-${n}`;
  }
}

type Executor = Kysely<Database> | Transaction<Database>;
type StoredInvoice = Awaited<ReturnType<typeof findInvoiceInScope>>;

/** What a credit note against `invoice` holds, computed by the pricing engine; writes nothing. */
async function computeFor(db: Executor, invoice: StoredInvoice, request: CreditNoteRequest, now: Date) {
  const document = await invoiceDocumentFor(db, invoice);
  const previousRows = await db.selectFrom("credit_notes").selectAll().where("invoice_id", "=", invoice.id).orderBy("id").execute();
  const previous = previousRows.map((row) => creditNoteDocumentFor(row, document));
  const lineRows = await invoiceLineRows(db, invoice.id);
  const positionOf = new Map(lineRows.map((l) => [l.id, l.position]));

  let creditRequest: CreditRequest;
  if (request.kind === "lines") {
    creditRequest = {
      kind: "lines",
      lines: request.lines.map((entry) => {
        const position = positionOf.get(entry.lineId);
        if (position === undefined) throw new AppError("validation", "Choose lines of this invoice.", { lines: [`Line ${entry.lineId} is not on invoice ${invoice.number}.`] });
        return {
          lineId: String(position),
          ...(entry.quantity !== undefined ? { quantity: entry.quantity } : {}),
          ...(entry.cycleIds !== undefined ? { cycleIds: entry.cycleIds.map(String) } : {}),
        };
      }),
    };
  } else {
    creditRequest = { kind: "amount", amountMinor: request.amountMinor, description: request.description };
  }

  const number = creditNoteNumberFor(invoice.number, previousRows.length + 1);
  const issueDate = billingToday(now);
  let computed: ReturnType<typeof computeCreditNote>;
  try {
    computed = computeCreditNote({ invoice: document, request: creditRequest, id: number, issueDate, reason: request.reason, previousCreditNotes: previous });
  } catch (error) {
    asAppError(error);
  }
  return { number, computed, previousCount: previousRows.length };
}

/** Stores a computed credit note and lowers the invoice's amount due, in the caller's transaction, audited. */
async function writeCreditNote(
  trx: Transaction<Database>,
  user: SessionUser,
  invoice: StoredInvoice,
  credit: Awaited<ReturnType<typeof computeFor>>,
  request: CreditNoteRequest,
  outcome: { settlement: CreatedCreditNote["settlement"]; refundedMinor: number; stripeCreditNoteId: string | null },
  now: Date,
): Promise<CreatedCreditNote> {
  const { number, computed, previousCount } = credit;
  const { totals } = computed;
  const totalMinor = totals.taxInclusiveMinor;
  const { settlement, stripeCreditNoteId } = outcome;
  // Nothing else credited this invoice meanwhile (the numbers are taken in order).
  const count = await trx.selectFrom("credit_notes").select((eb) => eb.fn.countAll<number>().as("n")).where("invoice_id", "=", invoice.id).executeTakeFirstOrThrow();
  if (Number(count.n) !== previousCount) throw new AppError("conflict", "Another credit note was just made for this invoice. Reload the page and check what is left to credit.");
  const current = await trx.selectFrom("invoices").select(["status", "amount_paid_minor", "amount_credited_minor"]).where("id", "=", invoice.id).executeTakeFirstOrThrow();
  const credited = current.amount_credited_minor + totalMinor;
  const amountDue = Math.max(0, invoice.total_minor - credited - current.amount_paid_minor);
  const settled = current.status === "open" || current.status === "uncollectible" ? amountDue === 0 : false;
  const { id } = await trx
    .insertInto("credit_notes")
    .values({
      invoice_id: invoice.id,
      number,
      reason: request.reason,
      net_minor: totals.taxExclusiveMinor,
      vat_minor: totals.vatTotalMinor,
      total_minor: totalMinor,
      lines: JSON.stringify(computed.document.lines),
      stripe_credit_note_id: stripeCreditNoteId,
      settlement,
      created_by: user.id,
      created_at: now.toISOString(),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  await trx
    .updateTable("invoices")
    .set({
      amount_credited_minor: credited,
      amount_due_minor: amountDue,
      ...(settled ? { status: "paid" as const, paid_at: now.toISOString(), last_payment_error: null } : {}),
      updated_at: now.toISOString(),
    })
    .where("id", "=", invoice.id)
    .execute();
  await recordAudit(
    trx,
    {
      actorUserId: user.id,
      organisationId: invoice.organisation_id,
      action: "credit_note.created",
      entity: "invoice",
      entityId: invoice.id,
      details: {
        creditNote: number,
        reason: request.reason,
        totalMinor,
        vatMinor: totals.vatTotalMinor,
        settlement,
        refundedMinor: outcome.refundedMinor,
        amountDueBefore: invoice.amount_due_minor,
        amountDueAfter: amountDue,
        stripeCreditNoteId,
      },
    },
    now,
  );
  return { id, number, totalMinor, settlement, amountDueMinor: amountDue };
}

function assertCreditable(invoice: StoredInvoice): void {
  if (invoice.status === "draft") throw new AppError("conflict", `Invoice ${invoice.number} has not been issued; change the draft instead of crediting it.`);
  if (invoice.status === "void") throw new AppError("conflict", `Invoice ${invoice.number} is void; there is nothing to credit.`);
}

/** Creates a credit note against an issued invoice; the caller may manage billing. */
export async function createCreditNote(
  db: Kysely<Database>,
  user: SessionUser,
  invoiceId: number,
  request: CreditNoteRequest,
  now = new Date(),
): Promise<CreatedCreditNote> {
  let invoice = await findInvoiceInScope(db, user, invoiceId);
  assertCreditable(invoice);

  // An open invoice gets its copy in the payment service first, so both amounts due move together.
  if (!invoice.stripe_invoice_id && invoice.status !== "paid") {
    await ensureStripeInvoice(db, invoice.id, now);
    invoice = await findInvoiceInScope(db, user, invoiceId);
  }

  const credit = await computeFor(db, invoice, request, now);
  const totalMinor = credit.computed.totals.taxInclusiveMinor;
  const { number } = credit;

  // What is still to pay absorbs the credit first; the rest is settled as finance chose.
  let stillDue = invoice.amount_due_minor;
  let remote: Stripe.Invoice | null = null;
  if (invoice.stripe_invoice_id) {
    try {
      remote = await stripeClient().invoices.retrieve(invoice.stripe_invoice_id);
    } catch (error) {
      paymentServiceError(error, "reading the invoice");
    }
    stillDue = remote.status === "paid" ? 0 : remote.amount_remaining;
  }
  if (invoice.status === "paid") stillDue = 0;
  const prePayment = Math.min(totalMinor, stillDue);
  const postPayment = totalMinor - prePayment;
  const paidOnline = remote ? remote.amount_paid - (remote.amount_paid_off_stripe ?? 0) : 0;
  let settlement: CreatedCreditNote["settlement"] = "amount_due";
  if (postPayment > 0) {
    settlement = request.settlement ?? (paidOnline > 0 ? "refund" : "out_of_band");
    if (settlement === "refund" && paidOnline <= 0) {
      throw new AppError("validation", "This invoice was not paid online, so there is no card payment to refund.", {
        settlement: ["Choose “outside the payment service” (bank transfer or set-off)."],
      });
    }
  }

  let stripeCreditNoteId: string | null = null;
  if (remote) {
    try {
      const created = await stripeClient().creditNotes.create(
        {
          invoice: remote.id!,
          amount: totalMinor,
          memo: `${number}: ${request.reason}`.slice(0, 5000),
          metadata: { steamlane_credit_note: number, steamlane_invoice_id: String(invoice.id) },
          ...(postPayment > 0 && settlement === "refund" ? { refund_amount: postPayment } : {}),
          ...(postPayment > 0 && settlement === "out_of_band" ? { out_of_band_amount: postPayment } : {}),
        },
        { idempotencyKey: `steamlane:credit-note:${number}` },
      );
      stripeCreditNoteId = created.id;
    } catch (error) {
      paymentServiceError(error, "creating the credit note");
    }
  }

  const refundedMinor = settlement === "refund" ? postPayment : 0;
  return db.transaction().execute((trx) => writeCreditNote(trx, user, invoice, credit, request, { settlement, refundedMinor, stripeCreditNoteId }, now));
}

/**
 * Creates a credit note inside the caller's transaction, for a paid invoice that has no copy in
 * the payment service (paid by bank transfer), so nothing needs the payment service: the credit is
 * settled outside it. The demo's seed uses this directly; anything else goes through
 * createCreditNote.
 */
export async function createCreditNoteIn(
  trx: Transaction<Database>,
  user: SessionUser,
  invoiceId: number,
  request: CreditNoteRequest,
  now: Date,
): Promise<CreatedCreditNote> {
  const invoice = await findInvoiceInScope(trx, user, invoiceId);
  assertCreditable(invoice);
  if (invoice.stripe_invoice_id || invoice.status !== "paid") {
    throw new AppError("conflict", `Invoice ${invoice.number} has a copy in the payment service or is still to be paid; credit it through the payment service.`);
  }
  if (request.settlement === "refund") {
    throw new AppError("validation", "This invoice was not paid online, so there is no card payment to refund.", {
      settlement: ["Choose “outside the payment service” (bank transfer or set-off)."],
    });
  }
  const credit = await computeFor(trx, invoice, request, now);
  return writeCreditNote(trx, user, invoice, credit, request, { settlement: "out_of_band", refundedMinor: 0, stripeCreditNoteId: null }, now);
}

/** Explains a credit note's money in one line, e.g. for a toast. */
export function describeCreditNote(note: CreatedCreditNote, currency: string): string {
  const amount = `${formatMinor(note.totalMinor)} ${currency}`;
  if (note.settlement === "refund") return `${note.number}: ${amount} credited and refunded to the card.`;
  if (note.settlement === "out_of_band") return `${note.number}: ${amount} credited, to be repaid outside the payment service.`;
  return `${note.number}: ${amount} credited; ${formatMinor(note.amountDueMinor)} ${currency} is now due.`;
}
