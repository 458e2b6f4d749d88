// Turns a priced billing period into an invoice document ready for totals and UBL export.

import { TZDate } from "@date-fns/tz";
import { format } from "date-fns";
import { PricingError } from "./errors";
import { addCalendarDays, isCalendarDate } from "./period";
import type { PricedPeriod } from "./price-period";
import type { ContractTerms, InvoiceDocument, PaymentMeans, TradeParty } from "./types";

export interface InvoiceHeader {
  id: string;
  /** YYYY-MM-DD. */
  issueDate: string;
  /** The unit's IANA time zone, which decides the calendar dates of the billing period. */
  timeZone: string;
  supplier: TradeParty;
  customer: TradeParty;
  buyerReference?: string;
  paymentMeans?: PaymentMeans;
  note?: string;
}

function localDate(instant: Date, timeZone: string): string {
  return format(new TZDate(instant.getTime(), timeZone), "yyyy-MM-dd");
}

/**
 * The invoice for `priced` under `terms`: its lines, the due date `paymentTermsDays` after the
 * issue date, payment terms in words, and the invoicing period (BG-14) as the inclusive local
 * dates of the half-open billing period.
 */
export function invoiceFromPricedPeriod(priced: PricedPeriod, terms: ContractTerms, header: InvoiceHeader): InvoiceDocument {
  if (priced.contractId !== terms.contractId) {
    throw new PricingError("invalid_document", `the lines were priced under contract ${priced.contractId}, not ${terms.contractId}`);
  }
  if (priced.currency !== terms.currency) {
    throw new PricingError("currency_mismatch", `the lines are in ${priced.currency}, contract ${terms.contractId} in ${terms.currency}`);
  }
  if (!isCalendarDate(header.issueDate)) {
    throw new PricingError("invalid_document", `issue date must be written YYYY-MM-DD, got ${JSON.stringify(header.issueDate)}`);
  }
  try {
    new Intl.DateTimeFormat("en", { timeZone: header.timeZone });
  } catch {
    throw new PricingError("invalid_document", `unknown time zone ${JSON.stringify(header.timeZone)}; use an IANA name such as Europe/London`);
  }
  const start = new Date(priced.period.start);
  const lastInstant = new Date(new Date(priced.period.end).getTime() - 1);
  const days = terms.paymentTermsDays;
  return {
    id: header.id,
    issueDate: header.issueDate,
    dueDate: addCalendarDays(header.issueDate, days),
    currency: priced.currency,
    ...(header.buyerReference ? { buyerReference: header.buyerReference } : {}),
    ...(header.note ? { note: header.note } : {}),
    invoicePeriod: { startDate: localDate(start, header.timeZone), endDate: localDate(lastInstant, header.timeZone) },
    supplier: header.supplier,
    customer: header.customer,
    ...(header.paymentMeans ? { paymentMeans: header.paymentMeans } : {}),
    paymentTerms: days === 0 ? "Payment due on receipt" : `Payment within ${days} days of the invoice date`,
    lines: priced.lines.map((line) => ({ ...line, vat: { ...line.vat }, cycleIds: [...line.cycleIds] })),
  };
}
