import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { addDaysToDate, localDateOf } from "@/lib/contracts/dates";
import { serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { formatDate } from "@/lib/format";
import type { Job, JobContext } from "@/lib/jobs/scheduler";
import type { Period } from "@/lib/jobs/schedule";
import { parseLocalDateTime } from "@/lib/local-time";
import { invoiceReminderMail } from "@/lib/mail/billing-templates";
import { enqueueMail } from "@/lib/mail/outbox";
import { calendarDate } from "./exports-document";
import { billingToday } from "./invoices";
import { billingRecipients } from "./payments";

// Reminders of overdue invoices. Finance keeps a schedule of days after the due date (e.g. 7, 21
// and 45); every morning the job queues, for each open invoice with money due, the reminder of
// the latest rule it has reached, to the customer's clinic managers (or its billing address),
// once: the outbox's dedupe key names the invoice, the rule and the recipient.
//
// Decisions:
// - Only the latest rule reached is sent. An invoice that is already 50 days overdue when the
//   schedule is first set gets one reminder (the 45-day one), not three at once, and the earlier
//   rules are never sent later.
// - Paid, void and uncollectible invoices get none; neither does an invoice before its due date
//   has passed (the earliest rule is one day after it).
// - Changing the schedule changes what is sent from then on; what was sent stays sent.

export const MAX_REMINDER_RULES = 10;
export const REMINDER_TIME = "08:00";

type Executor = Kysely<Database> | Transaction<Database>;

/** The schedule, in days after the due date, ascending. */
export async function reminderSchedule(db: Executor): Promise<number[]> {
  const rows = await db.selectFrom("reminder_rules").select("days_after_due").orderBy("days_after_due").execute();
  return rows.map((r) => r.days_after_due);
}

/** Replaces the schedule in one transaction (billing.manage), audited with before and after. */
export async function setReminderSchedule(db: Kysely<Database>, user: SessionUser, days: number[], now = new Date()): Promise<number[]> {
  const unique = [...new Set(days)].sort((a, b) => a - b);
  if (unique.length !== days.length) throw new AppError("validation", "Each day may appear once.", { days: ["Remove the repeated day."] });
  if (unique.length > MAX_REMINDER_RULES) throw new AppError("validation", `At most ${MAX_REMINDER_RULES} reminders.`, { days: [`Keep at most ${MAX_REMINDER_RULES}.`] });
  if (unique.some((d) => !Number.isInteger(d) || d < 1 || d > 365)) {
    throw new AppError("validation", "Reminder days are whole days from 1 to 365 after the due date.", { days: ["Use whole days from 1 to 365."] });
  }
  return db.transaction().execute(async (trx) => {
    const before = await reminderSchedule(trx);
    await trx.deleteFrom("reminder_rules").where("days_after_due", "not in", unique.length > 0 ? unique : [-1]).execute();
    for (const d of unique) {
      await trx
        .insertInto("reminder_rules")
        .values({ days_after_due: d, created_at: now.toISOString() })
        .onConflict((oc) => oc.column("days_after_due").doNothing())
        .execute();
    }
    await recordAudit(trx, { actorUserId: user.id, action: "billing.reminder_schedule_changed", entity: "reminder_rules", details: { before, after: unique } }, now);
    return unique;
  });
}

/** The latest rule an invoice due on `dueDate` has reached by `today`, or null. */
export function ruleReached(schedule: readonly number[], dueDate: string, today: string): number | null {
  let reached: number | null = null;
  for (const days of schedule) if (addDaysToDate(dueDate, days) <= today) reached = days;
  return reached;
}

export interface ReminderRunResult {
  invoices: number;
  queued: number;
}

/** Queues the reminders due at `now`; running it again the same day (or later for the same rule) queues nothing new. */
export async function sendDueReminders(db: Executor, now = new Date()): Promise<ReminderRunResult> {
  const schedule = await reminderSchedule(db);
  if (schedule.length === 0) return { invoices: 0, queued: 0 };
  const env = serverEnv();
  const today = billingToday(now);
  // No invoice before the earliest rule can be due for a reminder.
  const latestDue = addDaysToDate(today, -schedule[0]!);
  const invoices = await db
    .selectFrom("invoices")
    .innerJoin("organisations", "organisations.id", "invoices.organisation_id")
    .select([
      "invoices.id",
      "invoices.number",
      "invoices.organisation_id",
      "invoices.currency",
      "invoices.due_date",
      "invoices.amount_due_minor",
      "organisations.name as organisation_name",
    ])
    .where("invoices.status", "=", "open")
    .where("invoices.amount_due_minor", ">", 0)
    .where("invoices.due_date", "is not", null)
    // Due dates are calendar dates (an instant's text also sorts before the next day's date).
    .where("invoices.due_date", "<", addDaysToDate(latestDue, 1))
    .orderBy("invoices.id")
    .execute();
  let reminded = 0;
  let queued = 0;
  for (const invoice of invoices) {
    const dueDate = calendarDate(invoice.due_date!);
    const rule = ruleReached(schedule, dueDate, today);
    if (rule === null) continue;
    const daysOverdue = Math.round((Date.parse(`${today}T00:00:00Z`) - Date.parse(`${dueDate}T00:00:00Z`)) / 86_400_000);
    let any = false;
    for (const recipient of await billingRecipients(db, invoice.organisation_id)) {
      const key = `invoice_reminder:${invoice.id}:${rule}:${recipient.email.toLowerCase()}`;
      const exists = await db.selectFrom("outbox").select("id").where("dedupe_key", "=", key).executeTakeFirst();
      if (exists) continue;
      const mail = invoiceReminderMail({
        recipientName: recipient.name,
        organisationName: invoice.organisation_name,
        invoiceNumber: invoice.number,
        amountDueMinor: invoice.amount_due_minor,
        currency: invoice.currency,
        dueOn: formatDate(`${dueDate}T12:00:00Z`, "UTC"),
        daysOverdue,
        link: `${env.APP_URL}/clinic/invoices/${invoice.id}`,
      });
      await enqueueMail(db, { template: "billing.reminder", to: recipient.email, organisationId: invoice.organisation_id, dedupeKey: key, ...mail }, now);
      queued++;
      any = true;
    }
    if (any) reminded++;
  }
  return { invoices: reminded, queued };
}

/** The latest daily slot at `time` (local) at or before `now`, named by its local date. */
export function dailyPeriod(now: Date, timeZone: string, time = REMINDER_TIME): Period {
  const today = localDateOf(now, timeZone);
  let day = today;
  let at = parseLocalDateTime(`${day}T${time}`, timeZone)!;
  if (at.getTime() > now.getTime()) {
    day = addDaysToDate(today, -1);
    at = parseLocalDateTime(`${day}T${time}`, timeZone)!;
  }
  return { key: day, scheduledAt: at };
}

/** The scheduler's job: every morning at 08:00 in the unit's time zone. */
export const invoiceRemindersJob: Job = {
  name: "invoice_reminders",
  period: (now: Date, timeZone: string) => dailyPeriod(now, timeZone),
  run: async (trx: Transaction<Database>, ctx: JobContext) => ({ ...(await sendDueReminders(trx, ctx.now)) }),
};
