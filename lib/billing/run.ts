import "server-only";
import { createHash } from "node:crypto";
import { type Kysely, sql, type Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { isCustomerRole } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session-user";
import { contractTermsBetween } from "@/lib/contracts/service";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import type { InvoiceLineKind, VatBreakdown } from "@/lib/pricing/types";
import { nextInvoiceNumber } from "./numbering";
import { type BillableCycle, type CycleEvidence, type EarlierPartBilling, priceCustomerMonth, type PricedPart, type RunLine } from "./run-pricing";
import { billingPeriod, isBillingMonth, type Interval, monthLabel, monthOf, partAt, type PeriodPart, splitPeriod } from "./run-periods";

// Invoice runs: the preview of a month, the draft run with one invoice per customer, approval,
// discarding a draft, and reading runs back. Issuing through the payment service is in
// run-issue.ts.
//
// Decisions:
// - What is billed: cycles in state "delivered" whose delivery falls in the month and that have
//   no priced_cycles row. A delivered set that was recalled afterwards is billed once, when it is
//   finally delivered again (its delivered_at is then the last delivery); a cycle already priced
//   stays priced, and a credit for a recall is finance's decision (a credit note). The primary
//   key of priced_cycles guarantees a cycle is priced at most once, whatever runs overlap.
// - A customer with delivered sets but no invoice (no contract, a class missing from its rate
//   card, …) shows in the preview with the reasons and is left out of the run; its cycles stay
//   unpriced, so a later run over the same month picks them up once the contract is fixed.
// - A month with no delivered sets for a customer gives it no invoice, so no minimum fee.
// - A run is created only for a month that has ended (bands and the minimum fee are monthly).
// - The creator may approve the run (a small unit has one finance officer); the audit log keeps
//   who created and who approved, and the run page says when both were the same person.
// - A draft run can be discarded: its invoices and priced_cycles rows go, so the cycles can be
//   priced again. Approved runs cannot be discarded or changed.
// - One transaction per change: a run is created with all its invoices, lines and priced cycles,
//   or not at all.

type Executor = Kysely<Database> | Transaction<Database>;

export type RunStatus = Database["invoice_runs"]["status"];

export interface PreviewLine {
  position: number;
  kind: InvoiceLineKind;
  itemCode: string;
  description: string;
  note: string | null;
  quantity: number;
  unitPriceMinor: number;
  netMinor: number;
  vatCategory: string;
  vatRateBasisPoints: number;
  cycleIds: number[];
  contractReference: string;
}

export interface TotalsView {
  lineTotalMinor: number;
  taxExclusiveMinor: number;
  vatMinor: number;
  totalMinor: number;
  vatBreakdown: VatBreakdown[];
}

export interface PreviewCustomer {
  organisationId: number;
  name: string;
  shortCode: string;
  status: "ready" | "blocked";
  problems: string[];
  warnings: string[];
  /** The number the invoice would get if the run were created now. */
  invoiceNumber: string | null;
  currency: string | null;
  contractReference: string | null;
  paymentTermsDays: number | null;
  parts: PricedPart[];
  lines: PreviewLine[];
  totals: TotalsView | null;
  cycles: CycleEvidence[];
  lateCount: number;
}

export interface RunPreview {
  period: string;
  label: string;
  periodStart: string;
  periodEnd: string;
  /** False while the month is still running: it can be previewed, not billed. */
  ended: boolean;
  /** Changes whenever what the run would bill changes; creating a run checks it. */
  token: string;
  customers: PreviewCustomer[];
  totals: { currency: string; invoices: number; totalMinor: number }[];
}

interface CustomerComputation {
  preview: PreviewCustomer;
  lines: RunLine[];
  contractId: number | null;
}

function timeZone(): string {
  return serverEnv().UNIT_TIME_ZONE;
}

/** Throws a clear 422 unless `month` is a month that has started. */
function assertMonth(month: string, now: Date): Interval {
  if (!isBillingMonth(month)) {
    throw new AppError("validation", "Choose a month, written YYYY-MM (for example 2026-11).", { period: ["Write the month as YYYY-MM."] });
  }
  const period = billingPeriod(month, timeZone());
  if (Date.parse(period.start) > now.getTime()) {
    throw new AppError("validation", `${monthLabel(month)} has not started yet; choose a month up to ${monthLabel(monthOf(now, timeZone()))}.`, {
      period: ["Choose a month that has started."],
    });
  }
  return period;
}

/** The unit's own short code, which starts our invoice numbers. */
async function unitCode(db: Executor): Promise<string> {
  const unit = await db.selectFrom("organisations").select("short_code").where("kind", "=", "unit").orderBy("id").executeTakeFirst();
  if (!unit) throw new AppError("conflict", "The unit's own organisation is missing; add it before billing.");
  return unit.short_code;
}

async function takenNumbers(db: Executor, prefix: string): Promise<string[]> {
  const rows = await db
    .selectFrom("invoices")
    .select("number")
    .where("number", "like", `${prefix.replaceAll("%", "")}%`)
    .execute();
  return rows.map((r) => r.number);
}

/** The customer's delivered cycles of the period that no invoice has priced yet. */
export async function unpricedCycles(db: Executor, organisationId: number, period: Interval): Promise<BillableCycle[]> {
  const rows = await db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .leftJoin("priced_cycles", "priced_cycles.cycle_id", "cycles.id")
    .select([
      "cycles.id",
      "sets.serial",
      "set_types.name as set_name",
      "set_types.set_class",
      "set_types.sterilisation_method",
      "cycles.service_level",
      "cycles.heavy_soil",
      "cycles.out_of_hours",
      "cycles.missing_instrument",
      "cycles.loaner",
      "cycles.received_at",
      "cycles.released_at",
      "cycles.delivered_at",
    ])
    .where("cycles.organisation_id", "=", organisationId)
    .where("cycles.delivered_at", ">=", period.start)
    .where("cycles.delivered_at", "<", period.end)
    .where("cycles.state", "=", "delivered")
    .where("priced_cycles.cycle_id", "is", null)
    .orderBy("cycles.delivered_at")
    .orderBy("cycles.id")
    .execute();
  return rows.map((r) => ({
    id: r.id,
    serial: r.serial,
    setName: r.set_name,
    setClass: r.set_class,
    serviceLevel: r.service_level,
    heavySoil: r.heavy_soil === 1,
    outOfHours: r.out_of_hours === 1,
    missingInstrument: r.missing_instrument === 1,
    lowTemperature: r.sterilisation_method === "low_temperature",
    loaner: r.loaner === 1,
    receivedAt: r.received_at,
    releasedAt: r.released_at,
    deliveredAt: r.delivered_at!,
  }));
}

/** What earlier (not void) invoices of the same month billed the customer, per contract version. */
async function earlierBilling(
  db: Executor,
  organisationId: number,
  period: Interval,
  parts: readonly PeriodPart<{ id: number }>[],
): Promise<EarlierPartBilling[]> {
  const invoices = await db
    .selectFrom("invoices")
    .select(["id", "number"])
    .where("organisation_id", "=", organisationId)
    .where("period_start", "=", period.start)
    .where("status", "!=", "void")
    .execute();
  if (invoices.length === 0) return [];
  const ids = invoices.map((i) => i.id);
  const priced = await db
    .selectFrom("priced_cycles")
    .innerJoin("cycles", "cycles.id", "priced_cycles.cycle_id")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["priced_cycles.cycle_id", "priced_cycles.invoice_id", "cycles.delivered_at", "set_types.set_class"])
    .where("priced_cycles.invoice_id", "in", ids)
    .execute();
  const contractOfCycle = new Map<number, number>();
  const byContract = new Map<number, EarlierPartBilling>();
  const numberOf = new Map(invoices.map((i) => [i.id, i.number]));
  const entry = (contractId: number) => {
    let e = byContract.get(contractId);
    if (!e) {
      e = { contractId, classCounts: new Map(), baseMinor: 0, topUpMinor: 0, invoiceNumbers: [] };
      byContract.set(contractId, e);
    }
    return e;
  };
  for (const row of priced) {
    const part = row.delivered_at ? partAt(parts, row.delivered_at) : undefined;
    if (!part) continue;
    contractOfCycle.set(row.cycle_id, part.terms.id);
    const e = entry(part.terms.id);
    e.classCounts.set(row.set_class, (e.classCounts.get(row.set_class) ?? 0) + 1);
    const number = numberOf.get(row.invoice_id)!;
    if (!e.invoiceNumbers.includes(number)) e.invoiceNumbers.push(number);
  }
  const lines = await db
    .selectFrom("invoice_lines")
    .select(["kind", "net_minor", "cycle_ids"])
    .where("invoice_id", "in", ids)
    .where("kind", "in", ["processing", "surcharge", "minimum_fee_top_up"])
    .execute();
  for (const line of lines) {
    const first = (JSON.parse(line.cycle_ids) as unknown[]).map(Number)[0];
    const contractId = first === undefined ? undefined : contractOfCycle.get(first);
    if (contractId === undefined) continue;
    const e = entry(contractId);
    if (line.kind === "minimum_fee_top_up") e.topUpMinor += line.net_minor;
    else e.baseMinor += line.net_minor;
  }
  return [...byContract.values()];
}

async function computeCustomer(
  db: Executor,
  org: { id: number; name: string; short_code: string },
  month: string,
  period: Interval,
  unit: string,
): Promise<CustomerComputation | null> {
  const cycles = await unpricedCycles(db, org.id, period);
  if (cycles.length === 0) return null;
  const zone = timeZone();
  const versions = await contractTermsBetween(db, org.id, period, zone);
  const earlier = await earlierBilling(db, org.id, period, splitPeriod(period, versions));
  const result = priceCustomerMonth({ period, timeZone: zone, versions, cycles, earlier });
  const base = {
    organisationId: org.id,
    name: org.name,
    shortCode: org.short_code,
    warnings: result.warnings,
    cycles: result.evidence,
    lateCount: result.evidence.filter((c) => c.late).length,
  };
  if (!result.ok) {
    return {
      preview: {
        ...base,
        status: "blocked",
        problems: result.problems,
        invoiceNumber: null,
        currency: null,
        contractReference: null,
        paymentTermsDays: null,
        parts: [],
        lines: [],
        totals: null,
      },
      lines: [],
      contractId: null,
    };
  }
  const parts = { unitCode: unit, month, customerCode: org.short_code };
  const number = nextInvoiceNumber(parts, await takenNumbers(db, `${unit}-${month}-${org.short_code}`));
  return {
    preview: {
      ...base,
      status: "ready",
      problems: [],
      invoiceNumber: number,
      currency: result.currency,
      contractReference: result.contract.reference,
      paymentTermsDays: result.contract.paymentTermsDays,
      parts: result.parts,
      lines: result.lines.map((line) => ({
        position: line.position,
        kind: line.kind,
        itemCode: line.itemCode,
        description: line.description,
        note: line.note,
        quantity: line.quantity,
        unitPriceMinor: line.unitPriceMinor,
        netMinor: line.netMinor,
        vatCategory: line.vat.category,
        vatRateBasisPoints: line.vat.rateBasisPoints,
        cycleIds: line.cycleIds,
        contractReference: line.contractReference,
      })),
      totals: {
        lineTotalMinor: result.totals.lineTotalMinor,
        taxExclusiveMinor: result.totals.taxExclusiveMinor,
        vatMinor: result.totals.vatTotalMinor,
        totalMinor: result.totals.taxInclusiveMinor,
        vatBreakdown: result.totals.vatBreakdown,
      },
    },
    lines: result.lines,
    contractId: result.contract.id,
  };
}

function tokenOf(month: string, customers: CustomerComputation[]): string {
  const hash = createHash("sha256");
  hash.update(month);
  for (const { preview } of customers) {
    hash.update(
      JSON.stringify([
        preview.organisationId,
        preview.status,
        preview.invoiceNumber,
        preview.totals?.totalMinor ?? null,
        preview.lines.map((l) => [l.itemCode, l.quantity, l.netMinor]),
        preview.cycles.map((c) => c.cycleId),
      ]),
    );
  }
  return hash.digest("hex").slice(0, 32);
}

async function compute(db: Executor, month: string, now: Date): Promise<{ preview: RunPreview; customers: CustomerComputation[] }> {
  const period = assertMonth(month, now);
  const unit = await unitCode(db);
  const orgs = await db.selectFrom("organisations").select(["id", "name", "short_code"]).where("kind", "=", "customer").orderBy("name").execute();
  const customers: CustomerComputation[] = [];
  for (const org of orgs) {
    const computed = await computeCustomer(db, org, month, period, unit);
    if (computed) customers.push(computed);
  }
  const totals = new Map<string, { currency: string; invoices: number; totalMinor: number }>();
  for (const { preview } of customers) {
    if (!preview.totals || !preview.currency) continue;
    const t = totals.get(preview.currency) ?? { currency: preview.currency, invoices: 0, totalMinor: 0 };
    t.invoices += 1;
    t.totalMinor += preview.totals.totalMinor;
    totals.set(preview.currency, t);
  }
  return {
    preview: {
      period: month,
      label: monthLabel(month),
      periodStart: period.start,
      periodEnd: period.end,
      ended: Date.parse(period.end) <= now.getTime(),
      token: tokenOf(month, customers),
      customers: customers.map((c) => c.preview),
      totals: [...totals.values()],
    },
    customers,
  };
}

/** What a run for `month` would bill now, per customer; writes nothing. */
export async function previewRun(db: Executor, month: string, now = new Date()): Promise<RunPreview> {
  return (await compute(db, month, now)).preview;
}

export interface CreatedRun {
  runId: number;
  invoices: { id: number; number: string; organisationName: string; totalMinor: number; currency: string }[];
  skipped: { organisationName: string; problems: string[] }[];
}

/** Creates the draft run inside the caller's transaction (the seed uses this directly). */
export async function createRunIn(
  trx: Transaction<Database>,
  actorId: number | null,
  input: { period: string; token?: string },
  now: Date,
): Promise<CreatedRun> {
  const { preview, customers } = await compute(trx, input.period, now);
  if (!preview.ended) {
    throw new AppError("validation", `${preview.label} has not ended yet; its run can be created once the month is over.`, {
      period: ["Choose a month that has ended."],
    });
  }
  if (input.token && input.token !== preview.token) {
    throw new AppError("conflict", `What ${preview.label} would bill has changed since you previewed it. Look at the new preview, then create the run.`);
  }
  const ready = customers.filter((c) => c.preview.status === "ready");
  const skipped = customers.filter((c) => c.preview.status === "blocked").map((c) => ({ organisationName: c.preview.name, problems: c.preview.problems }));
  if (ready.length === 0) {
    throw new AppError(
      "validation",
      customers.length === 0
        ? `Nothing is left to bill for ${preview.label}: every delivered set of the month is already on an invoice.`
        : `No customer can be invoiced for ${preview.label} yet: ${skipped.map((s) => `${s.organisationName} — ${s.problems[0]}`).join(" ")}`,
    );
  }
  const iso = now.toISOString();
  const { id: runId } = await trx
    .insertInto("invoice_runs")
    .values({ period: preview.period, period_start: preview.periodStart, period_end: preview.periodEnd, status: "draft", created_by: actorId, created_at: iso })
    .returning("id")
    .executeTakeFirstOrThrow();
  const created: CreatedRun["invoices"] = [];
  for (const customer of ready) {
    const p = customer.preview;
    const totals = p.totals!;
    const { id: invoiceId } = await trx
      .insertInto("invoices")
      .values({
        run_id: runId,
        organisation_id: p.organisationId,
        contract_id: customer.contractId,
        number: p.invoiceNumber!,
        currency: p.currency!,
        period_start: preview.periodStart,
        period_end: preview.periodEnd,
        status: "draft",
        line_total_minor: totals.lineTotalMinor,
        tax_exclusive_minor: totals.taxExclusiveMinor,
        vat_minor: totals.vatMinor,
        total_minor: totals.totalMinor,
        amount_due_minor: totals.totalMinor,
        vat_breakdown: JSON.stringify(totals.vatBreakdown),
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await trx
      .insertInto("invoice_lines")
      .values(
        customer.lines.map((line) => ({
          invoice_id: invoiceId,
          position: line.position,
          kind: line.kind,
          item_code: line.itemCode,
          description: line.description,
          note: line.note,
          quantity: line.quantity,
          unit_price_minor: line.unitPriceMinor,
          net_minor: line.netMinor,
          vat_category: line.vat.category,
          vat_rate_bp: line.vat.rateBasisPoints,
          cycle_ids: JSON.stringify(line.cycleIds),
        })),
      )
      .execute();
    const rows = p.cycles.map((cycle) => ({
      cycle_id: cycle.cycleId,
      invoice_id: invoiceId,
      fee_minor: cycle.feeMinor ?? 0,
      late: cycle.late ? 1 : 0,
      priced_at: iso,
    }));
    for (let i = 0; i < rows.length; i += 1000) {
      try {
        await trx.insertInto("priced_cycles").values(rows.slice(i, i + 1000)).execute();
      } catch (error) {
        if (/UNIQUE|PRIMARY KEY/i.test((error as Error).message)) {
          throw new AppError("conflict", `Some of ${p.name}'s sets were priced by another run at the same moment. Preview ${preview.label} again.`);
        }
        throw error;
      }
    }
    created.push({ id: invoiceId, number: p.invoiceNumber!, organisationName: p.name, totalMinor: totals.totalMinor, currency: p.currency! });
  }
  await recordAudit(
    trx,
    {
      actorUserId: actorId,
      action: "billing.run_created",
      entity: "invoice_run",
      entityId: runId,
      details: {
        period: preview.period,
        invoices: created.map((i) => ({ number: i.number, totalMinor: i.totalMinor, currency: i.currency })),
        skipped,
      },
    },
    now,
  );
  return { runId, invoices: created, skipped };
}

/** Creates the month's draft run: one invoice per customer that can be invoiced, all or nothing. */
export async function createRun(db: Kysely<Database>, user: SessionUser, input: { period: string; token?: string }, now = new Date()): Promise<CreatedRun> {
  assertUnitStaff(user);
  return db.transaction().execute((trx) => createRunIn(trx, user.id, input, now));
}

async function lockedRun(trx: Transaction<Database>, runId: number) {
  const run = await trx.selectFrom("invoice_runs").selectAll().where("id", "=", runId).executeTakeFirst();
  if (!run) throw notFound("That invoice run");
  return run;
}

async function runTotals(trx: Executor, runId: number) {
  return trx
    .selectFrom("invoices")
    .select(["currency", sql<number>`count(*)`.as("invoices"), sql<number>`sum(total_minor)`.as("total_minor")])
    .where("run_id", "=", runId)
    .groupBy("currency")
    .execute();
}

/** Approves a draft run for issuing; audited with who created it. */
export async function approveRun(db: Kysely<Database>, user: SessionUser, runId: number, now = new Date()): Promise<{ runId: number; sameAsCreator: boolean }> {
  assertUnitStaff(user);
  return db.transaction().execute(async (trx) => {
    const run = await lockedRun(trx, runId);
    if (run.status !== "draft") throw new AppError("conflict", `This run is already ${run.status === "approved" ? "approved" : run.status}; nothing to approve.`);
    const updated = await trx
      .updateTable("invoice_runs")
      .set({ status: "approved", approved_by: user.id, approved_at: now.toISOString() })
      .where("id", "=", runId)
      .where("status", "=", "draft")
      .executeTakeFirst();
    if (Number(updated.numUpdatedRows) !== 1) throw new AppError("conflict", "This run changed while you were approving it; reload the page.");
    const sameAsCreator = run.created_by === user.id;
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        action: "billing.run_approved",
        entity: "invoice_run",
        entityId: runId,
        details: { period: run.period, createdBy: run.created_by, sameAsCreator, totals: await runTotals(trx, runId) },
      },
      now,
    );
    return { runId, sameAsCreator };
  });
}

/** Discards a draft run: its invoices go and their cycles can be priced again. */
export async function discardRun(db: Kysely<Database>, user: SessionUser, runId: number, now = new Date()): Promise<{ runId: number; invoices: number }> {
  assertUnitStaff(user);
  return db.transaction().execute(async (trx) => {
    const run = await lockedRun(trx, runId);
    if (run.status !== "draft") throw new AppError("conflict", `Only a draft run can be discarded; this one is ${run.status}.`);
    const invoices = await trx.selectFrom("invoices").select(["id", "number"]).where("run_id", "=", runId).execute();
    const ids = invoices.map((i) => i.id);
    if (ids.length > 0) {
      await trx.deleteFrom("priced_cycles").where("invoice_id", "in", ids).execute();
      await trx.deleteFrom("invoice_lines").where("invoice_id", "in", ids).execute();
      await trx.deleteFrom("invoices").where("id", "in", ids).execute();
    }
    await trx.deleteFrom("invoice_runs").where("id", "=", runId).execute();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        action: "billing.run_discarded",
        entity: "invoice_run",
        entityId: runId,
        details: { period: run.period, invoices: invoices.map((i) => i.number) },
      },
      now,
    );
    return { runId, invoices: ids.length };
  });
}

/** Runs are the unit's own documents: a customer's user gets "not found". */
export function assertUnitStaff(user: SessionUser): void {
  if (isCustomerRole(user.role)) throw notFound("That invoice run");
}

// ——— Reading runs back ———

export interface RunListRow {
  id: number;
  period: string;
  label: string;
  status: RunStatus;
  invoices: number;
  openInvoices: number;
  totals: { currency: string; totalMinor: number }[];
  createdAt: string;
  createdByName: string | null;
  approvedAt: string | null;
  approvedByName: string | null;
  issuedAt: string | null;
}

/** Every run, newest month first. */
export async function listRuns(db: Executor, user: SessionUser): Promise<RunListRow[]> {
  assertUnitStaff(user);
  const runs = await db
    .selectFrom("invoice_runs")
    .leftJoin("users as creator", "creator.id", "invoice_runs.created_by")
    .leftJoin("users as approver", "approver.id", "invoice_runs.approved_by")
    .select([
      "invoice_runs.id",
      "invoice_runs.period",
      "invoice_runs.status",
      "invoice_runs.created_at",
      "invoice_runs.approved_at",
      "invoice_runs.issued_at",
      "creator.name as creator_name",
      "approver.name as approver_name",
    ])
    .orderBy("invoice_runs.period", "desc")
    .orderBy("invoice_runs.id", "desc")
    .execute();
  const sums = await db
    .selectFrom("invoices")
    .select([
      "run_id",
      "currency",
      sql<number>`count(*)`.as("n"),
      sql<number>`sum(case when status != 'draft' then 1 else 0 end)`.as("issued"),
      sql<number>`sum(total_minor)`.as("total"),
    ])
    .where("run_id", "is not", null)
    .groupBy(["run_id", "currency"])
    .execute();
  return runs.map((run) => {
    const mine = sums.filter((s) => s.run_id === run.id);
    return {
      id: run.id,
      period: run.period,
      label: monthLabel(run.period),
      status: run.status,
      invoices: mine.reduce((n, s) => n + Number(s.n), 0),
      openInvoices: mine.reduce((n, s) => n + Number(s.issued), 0),
      totals: mine.map((s) => ({ currency: s.currency, totalMinor: Number(s.total) })),
      createdAt: run.created_at,
      createdByName: run.creator_name,
      approvedAt: run.approved_at,
      approvedByName: run.approver_name,
      issuedAt: run.issued_at,
    };
  });
}

export interface RunEvidenceCycle {
  cycleId: number;
  serial: string;
  setName: string;
  deliveredAt: string | null;
  late: boolean;
}

export interface RunInvoiceLine extends PreviewLine {
  id: number;
  stripeInvoiceItemId: string | null;
  cycles: RunEvidenceCycle[];
}

/** How far the payment service's copy of an invoice has got. */
export type IssueStage = "not_started" | "customer" | "invoice" | "items" | "finalized" | "issued";

export interface RunInvoice {
  id: number;
  number: string;
  organisationId: number;
  organisationName: string;
  currency: string;
  status: Database["invoices"]["status"];
  totals: TotalsView;
  issueDate: string | null;
  dueDate: string | null;
  stripeInvoiceId: string | null;
  stripeNumber: string | null;
  hostedInvoiceUrl: string | null;
  stage: IssueStage;
  itemsDone: number;
  lines: RunInvoiceLine[];
  lastFailure: { at: string; reason: string } | null;
}

export interface RunDetail extends RunListRow {
  periodStart: string;
  periodEnd: string;
  createdBy: number | null;
  approvedBy: number | null;
  invoiceList: RunInvoice[];
}

/** One run with its invoices, lines, the cycles behind each line and how far issuing got. */
export async function getRunDetail(db: Executor, user: SessionUser, runId: number): Promise<RunDetail> {
  assertUnitStaff(user);
  const row = (await listRuns(db, user)).find((r) => r.id === runId);
  const run = await db.selectFrom("invoice_runs").selectAll().where("id", "=", runId).executeTakeFirst();
  if (!row || !run) throw notFound("That invoice run");
  const invoices = await db
    .selectFrom("invoices")
    .innerJoin("organisations", "organisations.id", "invoices.organisation_id")
    .leftJoin("payment_customers", "payment_customers.organisation_id", "invoices.organisation_id")
    .selectAll("invoices")
    .select(["organisations.name as organisation_name", "payment_customers.stripe_customer_id"])
    .where("invoices.run_id", "=", runId)
    .orderBy("invoices.number")
    .execute();
  const ids = invoices.map((i) => i.id);
  const lines = ids.length === 0 ? [] : await db.selectFrom("invoice_lines").selectAll().where("invoice_id", "in", ids).orderBy("invoice_id").orderBy("position").execute();
  const cycles =
    ids.length === 0
      ? []
      : await db
          .selectFrom("priced_cycles")
          .innerJoin("cycles", "cycles.id", "priced_cycles.cycle_id")
          .innerJoin("sets", "sets.id", "cycles.set_id")
          .innerJoin("set_types", "set_types.id", "sets.set_type_id")
          .select(["priced_cycles.cycle_id", "priced_cycles.late", "sets.serial", "set_types.name", "cycles.delivered_at"])
          .where("priced_cycles.invoice_id", "in", ids)
          .execute();
  const cycleById = new Map(
    cycles.map((c) => [c.cycle_id, { cycleId: c.cycle_id, serial: c.serial, setName: c.name, deliveredAt: c.delivered_at, late: c.late === 1 }]),
  );
  const failures =
    ids.length === 0
      ? []
      : await db
          .selectFrom("audit_log")
          .select(["entity_id", "action", "at", "details"])
          .where("entity", "=", "invoice")
          .where("action", "in", ["billing.invoice_issue_failed", "billing.invoice_issued"])
          .where("entity_id", "in", ids.map(String))
          .orderBy("id")
          .execute();
  const lastFailure = new Map<number, { at: string; reason: string } | null>();
  for (const f of failures) {
    const id = Number(f.entity_id);
    if (f.action === "billing.invoice_issued") lastFailure.set(id, null);
    else lastFailure.set(id, { at: f.at, reason: String((JSON.parse(f.details) as { reason?: string }).reason ?? "") });
  }

  const invoiceList: RunInvoice[] = invoices.map((invoice) => {
    const mine = lines.filter((l) => l.invoice_id === invoice.id);
    const itemsDone = mine.filter((l) => l.stripe_invoice_item_id).length;
    const stage: IssueStage =
      invoice.status !== "draft"
        ? "issued"
        : invoice.stripe_number
          ? "finalized"
          : invoice.stripe_invoice_id && itemsDone > 0
            ? "items"
            : invoice.stripe_invoice_id
              ? "invoice"
              : invoice.stripe_customer_id
                ? "customer"
                : "not_started";
    return {
      id: invoice.id,
      number: invoice.number,
      organisationId: invoice.organisation_id,
      organisationName: invoice.organisation_name,
      currency: invoice.currency,
      status: invoice.status,
      totals: {
        lineTotalMinor: invoice.line_total_minor,
        taxExclusiveMinor: invoice.tax_exclusive_minor,
        vatMinor: invoice.vat_minor,
        totalMinor: invoice.total_minor,
        vatBreakdown: JSON.parse(invoice.vat_breakdown) as VatBreakdown[],
      },
      issueDate: invoice.issue_date,
      dueDate: invoice.due_date,
      stripeInvoiceId: invoice.stripe_invoice_id,
      stripeNumber: invoice.stripe_number,
      hostedInvoiceUrl: invoice.hosted_invoice_url,
      stage,
      itemsDone,
      lastFailure: invoice.status === "draft" ? (lastFailure.get(invoice.id) ?? null) : null,
      lines: mine.map((line) => {
        const cycleIds = (JSON.parse(line.cycle_ids) as unknown[]).map(Number);
        return {
          id: line.id,
          position: line.position,
          kind: line.kind as InvoiceLineKind,
          itemCode: line.item_code,
          description: line.description,
          note: line.note,
          quantity: line.quantity,
          unitPriceMinor: line.unit_price_minor,
          netMinor: line.net_minor,
          vatCategory: line.vat_category,
          vatRateBasisPoints: line.vat_rate_bp,
          cycleIds,
          contractReference: "",
          stripeInvoiceItemId: line.stripe_invoice_item_id,
          cycles: cycleIds.map((id) => cycleById.get(id)).filter((c): c is RunEvidenceCycle => c !== undefined),
        };
      }),
    };
  });
  return {
    ...row,
    periodStart: run.period_start,
    periodEnd: run.period_end,
    createdBy: run.created_by,
    approvedBy: run.approved_by,
    invoiceList,
  };
}
