import { randomUUID } from "node:crypto";
import { addSeconds } from "date-fns";
import type { Kysely, Transaction } from "kysely";
import type { Database, OutboxRow } from "@/db/schema";

// Every e-mail goes through the outbox table: queued in the same transaction as the change that
// causes it, sent by the worker, retried with backoff while the relay is down, marked sent once.

export interface MailMessage {
  template: string;
  to: string;
  subject: string;
  text: string;
  html: string;
  organisationId?: number | null;
  /** Queuing a second message with the same key does nothing. */
  dedupeKey?: string;
}

type Executor = Kysely<Database> | Transaction<Database>;

/** Queues a message; returns its outbox id (or the existing one for a repeated dedupe key). */
export async function enqueueMail(db: Executor, message: MailMessage, now = new Date()): Promise<number> {
  const row = await db
    .insertInto("outbox")
    .values({
      template: message.template,
      organisation_id: message.organisationId ?? null,
      to_address: message.to,
      subject: message.subject,
      text_body: message.text,
      html_body: message.html,
      message_id: `<${randomUUID()}@steamlane.local>`,
      dedupe_key: message.dedupeKey ?? null,
      status: "pending",
      next_attempt_at: now.toISOString(),
      created_at: now.toISOString(),
    })
    .onConflict((oc) => oc.column("dedupe_key").doNothing())
    .returning("id")
    .executeTakeFirst();
  if (row) return row.id;
  const existing = await db
    .selectFrom("outbox")
    .select("id")
    .where("dedupe_key", "=", message.dedupeKey!)
    .executeTakeFirstOrThrow();
  return existing.id;
}

/** What the outbox needs of a mail transport (nodemailer's transporter fits). */
export interface MailSender {
  sendMail(message: {
    from: string;
    to: string;
    subject: string;
    text: string;
    html: string;
    messageId: string;
  }): Promise<unknown>;
}

/** Seconds to wait after the n-th failed attempt: 5 s doubling, at most 30 minutes. */
export function backoffSeconds(attempts: number): number {
  return Math.min(5 * 2 ** Math.max(0, attempts - 1), 30 * 60);
}

/** How long a claimed message stays claimed before another worker may take it over. */
const CLAIM_SECONDS = 120;

/** Claims the next due message (pending and due, or a claim that expired). */
export async function claimNext(db: Kysely<Database>, now: Date): Promise<OutboxRow | undefined> {
  const iso = now.toISOString();
  return db.transaction().execute(async (trx) => {
    const next = await trx
      .selectFrom("outbox")
      .select("id")
      .where((eb) =>
        eb.or([
          eb.and([eb("status", "=", "pending"), eb("next_attempt_at", "<=", iso)]),
          eb.and([eb("status", "=", "sending"), eb("locked_until", "<", iso)]),
        ]),
      )
      .orderBy("next_attempt_at")
      .orderBy("id")
      .limit(1)
      .executeTakeFirst();
    if (!next) return undefined;
    return trx
      .updateTable("outbox")
      .set((eb) => ({
        status: "sending",
        attempts: eb("attempts", "+", 1),
        locked_until: addSeconds(now, CLAIM_SECONDS).toISOString(),
      }))
      .where("id", "=", next.id)
      .returningAll()
      .executeTakeFirst();
  });
}

export interface OutboxRunResult {
  sent: number;
  failed: number;
}

/** Sends every due message once; failures are rescheduled, never dropped. */
export async function processOutbox(
  db: Kysely<Database>,
  sender: MailSender,
  options: { from: string; now?: () => Date; limit?: number },
): Promise<OutboxRunResult> {
  const clock = options.now ?? (() => new Date());
  const result: OutboxRunResult = { sent: 0, failed: 0 };
  for (let i = 0; i < (options.limit ?? 100); i++) {
    const row = await claimNext(db, clock());
    if (!row) break;
    try {
      await sender.sendMail({
        from: options.from,
        to: row.to_address,
        subject: row.subject,
        text: row.text_body,
        html: row.html_body,
        messageId: row.message_id,
      });
      await db
        .updateTable("outbox")
        .set({ status: "sent", sent_at: clock().toISOString(), locked_until: null, last_error: null })
        .where("id", "=", row.id)
        .execute();
      result.sent++;
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      await db
        .updateTable("outbox")
        .set({
          status: "pending",
          locked_until: null,
          last_error: message.slice(0, 500),
          next_attempt_at: addSeconds(clock(), backoffSeconds(row.attempts)).toISOString(),
        })
        .where("id", "=", row.id)
        .execute();
      result.failed++;
      // The relay is likely down: stop this run and let the backoff decide the next try.
      break;
    }
  }
  return result;
}
