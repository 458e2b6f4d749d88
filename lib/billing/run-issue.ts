import "server-only";
import { type Kysely, type Selectable, sql } from "kysely";
import Stripe from "stripe";
import type { Database, InvoicesTable, InvoiceStatus } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { formatMoney } from "@/lib/contracts/format";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { formatBasisPoints, formatMinor } from "@/lib/pricing/money";
import type { VatBreakdown } from "@/lib/pricing/types";
import { stripeClient } from "@/lib/stripe";
import { ensurePaymentCustomer, METADATA } from "./payments";
import { assertUnitStaff } from "./run";
import { localDate, monthLabel, monthOf } from "./run-periods";

// Issuing an approved run through the payment service (Stripe, through its SDK), exactly once.
//
// For each invoice, in number order: the customer (created once, kept in payment_customers),
// the invoice as a draft (send_invoice, days until due = the contract's payment terms, pending
// items excluded), one invoice item per line (negative for the turnaround credit and for a
// reduced minimum-fee top-up) attached to that draft explicitly, one item per VAT rate, a check
// that the draft's total equals ours, finalization, a second check of the total and the amount
// due, and sending. Every step is committed to our database as soon as it succeeds, and every
// call carries an idempotency key derived from our ids, so a run stopped anywhere continues
// where it stopped when it is started again: stored ids skip finished steps, the keys make a
// repeated call return the first answer, and before creating anything we look for what an
// interrupted attempt may have made (found by our metadata, for when a key has expired).
//
// Decisions:
// - VAT: our EN 16931 totals are authoritative. The payment service computes no tax here, so
//   each VAT rate is an invoice item of its own ("VAT 20 % on …"), and its total equals ours.
// - A failure of the payment service itself (no answer, time-out, 5xx, rate limit, a request
//   still running) stops the run: the invoices after it are left for "Resume issuing". A refusal
//   of one invoice (a mismatch of totals, a request it rejects) is reported and the run goes on
//   with the next invoice.
// - Items carry the same metadata and keys as the payment pages' copy of an invoice
//   (lib/billing/payments.ts), so either can recognise what the other made.
// - One issuing at a time per run in this process; the idempotency keys cover anything else.

export type InvoiceIssueOutcome = "issued" | "already_issued" | "failed" | "not_attempted";

export interface InvoiceIssueResult {
  invoiceId: number;
  number: string;
  organisationName: string;
  outcome: InvoiceIssueOutcome;
  stripeNumber: string | null;
  reason: string | null;
}

export interface IssueRunResult {
  runId: number;
  status: Database["invoice_runs"]["status"];
  invoices: InvoiceIssueResult[];
  issued: number;
  failed: number;
  remaining: number;
}

export interface IssueOptions {
  now?: () => Date;
  /** Milliseconds the SDK waits for each answer (the client's own default otherwise). */
  requestTimeoutMs?: number;
}

/** The payment service did not do its part: stop and leave the rest for a retry. */
class ServiceFailure extends Error {}
/** This invoice cannot be issued as it stands: report it and go on with the next. */
class InvoiceFailure extends Error {}

const issuing = new Set<number>();

function isServiceError(error: unknown): boolean {
  return (
    error instanceof Stripe.errors.StripeConnectionError ||
    error instanceof Stripe.errors.StripeAPIError ||
    error instanceof Stripe.errors.StripeRateLimitError ||
    error instanceof Stripe.errors.StripeAuthenticationError ||
    error instanceof Stripe.errors.StripePermissionError
  );
}

/** Runs one call to the payment service, turning its failure into one of ours. */
async function call<T>(doing: string, fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (error) {
    if (error instanceof Stripe.errors.StripeError) {
      if (isServiceError(error)) {
        const why =
          error instanceof Stripe.errors.StripeConnectionError
            ? "did not answer in time or could not be reached"
            : error.statusCode === 409
              ? "was still working on an earlier request for it"
              : `answered with an error (${error.statusCode ?? "no status"}: ${error.message})`;
        throw new ServiceFailure(`The payment service ${why} while ${doing}.`);
      }
      throw new InvoiceFailure(`The payment service refused ${doing}: ${error.message}`);
    }
    throw error;
  }
}

function describeLine(line: { description: string; quantity: number; unit_price_minor: number }, currency: string): string {
  if (line.quantity === 1) return line.description;
  return `${line.description} (${line.quantity} × ${formatMinor(line.unit_price_minor)} ${currency})`;
}

type InvoiceRow = Selectable<InvoicesTable>;

interface Ctx {
  db: Kysely<Database>;
  stripe: Stripe;
  now: () => Date;
  request: Stripe.RequestOptions;
  timeZone: string;
}

const opts = (ctx: Ctx, idempotencyKey?: string): Stripe.RequestOptions => ({ ...ctx.request, ...(idempotencyKey ? { idempotencyKey } : {}) });

/** The customer in the payment service (created once, shared with the payment pages). */
async function customerOf(ctx: Ctx, organisationId: number): Promise<string> {
  try {
    return await ensurePaymentCustomer(ctx.db, organisationId, ctx.now());
  } catch (error) {
    if (error instanceof AppError) {
      if (error.code === "unavailable") throw new ServiceFailure(error.message);
      throw new InvoiceFailure(error.message);
    }
    throw error;
  }
}

/** A draft an interrupted attempt made for this invoice, found by our metadata. */
async function earlierCopy(ctx: Ctx, customerId: string, invoiceId: number): Promise<Stripe.Invoice | null> {
  return call("looking for an earlier copy of the invoice", async () => {
    for await (const candidate of ctx.stripe.invoices.list({ customer: customerId, limit: 100 }, opts(ctx))) {
      if (candidate.metadata?.[METADATA.invoiceId] === String(invoiceId) && candidate.status !== "void") return candidate;
    }
    return null;
  });
}

async function createDraft(ctx: Ctx, invoice: InvoiceRow, customerId: string): Promise<Stripe.Invoice> {
  const contract = invoice.contract_id
    ? await ctx.db.selectFrom("contracts").select(["payment_terms_days", "reference"]).where("id", "=", invoice.contract_id).executeTakeFirst()
    : undefined;
  if (!contract) throw new InvoiceFailure(`Invoice ${invoice.number} has no contract, so its payment terms are unknown.`);
  const month = monthLabel(monthOf(new Date(invoice.period_start), ctx.timeZone));
  return call("creating the invoice", () =>
    ctx.stripe.invoices.create(
      {
        customer: customerId,
        collection_method: "send_invoice",
        days_until_due: contract.payment_terms_days,
        currency: invoice.currency.toLowerCase(),
        auto_advance: false,
        pending_invoice_items_behavior: "exclude",
        description: `Instrument reprocessing, ${month}. Our invoice ${invoice.number}, under contract ${contract.reference}.`,
        metadata: {
          [METADATA.invoiceId]: String(invoice.id),
          [METADATA.invoiceNumber]: invoice.number,
          [METADATA.organisationId]: String(invoice.organisation_id),
          steamlane_run_id: String(invoice.run_id ?? ""),
          [METADATA.returnUrl]: `${serverEnv().APP_URL}/clinic/invoices/${invoice.id}`,
        },
      },
      opts(ctx, `steamlane:invoice:${invoice.id}`),
    ),
  );
}

/** Adds every line and VAT item the draft does not carry yet; each item id is stored at once. */
async function addItems(ctx: Ctx, invoice: InvoiceRow, customerId: string, stripeInvoiceId: string): Promise<void> {
  const { db, stripe } = ctx;
  const currency = invoice.currency.toLowerCase();
  const present = new Map<string, string>();
  await call("reading the invoice's lines", async () => {
    for await (const line of stripe.invoices.listLineItems(stripeInvoiceId, { limit: 100 }, opts(ctx))) {
      const key = line.metadata?.[METADATA.itemKey];
      const item = line.parent?.invoice_item_details?.invoice_item;
      if (key && item) present.set(key, item);
    }
  });
  const lines = await db.selectFrom("invoice_lines").selectAll().where("invoice_id", "=", invoice.id).orderBy("position").execute();
  for (const line of lines) {
    const key = `line:${line.id}`;
    let itemId = present.get(key) ?? null;
    if (!itemId) {
      const item = await call(`adding line ${line.position} ("${line.description}")`, () =>
        stripe.invoiceItems.create(
          {
            customer: customerId,
            invoice: stripeInvoiceId,
            amount: line.net_minor,
            currency,
            description: describeLine(line, invoice.currency),
            metadata: {
              [METADATA.itemKey]: key,
              [METADATA.invoiceId]: String(invoice.id),
              steamlane_line_id: String(line.id),
              steamlane_item_code: line.item_code,
            },
          },
          opts(ctx, `steamlane:invoice-line:${line.id}`),
        ),
      );
      itemId = item.id;
    }
    if (line.stripe_invoice_item_id !== itemId) {
      await db.updateTable("invoice_lines").set({ stripe_invoice_item_id: itemId }).where("id", "=", line.id).execute();
    }
  }
  const breakdown = JSON.parse(invoice.vat_breakdown) as VatBreakdown[];
  for (const group of breakdown) {
    if (group.taxAmountMinor === 0) continue;
    const key = `vat:${group.category}:${group.rateBasisPoints}`;
    if (present.has(key)) continue;
    const rate = formatBasisPoints(group.rateBasisPoints);
    await call(`adding VAT at ${rate} %`, () =>
      stripe.invoiceItems.create(
        {
          customer: customerId,
          invoice: stripeInvoiceId,
          amount: group.taxAmountMinor,
          currency,
          description: `VAT ${rate} % on ${formatMinor(group.taxableAmountMinor)} ${invoice.currency}`,
          metadata: { [METADATA.itemKey]: key, [METADATA.invoiceId]: String(invoice.id) },
        },
        opts(ctx, `steamlane:invoice-vat:${invoice.id}:${group.category}:${group.rateBasisPoints}`),
      ),
    );
  }
}

function money(minor: number, currency: string): string {
  return formatMoney(minor, currency);
}

/** Refuses an invoice whose copy does not carry our amounts. */
function assertAmounts(invoice: InvoiceRow, copy: Stripe.Invoice, stage: "draft" | "finalized"): void {
  if (copy.currency.toUpperCase() !== invoice.currency) {
    throw new InvoiceFailure(`The payment service's copy of ${invoice.number} is in ${copy.currency.toUpperCase()}, ours in ${invoice.currency}.`);
  }
  const next = stage === "draft" ? "it was not finalized" : "it was not sent";
  if (copy.total !== invoice.total_minor) {
    throw new InvoiceFailure(
      `The payment service's copy of ${invoice.number} totals ${money(copy.total, invoice.currency)}, ours ${money(invoice.total_minor, invoice.currency)}; ${next}. ` +
        "Compare its lines with ours in the payment service, remove what does not belong, then resume issuing.",
    );
  }
  if (stage === "finalized" && copy.amount_due !== invoice.amount_due_minor) {
    throw new InvoiceFailure(
      `The payment service asks ${money(copy.amount_due, invoice.currency)} for ${invoice.number}, ours ${money(invoice.amount_due_minor, invoice.currency)} ` +
        "(a customer balance was applied); it was not sent. Settle the customer's balance in the payment service or void its copy, then resume issuing.",
    );
  }
}

async function storeFinalized(ctx: Ctx, invoiceId: number, copy: Stripe.Invoice): Promise<void> {
  await ctx.db
    .updateTable("invoices")
    .set({ stripe_number: copy.number ?? null, hosted_invoice_url: copy.hosted_invoice_url ?? null, updated_at: ctx.now().toISOString() })
    .where("id", "=", invoiceId)
    .execute();
}

/** Takes one draft invoice of the run through every step it has not finished. */
async function issueInvoice(ctx: Ctx, invoiceId: number, actorId: number | null): Promise<string | null> {
  const { db, stripe } = ctx;
  const invoice: InvoiceRow = await db.selectFrom("invoices").selectAll().where("id", "=", invoiceId).executeTakeFirstOrThrow();
  const customerId = await customerOf(ctx, invoice.organisation_id);

  let copy: Stripe.Invoice;
  if (invoice.stripe_invoice_id) {
    copy = await call("reading the invoice", () => stripe.invoices.retrieve(invoice.stripe_invoice_id!, {}, opts(ctx)));
  } else {
    copy = (await earlierCopy(ctx, customerId, invoice.id)) ?? (await createDraft(ctx, invoice, customerId));
    await db
      .updateTable("invoices")
      .set({ stripe_invoice_id: copy.id, updated_at: ctx.now().toISOString() })
      .where("id", "=", invoice.id)
      .where("stripe_invoice_id", "is", null)
      .execute();
  }
  if (copy.status === "void" || copy.status === "uncollectible") {
    throw new InvoiceFailure(`The payment service's copy of ${invoice.number} (${copy.id}) is ${copy.status}; it cannot be issued.`);
  }

  if (copy.status === "draft") {
    await addItems(ctx, invoice, customerId, copy.id!);
    const draft = await call("reading the draft", () => stripe.invoices.retrieve(copy.id!, {}, opts(ctx)));
    assertAmounts(invoice, draft, "draft");
    try {
      copy = await call("finalizing the invoice", () =>
        stripe.invoices.finalizeInvoice(copy.id!, { auto_advance: false }, opts(ctx, `steamlane:finalize:${invoice.id}`)),
      );
    } catch (error) {
      // Finalized by an attempt whose answer was lost after its key expired: read it back.
      if (!(error instanceof InvoiceFailure)) throw error;
      const current = await call("reading the invoice", () => stripe.invoices.retrieve(copy.id!, {}, opts(ctx)));
      if (current.status === "draft") throw error;
      copy = current;
    }
  }
  await storeFinalized(ctx, invoice.id, copy);
  assertAmounts(invoice, copy, "finalized");

  if (copy.status === "open") {
    copy = await call("sending the invoice", () => stripe.invoices.sendInvoice(copy.id!, {}, opts(ctx, `steamlane:send:${invoice.id}`)));
  }
  const finalizedAt = copy.status_transitions?.finalized_at ?? Math.floor(ctx.now().getTime() / 1000);
  const issueDate = localDate(new Date(finalizedAt * 1000), ctx.timeZone);
  const dueDate = copy.due_date ? localDate(new Date(copy.due_date * 1000), ctx.timeZone) : issueDate;
  const paid = copy.status === "paid";
  const at = ctx.now();
  await db.transaction().execute(async (trx) => {
    // The payment service's webhooks may have got here first (a zero invoice is paid when it is
    // finalized): the dates are filled in if missing, and the status only moves on from draft.
    await trx
      .updateTable("invoices")
      .set({
        status: sql<InvoiceStatus>`case when status = 'draft' then ${paid ? "paid" : "open"} else status end`,
        issue_date: sql<string>`coalesce(issue_date, ${issueDate})`,
        due_date: sql<string>`coalesce(due_date, ${dueDate})`,
        stripe_number: copy.number ?? null,
        hosted_invoice_url: copy.hosted_invoice_url ?? null,
        ...(paid ? { amount_due_minor: 0, paid_at: sql<string>`coalesce(paid_at, ${at.toISOString()})` } : {}),
        updated_at: at.toISOString(),
      })
      .where("id", "=", invoice.id)
      .execute();
    await recordAudit(
      trx,
      {
        actorUserId: actorId,
        organisationId: invoice.organisation_id,
        action: "billing.invoice_issued",
        entity: "invoice",
        entityId: invoice.id,
        details: { number: invoice.number, stripeInvoiceId: copy.id, stripeNumber: copy.number, totalMinor: invoice.total_minor, dueDate },
      },
      at,
    );
  });
  return copy.number ?? null;
}

/**
 * Issues every invoice of an approved run (or resumes a run left part-way), in number order, and
 * says per invoice what happened. The run is "issued" once every invoice is open.
 */
export async function issueRun(db: Kysely<Database>, user: SessionUser | { id: number | null }, runId: number, options: IssueOptions = {}): Promise<IssueRunResult> {
  if ("role" in user) assertUnitStaff(user);
  const now = options.now ?? (() => new Date());
  if (issuing.has(runId)) throw new AppError("conflict", "This run is being issued right now. Wait for that to finish, then look again.");
  issuing.add(runId);
  try {
    const run = await db.selectFrom("invoice_runs").selectAll().where("id", "=", runId).executeTakeFirst();
    if (!run) throw notFound("That invoice run");
    if (run.status === "draft") throw new AppError("conflict", "Approve this run before issuing it.");
    let stripe: Stripe;
    try {
      stripe = stripeClient();
    } catch (error) {
      throw new AppError("unavailable", `${(error as Error).message} Nothing was issued.`);
    }
    if (run.status === "approved") {
      await db.transaction().execute(async (trx) => {
        await trx.updateTable("invoice_runs").set({ status: "issuing" }).where("id", "=", runId).where("status", "=", "approved").execute();
        await recordAudit(trx, { actorUserId: user.id, action: "billing.run_issuing", entity: "invoice_run", entityId: runId, details: { period: run.period } }, now());
      });
    }
    const ctx: Ctx = {
      db,
      stripe,
      now,
      request: options.requestTimeoutMs ? { timeout: options.requestTimeoutMs } : {},
      timeZone: serverEnv().UNIT_TIME_ZONE,
    };
    const invoices = await db
      .selectFrom("invoices")
      .innerJoin("organisations", "organisations.id", "invoices.organisation_id")
      .select(["invoices.id", "invoices.number", "invoices.status", "invoices.stripe_number", "invoices.organisation_id", "organisations.name"])
      .where("invoices.run_id", "=", runId)
      .orderBy("invoices.number")
      .execute();
    const results: InvoiceIssueResult[] = [];
    let stopped: string | null = null;
    for (const invoice of invoices) {
      const base = { invoiceId: invoice.id, number: invoice.number, organisationName: invoice.name };
      if (invoice.status !== "draft") {
        results.push({ ...base, outcome: "already_issued", stripeNumber: invoice.stripe_number, reason: null });
        continue;
      }
      if (stopped) {
        results.push({ ...base, outcome: "not_attempted", stripeNumber: null, reason: "Left for a retry: the payment service failed on an earlier invoice." });
        continue;
      }
      try {
        const stripeNumber = await issueInvoice(ctx, invoice.id, user.id);
        results.push({ ...base, outcome: "issued", stripeNumber, reason: null });
      } catch (error) {
        if (!(error instanceof ServiceFailure || error instanceof InvoiceFailure)) throw error;
        const reason =
          error instanceof ServiceFailure ? `${error.message} What was done is kept; resume issuing to continue without billing anything twice.` : error.message;
        if (error instanceof ServiceFailure) stopped = reason;
        results.push({ ...base, outcome: "failed", stripeNumber: null, reason });
        await recordAudit(
          db,
          {
            actorUserId: user.id,
            organisationId: invoice.organisation_id,
            action: "billing.invoice_issue_failed",
            entity: "invoice",
            entityId: invoice.id,
            details: { number: invoice.number, reason, serviceFailure: error instanceof ServiceFailure },
          },
          now(),
        );
      }
    }
    const left = await db.selectFrom("invoices").select("id").where("run_id", "=", runId).where("status", "=", "draft").execute();
    let status: IssueRunResult["status"] = "issuing";
    if (left.length === 0) {
      await db.transaction().execute(async (trx) => {
        const updated = await trx
          .updateTable("invoice_runs")
          .set({ status: "issued", issued_at: now().toISOString() })
          .where("id", "=", runId)
          .where("status", "=", "issuing")
          .executeTakeFirst();
        if (Number(updated.numUpdatedRows) === 1) {
          await recordAudit(trx, { actorUserId: user.id, action: "billing.run_issued", entity: "invoice_run", entityId: runId, details: { period: run.period } }, now());
        }
      });
      status = "issued";
    }
    return {
      runId,
      status,
      invoices: results,
      issued: results.filter((r) => r.outcome === "issued").length,
      failed: results.filter((r) => r.outcome === "failed").length,
      remaining: left.length,
    };
  } finally {
    issuing.delete(runId);
  }
}
