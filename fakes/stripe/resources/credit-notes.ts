import type Stripe from "stripe";
import { previousAttributes, type Ctx } from "../context";
import { badState, invalidParam, invalidRequest } from "../errors";
import { listOf, paginate, readListQuery, type ApiList } from "../list";
import { amountFromDecimal } from "../money";
import { inRange, missing, type Params } from "../params";
import {
  newestFirst,
  newId,
  type ChargeObject,
  type CreditNoteCore,
  type CreditNoteLineObject,
  type CreditNoteRow,
  type InvoiceRow,
  type Row,
} from "../state";
import { copy, mergeMetadata, newMetadata, rowOf } from "./common";
import { renderCustomer } from "./customers";
import { invoiceLines, recomputeTotals } from "./invoice-math";
import { markPaid, renderInvoice, syncPaymentIntent } from "./invoices";
import { refundable, refundCharge } from "./refunds";

// POST/GET /v1/credit_notes, GET/POST /v1/credit_notes/:id, POST …/:id/void, GET …/:id/lines.
// As Stripe documents for credit notes: the credit first reduces the invoice's amount_remaining
// (and amount_due), never below zero — the pre_payment_amount; the rest, the
// post_payment_amount, must be settled by refund_amount (a refund of the invoice's card
// payment), refunds (existing refunds), credit_amount (the customer balance) and
// out_of_band_amount, whose sum must equal it.

export type CreditNoteWire = CreditNoteCore & { pdf: string; lines: ApiList<CreditNoteLineObject> };

export function renderCreditNote(ctx: Ctx, row: CreditNoteRow): CreditNoteWire {
  const lines = row.lines.map(copy);
  return {
    ...copy(row.obj),
    pdf: ctx.link(`/hosted/credit_notes/${row.obj.id}/pdf`),
    lines: listOf(lines.slice(0, 10), `/v1/credit_notes/${row.obj.id}/lines`, lines.length > 10),
  };
}

// The invoice's successful card charges.
function invoiceCharges(ctx: Ctx, invoice: InvoiceRow): Row<ChargeObject>[] {
  const intents = new Set<string>();
  for (const id of invoice.invoicePaymentIds) {
    const pi = ctx.state.invoicePayments.get(id)?.obj.payment.payment_intent;
    if (typeof pi === "string") intents.add(pi);
  }
  return [...ctx.state.charges.values()].filter(
    (c) => typeof c.obj.payment_intent === "string" && intents.has(c.obj.payment_intent) && c.obj.status === "succeeded",
  );
}

function notesOf(ctx: Ctx, invoiceId: string): CreditNoteRow[] {
  return [...ctx.state.creditNotes.values()].filter((n) => n.obj.invoice === invoiceId);
}

// Refunds of the invoice's charges made with the Refund API rather than by a credit note.
function refundsOutsideNotes(ctx: Ctx, invoice: InvoiceRow): number {
  const charges = new Set(invoiceCharges(ctx, invoice).map((c) => c.obj.id));
  const linked = new Set(notesOf(ctx, invoice.obj.id).flatMap((n) => n.obj.refunds.map((r) => r.refund as string)));
  let sum = 0;
  for (const r of ctx.state.refunds.values()) {
    if (typeof r.obj.charge === "string" && charges.has(r.obj.charge) && !linked.has(r.obj.id)) sum += r.obj.amount;
  }
  return sum;
}

interface LineDraft {
  line: Omit<CreditNoteLineObject, "id">;
}

function readLines(ctx: Ctx, invoice: InvoiceRow, lines: Params[]): LineDraft[] {
  const invoiceLineById = new Map(invoiceLines(ctx.state, invoice).map((l) => [l.id, l]));
  const credited = new Map<string, number>();
  for (const note of notesOf(ctx, invoice.obj.id)) {
    if (note.obj.status === "void") continue;
    for (const l of note.lines) {
      if (l.invoice_line_item) credited.set(l.invoice_line_item, (credited.get(l.invoice_line_item) ?? 0) + l.amount);
    }
  }
  return lines.map((lp, i) => {
    const name = `lines[${i}]`;
    const type = lp.enumOf("type", ["invoice_line_item", "custom_line_item"] as const);
    if (!type) throw missing(`${name}[type]`);
    const description = lp.string("description") ?? null;
    const metadata = newMetadata(lp.metadata());
    const quantity = lp.integer("quantity", { min: 1 });
    const amountGiven = lp.integer("amount", { min: 1 });
    const unitAmount = lp.integer("unit_amount", { min: 0 });
    const unitDecimal = lp.decimal("unit_amount_decimal");
    const taxRates = lp.stringArray("tax_rates");
    if (taxRates && taxRates.length > 0) throw invalidParam("This local fake has no tax rates.", `${name}[tax_rates]`);
    lp.ignore("tax_amounts");
    if (type === "invoice_line_item") {
      const lineId = lp.requiredString("invoice_line_item");
      lp.done();
      const line = invoiceLineById.get(lineId);
      if (!line) throw invalidParam(`Invalid ${name}[invoice_line_item]: '${lineId}' is not a line of invoice ${invoice.obj.id}.`, `${name}[invoice_line_item]`);
      const unit = line.pricing?.unit_amount_decimal ?? String(line.amount);
      const amount = amountGiven ?? (quantity !== undefined ? amountFromDecimal(unit, quantity) : line.amount);
      const left = line.amount - (credited.get(lineId) ?? 0);
      if (amount > left) {
        throw invalidParam(`${name} credits ${amount}, more than is left to credit on ${lineId} (${left}).`, `${name}[amount]`);
      }
      credited.set(lineId, (credited.get(lineId) ?? 0) + amount);
      return {
        line: {
          object: "credit_note_line_item",
          amount,
          description: description ?? line.description,
          discount_amount: 0,
          discount_amounts: [],
          invoice_line_item: lineId,
          livemode: false,
          metadata,
          pretax_credit_amounts: [],
          quantity: quantity ?? line.quantity,
          tax_rates: [],
          taxes: [],
          type: "invoice_line_item",
          unit_amount: /^\d+$/.test(unit) ? Number(unit) : null,
          unit_amount_decimal: unit,
        },
      };
    }
    lp.done();
    if (!description) throw missing(`${name}[description]`);
    if (unitAmount !== undefined && unitDecimal !== undefined) {
      throw invalidParam("You may only specify one of these parameters: unit_amount, unit_amount_decimal.", `${name}[unit_amount]`);
    }
    const unit = unitDecimal ?? (unitAmount !== undefined ? String(unitAmount) : undefined);
    const qty = quantity ?? 1;
    const amount = unit !== undefined ? amountFromDecimal(unit, qty) : amountGiven;
    if (amount === undefined) throw missing(`${name}[unit_amount]`);
    return {
      line: {
        object: "credit_note_line_item",
        amount,
        description,
        discount_amount: 0,
        discount_amounts: [],
        livemode: false,
        metadata,
        pretax_credit_amounts: [],
        quantity: qty,
        tax_rates: [],
        taxes: [],
        type: "custom_line_item",
        unit_amount: unit !== undefined && /^\d+$/.test(unit) ? Number(unit) : null,
        unit_amount_decimal: unit ?? String(amount),
      },
    };
  });
}

// POST /v1/credit_notes
export function createCreditNote(ctx: Ctx, p: Params): object {
  const invoiceId = p.id("invoice", ["in_"]);
  if (!invoiceId) throw missing("invoice");
  const lineParams = p.objectArray("lines");
  const amountGiven = p.integer("amount", { min: 1 });
  const memo = p.string("memo", { maxLength: 5000 }) ?? null;
  const reason = p.enumOf("reason", ["duplicate", "fraudulent", "order_change", "product_unsatisfactory"] as const) ?? null;
  const metadata = newMetadata(p.metadata());
  const refundAmount = p.integer("refund_amount", { min: 0 }) ?? 0;
  const creditAmount = p.integer("credit_amount", { min: 0 }) ?? 0;
  const outOfBand = p.integer("out_of_band_amount", { min: 0 });
  const linkParams = p.objectArray("refunds") ?? [];
  const effectiveAt = p.integer("effective_at", { min: 0 });
  p.ignore("email_type");
  if (p.has("shipping_cost")) throw invalidParam("This local fake has no shipping costs; leave out shipping_cost.", "shipping_cost");
  const links = linkParams.map((lp) => {
    const refund = lp.requiredString("refund");
    const amount = lp.integer("amount_refunded", { min: 1 });
    lp.ignore("type");
    lp.done();
    return { refund, amount };
  });
  p.done();

  const invoice = rowOf(ctx.state.invoices, invoiceId, "invoice", "invoice");
  const inv = invoice.obj;
  if (inv.status === "draft" || inv.status === "void") {
    throw badState(`Invoice ${inv.id} is ${inv.status}; credit notes can only be issued for finalized invoices that are not void.`);
  }
  const drafts = lineParams ? readLines(ctx, invoice, lineParams) : [];
  const linesTotal = drafts.reduce((s, d) => s + d.line.amount, 0);
  if (drafts.length === 0 && amountGiven === undefined) throw missing("amount");
  if (drafts.length > 0 && amountGiven !== undefined && amountGiven !== linesTotal) {
    throw invalidParam(`amount (${amountGiven}) must equal the sum of the lines (${linesTotal}).`, "amount");
  }
  const total = drafts.length > 0 ? linesTotal : amountGiven!;
  if (total <= 0) throw invalidParam("A credit note must credit a positive amount.", "amount");

  const issued = notesOf(ctx, inv.id).filter((n) => n.obj.status !== "void").reduce((s, n) => s + n.obj.total, 0);
  const creditable = inv.total - issued - refundsOutsideNotes(ctx, invoice);
  if (total > creditable) {
    throw invalidRequest(`The credit note's total (${total}) is more than is left to credit on invoice ${inv.id} (${creditable}).`, {
      param: "amount",
      code: "credit_note_amount_too_large",
    });
  }
  const pre = inv.status === "paid" ? 0 : Math.min(total, inv.amount_remaining);
  const post = total - pre;

  // The existing refunds to link, checked against the invoice's charges.
  const charges = invoiceCharges(ctx, invoice);
  const chargeIds = new Set(charges.map((c) => c.obj.id));
  const alreadyLinked = new Set([...ctx.state.creditNotes.values()].flatMap((n) => n.obj.refunds.map((r) => r.refund as string)));
  const linked = links.map((l, i) => {
    const r = rowOf(ctx.state.refunds, l.refund, "refund", `refunds[${i}][refund]`);
    if (typeof r.obj.charge !== "string" || !chargeIds.has(r.obj.charge)) {
      throw invalidParam(`Refund ${l.refund} is not a refund of invoice ${inv.id}'s payment.`, `refunds[${i}][refund]`);
    }
    if (alreadyLinked.has(r.obj.id)) throw invalidParam(`Refund ${l.refund} already belongs to a credit note.`, `refunds[${i}][refund]`);
    const amount = l.amount ?? r.obj.amount;
    if (amount > r.obj.amount) throw invalidParam(`amount_refunded (${amount}) is more than refund ${l.refund} (${r.obj.amount}).`, `refunds[${i}][amount_refunded]`);
    return { row: r, amount };
  });
  const linkedSum = linked.reduce((s, l) => s + l.amount, 0);
  const settled = refundAmount + creditAmount + (outOfBand ?? 0) + linkedSum;
  if (settled !== post) {
    throw invalidParam(
      post === 0
        ? `Invoice ${inv.id} still has ${inv.amount_remaining} to pay, which this credit note reduces (pre-payment); refund_amount, credit_amount, out_of_band_amount and refunds must be left out or zero.`
        : `Of this credit note's ${total}, ${post} exceeds what is left to pay on invoice ${inv.id} (post-payment): refund_amount, credit_amount, out_of_band_amount and refunds must add up to ${post} (they add up to ${settled}).`,
      "refund_amount",
    );
  }
  let refundLeft = refundAmount;
  const toRefund: { charge: Row<ChargeObject>; amount: number }[] = [];
  for (const charge of charges) {
    if (refundLeft === 0) break;
    const take = Math.min(refundLeft, refundable(charge.obj));
    if (take > 0) toRefund.push({ charge, amount: take });
    refundLeft -= take;
  }
  if (refundLeft > 0) {
    throw invalidParam(
      `refund_amount (${refundAmount}) is more than can be refunded on invoice ${inv.id}'s card payments; use credit_amount or out_of_band_amount for the rest.`,
      "refund_amount",
    );
  }

  // Everything is checked: now act.
  const beforeInvoice = renderInvoice(ctx, invoice);
  const refunds: Stripe.CreditNote.Refund[] = linked.map((l) => ({
    amount_refunded: l.amount,
    payment_record_refund: null,
    refund: l.row.obj.id,
    type: "refund",
  }));
  for (const r of toRefund) {
    const refund = refundCharge(ctx, r.charge, r.amount, reason === "duplicate" || reason === "fraudulent" ? reason : "requested_by_customer", {});
    refunds.push({ amount_refunded: r.amount, payment_record_refund: null, refund: refund.obj.id, type: "refund" });
  }
  if (creditAmount > 0) adjustBalance(ctx, inv.customer as string, -creditAmount);
  const count = notesOf(ctx, inv.id).length + 1;
  const obj: CreditNoteCore = {
    id: newId("cn"),
    object: "credit_note",
    amount: total,
    amount_shipping: 0,
    created: ctx.now,
    currency: inv.currency,
    customer: inv.customer as string,
    customer_account: null,
    customer_balance_transaction: null,
    discount_amount: 0,
    discount_amounts: [],
    effective_at: effectiveAt ?? ctx.now,
    invoice: inv.id,
    livemode: false,
    memo,
    metadata,
    number: `${inv.number}-CN-${String(count).padStart(2, "0")}`,
    out_of_band_amount: outOfBand ?? null,
    post_payment_amount: post,
    pre_payment_amount: pre,
    pretax_credit_amounts: [],
    reason,
    refunds,
    shipping_cost: null,
    status: "issued",
    subtotal: total,
    subtotal_excluding_tax: total,
    total,
    total_excluding_tax: total,
    total_taxes: [],
    type: pre > 0 && post > 0 ? "mixed" : pre > 0 ? "pre_payment" : "post_payment",
    voided_at: null,
  };
  const lines: CreditNoteLineObject[] = drafts.map((d) => ({ id: newId("cnli"), ...d.line }));
  const row = ctx.state.add<CreditNoteCore, CreditNoteRow>(ctx.state.creditNotes, { obj, lines, creditAmount });

  inv.pre_payment_credit_notes_amount += pre;
  inv.post_payment_credit_notes_amount += post;
  recomputeTotals(ctx.state, invoice);
  syncPaymentIntent(ctx, invoice);
  const out = renderCreditNote(ctx, row);
  ctx.emit("credit_note.created", out);
  const afterInvoice = renderInvoice(ctx, invoice);
  ctx.emit("invoice.updated", afterInvoice, previousAttributes(beforeInvoice, afterInvoice));
  if (pre > 0 && inv.amount_remaining === 0 && (inv.status === "open" || inv.status === "uncollectible")) markPaid(ctx, invoice, false);
  return out;
}

function adjustBalance(ctx: Ctx, customerId: string, delta: number): void {
  const customer = ctx.state.customers.get(customerId);
  if (!customer || delta === 0) return;
  const before = renderCustomer(customer);
  customer.obj.balance += delta;
  const after = renderCustomer(customer);
  ctx.emit("customer.updated", after, previousAttributes(before, after));
}

// POST /v1/credit_notes/:id/void — undoes the credit on the invoice and the customer balance.
// A credit note that refunded money, or whose invoice is no longer open, cannot be voided
// (refunds are final).
export function voidCreditNote(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  const row = rowOf(ctx.state.creditNotes, path.id, "credit note");
  const o = row.obj;
  if (o.status === "void") throw badState(`Credit note ${o.id} is already void.`);
  if (o.refunds.length > 0) throw badState(`Credit note ${o.id} refunded a payment; refunds cannot be undone, so it cannot be voided.`);
  const invoice = rowOf(ctx.state.invoices, o.invoice as string, "invoice", "invoice");
  const inv = invoice.obj;
  if (o.pre_payment_amount > 0 && inv.status !== "open" && inv.status !== "uncollectible") {
    throw badState(`Credit note ${o.id} reduced invoice ${inv.id}, which is now ${inv.status}; it can no longer be voided.`);
  }
  const beforeInvoice = renderInvoice(ctx, invoice);
  o.status = "void";
  o.voided_at = ctx.now;
  inv.pre_payment_credit_notes_amount -= o.pre_payment_amount;
  inv.post_payment_credit_notes_amount -= o.post_payment_amount;
  recomputeTotals(ctx.state, invoice);
  syncPaymentIntent(ctx, invoice);
  if (row.creditAmount > 0) adjustBalance(ctx, inv.customer as string, row.creditAmount);
  const out = renderCreditNote(ctx, row);
  ctx.emit("credit_note.voided", out);
  const afterInvoice = renderInvoice(ctx, invoice);
  ctx.emit("invoice.updated", afterInvoice, previousAttributes(beforeInvoice, afterInvoice));
  return out;
}

// POST /v1/credit_notes/:id (memo, metadata)
export function updateCreditNote(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const memo = p.string("memo", { maxLength: 5000 });
  const metadata = p.metadata();
  p.done();
  const row = rowOf(ctx.state.creditNotes, path.id, "credit note");
  const before = renderCreditNote(ctx, row);
  if (memo !== undefined) row.obj.memo = memo;
  row.obj.metadata = mergeMetadata(row.obj.metadata, metadata);
  const out = renderCreditNote(ctx, row);
  const previous = previousAttributes(before, out);
  if (Object.keys(previous).length > 0) ctx.emit("credit_note.updated", out, previous);
  return out;
}

// GET /v1/credit_notes/:id
export function retrieveCreditNote(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderCreditNote(ctx, rowOf(ctx.state.creditNotes, path.id, "credit note"));
}

// GET /v1/credit_notes (invoice, customer, created)
export function listCreditNotes(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const invoice = p.string("invoice");
  const customer = p.string("customer");
  const created = p.range("created");
  p.done();
  const rows = newestFirst(ctx.state.creditNotes.values()).filter(
    (r) =>
      (invoice === undefined || r.obj.invoice === invoice) &&
      (customer === undefined || r.obj.customer === customer) &&
      inRange(r.obj.created, created),
  );
  return paginate(
    rows.map((r) => renderCreditNote(ctx, r as CreditNoteRow)),
    q,
    "/v1/credit_notes",
  );
}

// GET /v1/credit_notes/:id/lines
export function listCreditNoteLines(ctx: Ctx, p: Params, path: Record<string, string>): object {
  const q = readListQuery(p);
  p.done();
  const row = rowOf(ctx.state.creditNotes, path.id, "credit note");
  return paginate(row.lines.map(copy), q, `/v1/credit_notes/${row.obj.id}/lines`);
}
