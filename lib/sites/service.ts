import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { assertCan } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import { getSite } from "./queries";
import type { SiteFields } from "./schemas";

// Creating and changing sites (administrator only). The depot belongs to the unit itself.

function columns(input: SiteFields) {
  return {
    name: input.name,
    address_line1: input.addressLine1,
    address_line2: input.addressLine2,
    town: input.town,
    postcode: input.postcode,
    latitude: input.latitude,
    longitude: input.longitude,
    opening_hours: JSON.stringify(input.openingHours),
    delivery_notes: input.deliveryNotes,
    contact_name: input.contactName,
    contact_phone: input.contactPhone,
    contact_email: input.contactEmail,
  };
}

async function assertNameFree(trx: Transaction<Database>, organisationId: number, name: string, exceptId?: number) {
  let query = trx.selectFrom("sites").select("id").where("organisation_id", "=", organisationId).where("name", "=", name);
  if (exceptId) query = query.where("id", "!=", exceptId);
  if (await query.executeTakeFirst()) {
    throw new AppError("conflict", "This organisation already has a site with that name.", { name: ["Already in use."] });
  }
}

export async function createSite(db: Kysely<Database>, user: SessionUser, input: SiteFields, now = new Date()): Promise<{ id: number }> {
  assertCan(user, "sites.manage");
  return db.transaction().execute(async (trx) => {
    const org = await trx.selectFrom("organisations").select(["id", "kind"]).where("id", "=", input.organisationId).executeTakeFirst();
    if (!org) throw notFound("That organisation");
    await assertNameFree(trx, org.id, input.name);
    const iso = now.toISOString();
    const { id } = await trx
      .insertInto("sites")
      .values({ organisation_id: org.id, ...columns(input), is_depot: 0, created_at: iso, updated_at: iso })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(trx, { actorUserId: user.id, organisationId: org.id, action: "site.created", entity: "site", entityId: id, details: { name: input.name } }, now);
    return { id };
  });
}

export async function updateSite(
  db: Kysely<Database>,
  user: SessionUser,
  input: SiteFields & { id: number },
  now = new Date(),
): Promise<void> {
  assertCan(user, "sites.manage");
  await db.transaction().execute(async (trx) => {
    const before = await getSite(trx, user, input.id);
    if (before.organisationId !== input.organisationId) {
      throw new AppError("validation", "A site cannot move to another organisation.", { organisationId: ["Keep the site's organisation."] });
    }
    await assertNameFree(trx, before.organisationId, input.name, input.id);
    await trx
      .updateTable("sites")
      .set({ ...columns(input), updated_at: now.toISOString() })
      .where("id", "=", input.id)
      .execute();
    await recordAudit(
      trx,
      { actorUserId: user.id, organisationId: before.organisationId, action: "site.updated", entity: "site", entityId: input.id, details: { before: { ...before, openingHours: undefined }, after: { ...input, openingHours: undefined } } },
      now,
    );
  });
}

export async function setSiteActive(db: Kysely<Database>, user: SessionUser, input: { id: number; active: boolean }, now = new Date()): Promise<void> {
  assertCan(user, "sites.manage");
  await db.transaction().execute(async (trx) => {
    const site = await getSite(trx, user, input.id);
    if (site.isDepot && !input.active) throw new AppError("conflict", "The unit's depot cannot be switched off: every van run starts there.");
    await trx.updateTable("sites").set({ active: input.active ? 1 : 0, updated_at: now.toISOString() }).where("id", "=", input.id).execute();
    await recordAudit(trx, { actorUserId: user.id, organisationId: site.organisationId, action: input.active ? "site.enabled" : "site.disabled", entity: "site", entityId: input.id }, now);
  });
}
