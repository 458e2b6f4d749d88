import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";

// What each home page shows first, read in the caller's scope.

export interface TeamSummary {
  active: number;
  invited: number;
  disabled: number;
}

export async function teamSummary(db: Kysely<Database>, user: SessionUser): Promise<TeamSummary> {
  const rows = await db
    .selectFrom("users")
    .select(["status", (eb) => eb.fn.countAll<number>().as("n")])
    .where(tenantScope(user, { organisation: "users.organisation_id" }))
    .groupBy("status")
    .execute();
  const summary: TeamSummary = { active: 0, invited: 0, disabled: 0 };
  for (const r of rows) summary[r.status] = Number(r.n);
  return summary;
}

export interface CustomerSummary {
  id: number;
  name: string;
  shortCode: string;
  sites: number;
  users: number;
}

export async function customerSummaries(db: Kysely<Database>): Promise<CustomerSummary[]> {
  const rows = await db
    .selectFrom("organisations")
    .select((eb) => [
      "organisations.id",
      "organisations.name",
      "organisations.short_code",
      eb.selectFrom("sites").select(eb.fn.countAll<number>().as("n")).whereRef("sites.organisation_id", "=", "organisations.id").as("sites"),
      eb.selectFrom("users").select(eb.fn.countAll<number>().as("n")).whereRef("users.organisation_id", "=", "organisations.id").as("users"),
    ])
    .where("kind", "=", "customer")
    .orderBy("name")
    .execute();
  return rows.map((r) => ({ id: r.id, name: r.name, shortCode: r.short_code, sites: Number(r.sites), users: Number(r.users) }));
}

export interface AuditLine {
  id: number;
  at: string;
  action: string;
  actorName: string | null;
  organisationName: string | null;
}

export async function recentAudit(db: Kysely<Database>, limit = 8): Promise<AuditLine[]> {
  const rows = await db
    .selectFrom("audit_log")
    .leftJoin("users", "users.id", "audit_log.actor_user_id")
    .leftJoin("organisations", "organisations.id", "audit_log.organisation_id")
    .select(["audit_log.id", "audit_log.at", "audit_log.action", "users.name as actor", "organisations.name as org"])
    .orderBy("audit_log.id", "desc")
    .limit(limit)
    .execute();
  return rows.map((r) => ({ id: r.id, at: r.at, action: r.action, actorName: r.actor, organisationName: r.org }));
}

export interface DepotView {
  name: string;
  address: string;
}

export async function depot(db: Kysely<Database>): Promise<DepotView | null> {
  const row = await db
    .selectFrom("sites")
    .select(["name", "address_line1", "town", "postcode"])
    .where("is_depot", "=", 1)
    .executeTakeFirst();
  return row ? { name: row.name, address: `${row.address_line1}, ${row.town} ${row.postcode}` } : null;
}
