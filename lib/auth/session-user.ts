import type { Kysely } from "kysely";
import type { Database, OrganisationKind } from "@/db/schema";
import { isRole, type Role } from "./roles";

/** The caller as every check sees it: small, explicit, never the whole user row. */
export interface SessionUser {
  id: number;
  name: string;
  email: string;
  role: Role;
  organisationId: number;
  organisationName: string;
  organisationKind: OrganisationKind;
  /** Set for clinic staff, who see only their own site. */
  siteId: number | null;
}

/** What the session token carries besides the user id. */
export interface SessionClaims {
  userId: number;
  sessionVersion: number;
}

/**
 * Loads the signed-in user for a session, or null when the account is gone, disabled, or its
 * sessions were revoked (the token's version is older than the user's).
 */
export async function loadSessionUser(db: Kysely<Database>, claims: SessionClaims): Promise<SessionUser | null> {
  const row = await db
    .selectFrom("users")
    .innerJoin("organisations", "organisations.id", "users.organisation_id")
    .select([
      "users.id",
      "users.name",
      "users.email",
      "users.role",
      "users.site_id",
      "users.status",
      "users.session_version",
      "users.organisation_id",
      "organisations.name as organisation_name",
      "organisations.kind as organisation_kind",
      "organisations.active as organisation_active",
    ])
    .where("users.id", "=", claims.userId)
    .executeTakeFirst();
  if (!row || row.status !== "active" || !row.organisation_active) return null;
  if (row.session_version !== claims.sessionVersion || !isRole(row.role)) return null;
  return {
    id: row.id,
    name: row.name,
    email: row.email,
    role: row.role,
    organisationId: row.organisation_id,
    organisationName: row.organisation_name,
    organisationKind: row.organisation_kind,
    siteId: row.site_id,
  };
}
