import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { loadSessionUser } from "@/lib/auth/session-user";
import { createCreditNoteIn } from "@/lib/billing/credit-notes";
import { addDaysToDate, startOfLocalDate } from "@/lib/contracts/dates";
import { createRunIn } from "@/lib/billing/run";
import { addMonths, billingPeriod, localDate, monthOf } from "@/lib/billing/run-periods";
import { serverEnv } from "@/lib/env";
import type { SeedResult } from "./demo";

// The demo's invoices: the two complete months before `now`, priced by the same code as a real
// run (createRunIn) from the delivered history, approved and issued by the finance officer.
//
// Seeding talks to no payment service, so the invoices are issued here only: status open or
// paid, issue and due dates set, and no copy in the payment service yet (stripe_invoice_id,
// stripe_number and hosted_invoice_url are null, and no payment_customers row is made). The
// clinic's "Pay online" makes the copy when it is first needed (lib/billing/payments.ts).
//
// - The earlier month: the hospital group's and the day-surgery centre's invoices are paid (by
//   bank transfer, twelve days after issue: amount paid = total, nothing due, no payments row,
//   since no payment went through the payment service); the dental group's, on 14-day terms,
//   is open and overdue; the veterinary clinic's is open.
// - The later month: every invoice open, issued this month.
// - One credit note: the hospital group disputed one set on its paid invoice of the earlier month
//   (it came back with the contents list of another tray); finance credited that set two days
//   after the payment. It is made by createCreditNoteIn, the credit-note code the app uses for an
//   invoice paid outside the payment service, so it is settled outside it (out of band) and
//   leaves the invoice paid.
// - A month's run is made after the month has ended and before `now`: at 09:00 on the first day
//   after it, or, when the demo is seeded earlier than that, in the time between the end of the
//   month and `now` (a demo seeded at 00:30 on the 1st still bills last month in full).
// Deterministic: everything derives from `now` and the history.

const HOUR_MS = 3_600_000;

export interface InvoiceSeed {
  /** Invoice ids by our number. */
  invoices: Record<string, number>;
  /** Run ids by month. */
  runs: Record<string, number>;
}

function earlier(a: Date, b: Date): Date {
  return a.getTime() < b.getTime() ? a : b;
}

const CREDITED = { organisation: "QMH", reason: "The set came back with the contents list of another tray; the clinic sent it back unused." } as const;

/** When a month's run is created, approved and issued: after the month's end, before `now`. */
function runTimes(month: string, timeZone: string, now: Date): { createdAt: Date; approvedAt: Date; issuedAt: Date } {
  const end = new Date(billingPeriod(month, timeZone).end).getTime();
  // At 09:00 on the first day after the month, or an hour before `now`.
  const createdAt = Math.min(startOfLocalDate(`${addMonths(month, 1)}-01`, timeZone).getTime() + 9 * HOUR_MS, now.getTime() - HOUR_MS);
  if (createdAt >= end) return { createdAt: new Date(createdAt), approvedAt: new Date(createdAt + 20 * 60_000), issuedAt: new Date(createdAt + 40 * 60_000) };
  // Seeded within the hour after the month ended: the three steps share the time since, in whole seconds.
  const step = Math.floor((now.getTime() - end) / 4 / 1000) * 1000;
  return { createdAt: new Date(end + step), approvedAt: new Date(end + 2 * step), issuedAt: new Date(end + 3 * step) };
}

export async function seedInvoices(trx: Transaction<Database>, seed: SeedResult, now: Date): Promise<InvoiceSeed> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const finance = seed.users["finance@larkmoor.example"] ?? null;
  const thisMonth = monthOf(now, timeZone);
  const result: InvoiceSeed = { invoices: {}, runs: {} };
  const months = [addMonths(thisMonth, -2), addMonths(thisMonth, -1)];
  let credit: { invoiceId: number; at: Date } | undefined;
  for (const [index, month] of months.entries()) {
    const { createdAt, approvedAt, issuedAt } = runTimes(month, timeZone, now);
    let created;
    try {
      created = await createRunIn(trx, finance, { period: month }, createdAt);
    } catch (error) {
      // A demo seeded without history for the month has nothing to bill.
      if (error instanceof Error && /Nothing is left to bill|No customer can be invoiced/.test(error.message)) continue;
      throw error;
    }
    result.runs[month] = created.runId;
    await trx
      .updateTable("invoice_runs")
      .set({ status: "issued", approved_by: finance, approved_at: approvedAt.toISOString(), issued_at: issuedAt.toISOString() })
      .where("id", "=", created.runId)
      .execute();
    await recordAudit(trx, { actorUserId: finance, action: "billing.run_approved", entity: "invoice_run", entityId: created.runId, details: { period: month, sameAsCreator: true } }, approvedAt);
    await recordAudit(trx, { actorUserId: finance, action: "billing.run_issued", entity: "invoice_run", entityId: created.runId, details: { period: month } }, issuedAt);

    const issueDate = localDate(issuedAt, timeZone);
    const invoices = await trx
      .selectFrom("invoices")
      .innerJoin("organisations", "organisations.id", "invoices.organisation_id")
      .innerJoin("contracts", "contracts.id", "invoices.contract_id")
      .select(["invoices.id", "invoices.number", "invoices.total_minor", "organisations.short_code", "contracts.payment_terms_days"])
      .where("invoices.run_id", "=", created.runId)
      .execute();
    for (const invoice of invoices) {
      const paid = index === 0 && (invoice.short_code === "QMH" || invoice.short_code === "ODS");
      const paidAt = earlier(new Date(startOfLocalDate(addDaysToDate(issueDate, 12), timeZone).getTime() + 10.5 * HOUR_MS), new Date(now.getTime() - 30 * 60_000));
      if (paid && invoice.short_code === CREDITED.organisation) credit = { invoiceId: invoice.id, at: earlier(new Date(paidAt.getTime() + 2 * 24 * HOUR_MS), new Date(now.getTime() - 15 * 60_000)) };
      await trx
        .updateTable("invoices")
        .set({
          status: paid ? "paid" : "open",
          issue_date: issueDate,
          due_date: addDaysToDate(issueDate, invoice.payment_terms_days),
          ...(paid ? { amount_paid_minor: invoice.total_minor, amount_due_minor: 0, paid_at: paidAt.toISOString() } : {}),
          updated_at: (paid ? paidAt : issuedAt).toISOString(),
        })
        .where("id", "=", invoice.id)
        .execute();
      await recordAudit(
        trx,
        {
          actorUserId: finance,
          organisationId: null,
          action: "billing.invoice_issued",
          entity: "invoice",
          entityId: invoice.id,
          details: { number: invoice.number, totalMinor: invoice.total_minor, paymentServiceCopy: false },
        },
        issuedAt,
      );
      result.invoices[invoice.number] = invoice.id;
    }
  }
  if (credit && finance !== null) await creditOneSet(trx, finance, credit.invoiceId, credit.at);
  return result;
}

/** Credits the first set of the invoice's first processing line, as finance would from the invoice page. */
async function creditOneSet(trx: Transaction<Database>, financeId: number, invoiceId: number, at: Date): Promise<void> {
  const row = await trx.selectFrom("users").select("session_version").where("id", "=", financeId).executeTakeFirstOrThrow();
  const finance = await loadSessionUser(trx, { userId: financeId, sessionVersion: row.session_version });
  if (!finance) return;
  const line = await trx
    .selectFrom("invoice_lines")
    .select(["id", "cycle_ids"])
    .where("invoice_id", "=", invoiceId)
    .where("kind", "=", "processing")
    .orderBy("position")
    .executeTakeFirst();
  const cycleId = line ? (JSON.parse(line.cycle_ids) as number[])[0] : undefined;
  if (!line || cycleId === undefined) return;
  await createCreditNoteIn(trx, finance, invoiceId, { kind: "lines", lines: [{ lineId: line.id, cycleIds: [Number(cycleId)] }], reason: CREDITED.reason }, at);
}
