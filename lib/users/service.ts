import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { addHours } from "date-fns";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { hashPassword } from "@/lib/auth/password";
import { CUSTOMER_ROLES, ROLE_LABELS, type Role, UNIT_ROLES } from "@/lib/auth/roles";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import { enqueueMail } from "@/lib/mail/outbox";
import { invitationMail } from "@/lib/mail/templates";
import type { ListUsersQuery } from "./schemas";

// Users: listing in the caller's scope, inviting, disabling, and accepting an invitation.

export const INVITATION_HOURS = 72;

export interface UserListRow {
  id: number;
  name: string;
  email: string;
  role: Role;
  status: "invited" | "active" | "disabled";
  organisationId: number;
  organisationName: string;
  siteId: number | null;
  siteName: string | null;
  lastSignInAt: string | null;
}

const SORT_COLUMNS = {
  name: "users.name",
  email: "users.email",
  role: "users.role",
  status: "users.status",
  organisation: "organisations.name",
  last_sign_in_at: "users.last_sign_in_at",
} as const;

function scopedUsers(db: Kysely<Database>, user: SessionUser) {
  return db
    .selectFrom("users")
    .innerJoin("organisations", "organisations.id", "users.organisation_id")
    .leftJoin("sites", "sites.id", "users.site_id")
    .where(tenantScope(user, { organisation: "users.organisation_id" }));
}

const USER_COLUMNS = [
  "users.id",
  "users.name",
  "users.email",
  "users.role",
  "users.status",
  "users.organisation_id",
  "organisations.name as organisation_name",
  "users.site_id",
  "sites.name as site_name",
  "users.last_sign_in_at",
] as const;

type UserRow = Awaited<ReturnType<ReturnType<typeof selectUsers>["executeTakeFirstOrThrow"]>>;

function selectUsers(db: Kysely<Database>, user: SessionUser) {
  return scopedUsers(db, user).select(USER_COLUMNS);
}

function toListRow(r: UserRow): UserListRow {
  return {
    id: r.id,
    name: r.name,
    email: r.email,
    role: r.role as Role,
    status: r.status,
    organisationId: r.organisation_id,
    organisationName: r.organisation_name,
    siteId: r.site_id,
    siteName: r.site_name,
    lastSignInAt: r.last_sign_in_at,
  };
}

export async function listUsers(
  db: Kysely<Database>,
  user: SessionUser,
  query: ListUsersQuery,
): Promise<Page<UserListRow>> {
  let base = scopedUsers(db, user);
  if (query.q) base = base.where(searchTerm(["users.name", "users.email"], query.q));
  if (query.role) base = base.where("users.role", "=", query.role);
  if (query.status) base = base.where("users.status", "=", query.status);
  if (query.organisationId) base = base.where("users.organisation_id", "=", query.organisationId);
  const page = await fetchPage(base, (qb) => qb.select(USER_COLUMNS), query, SORT_COLUMNS[query.sort], "users.id");
  return { total: page.total, rows: page.rows.map(toListRow) };
}

/** One user in the caller's scope, or 404. */
export async function getUser(db: Kysely<Database>, user: SessionUser, id: number): Promise<UserListRow> {
  const row = await selectUsers(db, user).where("users.id", "=", id).executeTakeFirst();
  if (!row) throw notFound("That user");
  return toListRow(row);
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** The roles a caller may hand out in an organisation of the given kind. */
export function assignableRoles(caller: SessionUser, organisationKind: "unit" | "customer"): readonly Role[] {
  if (organisationKind === "customer") return CUSTOMER_ROLES;
  return caller.role === "admin" ? UNIT_ROLES : [];
}

export interface InviteInput {
  name: string;
  email: string;
  role: Role;
  organisationId: number;
  siteId?: number | null;
}

export interface MailContext {
  appUrl: string;
  timeZone: string;
}

/**
 * Creates an invited user with a one-time link valid for 72 hours and queues the invitation
 * e-mail, all in one transaction. Returns the token for the caller's tests only.
 */
export async function inviteUser(
  db: Kysely<Database>,
  caller: SessionUser,
  input: InviteInput,
  mail: MailContext,
  now = new Date(),
): Promise<{ userId: number; token: string }> {
  return db.transaction().execute(async (trx) => {
    // The organisation must be one the caller may reach; a forged id reads as "not found".
    const org = await trx
      .selectFrom("organisations")
      .select(["id", "name", "kind", "active"])
      .where("id", "=", input.organisationId)
      .where(tenantScope(caller, { organisation: "organisations.id" }))
      .executeTakeFirst();
    if (!org || !org.active) throw notFound("That organisation");

    if (!assignableRoles(caller, org.kind).includes(input.role)) {
      throw new AppError("validation", "That role does not fit this organisation.", {
        role: [
          org.kind === "customer"
            ? "Clinic organisations have clinic staff and clinic managers only."
            : "Only an administrator can add the unit's own staff.",
        ],
      });
    }

    let siteId: number | null = null;
    if (input.siteId) {
      const site = await trx
        .selectFrom("sites")
        .select("id")
        .where("id", "=", input.siteId)
        .where("organisation_id", "=", org.id)
        .executeTakeFirst();
      if (!site) throw new AppError("validation", "Choose a site of this organisation.", { siteId: ["Unknown site."] });
      siteId = site.id;
    }
    if (input.role === "clinic_staff" && siteId === null) {
      throw new AppError("validation", "Clinic staff work at one site: choose it.", { siteId: ["Choose a site."] });
    }

    const existing = await trx.selectFrom("users").select("id").where("email", "=", input.email).executeTakeFirst();
    if (existing) {
      throw new AppError("conflict", "Someone with this e-mail address already has an account.", {
        email: ["Already in use."],
      });
    }

    const iso = now.toISOString();
    const { id: userId } = await trx
      .insertInto("users")
      .values({
        organisation_id: org.id,
        site_id: siteId,
        email: input.email,
        name: input.name,
        role: input.role,
        password_hash: null,
        status: "invited",
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();

    const token = await createInvitation(trx, { userId, createdBy: caller.id, now });
    const expiresAt = addHours(now, INVITATION_HOURS);
    const rendered = invitationMail({
      inviteeName: input.name,
      inviterName: caller.name,
      organisationName: org.name,
      roleLabel: ROLE_LABELS[input.role],
      link: `${mail.appUrl}/accept-invite/${token}`,
      expiresAt,
      timeZone: mail.timeZone,
    });
    await enqueueMail(trx, { template: "invitation", to: input.email, organisationId: org.id, ...rendered }, now);
    await recordAudit(
      trx,
      {
        actorUserId: caller.id,
        organisationId: org.id,
        action: "user.invited",
        entity: "user",
        entityId: userId,
        details: { role: input.role, siteId },
      },
      now,
    );
    return { userId, token };
  });
}

async function createInvitation(
  trx: Kysely<Database>,
  input: { userId: number; createdBy: number; now: Date },
): Promise<string> {
  const token = randomBytes(32).toString("base64url");
  await trx
    .insertInto("invitations")
    .values({
      user_id: input.userId,
      token_hash: hashToken(token),
      expires_at: addHours(input.now, INVITATION_HOURS).toISOString(),
      created_by: input.createdBy,
      created_at: input.now.toISOString(),
    })
    .execute();
  return token;
}

/** Revokes earlier links of an invited user and sends a fresh one. */
export async function resendInvitation(
  db: Kysely<Database>,
  caller: SessionUser,
  userId: number,
  mail: MailContext,
  now = new Date(),
): Promise<{ token: string }> {
  return db.transaction().execute(async (trx) => {
    const target = await getUser(trx, caller, userId);
    if (target.status !== "invited") {
      throw new AppError("conflict", "This person has already set a password; there is nothing to resend.");
    }
    await trx
      .updateTable("invitations")
      .set({ revoked_at: now.toISOString() })
      .where("user_id", "=", userId)
      .where("used_at", "is", null)
      .where("revoked_at", "is", null)
      .execute();
    const token = await createInvitation(trx, { userId, createdBy: caller.id, now });
    const rendered = invitationMail({
      inviteeName: target.name,
      inviterName: caller.name,
      organisationName: target.organisationName,
      roleLabel: ROLE_LABELS[target.role],
      link: `${mail.appUrl}/accept-invite/${token}`,
      expiresAt: addHours(now, INVITATION_HOURS),
      timeZone: mail.timeZone,
    });
    await enqueueMail(trx, { template: "invitation", to: target.email, organisationId: target.organisationId, ...rendered }, now);
    await recordAudit(trx, { actorUserId: caller.id, organisationId: target.organisationId, action: "user.invitation_resent", entity: "user", entityId: userId }, now);
    return { token };
  });
}

/** Disables or re-enables an account; disabling ends every session it holds. */
export async function setUserStatus(
  db: Kysely<Database>,
  caller: SessionUser,
  input: { userId: number; status: "active" | "disabled" },
  now = new Date(),
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const target = await getUser(trx, caller, input.userId);
    if (target.id === caller.id) throw new AppError("conflict", "You cannot disable your own account.");
    if (target.status === "invited") {
      throw new AppError("conflict", "This person has not accepted the invitation yet.");
    }
    // The scope already limits a clinic manager to its own organisation's (clinic) users.
    await trx
      .updateTable("users")
      .set((eb) => ({
        status: input.status,
        updated_at: now.toISOString(),
        session_version: eb("session_version", "+", input.status === "disabled" ? 1 : 0),
      }))
      .where("id", "=", target.id)
      .execute();
    await recordAudit(trx, { actorUserId: caller.id, organisationId: target.organisationId, action: `user.${input.status === "disabled" ? "disabled" : "enabled"}`, entity: "user", entityId: target.id }, now);
  });
}

/** Ends every session of the user (after a password change, or on request). */
export async function revokeSessions(db: Kysely<Database>, userId: number): Promise<void> {
  await db
    .updateTable("users")
    .set((eb) => ({ session_version: eb("session_version", "+", 1) }))
    .where("id", "=", userId)
    .execute();
}

export interface InvitationInfo {
  name: string;
  email: string;
  organisationName: string;
}

/** What the set-password page shows for a token; a clear error when it cannot be used. */
export async function describeInvitation(db: Kysely<Database>, token: string, now = new Date()): Promise<InvitationInfo> {
  const invitation = await findInvitation(db, token);
  assertUsable(invitation, now);
  return { name: invitation.name, email: invitation.email, organisationName: invitation.organisation_name };
}

async function findInvitation(db: Kysely<Database>, token: string) {
  const row = await db
    .selectFrom("invitations")
    .innerJoin("users", "users.id", "invitations.user_id")
    .innerJoin("organisations", "organisations.id", "users.organisation_id")
    .select([
      "invitations.id",
      "invitations.user_id",
      "invitations.expires_at",
      "invitations.used_at",
      "invitations.revoked_at",
      "users.name",
      "users.email",
      "users.status",
      "organisations.name as organisation_name",
      "organisations.id as organisation_id",
    ])
    .where("invitations.token_hash", "=", hashToken(token))
    .executeTakeFirst();
  if (!row) throw new AppError("not_found", "This invitation link is not valid. Check that you copied the whole link.");
  return row;
}

function assertUsable(invitation: Awaited<ReturnType<typeof findInvitation>>, now: Date) {
  if (invitation.used_at || invitation.status !== "invited") {
    throw new AppError("conflict", "This invitation has already been used. Sign in with your e-mail and password.");
  }
  if (invitation.revoked_at) throw new AppError("conflict", "A newer invitation replaced this link. Use the latest e-mail.");
  if (invitation.expires_at <= now.toISOString()) {
    throw new AppError("conflict", "This invitation link has expired. Ask whoever invited you to send a new one.");
  }
}

/** Sets the password of an invited user and activates the account; the link works once. */
export async function acceptInvitation(
  db: Kysely<Database>,
  input: { token: string; password: string },
  now = new Date(),
): Promise<{ email: string }> {
  const passwordHash = await hashPassword(input.password);
  return db.transaction().execute(async (trx) => {
    const invitation = await findInvitation(trx, input.token);
    assertUsable(invitation, now);
    const used = await trx
      .updateTable("invitations")
      .set({ used_at: now.toISOString() })
      .where("id", "=", invitation.id)
      .where("used_at", "is", null)
      .executeTakeFirst();
    if (Number(used.numUpdatedRows) !== 1) throw new AppError("conflict", "This invitation has already been used.");
    await trx
      .updateTable("users")
      .set({ password_hash: passwordHash, status: "active", updated_at: now.toISOString() })
      .where("id", "=", invitation.user_id)
      .execute();
    await recordAudit(trx, { actorUserId: invitation.user_id, organisationId: invitation.organisation_id, action: "user.invitation_accepted", entity: "user", entityId: invitation.user_id }, now);
    return { email: invitation.email };
  });
}
