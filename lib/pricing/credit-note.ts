// Credit notes against an issued invoice: the whole invoice, some of its lines (or some cycles of
// a line), or an amount. VAT is computed exactly as on an invoice, per category and rate on the
// credit note's own taxable amounts (so two partial credits may differ by a cent from one full
// credit). Amounts on a credit note are positive where they reverse a positive invoice amount.
// Earlier credit notes against the same invoice are taken into account, so nothing is credited
// twice and no VAT group is credited beyond what was invoiced.

import { PricingError } from "./errors";
import { assertInteger, multiplyExact, sumExact } from "./money";
import { isCalendarDate } from "./period";
import { computeInvoiceTotals } from "./totals";
import type {
  CreditNoteDocument,
  CreditNoteLine,
  InvoiceDocument,
  InvoiceLine,
  InvoiceTotals,
  VatTreatment,
} from "./types";

/** Which part of the invoice to credit. */
export type CreditRequest =
  | { kind: "full" }
  | {
      kind: "lines";
      /** Either a quantity of the line, or the cycles of the line to credit (one unit each). */
      lines: { lineId: string; quantity?: number; cycleIds?: string[] }[];
    }
  | {
      kind: "amount";
      amountMinor: number;
      description: string;
      /** Needed when the invoice has more than one VAT category or rate. */
      vat?: VatTreatment;
    };

export interface CreditNoteInput {
  invoice: InvoiceDocument;
  request: CreditRequest;
  id: string;
  issueDate: string;
  /** Why the credit is given, shown as the document note. */
  reason: string;
  /** Credit notes already issued against the same invoice. */
  previousCreditNotes?: readonly CreditNoteDocument[];
  paymentTerms?: string;
}

export interface ComputedCreditNote {
  document: CreditNoteDocument;
  totals: InvoiceTotals;
}

function creditError(message: string, details: Record<string, unknown> = {}): PricingError {
  return new PricingError("invalid_credit", message, details);
}

function vatKey(vat: VatTreatment): string {
  return `${vat.category}|${vat.rateBasisPoints}`;
}

interface AlreadyCredited {
  quantityByLine: Map<string, number>;
  cycleIdsByLine: Map<string, Set<string>>;
  taxableByVat: Map<string, number>;
}

function alreadyCredited(invoice: InvoiceDocument, previous: readonly CreditNoteDocument[]): AlreadyCredited {
  const result: AlreadyCredited = { quantityByLine: new Map(), cycleIdsByLine: new Map(), taxableByVat: new Map() };
  for (const note of previous) {
    if (note.precedingInvoice?.id !== invoice.id) {
      throw creditError(`credit note ${note.id} refers to invoice ${note.precedingInvoice?.id}, not ${invoice.id}`, { creditNoteId: note.id });
    }
    if (note.currency !== invoice.currency) {
      throw new PricingError("currency_mismatch", `credit note ${note.id} is in ${note.currency}, invoice ${invoice.id} in ${invoice.currency}`);
    }
    const totals = computeInvoiceTotals(note.lines, note.allowancesCharges ?? []);
    for (const entry of totals.vatBreakdown) {
      const key = vatKey(entry);
      result.taxableByVat.set(key, (result.taxableByVat.get(key) ?? 0) + entry.taxableAmountMinor);
    }
    for (const line of note.lines) {
      if (!line.creditsLineId) continue;
      result.quantityByLine.set(line.creditsLineId, (result.quantityByLine.get(line.creditsLineId) ?? 0) + line.quantity);
      const cycleIds = result.cycleIdsByLine.get(line.creditsLineId) ?? new Set<string>();
      for (const cycleId of line.cycleIds) cycleIds.add(cycleId);
      result.cycleIdsByLine.set(line.creditsLineId, cycleIds);
    }
  }
  return result;
}

function creditLine(source: InvoiceLine, id: string, quantity: number, cycleIds: string[]): CreditNoteLine {
  return {
    id,
    kind: source.kind,
    itemCode: source.itemCode,
    description: source.description,
    ...(source.note ? { note: source.note } : {}),
    quantity,
    unitCode: source.unitCode ?? "C62",
    unitPriceMinor: source.unitPriceMinor,
    netAmountMinor: multiplyExact(quantity, source.unitPriceMinor, `credit of line ${source.id}`),
    vat: { ...source.vat },
    cycleIds,
    creditsLineId: source.id,
  };
}

function linesToCredit(invoice: InvoiceDocument, request: CreditRequest, done: AlreadyCredited): CreditNoteLine[] {
  const byId = new Map<string, InvoiceLine>();
  for (const line of invoice.lines) {
    if (byId.has(line.id)) throw creditError(`invoice ${invoice.id} has two lines with id ${line.id}`);
    byId.set(line.id, line);
  }

  if (request.kind === "full") {
    return invoice.lines.map((line, index) => {
      if ((done.quantityByLine.get(line.id) ?? 0) !== 0) {
        throw creditError(`line ${line.id} of invoice ${invoice.id} was already credited in part; credit the remaining lines instead`, {
          lineId: line.id,
        });
      }
      return creditLine(line, String(index + 1), line.quantity, [...line.cycleIds]);
    });
  }

  if (request.kind === "lines") {
    if (request.lines.length === 0) throw creditError("name at least one line to credit");
    const requested = new Set<string>();
    return request.lines.map((entry, index) => {
      const source = byId.get(entry.lineId);
      if (!source) throw creditError(`invoice ${invoice.id} has no line ${entry.lineId}`, { lineId: entry.lineId });
      if (requested.has(entry.lineId)) throw creditError(`line ${entry.lineId} is named twice; give its total quantity once`);
      requested.add(entry.lineId);
      let quantity: number;
      let cycleIds: string[];
      if (entry.cycleIds !== undefined) {
        if (source.kind !== "processing" && source.kind !== "surcharge") {
          throw creditError(`line ${source.id} is not priced per set; credit it by quantity or by amount`);
        }
        if (source.unitCode === "LS") {
          throw creditError(`line ${source.id} is a lump sum; credit part of it by amount`);
        }
        if (entry.cycleIds.length === 0) throw creditError(`line ${source.id}: name at least one cycle to credit`);
        const own = new Set(source.cycleIds);
        const unique = new Set(entry.cycleIds);
        if (unique.size !== entry.cycleIds.length) throw creditError(`line ${source.id}: a cycle is named twice`);
        for (const cycleId of entry.cycleIds) {
          if (!own.has(cycleId)) throw creditError(`cycle ${cycleId} was not billed on line ${source.id}`, { cycleId, lineId: source.id });
          if (done.cycleIdsByLine.get(source.id)?.has(cycleId)) throw creditError(`cycle ${cycleId} on line ${source.id} was already credited`, { cycleId });
        }
        if (entry.quantity !== undefined && entry.quantity !== entry.cycleIds.length) {
          throw creditError(`line ${source.id}: quantity ${entry.quantity} does not match the ${entry.cycleIds.length} cycle(s) named`);
        }
        quantity = entry.cycleIds.length;
        cycleIds = [...entry.cycleIds];
      } else {
        quantity = assertInteger(entry.quantity, `quantity to credit on line ${source.id}`);
        if (quantity === 0 || Math.sign(quantity) !== Math.sign(source.quantity)) {
          throw creditError(`line ${source.id}: the quantity to credit must be non-zero and have the sign of the invoiced quantity ${source.quantity}`);
        }
        cycleIds = quantity === source.quantity ? [...source.cycleIds] : [];
      }
      const credited = done.quantityByLine.get(source.id) ?? 0;
      if (Math.abs(credited + quantity) > Math.abs(source.quantity)) {
        throw creditError(
          `line ${source.id}: crediting ${quantity} more would exceed the invoiced quantity ${source.quantity} (already credited ${credited})`,
          { lineId: source.id },
        );
      }
      return creditLine(source, String(index + 1), quantity, cycleIds);
    });
  }

  const amountMinor = assertInteger(request.amountMinor, "amount to credit", { min: 1 });
  if (!request.description?.trim()) throw creditError("an amount credit needs a description for its line");
  const invoiceTotals = computeInvoiceTotals(invoice.lines, invoice.allowancesCharges ?? []);
  let vat: VatTreatment;
  if (request.vat) {
    const match = invoiceTotals.vatBreakdown.find((entry) => vatKey(entry) === vatKey(request.vat as VatTreatment));
    if (!match) throw creditError(`invoice ${invoice.id} has no VAT ${request.vat.category} at ${request.vat.rateBasisPoints} bp to credit`);
    vat = { ...request.vat };
  } else if (invoiceTotals.vatBreakdown.length === 1) {
    const only = invoiceTotals.vatBreakdown[0];
    vat = { category: only.category, rateBasisPoints: only.rateBasisPoints, ...(only.exemptionReason ? { exemptionReason: only.exemptionReason } : {}) };
  } else {
    throw creditError(`invoice ${invoice.id} has ${invoiceTotals.vatBreakdown.length} VAT groups; say which one the amount credits`);
  }
  return [
    {
      id: "1",
      kind: "other",
      itemCode: "credit",
      description: request.description.trim(),
      quantity: 1,
      unitCode: "LS",
      unitPriceMinor: amountMinor,
      netAmountMinor: amountMinor,
      vat,
      cycleIds: [],
    },
  ];
}

/**
 * Computes a credit note against `invoice`: its lines, document totals and VAT, refusing to
 * credit a line, a cycle or a VAT group beyond what was invoiced (counting earlier credit notes).
 */
export function computeCreditNote(input: CreditNoteInput): ComputedCreditNote {
  const { invoice, request } = input;
  if (!input.id?.trim()) throw creditError("a credit note needs an id");
  if (!isCalendarDate(input.issueDate)) throw creditError(`issue date must be written YYYY-MM-DD, got ${JSON.stringify(input.issueDate)}`);
  if (input.issueDate < invoice.issueDate) throw creditError(`the credit note cannot be dated before invoice ${invoice.id} (${invoice.issueDate})`);
  if (!input.reason?.trim()) throw creditError("say why the credit is given (reason)");

  const done = alreadyCredited(invoice, input.previousCreditNotes ?? []);
  const lines = linesToCredit(invoice, request, done);
  const allowancesCharges = request.kind === "full" ? (invoice.allowancesCharges ?? []).map((entry) => ({ ...entry, vat: { ...entry.vat } })) : [];
  const totals = computeInvoiceTotals(lines, allowancesCharges);
  if (totals.taxExclusiveMinor <= 0) {
    throw creditError(`the credit note would total ${totals.taxExclusiveMinor} minor units before VAT; a credit note credits a positive amount`);
  }

  const invoiced = computeInvoiceTotals(invoice.lines, invoice.allowancesCharges ?? []);
  for (const entry of totals.vatBreakdown) {
    const key = vatKey(entry);
    const invoicedGroup = invoiced.vatBreakdown.find((group) => vatKey(group) === key);
    const limit = invoicedGroup?.taxableAmountMinor ?? 0;
    const total = sumExact([done.taxableByVat.get(key) ?? 0, entry.taxableAmountMinor], "credited taxable amount");
    if (Math.abs(total) > Math.abs(limit)) {
      throw creditError(
        `credits for VAT ${entry.category} at ${entry.rateBasisPoints} bp would total ${total} minor units, more than the ${limit} invoiced`,
        { category: entry.category },
      );
    }
  }

  const document: CreditNoteDocument = {
    id: input.id,
    issueDate: input.issueDate,
    currency: invoice.currency,
    note: input.reason.trim(),
    ...(invoice.buyerReference ? { buyerReference: invoice.buyerReference } : {}),
    ...(invoice.invoicePeriod ? { invoicePeriod: { ...invoice.invoicePeriod } } : {}),
    supplier: invoice.supplier,
    customer: invoice.customer,
    paymentTerms: input.paymentTerms ?? `Credit against invoice ${invoice.id}, refunded or set off against a later invoice`,
    lines,
    ...(allowancesCharges.length > 0 ? { allowancesCharges } : {}),
    precedingInvoice: { id: invoice.id, issueDate: invoice.issueDate },
  };
  return { document, totals };
}
