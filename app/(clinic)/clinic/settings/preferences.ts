import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { MAIL_KINDS, type MailPreferences, parseMailPreferences } from "@/lib/orders/mail-preferences";

// A clinic user's own choice of notification e-mails (users.mail_preferences, a JSON object of
// kind → on/off). Unit staff receive none of these, so they have nothing to choose.

function assertCustomer(user: SessionUser): void {
  if (user.organisationKind !== "customer") {
    throw new AppError("forbidden", "E-mail preferences are for clinic users; unit staff do not receive these e-mails.");
  }
}

/** The caller's current choices (every kind not chosen yet is on). */
export async function getMailPreferences(db: Kysely<Database>, user: SessionUser): Promise<MailPreferences> {
  assertCustomer(user);
  const row = await db.selectFrom("users").select("mail_preferences").where("id", "=", user.id).executeTakeFirstOrThrow();
  return parseMailPreferences(row.mail_preferences);
}

/** Saves the caller's choices, with what changed in the audit log. */
export async function saveMailPreferences(db: Kysely<Database>, user: SessionUser, chosen: MailPreferences, now = new Date()): Promise<MailPreferences> {
  assertCustomer(user);
  return db.transaction().execute(async (trx) => {
    const row = await trx.selectFrom("users").select("mail_preferences").where("id", "=", user.id).executeTakeFirstOrThrow();
    const before = parseMailPreferences(row.mail_preferences);
    const after = Object.fromEntries(MAIL_KINDS.map((k) => [k, chosen[k]])) as MailPreferences;
    const changed = MAIL_KINDS.filter((k) => before[k] !== after[k]);
    if (changed.length === 0) return after;
    await trx
      .updateTable("users")
      .set({ mail_preferences: JSON.stringify(after), updated_at: now.toISOString() })
      .where("id", "=", user.id)
      .execute();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: user.organisationId,
        action: "user.mail_preferences_changed",
        entity: "user",
        entityId: user.id,
        details: { on: changed.filter((k) => after[k]), off: changed.filter((k) => !after[k]) },
      },
      now,
    );
    return after;
  });
}
