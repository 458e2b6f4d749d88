import "server-only";
import type { Kysely, Transaction } from "kysely";
import Stripe from "stripe";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { addDaysToDate, startOfLocalDate } from "@/lib/contracts/dates";
import { serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { formatMinor, formatBasisPoints } from "@/lib/pricing/money";
import { computeInvoiceTotals } from "@/lib/pricing/totals";
import { stripeClient } from "@/lib/stripe";
import { findInvoiceInScope, invoiceLineRows, toPricingLines } from "./invoices";

// The payment service's copy of an invoice, made on demand: the customer once per organisation,
// the invoice with one item per line and one per VAT group (the payment service computes no tax
// here, so VAT is an item of its own and its total equals ours), finalized so that it has a
// hosted payment page. Every step is idempotent: the SDK call carries a key derived from our own
// ids, each id is stored as soon as it is known, and before creating anything we look for what
// an earlier, interrupted attempt may already have made (after the keys' 24 hours have passed).

type Executor = Kysely<Database> | Transaction<Database>;

/** Metadata keys on the payment service's objects that lead back to ours. */
export const METADATA = {
  invoiceId: "steamlane_invoice_id",
  invoiceNumber: "steamlane_invoice_number",
  organisationId: "steamlane_organisation_id",
  itemKey: "steamlane_item",
  returnUrl: "return_url",
} as const;

/** Turns a failure of the payment service into an error the person at the screen can act on. */
export function paymentServiceError(error: unknown, doing: string): never {
  if (error instanceof AppError) throw error;
  if (error instanceof Stripe.errors.StripeError) {
    console.error(`payment service: ${doing}: ${error.type} ${error.message}`);
    if (error instanceof Stripe.errors.StripeConnectionError || error instanceof Stripe.errors.StripeAPIError) {
      throw new AppError("unavailable", `The payment service did not answer while ${doing}. Nothing was lost: try again in a minute.`);
    }
    throw new AppError("conflict", `The payment service refused ${doing}: ${error.message}`);
  }
  throw error;
}

/** Who at a customer hears about its invoices: its active clinic managers, else its billing address. */
export async function billingRecipients(db: Executor, organisationId: number): Promise<{ userId: number | null; name: string; email: string }[]> {
  const managers = await db
    .selectFrom("users")
    .select(["id", "name", "email"])
    .where("organisation_id", "=", organisationId)
    .where("role", "=", "clinic_manager")
    .where("status", "=", "active")
    .orderBy("id")
    .execute();
  if (managers.length > 0) return managers.map((m) => ({ userId: m.id, name: m.name, email: m.email }));
  const org = await db.selectFrom("organisations").select(["name", "billing_email"]).where("id", "=", organisationId).executeTakeFirst();
  return org?.billing_email ? [{ userId: null, name: `${org.name} accounts`, email: org.billing_email }] : [];
}

/** The organisation's customer in the payment service, created once. */
export async function ensurePaymentCustomer(db: Kysely<Database>, organisationId: number, now = new Date()): Promise<string> {
  const existing = await db.selectFrom("payment_customers").select("stripe_customer_id").where("organisation_id", "=", organisationId).executeTakeFirst();
  if (existing) return existing.stripe_customer_id;
  const org = await db.selectFrom("organisations").select(["id", "name", "short_code", "billing_email"]).where("id", "=", organisationId).executeTakeFirstOrThrow();
  const email = org.billing_email ?? (await billingRecipients(db, org.id))[0]?.email;
  let customer: Stripe.Customer;
  try {
    customer = await stripeClient().customers.create(
      {
        name: org.name,
        ...(email ? { email } : {}),
        metadata: { [METADATA.organisationId]: String(org.id), steamlane_short_code: org.short_code },
      },
      { idempotencyKey: `steamlane:customer:${org.id}` },
    );
  } catch (error) {
    paymentServiceError(error, "creating the customer");
  }
  await db
    .insertInto("payment_customers")
    .values({ organisation_id: org.id, stripe_customer_id: customer.id, created_at: now.toISOString() })
    .onConflict((oc) => oc.column("organisation_id").doNothing())
    .execute();
  const stored = await db.selectFrom("payment_customers").select("stripe_customer_id").where("organisation_id", "=", org.id).executeTakeFirstOrThrow();
  return stored.stripe_customer_id;
}

/** The last second of a local due date in the unit's time zone, as the payment service's Unix time. */
function dueTimestamp(dueDate: string): number {
  const nextDay = startOfLocalDate(addDaysToDate(dueDate, 1), serverEnv().UNIT_TIME_ZONE);
  return Math.floor(nextDay.getTime() / 1000) - 1;
}

function describeLine(line: { description: string; quantity: number; unit_price_minor: number }, currency: string): string {
  if (line.quantity === 1) return line.description;
  return `${line.description} (${line.quantity} × ${formatMinor(line.unit_price_minor)} ${currency})`;
}

export interface StripeInvoiceCopy {
  stripeInvoiceId: string;
  hostedInvoiceUrl: string | null;
  status: Stripe.Invoice.Status | null;
}

/**
 * Makes sure an issued invoice has its copy in the payment service, finalized, with a hosted
 * payment page, and stores the ids and the page's address. Safe to call again at any point:
 * a second call finds what the first made. For the invoice-run engineer's issue step and for
 * "Pay online" on an invoice issued before it had a copy (seeded, or issued while the payment
 * service was down). The caller has checked who may do this.
 */
export async function ensureStripeInvoice(db: Kysely<Database>, invoiceId: number, now = new Date()): Promise<StripeInvoiceCopy> {
  const invoice = await db.selectFrom("invoices").selectAll().where("id", "=", invoiceId).executeTakeFirst();
  if (!invoice) throw new AppError("not_found", "That invoice was not found.");
  if (invoice.status === "draft") throw new AppError("conflict", `Invoice ${invoice.number} has not been issued yet; approve and issue its run first.`);
  if (invoice.status === "void") throw new AppError("conflict", `Invoice ${invoice.number} is void; nothing can be paid on it.`);
  const stripe = stripeClient();
  const currency = invoice.currency.toLowerCase();

  // A copy already finalized: refresh what we show and stop.
  if (invoice.stripe_invoice_id) {
    let current: Stripe.Invoice;
    try {
      current = await stripe.invoices.retrieve(invoice.stripe_invoice_id);
    } catch (error) {
      paymentServiceError(error, "reading the invoice");
    }
    if (current.status !== "draft") return storeCopy(db, invoiceId, current, now);
  } else if (invoice.status === "paid") {
    throw new AppError("conflict", `Invoice ${invoice.number} is already paid.`);
  }

  const customerId = await ensurePaymentCustomer(db, invoice.organisation_id, now);
  let stripeInvoice: Stripe.Invoice;
  try {
    stripeInvoice = invoice.stripe_invoice_id
      ? await stripe.invoices.retrieve(invoice.stripe_invoice_id)
      : ((await findEarlierCopy(stripe, customerId, invoiceId)) ??
        (await stripe.invoices.create(
          {
            customer: customerId,
            collection_method: "send_invoice",
            currency,
            auto_advance: false,
            pending_invoice_items_behavior: "exclude",
            ...(invoice.due_date && dueTimestamp(invoice.due_date) > Math.floor(now.getTime() / 1000) + 60
              ? { due_date: dueTimestamp(invoice.due_date) }
              : { days_until_due: 0 }),
            description: `Invoice ${invoice.number} from ${serverEnv().APP_URL.replace(/^https?:\/\//, "")}`,
            ...(invoice.number.length <= 26 ? { number: invoice.number } : {}),
            metadata: {
              [METADATA.invoiceId]: String(invoice.id),
              [METADATA.invoiceNumber]: invoice.number,
              [METADATA.organisationId]: String(invoice.organisation_id),
              [METADATA.returnUrl]: `${serverEnv().APP_URL}/clinic/invoices/${invoice.id}`,
            },
          },
          // Not the run's key: this copy is made for an invoice already issued, with its own due date.
          { idempotencyKey: `steamlane:invoice-copy:${invoice.id}` },
        )));
  } catch (error) {
    paymentServiceError(error, "creating the invoice");
  }
  await db
    .updateTable("invoices")
    .set({ stripe_invoice_id: stripeInvoice.id, updated_at: now.toISOString() })
    .where("id", "=", invoiceId)
    .where("stripe_invoice_id", "is", null)
    .execute();

  if (stripeInvoice.status === "draft") {
    await addItems(db, stripe, invoice, customerId, stripeInvoice.id);
    try {
      const draft = await stripe.invoices.retrieve(stripeInvoice.id);
      if (draft.total !== invoice.total_minor) {
        throw new AppError(
          "conflict",
          `The payment service's copy of ${invoice.number} totals ${formatMinor(draft.total)} ${invoice.currency}, ours ${formatMinor(invoice.total_minor)}; it was not finalized. Check the invoice's lines.`,
        );
      }
      stripeInvoice = await stripe.invoices.finalizeInvoice(stripeInvoice.id, { auto_advance: false }, { idempotencyKey: `steamlane:finalize:${invoice.id}` });
    } catch (error) {
      paymentServiceError(error, "finalizing the invoice");
    }
  }
  return storeCopy(db, invoiceId, stripeInvoice, now);
}

/** An invoice an earlier attempt made for ours, found by its metadata (when the reply was lost). */
async function findEarlierCopy(stripe: Stripe, customerId: string, invoiceId: number): Promise<Stripe.Invoice | null> {
  for await (const candidate of stripe.invoices.list({ customer: customerId, limit: 100 })) {
    if (candidate.metadata?.[METADATA.invoiceId] === String(invoiceId) && candidate.status !== "void") return candidate;
  }
  return null;
}

/** Adds every line, and one item per VAT group, that the draft does not carry yet. */
async function addItems(
  db: Kysely<Database>,
  stripe: Stripe,
  invoice: { id: number; currency: string; vat_breakdown: string },
  customerId: string,
  stripeInvoiceId: string,
): Promise<void> {
  const currency = invoice.currency.toLowerCase();
  const present = new Set<string>();
  try {
    for await (const line of stripe.invoices.listLineItems(stripeInvoiceId, { limit: 100 })) {
      const key = line.metadata?.[METADATA.itemKey];
      if (key) present.add(key);
    }
  } catch (error) {
    paymentServiceError(error, "reading the invoice's lines");
  }
  const lines = await invoiceLineRows(db, invoice.id);
  for (const line of lines) {
    const key = `line:${line.id}`;
    if (present.has(key)) continue;
    let item: Stripe.InvoiceItem;
    try {
      item = await stripe.invoiceItems.create(
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
        // The same key and parameters as the run's issuing, so either recognises the other's item.
        { idempotencyKey: `steamlane:invoice-line:${line.id}` },
      );
    } catch (error) {
      paymentServiceError(error, "adding the invoice's lines");
    }
    await db.updateTable("invoice_lines").set({ stripe_invoice_item_id: item.id }).where("id", "=", line.id).execute();
  }
  const totals = computeInvoiceTotals(toPricingLines(lines, invoice.vat_breakdown));
  for (const group of totals.vatBreakdown) {
    if (group.taxAmountMinor === 0) continue;
    const key = `vat:${group.category}:${group.rateBasisPoints}`;
    if (present.has(key)) continue;
    try {
      await stripe.invoiceItems.create(
        {
          customer: customerId,
          invoice: stripeInvoiceId,
          amount: group.taxAmountMinor,
          currency,
          description: `VAT ${formatBasisPoints(group.rateBasisPoints)} % on ${formatMinor(group.taxableAmountMinor)} ${invoice.currency}`,
          metadata: { [METADATA.itemKey]: key, [METADATA.invoiceId]: String(invoice.id) },
        },
        { idempotencyKey: `steamlane:invoice-vat:${invoice.id}:${group.category}:${group.rateBasisPoints}` },
      );
    } catch (error) {
      paymentServiceError(error, "adding the invoice's VAT");
    }
  }
}

async function storeCopy(db: Kysely<Database>, invoiceId: number, copy: Stripe.Invoice, now: Date): Promise<StripeInvoiceCopy> {
  await db
    .updateTable("invoices")
    .set({
      stripe_invoice_id: copy.id,
      hosted_invoice_url: copy.hosted_invoice_url ?? null,
      stripe_number: copy.number ?? null,
      updated_at: now.toISOString(),
    })
    .where("id", "=", invoiceId)
    .execute();
  return { stripeInvoiceId: copy.id!, hostedInvoiceUrl: copy.hosted_invoice_url ?? null, status: copy.status };
}

/**
 * "Pay online" for a clinic manager: the invoice in their scope, open, with money due; its hosted
 * payment page (made now if it has none yet). The page is the payment service's own.
 */
export async function startOnlinePayment(db: Kysely<Database>, user: SessionUser, invoiceId: number, now = new Date()): Promise<{ url: string }> {
  const invoice = await findInvoiceInScope(db, user, invoiceId);
  if (invoice.status === "paid") throw new AppError("conflict", `Invoice ${invoice.number} is already paid. Thank you.`);
  if (invoice.status !== "open" && invoice.status !== "uncollectible") {
    throw new AppError("conflict", `Invoice ${invoice.number} is ${invoice.status}; there is nothing to pay on it.`);
  }
  if (invoice.amount_due_minor <= 0) throw new AppError("conflict", `Nothing is due on invoice ${invoice.number}.`);
  const copy = await ensureStripeInvoice(db, invoice.id, now);
  if (!copy.hostedInvoiceUrl) throw new AppError("unavailable", "The payment service gave no payment page for this invoice yet. Try again in a minute.");
  return { url: copy.hostedInvoiceUrl };
}

/**
 * Finance voids an open invoice (issued in error) or marks it uncollectible (written off), in the
 * payment service first and then here, with the reason in the audit log. A paid invoice is never
 * voided: it gets a credit note instead.
 */
export async function closeInvoice(
  db: Kysely<Database>,
  user: SessionUser,
  invoiceId: number,
  input: { to: "void" | "uncollectible"; reason: string },
  now = new Date(),
): Promise<{ status: "void" | "uncollectible" }> {
  const invoice = await findInvoiceInScope(db, user, invoiceId);
  const allowed = input.to === "void" ? ["open", "uncollectible"] : ["open"];
  if (!allowed.includes(invoice.status)) {
    throw new AppError(
      "conflict",
      invoice.status === "paid"
        ? `Invoice ${invoice.number} is paid; credit it with a credit note instead.`
        : `Invoice ${invoice.number} is ${invoice.status}; only ${allowed.join(" or ")} invoices can be ${input.to === "void" ? "voided" : "marked uncollectible"}.`,
    );
  }
  if (invoice.stripe_invoice_id) {
    const stripe = stripeClient();
    try {
      const remote = await stripe.invoices.retrieve(invoice.stripe_invoice_id);
      if (remote.status === "paid") {
        throw new AppError("conflict", `Invoice ${invoice.number} has just been paid online; it cannot be ${input.to === "void" ? "voided" : "written off"}.`);
      }
      if (remote.status !== input.to) {
        if (input.to === "void") await stripe.invoices.voidInvoice(remote.id!, {}, { idempotencyKey: `steamlane:void:${invoice.id}` });
        else await stripe.invoices.markUncollectible(remote.id!, {}, { idempotencyKey: `steamlane:uncollectible:${invoice.id}` });
      }
    } catch (error) {
      paymentServiceError(error, input.to === "void" ? "voiding the invoice" : "marking the invoice uncollectible");
    }
  }
  return db.transaction().execute(async (trx) => {
    const changed = await trx
      .updateTable("invoices")
      .set({ status: input.to, ...(input.to === "void" ? { amount_due_minor: 0 } : {}), updated_at: now.toISOString() })
      .where("id", "=", invoice.id)
      .where("status", "in", allowed as ("open" | "uncollectible")[])
      .executeTakeFirst();
    if (Number(changed.numUpdatedRows) !== 1) throw new AppError("conflict", `Invoice ${invoice.number} changed meanwhile; reload the page.`);
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: invoice.organisation_id,
        action: input.to === "void" ? "invoice.voided" : "invoice.marked_uncollectible",
        entity: "invoice",
        entityId: invoice.id,
        details: { from: invoice.status, reason: input.reason },
      },
      now,
    );
    return { status: input.to };
  });
}
