import "server-only";
import type { Kysely } from "kysely";
import type { Database, OrganisationKind } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { assertCan } from "@/lib/auth/permissions";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import type { ListOrganisationsQuery } from "./schemas";

// Organisations: the unit itself and its customers. Only the administrator changes them.

export interface OrganisationRow {
  id: number;
  kind: OrganisationKind;
  name: string;
  shortCode: string;
  billingEmail: string | null;
  active: boolean;
  sites: number;
  users: number;
}

const SORTS = {
  name: "organisations.name",
  short_code: "organisations.short_code",
  sites: "sites",
  users: "users",
} as const;

function scoped(db: Kysely<Database>, user: SessionUser) {
  return db.selectFrom("organisations").where(tenantScope(user, { organisation: "organisations.id" }));
}

function withCounts(qb: ReturnType<typeof scoped>) {
  return qb.select((eb) => [
    "organisations.id",
    "organisations.kind",
    "organisations.name",
    "organisations.short_code",
    "organisations.billing_email",
    "organisations.active",
    eb
      .selectFrom("sites")
      .select(eb.fn.countAll<number>().as("n"))
      .whereRef("sites.organisation_id", "=", "organisations.id")
      .as("sites"),
    eb
      .selectFrom("users")
      .select(eb.fn.countAll<number>().as("n"))
      .whereRef("users.organisation_id", "=", "organisations.id")
      .as("users"),
  ]);
}

type Row = Awaited<ReturnType<ReturnType<typeof withCounts>["executeTakeFirstOrThrow"]>>;

function toRow(r: Row): OrganisationRow {
  return {
    id: r.id,
    kind: r.kind,
    name: r.name,
    shortCode: r.short_code,
    billingEmail: r.billing_email,
    active: r.active === 1,
    sites: Number(r.sites),
    users: Number(r.users),
  };
}

export async function listOrganisations(
  db: Kysely<Database>,
  user: SessionUser,
  query: ListOrganisationsQuery,
): Promise<Page<OrganisationRow>> {
  let base = scoped(db, user);
  if (query.q) base = base.where(searchTerm(["organisations.name", "organisations.short_code"], query.q));
  if (query.kind) base = base.where("organisations.kind", "=", query.kind);
  if (query.active) base = base.where("organisations.active", "=", query.active === "yes" ? 1 : 0);
  const page = await fetchPage(base, withCounts, query, SORTS[query.sort], "organisations.id");
  return { total: page.total, rows: page.rows.map(toRow) };
}

export async function getOrganisation(db: Kysely<Database>, user: SessionUser, id: number): Promise<OrganisationRow> {
  const row = await withCounts(scoped(db, user).where("organisations.id", "=", id)).executeTakeFirst();
  if (!row) throw notFound("That organisation");
  return toRow(row);
}

/** Customer organisations for pickers (catalogue, sets, contracts): id and name. */
export async function customerOptions(db: Kysely<Database>, user: SessionUser): Promise<{ id: number; name: string }[]> {
  return scoped(db, user)
    .select(["organisations.id", "organisations.name"])
    .where("organisations.kind", "=", "customer")
    .where("organisations.active", "=", 1)
    .orderBy("organisations.name")
    .execute();
}

async function assertUnique(db: Kysely<Database>, input: { name: string; shortCode: string }, exceptId?: number) {
  let query = db
    .selectFrom("organisations")
    .select(["id", "name", "short_code"])
    .where((eb) => eb.or([eb("name", "=", input.name), eb("short_code", "=", input.shortCode)]));
  if (exceptId) query = query.where("id", "!=", exceptId);
  const clash = await query.executeTakeFirst();
  if (!clash) return;
  if (clash.name === input.name) {
    throw new AppError("conflict", "Another organisation already has this name.", { name: ["Already in use."] });
  }
  throw new AppError("conflict", `The short code ${input.shortCode} is taken by ${clash.name}.`, { shortCode: ["Already in use."] });
}

export interface OrganisationFields {
  name: string;
  shortCode: string;
  billingEmail: string | null;
}

/** Adds a customer organisation. */
export async function createCustomer(
  db: Kysely<Database>,
  user: SessionUser,
  input: OrganisationFields,
  now = new Date(),
): Promise<{ id: number }> {
  assertCan(user, "organisations.manage");
  return db.transaction().execute(async (trx) => {
    await assertUnique(trx, input);
    const iso = now.toISOString();
    const { id } = await trx
      .insertInto("organisations")
      .values({ kind: "customer", name: input.name, short_code: input.shortCode, billing_email: input.billingEmail, created_at: iso, updated_at: iso })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(trx, { actorUserId: user.id, organisationId: id, action: "organisation.created", entity: "organisation", entityId: id, details: { ...input } }, now);
    return { id };
  });
}

export async function updateOrganisation(
  db: Kysely<Database>,
  user: SessionUser,
  input: OrganisationFields & { id: number },
  now = new Date(),
): Promise<void> {
  assertCan(user, "organisations.manage");
  await db.transaction().execute(async (trx) => {
    const before = await getOrganisation(trx, user, input.id);
    await assertUnique(trx, input, input.id);
    await trx
      .updateTable("organisations")
      .set({ name: input.name, short_code: input.shortCode, billing_email: input.billingEmail, updated_at: now.toISOString() })
      .where("id", "=", input.id)
      .execute();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: input.id,
        action: "organisation.updated",
        entity: "organisation",
        entityId: input.id,
        details: { before: { name: before.name, shortCode: before.shortCode, billingEmail: before.billingEmail }, after: { ...input } },
      },
      now,
    );
  });
}

/** Switches a customer off (its users can no longer sign in) or on again. */
export async function setOrganisationActive(
  db: Kysely<Database>,
  user: SessionUser,
  input: { id: number; active: boolean },
  now = new Date(),
): Promise<void> {
  assertCan(user, "organisations.manage");
  await db.transaction().execute(async (trx) => {
    const org = await getOrganisation(trx, user, input.id);
    if (org.kind === "unit") throw new AppError("conflict", "The unit's own organisation cannot be switched off.");
    await trx
      .updateTable("organisations")
      .set({ active: input.active ? 1 : 0, updated_at: now.toISOString() })
      .where("id", "=", input.id)
      .execute();
    await recordAudit(trx, { actorUserId: user.id, organisationId: input.id, action: input.active ? "organisation.enabled" : "organisation.disabled", entity: "organisation", entityId: input.id }, now);
  });
}
