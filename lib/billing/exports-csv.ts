import "server-only";
import type { Kysely } from "kysely";
import Papa from "papaparse";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { formatBasisPoints, formatMinor } from "@/lib/pricing/money";
import { calendarDate, periodDates } from "./exports-document";
import { allInvoices, type InvoiceFilters, parseCycleIds, unitCodeOf } from "./invoices";

// Finance's CSV exports: one row per invoice (headers), or one row per invoice line. Amounts are
// decimals in the invoice's currency ("1656.25"), dates are calendar dates, one currency column.
//
// Spreadsheet formula injection (OWASP, "CSV Injection"): a text cell that begins with =, +, -,
// @, a tab or a carriage return is prefixed with a single quote, so a spreadsheet shows it as
// text instead of evaluating it. The amounts and counts we write ourselves are plain decimal
// numbers ("-12.50"), which no spreadsheet evaluates as a formula; they are left as numbers so
// that they still add up.

const FORMULA_START = /^[=+\-@\t\r]/;
const PLAIN_NUMBER = /^-?\d+(\.\d+)?$/;

/** A cell made safe to open in a spreadsheet. */
export function safeCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return "";
  const text = String(value);
  if (typeof value === "number" || PLAIN_NUMBER.test(text)) return text;
  return FORMULA_START.test(text) ? `'${text}` : text;
}

function toCsv(header: string[], rows: (string | number | null)[][]): string {
  // A byte-order mark lets spreadsheet programs read the file as UTF-8 (names with accents).
  return `\uFEFF${Papa.unparse({ fields: header, data: rows.map((r) => r.map(safeCell)) }, { newline: "\r\n", quotes: false })}\r\n`;
}

const HEADER_COLUMNS = [
  "invoice_number",
  "customer",
  "status",
  "currency",
  "period_start",
  "period_end",
  "issue_date",
  "due_date",
  "days_overdue",
  "total_with_vat",
  "amount_paid",
  "amount_credited",
  "amount_due",
  "paid_at",
  "last_payment_error",
];

/** One row per invoice matching the filters. */
export async function invoiceHeadersCsv(db: Kysely<Database>, user: SessionUser, filters: InvoiceFilters, now = new Date()): Promise<string> {
  const invoices = await allInvoices(db, user, filters, now);
  const rows = invoices.map((i) => {
    const period = periodDates(i.periodStart, i.periodEnd);
    return [
      i.number,
      i.organisationName,
      i.status,
      i.currency,
      period.startDate,
      period.endDate,
      i.issueDate ? calendarDate(i.issueDate) : null,
      i.dueDate ? calendarDate(i.dueDate) : null,
      i.daysOverdue !== null && i.daysOverdue > 0 ? i.daysOverdue : null,
      formatMinor(i.totalMinor),
      formatMinor(i.amountPaidMinor),
      formatMinor(i.amountCreditedMinor),
      formatMinor(i.amountDueMinor),
      i.paidAt,
      i.lastPaymentError,
    ];
  });
  return toCsv(HEADER_COLUMNS, rows);
}

const LINE_COLUMNS = [
  "invoice_number",
  "customer",
  "currency",
  "line",
  "kind",
  "item_code",
  "description",
  "note",
  "quantity",
  "unit",
  "unit_price",
  "net_amount",
  "vat_category",
  "vat_rate_percent",
  "sets",
  "cycle_ids",
];

/** One row per line of every invoice matching the filters. */
export async function invoiceLinesCsv(db: Kysely<Database>, user: SessionUser, filters: InvoiceFilters, now = new Date()): Promise<string> {
  const invoices = await allInvoices(db, user, filters, now);
  const byId = new Map(invoices.map((i) => [i.id, i]));
  const rows: (string | number | null)[][] = [];
  const ids = invoices.map((i) => i.id);
  for (let start = 0; start < ids.length; start += 500) {
    const chunk = ids.slice(start, start + 500);
    const lines = await db.selectFrom("invoice_lines").selectAll().where("invoice_id", "in", chunk).orderBy("invoice_id").orderBy("position").execute();
    for (const line of lines) {
      const invoice = byId.get(line.invoice_id)!;
      const cycleIds = parseCycleIds(line.cycle_ids);
      rows.push([
        invoice.number,
        invoice.organisationName,
        invoice.currency,
        line.position,
        line.kind,
        line.item_code,
        line.description,
        line.note,
        line.quantity,
        unitCodeOf(line),
        formatMinor(line.unit_price_minor),
        formatMinor(line.net_minor),
        line.vat_category,
        formatBasisPoints(line.vat_rate_bp),
        cycleIds.length,
        cycleIds.join(" "),
      ]);
    }
  }
  rows.sort((a, b) => String(a[0]).localeCompare(String(b[0])) || Number(a[3]) - Number(b[3]));
  return toCsv(LINE_COLUMNS, rows);
}
