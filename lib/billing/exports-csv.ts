import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { toCsv } from "@/lib/csv";
import { formatBasisPoints, formatMinor } from "@/lib/pricing/money";
import { calendarDate, periodDates } from "./exports-document";
import { allInvoices, type InvoiceFilters, parseCycleIds, unitCodeOf } from "./invoices";

// Finance's CSV exports: one row per invoice (headers), or one row per invoice line. Amounts are
// decimals in the invoice's currency ("1656.25"), dates are calendar dates, one currency column.
// Every cell goes through lib/csv.ts, which neutralises spreadsheet formulas.

export { safeCell } from "@/lib/csv";

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
