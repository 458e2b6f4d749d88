// Our own document numbers (pure). The payment service numbers its copy of an invoice itself;
// these are the numbers on our invoices, exports and credit notes.
//
// - An invoice: <unit>-<month>-<customer>, e.g. LSS-2026-11-QMH. A later run over the same month
//   for the same customer (sets whose delivery was recorded late) gets -2, -3, …:
//   LSS-2026-11-QMH-2.
// - A credit note: <unit>-CN-<month>-<customer>-<n>, numbered per invoice from 1, e.g.
//   LSS-CN-2026-11-QMH-1 for the first credit note on LSS-2026-11-QMH.

const CODE_PATTERN = /^[A-Z0-9]{1,12}$/;
const MONTH_PATTERN = /^\d{4}-(0[1-9]|1[0-2])$/;

function code(value: string, what: string): string {
  const upper = value.trim().toUpperCase();
  if (!CODE_PATTERN.test(upper)) throw new Error(`${what} must be 1–12 letters or digits, got ${JSON.stringify(value)}`);
  return upper;
}

export interface InvoiceNumberParts {
  unitCode: string;
  month: string;
  customerCode: string;
  /** 1 for the month's first invoice to the customer, 2 for the next, … */
  sequence: number;
}

export function invoiceNumber(parts: InvoiceNumberParts): string {
  if (!MONTH_PATTERN.test(parts.month)) throw new Error(`month must be written YYYY-MM, got ${JSON.stringify(parts.month)}`);
  if (!Number.isSafeInteger(parts.sequence) || parts.sequence < 1) throw new Error(`sequence must be a whole number from 1, got ${parts.sequence}`);
  const base = `${code(parts.unitCode, "unit code")}-${parts.month}-${code(parts.customerCode, "customer code")}`;
  return parts.sequence === 1 ? base : `${base}-${parts.sequence}`;
}

/** The first number of the sequence for the month and customer that is not in `taken`. */
export function nextInvoiceNumber(parts: Omit<InvoiceNumberParts, "sequence">, taken: Iterable<string>): string {
  const used = new Set(taken);
  for (let sequence = 1; ; sequence += 1) {
    const candidate = invoiceNumber({ ...parts, sequence });
    if (!used.has(candidate)) return candidate;
  }
}

/** The credit note number for the `sequence`-th credit note on an invoice numbered as above. */
export function creditNoteNumber(invoiceNo: string, sequence: number): string {
  const match = /^([A-Z0-9]{1,12})-(\d{4}-\d{2}-[A-Z0-9]{1,12}(?:-\d+)?)$/.exec(invoiceNo);
  if (!match) throw new Error(`not one of our invoice numbers: ${JSON.stringify(invoiceNo)}`);
  if (!Number.isSafeInteger(sequence) || sequence < 1) throw new Error(`sequence must be a whole number from 1, got ${sequence}`);
  return `${match[1]}-CN-${match[2]}-${sequence}`;
}
