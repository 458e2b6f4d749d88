import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { addDaysToDate, startOfLocalDate } from "@/lib/contracts/dates";
import { createRunIn } from "@/lib/billing/run";
import { addMonths, localDate, monthOf } from "@/lib/billing/run-periods";
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

export async function seedInvoices(trx: Transaction<Database>, seed: SeedResult, now: Date): Promise<InvoiceSeed> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const finance = seed.users["finance@larkmoor.example"] ?? null;
  const thisMonth = monthOf(now, timeZone);
  const result: InvoiceSeed = { invoices: {}, runs: {} };
  const months = [addMonths(thisMonth, -2), addMonths(thisMonth, -1)];
  for (const [index, month] of months.entries()) {
    const firstDayAfter = `${addMonths(month, 1)}-01`;
    // The run is made at 09:00 on the first day after the month, or just before `now`.
    const createdAt = earlier(new Date(startOfLocalDate(firstDayAfter, timeZone).getTime() + 9 * HOUR_MS), new Date(now.getTime() - HOUR_MS));
    const approvedAt = new Date(createdAt.getTime() + 20 * 60_000);
    const issuedAt = new Date(createdAt.getTime() + 40 * 60_000);
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
  return result;
}
