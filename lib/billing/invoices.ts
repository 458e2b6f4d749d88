import "server-only";
import { type Kysely, sql, type Transaction } from "kysely";
import { z } from "zod";
import type { Database, InvoiceStatus } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { addDaysToDate, localDateOf } from "@/lib/contracts/dates";
import { daysBetween } from "@/db/dialect";
import { serverEnv } from "@/lib/env";
import { notFound } from "@/lib/errors";
import { fetchPage, listQuerySchema, type Page, searchTerm } from "@/lib/http/paging";
import { computeInvoiceTotals } from "@/lib/pricing/totals";
import { AGE_BUCKETS, type AgeBucket, ageBucketOf } from "./ageing";
import type { InvoiceLine, InvoiceLineKind, VatBreakdown, VatCategoryCode } from "@/lib/pricing/types";

// Invoices as the finance pages and the clinic's invoice pages read them: the list with its age
// (how long past its due date an unpaid invoice is), totals per age bucket, and one invoice with
// its lines, the cycles each line was priced from, its payments, credit notes and reminders.
//
// Decisions:
// - Age is counted in whole days from the due date to the unit's local date today; an open
//   invoice due today or later is "current". Only open invoices have an age: paid, void and
//   uncollectible invoices are no longer owed (uncollectible ones were written off).
// - Totals are given per currency, never added across currencies.
// - A recalled cycle on an invoice is shown with its state as it is now: the invoice bills the
//   processing that was delivered; a credit for it is finance's decision (a credit note).

type Executor = Kysely<Database> | Transaction<Database>;

export const INVOICE_STATUSES = ["draft", "open", "paid", "void", "uncollectible"] as const satisfies readonly InvoiceStatus[];
export { AGE_BUCKETS, type AgeBucket, ageBucketOf } from "./ageing";

/** Inclusive bounds of days overdue for each bucket (null: unbounded). */
const BUCKET_BOUNDS: Record<AgeBucket, [number | null, number | null]> = {
  current: [null, 0],
  "1_30": [1, 30],
  "31_60": [31, 60],
  "61_90": [61, 90],
  over_90: [91, null],
};

/** The unit's local date today, which decides what is overdue. */
export function billingToday(now = new Date()): string {
  return localDateOf(now, serverEnv().UNIT_TIME_ZONE);
}

export const listInvoicesQuerySchema = listQuerySchema(["due_date", "issue_date", "number", "customer", "total", "amount_due", "status"], {
  status: z.enum(INVOICE_STATUSES).optional().or(z.literal("").transform(() => undefined)),
  age: z.enum(AGE_BUCKETS).optional().or(z.literal("").transform(() => undefined)),
  organisationId: z.coerce.number().int().positive().optional().or(z.literal("").transform(() => undefined)),
});
export type ListInvoicesQuery = z.infer<typeof listInvoicesQuerySchema>;

const SORT_COLUMNS = {
  due_date: "invoices.due_date",
  issue_date: "invoices.issue_date",
  number: "invoices.number",
  customer: "organisations.name",
  total: "invoices.total_minor",
  amount_due: "invoices.amount_due_minor",
  status: "invoices.status",
} as const;

export interface InvoiceListRow {
  id: number;
  number: string;
  organisationId: number;
  organisationName: string;
  currency: string;
  periodStart: string;
  periodEnd: string;
  issueDate: string | null;
  dueDate: string | null;
  status: InvoiceStatus;
  totalMinor: number;
  amountPaidMinor: number;
  amountCreditedMinor: number;
  amountDueMinor: number;
  /** Whole days past the due date; null unless the invoice is open. */
  daysOverdue: number | null;
  ageBucket: AgeBucket | null;
  lastPaymentError: string | null;
  paidAt: string | null;
  hasOnlinePayment: boolean;
}

/** Days between the due date and `today`, as SQL (positive once overdue). */
function daysOverdueSql(db: Executor, today: string) {
  return daysBetween(db, sql.ref("invoices.due_date"), today);
}

function scopedInvoices(db: Executor, user: SessionUser) {
  return db
    .selectFrom("invoices")
    .innerJoin("organisations", "organisations.id", "invoices.organisation_id")
    .where(tenantScope(user, { organisation: "invoices.organisation_id" }));
}

type ScopedInvoices = ReturnType<typeof scopedInvoices>;

/** The list's filters as WHERE terms; clinics never see drafts (they are not issued yet). */
function filtered(base: ScopedInvoices, user: SessionUser, query: InvoiceFilters, today: string) {
  let q = base;
  if (user.organisationKind === "customer") q = q.where("invoices.status", "!=", "draft");
  if (query.q) q = q.where(searchTerm(["invoices.number", "organisations.name", "invoices.stripe_number"], query.q));
  if (query.status) q = q.where("invoices.status", "=", query.status);
  if (query.organisationId) q = q.where("invoices.organisation_id", "=", query.organisationId);
  if (query.age) {
    const [min, max] = BUCKET_BOUNDS[query.age];
    q = q.where("invoices.status", "=", "open").where("invoices.due_date", "is not", null);
    // Bounds on days overdue become bounds on the due date: overdue by ≥ min ⇔ due ≤ today − min.
    if (min !== null) q = q.where("invoices.due_date", "<=", addDaysToDate(today, -min));
    if (max !== null) q = q.where("invoices.due_date", ">=", addDaysToDate(today, -max));
  }
  return q;
}

const LIST_COLUMNS = [
  "invoices.id",
  "invoices.number",
  "invoices.organisation_id",
  "organisations.name as organisation_name",
  "invoices.currency",
  "invoices.period_start",
  "invoices.period_end",
  "invoices.issue_date",
  "invoices.due_date",
  "invoices.status",
  "invoices.total_minor",
  "invoices.amount_paid_minor",
  "invoices.amount_credited_minor",
  "invoices.amount_due_minor",
  "invoices.last_payment_error",
  "invoices.paid_at",
  "invoices.hosted_invoice_url",
] as const;

interface ListRowShape {
  id: number;
  number: string;
  organisation_id: number;
  organisation_name: string;
  currency: string;
  period_start: string;
  period_end: string;
  issue_date: string | null;
  due_date: string | null;
  status: InvoiceStatus;
  total_minor: number;
  amount_paid_minor: number;
  amount_credited_minor: number;
  amount_due_minor: number;
  last_payment_error: string | null;
  paid_at: string | null;
  hosted_invoice_url: string | null;
  days_overdue: number | null;
}

function toListRow(r: ListRowShape): InvoiceListRow {
  const open = r.status === "open" && r.due_date !== null && r.days_overdue !== null;
  return {
    id: r.id,
    number: r.number,
    organisationId: r.organisation_id,
    organisationName: r.organisation_name,
    currency: r.currency,
    periodStart: r.period_start,
    periodEnd: r.period_end,
    issueDate: r.issue_date,
    dueDate: r.due_date,
    status: r.status,
    totalMinor: r.total_minor,
    amountPaidMinor: r.amount_paid_minor,
    amountCreditedMinor: r.amount_credited_minor,
    amountDueMinor: r.amount_due_minor,
    daysOverdue: open ? Number(r.days_overdue) : null,
    ageBucket: open ? ageBucketOf(Number(r.days_overdue)) : null,
    lastPaymentError: r.last_payment_error,
    paidAt: r.paid_at,
    hasOnlinePayment: r.hosted_invoice_url !== null,
  };
}

/** Invoices in the caller's scope, paged, sorted and filtered. */
export async function listInvoices(db: Executor, user: SessionUser, query: ListInvoicesQuery, now = new Date()): Promise<Page<InvoiceListRow>> {
  const today = billingToday(now);
  const base = filtered(scopedInvoices(db, user), user, query, today);
  const page = await fetchPage(
    base,
    (qb) => qb.select(LIST_COLUMNS).select(daysOverdueSql(db, today).as("days_overdue")),
    query,
    SORT_COLUMNS[query.sort],
    "invoices.id",
  );
  return { total: page.total, rows: page.rows.map((r) => toListRow(r as ListRowShape)) };
}

export type InvoiceFilters = Omit<ListInvoicesQuery, "page" | "pageSize" | "sort" | "dir">;

/** Every invoice the filters match, in number order (for exports; no paging). */
export async function allInvoices(db: Executor, user: SessionUser, filters: InvoiceFilters, now = new Date()): Promise<InvoiceListRow[]> {
  const today = billingToday(now);
  const rows = await filtered(scopedInvoices(db, user), user, filters, today)
    .select(LIST_COLUMNS)
    .select(daysOverdueSql(db, today).as("days_overdue"))
    .orderBy("invoices.number")
    .orderBy("invoices.id")
    .execute();
  return rows.map((r) => toListRow(r as ListRowShape));
}

export interface CurrencyTotals {
  currency: string;
  count: number;
  totalMinor: number;
  amountDueMinor: number;
}

export interface InvoiceSummary {
  /** The filtered list's totals, per currency. */
  filtered: CurrencyTotals[];
  /** Open invoices by age, per currency (unfiltered by status and age, filtered by customer and search). */
  ageing: { bucket: AgeBucket; totals: CurrencyTotals[] }[];
  /** Every status, per currency (same filters as the ageing). */
  byStatus: { status: InvoiceStatus; totals: CurrencyTotals[] }[];
}

function toTotals(rows: { currency: string; n: number | bigint; total: number | null; due: number | null }[]): CurrencyTotals[] {
  return rows
    .map((r) => ({ currency: r.currency, count: Number(r.n), totalMinor: Number(r.total ?? 0), amountDueMinor: Number(r.due ?? 0) }))
    .sort((a, b) => a.currency.localeCompare(b.currency));
}

/** Totals of the list as filtered, the ageing of open invoices, and counts by status. */
export async function summariseInvoices(
  db: Executor,
  user: SessionUser,
  query: InvoiceFilters,
  now = new Date(),
): Promise<InvoiceSummary> {
  const today = billingToday(now);
  const aggregate = <Q extends ScopedInvoices>(q: Q) =>
    q
      .select([
        "invoices.currency as currency",
        sql<number>`count(*)`.as("n"),
        sql<number>`sum(invoices.total_minor)`.as("total"),
        sql<number>`sum(invoices.amount_due_minor)`.as("due"),
      ])
      .groupBy("invoices.currency");

  const filteredRows = await aggregate(filtered(scopedInvoices(db, user), user, query, today)).execute();
  const broad = { q: query.q, organisationId: query.organisationId };
  const bucketSql = sql<AgeBucket>`case
    when ${daysOverdueSql(db, today)} <= 0 then 'current'
    when ${daysOverdueSql(db, today)} <= 30 then '1_30'
    when ${daysOverdueSql(db, today)} <= 60 then '31_60'
    when ${daysOverdueSql(db, today)} <= 90 then '61_90'
    else 'over_90' end`;
  const ageRows = await filtered(scopedInvoices(db, user), user, broad, today)
    .where("invoices.status", "=", "open")
    .where("invoices.due_date", "is not", null)
    .select([
      bucketSql.as("bucket"),
      "invoices.currency as currency",
      sql<number>`count(*)`.as("n"),
      sql<number>`sum(invoices.total_minor)`.as("total"),
      sql<number>`sum(invoices.amount_due_minor)`.as("due"),
    ])
    .groupBy(["bucket", "invoices.currency"])
    .execute();
  const statusRows = await filtered(scopedInvoices(db, user), user, broad, today)
    .select([
      "invoices.status as status",
      "invoices.currency as currency",
      sql<number>`count(*)`.as("n"),
      sql<number>`sum(invoices.total_minor)`.as("total"),
      sql<number>`sum(invoices.amount_due_minor)`.as("due"),
    ])
    .groupBy(["invoices.status", "invoices.currency"])
    .execute();
  const statuses = user.organisationKind === "customer" ? INVOICE_STATUSES.filter((s) => s !== "draft") : INVOICE_STATUSES;
  return {
    filtered: toTotals(filteredRows),
    ageing: AGE_BUCKETS.map((bucket) => ({ bucket, totals: toTotals(ageRows.filter((r) => r.bucket === bucket)) })),
    byStatus: statuses.map((status) => ({ status, totals: toTotals(statusRows.filter((r) => r.status === status)) })),
  };
}

// ---- one invoice ----

export interface EvidenceCycle {
  cycleId: number;
  serial: string;
  setName: string;
  siteName: string;
  deliveredAt: string | null;
  late: boolean;
  state: string;
}

export interface InvoiceLineView {
  id: number;
  position: number;
  kind: InvoiceLineKind;
  itemCode: string;
  description: string;
  note: string | null;
  quantity: number;
  unitCode: string;
  unitPriceMinor: number;
  netMinor: number;
  vatCategory: VatCategoryCode;
  vatRateBasisPoints: number;
  cycles: EvidenceCycle[];
}

export interface PaymentView {
  id: number;
  stripePaymentId: string;
  amountMinor: number;
  currency: string;
  status: string;
  paidAt: string | null;
}

export interface CreditNoteView {
  id: number;
  number: string;
  reason: string;
  netMinor: number;
  vatMinor: number;
  totalMinor: number;
  settlement: "amount_due" | "refund" | "out_of_band" | null;
  createdAt: string;
  createdByName: string | null;
}

export interface ReminderSent {
  daysAfterDue: number;
  queuedAt: string;
  recipients: number;
}

export interface InvoiceDetail extends InvoiceListRow {
  runId: number | null;
  contractId: number | null;
  organisationShortCode: string;
  lineTotalMinor: number;
  taxExclusiveMinor: number;
  vatMinor: number;
  vatBreakdown: VatBreakdown[];
  hostedInvoiceUrl: string | null;
  stripeInvoiceId: string | null;
  stripeNumber: string | null;
  createdAt: string;
  updatedAt: string;
  lines: InvoiceLineView[];
  payments: PaymentView[];
  creditNotes: CreditNoteView[];
  reminders: ReminderSent[];
}

const CATEGORY_CODES = new Set(["S", "Z", "E", "AE", "K", "G", "O", "L", "M"]);
const LINE_KINDS = new Set(["processing", "surcharge", "sla_credit", "minimum_fee_top_up", "other"]);

/** The cycle ids a line was priced from (stored as a JSON array of numbers or numeric strings). */
export function parseCycleIds(json: string | null | undefined): number[] {
  let value: unknown;
  try {
    value = JSON.parse(json ?? "[]");
  } catch {
    return [];
  }
  if (!Array.isArray(value)) return [];
  return value.map((v) => Number(v)).filter((n) => Number.isSafeInteger(n) && n > 0);
}

/**
 * UN/ECE Rec. 20 unit of a stored line: the pricing engine prices per set ("C62", one) and
 * writes lump sums ("LS") for minimum-fee top-ups, SLA credits, percentage surcharges (which
 * carry a note saying how they were computed) and other lines.
 */
export function unitCodeOf(line: { kind: string; note: string | null; quantity: number }): string {
  if (line.kind === "minimum_fee_top_up" || line.kind === "sla_credit" || line.kind === "other") return "LS";
  if (line.kind === "surcharge" && line.note && line.quantity === 1) return "LS";
  return "C62";
}

/** Exemption reasons by "category|rate" from the stored VAT breakdown, when it carries any. */
export function exemptionReasons(json: string | null | undefined): Map<string, string> {
  const reasons = new Map<string, string>();
  let value: unknown;
  try {
    value = JSON.parse(json ?? "[]");
  } catch {
    return reasons;
  }
  if (!Array.isArray(value)) return reasons;
  for (const entry of value as Record<string, unknown>[]) {
    const category = entry?.category;
    const rate = entry?.rateBasisPoints ?? entry?.rate_basis_points ?? entry?.rate_bp;
    const reason = entry?.exemptionReason ?? entry?.exemption_reason;
    if (typeof category === "string" && typeof rate === "number" && typeof reason === "string" && reason.trim()) {
      reasons.set(`${category}|${rate}`, reason.trim());
    }
  }
  return reasons;
}

/** The stored lines of an invoice in the pricing engine's shape (for totals, UBL and credits). */
export function toPricingLines(
  rows: { position: number; kind: string; item_code: string; description: string; note: string | null; quantity: number; unit_price_minor: number; net_minor: number; vat_category: string; vat_rate_bp: number; cycle_ids: string }[],
  vatBreakdownJson: string,
): InvoiceLine[] {
  const reasons = exemptionReasons(vatBreakdownJson);
  return rows.map((r) => {
    const category = (CATEGORY_CODES.has(r.vat_category) ? r.vat_category : "S") as VatCategoryCode;
    const reason = reasons.get(`${category}|${r.vat_rate_bp}`);
    return {
      id: String(r.position),
      kind: (LINE_KINDS.has(r.kind) ? r.kind : "other") as InvoiceLineKind,
      itemCode: r.item_code,
      description: r.description,
      ...(r.note ? { note: r.note } : {}),
      quantity: r.quantity,
      unitCode: unitCodeOf(r),
      unitPriceMinor: r.unit_price_minor,
      netAmountMinor: r.net_minor,
      vat: { category, rateBasisPoints: r.vat_rate_bp, ...(reason ? { exemptionReason: reason } : {}) },
      cycleIds: parseCycleIds(r.cycle_ids).map(String),
    };
  });
}

/** The invoice row itself in the caller's scope (clinics never see drafts), or 404. */
export async function findInvoiceInScope(db: Executor, user: SessionUser, id: number) {
  let q = scopedInvoices(db, user).selectAll("invoices").select(["organisations.name as organisation_name", "organisations.short_code"]).where("invoices.id", "=", id);
  if (user.organisationKind === "customer") q = q.where("invoices.status", "!=", "draft");
  const row = await q.executeTakeFirst();
  if (!row) throw notFound("That invoice");
  return row;
}

/** Reads the lines of an invoice, in order. */
export async function invoiceLineRows(db: Executor, invoiceId: number) {
  return db.selectFrom("invoice_lines").selectAll().where("invoice_id", "=", invoiceId).orderBy("position").execute();
}

/** One invoice in the caller's scope with its lines, evidence, payments, credit notes and reminders; 404 otherwise. */
export async function getInvoiceDetail(db: Executor, user: SessionUser, id: number, now = new Date()): Promise<InvoiceDetail> {
  const today = billingToday(now);
  const row = await findInvoiceInScope(db, user, id);
  const daysOverdue =
    row.due_date === null ? null : Math.round((Date.parse(`${today}T00:00:00Z`) - Date.parse(`${row.due_date}T00:00:00Z`)) / 86_400_000);
  const listRow = toListRow({ ...row, days_overdue: daysOverdue });

  const lineRows = await invoiceLineRows(db, id);
  const pricingLines = toPricingLines(lineRows, row.vat_breakdown);
  const totals = computeInvoiceTotals(pricingLines);

  const allCycleIds = [...new Set(lineRows.flatMap((l) => parseCycleIds(l.cycle_ids)))];
  const cycles = new Map<number, EvidenceCycle>();
  // SQLite allows a limited number of bound values per statement: read the evidence in chunks.
  for (let i = 0; i < allCycleIds.length; i += 500) {
    const chunk = allCycleIds.slice(i, i + 500);
    const found = await db
      .selectFrom("cycles")
      .innerJoin("sets", "sets.id", "cycles.set_id")
      .innerJoin("set_types", "set_types.id", "sets.set_type_id")
      .innerJoin("sites", "sites.id", "cycles.site_id")
      .leftJoin("priced_cycles", "priced_cycles.cycle_id", "cycles.id")
      .select([
        "cycles.id",
        "cycles.state",
        "cycles.delivered_at",
        "sets.serial",
        "set_types.name as set_name",
        "sites.name as site_name",
        "priced_cycles.late",
      ])
      .where("cycles.id", "in", chunk)
      // The evidence belongs to the invoice's customer, whatever the stored ids say.
      .where("cycles.organisation_id", "=", row.organisation_id)
      .execute();
    for (const c of found) {
      cycles.set(c.id, {
        cycleId: c.id,
        serial: c.serial,
        setName: c.set_name,
        siteName: c.site_name,
        deliveredAt: c.delivered_at,
        late: c.late === 1,
        state: c.state,
      });
    }
  }

  const payments = await db
    .selectFrom("payments")
    .selectAll()
    .where("invoice_id", "=", id)
    .orderBy("created_at")
    .orderBy("id")
    .execute();
  const creditNotes = await db
    .selectFrom("credit_notes")
    .leftJoin("users", "users.id", "credit_notes.created_by")
    .select([
      "credit_notes.id",
      "credit_notes.number",
      "credit_notes.reason",
      "credit_notes.net_minor",
      "credit_notes.vat_minor",
      "credit_notes.total_minor",
      "credit_notes.settlement",
      "credit_notes.created_at",
      "users.name as created_by_name",
    ])
    .where("credit_notes.invoice_id", "=", id)
    .orderBy("credit_notes.id")
    .execute();
  const reminderRows = await db
    .selectFrom("outbox")
    .select(["dedupe_key", "created_at"])
    .where("template", "=", "billing.reminder")
    .where("dedupe_key", "like", `invoice_reminder:${id}:%`)
    .orderBy("created_at")
    .execute();
  const reminders = new Map<number, ReminderSent>();
  for (const r of reminderRows) {
    const days = Number(r.dedupe_key?.split(":")[2]);
    if (!Number.isInteger(days)) continue;
    const entry = reminders.get(days) ?? { daysAfterDue: days, queuedAt: r.created_at, recipients: 0 };
    entry.recipients++;
    reminders.set(days, entry);
  }

  return {
    ...listRow,
    runId: row.run_id,
    contractId: row.contract_id,
    organisationShortCode: row.short_code,
    lineTotalMinor: row.line_total_minor,
    taxExclusiveMinor: row.tax_exclusive_minor,
    vatMinor: row.vat_minor,
    vatBreakdown: totals.vatBreakdown,
    hostedInvoiceUrl: row.hosted_invoice_url,
    stripeInvoiceId: row.stripe_invoice_id,
    stripeNumber: row.stripe_number,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
    lines: lineRows.map((l, index) => ({
      id: l.id,
      position: l.position,
      kind: pricingLines[index]!.kind,
      itemCode: l.item_code,
      description: l.description,
      note: l.note,
      quantity: l.quantity,
      unitCode: pricingLines[index]!.unitCode ?? "C62",
      unitPriceMinor: l.unit_price_minor,
      netMinor: l.net_minor,
      vatCategory: pricingLines[index]!.vat.category,
      vatRateBasisPoints: l.vat_rate_bp,
      cycles: parseCycleIds(l.cycle_ids)
        .map((cid) => cycles.get(cid))
        .filter((c): c is EvidenceCycle => c !== undefined),
    })),
    payments: payments.map((p) => ({
      id: p.id,
      stripePaymentId: p.stripe_payment_id,
      amountMinor: p.amount_minor,
      currency: p.currency,
      status: p.status,
      paidAt: p.paid_at,
    })),
    creditNotes: creditNotes.map((c) => ({
      id: c.id,
      number: c.number,
      reason: c.reason,
      netMinor: c.net_minor,
      vatMinor: c.vat_minor,
      totalMinor: c.total_minor,
      settlement: c.settlement,
      createdAt: c.created_at,
      createdByName: c.created_by_name,
    })),
    reminders: [...reminders.values()].sort((a, b) => a.daysAfterDue - b.daysAfterDue),
  };
}

/** Customers that have invoices, for the finance filter. */
export async function invoiceCustomers(db: Executor, user: SessionUser): Promise<{ id: number; name: string }[]> {
  const rows = await scopedInvoices(db, user)
    .select(["organisations.id", "organisations.name"])
    .distinct()
    .orderBy("organisations.name")
    .execute();
  return rows.map((r) => ({ id: r.id, name: r.name }));
}
