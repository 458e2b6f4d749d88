import { type Expression, type SqlBool, sql } from "kysely";
import { isCustomerRole } from "./roles";
import type { SessionUser } from "./session-user";

// The tenant scope, as one WHERE term. Unit staff see every organisation; a clinic manager sees
// its own organisation; clinic staff see their own organisation and, where the table has a site,
// only their own site. Put it in the query itself so another tenant's row is never read.

export interface ScopeColumns {
  /** The row's organisation column, e.g. "sites.organisation_id". */
  organisation: string;
  /** The row's site column, where it has one, e.g. "sites.id" or "orders.site_id". */
  site?: string;
}

export function tenantScope(user: SessionUser, columns: ScopeColumns): Expression<SqlBool> {
  if (!isCustomerRole(user.role)) return sql<SqlBool>`1 = 1`;
  const org = sql<SqlBool>`${sql.ref(columns.organisation)} = ${user.organisationId}`;
  if (user.role === "clinic_staff" && columns.site) {
    // Clinic staff always have a site; without one they see no site-bound rows at all.
    return sql<SqlBool>`(${org} and ${sql.ref(columns.site)} = ${user.siteId ?? -1})`;
  }
  return org;
}

/** True when the caller may act on rows of this organisation at all. */
export function canReachOrganisation(user: SessionUser, organisationId: number): boolean {
  return !isCustomerRole(user.role) || user.organisationId === organisationId;
}
