import type { Generated, Insertable, Selectable, Updateable } from "kysely";

// The database as the app sees it. Dates are ISO-8601 UTC text; booleans are 0/1 integers;
// JSON columns are text parsed at the data-access boundary.

export type OrganisationKind = "unit" | "customer";

export interface OrganisationsTable {
  id: Generated<number>;
  kind: OrganisationKind;
  name: string;
  short_code: string;
  billing_email: string | null;
  active: Generated<number>;
  created_at: string;
  updated_at: string;
}

export interface SitesTable {
  id: Generated<number>;
  organisation_id: number;
  name: string;
  address_line1: string;
  address_line2: string | null;
  town: string;
  postcode: string;
  latitude: number;
  longitude: number;
  opening_hours: string;
  delivery_notes: string | null;
  contact_name: string | null;
  contact_phone: string | null;
  contact_email: string | null;
  is_depot: Generated<number>;
  active: Generated<number>;
  created_at: string;
  updated_at: string;
}

export type UserStatus = "invited" | "active" | "disabled";

export interface UsersTable {
  id: Generated<number>;
  organisation_id: number;
  site_id: number | null;
  email: string;
  name: string;
  role: string;
  password_hash: string | null;
  status: UserStatus;
  session_version: Generated<number>;
  mail_preferences: Generated<string>;
  last_sign_in_at: string | null;
  created_at: string;
  updated_at: string;
}

export interface InvitationsTable {
  id: Generated<number>;
  user_id: number;
  token_hash: string;
  expires_at: string;
  used_at: string | null;
  revoked_at: string | null;
  created_by: number | null;
  created_at: string;
}

export interface SignInFailuresTable {
  id: Generated<number>;
  email: string;
  at: string;
}

export interface AuditLogTable {
  id: Generated<number>;
  at: string;
  actor_user_id: number | null;
  organisation_id: number | null;
  action: string;
  entity: string;
  entity_id: string | null;
  details: Generated<string>;
}

export type OutboxStatus = "pending" | "sending" | "sent";

export interface OutboxTable {
  id: Generated<number>;
  template: string;
  organisation_id: number | null;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string;
  message_id: string;
  dedupe_key: string | null;
  status: OutboxStatus;
  attempts: Generated<number>;
  next_attempt_at: string;
  locked_until: string | null;
  last_error: string | null;
  created_at: string;
  sent_at: string | null;
}

export interface Database {
  organisations: OrganisationsTable;
  sites: SitesTable;
  users: UsersTable;
  invitations: InvitationsTable;
  sign_in_failures: SignInFailuresTable;
  audit_log: AuditLogTable;
  outbox: OutboxTable;
}

export type Organisation = Selectable<OrganisationsTable>;
export type Site = Selectable<SitesTable>;
export type NewSite = Insertable<SitesTable>;
export type User = Selectable<UsersTable>;
export type NewUser = Insertable<UsersTable>;
export type UserUpdate = Updateable<UsersTable>;
export type OutboxRow = Selectable<OutboxTable>;
