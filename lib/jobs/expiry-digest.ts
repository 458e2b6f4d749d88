import "server-only";
import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { CUSTOMER_ROLES, isRole } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session-user";
import { serverEnv } from "@/lib/env";
import { expiryPhrase, formatLocalDate } from "@/lib/expiry/dates";
import { DEFAULT_EXPIRY_DAYS } from "@/lib/expiry/schemas";
import { listExpiringSets } from "@/lib/expiry/service";
import { expiryDigestMail } from "@/lib/mail/digest-templates";
import { enqueueMail } from "@/lib/mail/outbox";
import { parseMailPreferences } from "@/lib/orders/mail-preferences";
import { type Period, weeklyPeriod } from "./schedule";
import type { Job, JobContext } from "./scheduler";

// The weekly digest of sets nearing expiry: every Monday at 07:00 in the unit's time zone, each
// active clinic user who wants it gets the list of their own scope's sets (their site's, or the
// organisation's for a manager with no site). Nobody with nothing to report gets an e-mail. The
// dedupe key (user and ISO week) makes a second run in the same week queue nothing.

export const EXPIRY_DIGEST_WEEKDAY = 1;
export const EXPIRY_DIGEST_TIME = "07:00";

export async function runExpiryDigest(trx: Transaction<Database>, ctx: JobContext): Promise<{ recipients: number; queued: number }> {
  const env = serverEnv();
  const users = await trx
    .selectFrom("users")
    .innerJoin("organisations", "organisations.id", "users.organisation_id")
    .leftJoin("sites", "sites.id", "users.site_id")
    .select([
      "users.id",
      "users.name",
      "users.email",
      "users.role",
      "users.site_id",
      "users.mail_preferences",
      "users.organisation_id",
      "organisations.name as organisation_name",
      "sites.name as site_name",
    ])
    .where("users.status", "=", "active")
    .where("users.role", "in", [...CUSTOMER_ROLES])
    .where("organisations.kind", "=", "customer")
    .where("organisations.active", "=", 1)
    .orderBy("users.id")
    .execute();
  let recipients = 0;
  let queued = 0;
  for (const u of users) {
    if (!isRole(u.role) || !parseMailPreferences(u.mail_preferences).expiry_digest) continue;
    recipients++;
    // The recipient's own view of the data: the same tenant scope as their pages.
    const viewer: SessionUser = {
      id: u.id,
      name: u.name,
      email: u.email,
      role: u.role,
      organisationId: u.organisation_id,
      organisationName: u.organisation_name,
      organisationKind: "customer",
      siteId: u.site_id,
    };
    const list = await listExpiringSets(trx, viewer, { now: ctx.now, days: DEFAULT_EXPIRY_DAYS });
    if (list.rows.length === 0) continue;
    const mail = expiryDigestMail({
      recipientName: u.name,
      organisationName: u.organisation_name,
      scope: u.role === "clinic_staff" && u.site_name ? u.site_name : "all your sites",
      days: list.days,
      week: ctx.period.key,
      link: `${env.APP_URL}/clinic/expiring`,
      settingsLink: `${env.APP_URL}/clinic/settings`,
      lines: list.rows.map((r) => ({
        serial: r.serial,
        setName: r.setName,
        siteName: r.siteName,
        expiresOn: formatLocalDate(r.expiresOn),
        phrase: expiryPhrase(r.daysLeft),
        expired: r.status === "expired",
      })),
    });
    await enqueueMail(
      trx,
      { template: "digest.expiry", to: u.email, organisationId: u.organisation_id, dedupeKey: `expiry_digest:${u.id}:${ctx.period.key}`, ...mail },
      ctx.now,
    );
    queued++;
  }
  return { recipients, queued };
}

export const expiryDigestJob: Job = {
  name: "expiry_digest",
  period: (now: Date, timeZone: string): Period => weeklyPeriod(now, timeZone, EXPIRY_DIGEST_WEEKDAY, EXPIRY_DIGEST_TIME),
  run: runExpiryDigest,
};
