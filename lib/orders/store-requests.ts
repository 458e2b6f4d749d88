import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { refreshOrderStatus } from "@/lib/cycles/store";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { parseLocalDateTime } from "@/lib/local-time";
import type { z } from "zod";
import type { storeRequestSchema } from "./schemas";

// Sets the unit keeps in its store for a clinic (released, and booked with "keep in store"), and
// the clinic's request to have some of them delivered.

export interface StoredSet {
  cycleId: number;
  setId: number;
  serial: string;
  name: string;
  siteId: number;
  siteName: string;
  releasedAt: string | null;
  expiresOn: string | null;
}

export async function storedSets(db: Kysely<Database>, user: SessionUser): Promise<StoredSet[]> {
  const rows = await db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("sites", "sites.id", "cycles.site_id")
    .select([
      "cycles.id",
      "cycles.set_id",
      "sets.serial",
      "set_types.name",
      "cycles.site_id",
      "sites.name as site_name",
      "cycles.released_at",
      "cycles.expires_on",
    ])
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .where("cycles.state", "=", "released")
    .where("cycles.keep_in_store", "=", 1)
    .where("cycles.return_order_id", "is", null)
    .orderBy("sites.name")
    .orderBy("set_types.name")
    .orderBy("sets.serial")
    .execute();
  return rows.map((r) => ({
    cycleId: r.id,
    setId: r.set_id,
    serial: r.serial,
    name: r.name,
    siteId: r.site_id,
    siteName: r.site_name,
    releasedAt: r.released_at,
    expiresOn: r.expires_on,
  }));
}

/** Asks for stored sets to be delivered to a site: a store-request order the next delivery serves. */
export async function requestFromStore(
  db: Kysely<Database>,
  user: SessionUser,
  input: z.output<typeof storeRequestSchema>,
  now = new Date(),
): Promise<{ orderId: number; reference: string }> {
  return db.transaction().execute(async (trx) => {
    const site = await trx
      .selectFrom("sites")
      .select(["id", "organisation_id", "name"])
      .where("id", "=", input.siteId)
      .where(tenantScope(user, { organisation: "sites.organisation_id", site: "sites.id" }))
      .executeTakeFirst();
    if (!site) throw notFound("That site");
    const neededBy = parseLocalDateTime(input.neededBy, serverEnv().UNIT_TIME_ZONE);
    if (!neededBy) throw new AppError("validation", "That is not a real date and time.", { neededBy: ["Choose a real date and time."] });
    if (neededBy <= now) throw new AppError("validation", "Choose a needed-by time in the future.", { neededBy: ["Choose a later time."] });
    const cycles = await trx
      .selectFrom("cycles")
      .innerJoin("sets", "sets.id", "cycles.set_id")
      .select(["cycles.id", "cycles.state", "cycles.keep_in_store", "cycles.return_order_id", "cycles.site_id", "sets.serial"])
      .where("cycles.id", "in", input.cycleIds)
      .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
      .execute();
    const problems: string[] = [];
    for (const id of input.cycleIds) {
      const c = cycles.find((x) => x.id === id);
      if (!c) problems.push(`Set #${id} is not in your store.`);
      else if (c.state !== "released" || c.keep_in_store !== 1) problems.push(`${c.serial} is not in the unit's store.`);
      else if (c.return_order_id) problems.push(`${c.serial} has already been asked for.`);
      else if (c.site_id !== site.id) problems.push(`${c.serial} belongs to another of your sites; ask for it from there.`);
    }
    if (problems.length) throw new AppError("validation", problems[0]!, { cycleIds: problems });

    const org = await trx.selectFrom("organisations").select("short_code").where("id", "=", site.organisation_id).executeTakeFirstOrThrow();
    const prefix = `${org.short_code}-S`;
    const last = await trx
      .selectFrom("orders")
      .select("reference")
      .where("organisation_id", "=", site.organisation_id)
      .where("reference", "like", `${prefix}%`)
      .orderBy("reference", "desc")
      .limit(1)
      .executeTakeFirst();
    const reference = `${prefix}${String(last ? Number(last.reference.slice(prefix.length)) + 1 : 1).padStart(6, "0")}`;
    const iso = now.toISOString();
    const { id: orderId } = await trx
      .insertInto("orders")
      .values({
        organisation_id: site.organisation_id,
        site_id: site.id,
        reference,
        kind: "store_request",
        status: "ready",
        service_level: "standard",
        needed_back_by: neededBy.toISOString(),
        promised_return_at: null,
        notes: input.notes,
        created_by: user.id,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await trx
      .updateTable("cycles")
      .set({ return_order_id: orderId, keep_in_store: 0, needed_back_by: neededBy.toISOString(), updated_at: iso })
      .where("id", "in", input.cycleIds)
      .execute();
    await refreshOrderStatus(trx, orderId, now);
    await recordAudit(trx, { actorUserId: user.id, organisationId: site.organisation_id, action: "order.store_requested", entity: "order", entityId: orderId, details: { reference, sets: input.cycleIds.length } }, now);
    return { orderId, reference };
  });
}
