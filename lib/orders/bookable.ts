import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { notFound } from "@/lib/errors";

// What a site can book: its sets in service with no open cycle (not already on their way).

export interface BookableSet {
  id: number;
  serial: string;
  giai: string;
  name: string;
  setClass: string;
  loaner: boolean;
  hasIfu: boolean;
}

export async function bookableSets(db: Kysely<Database>, user: SessionUser, siteId: number, keepOrderId?: number): Promise<BookableSet[]> {
  const site = await db
    .selectFrom("sites")
    .select("id")
    .where("id", "=", siteId)
    .where(tenantScope(user, { organisation: "sites.organisation_id", site: "sites.id" }))
    .executeTakeFirst();
  if (!site) throw notFound("That site");
  const rows = await db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial", "sets.giai", "set_types.name", "set_types.set_class", "set_types.ifu_file_id"])
    .where("sets.home_site_id", "=", siteId)
    .where("sets.status", "=", "in_service")
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom("cycles")
            .select("cycles.id")
            .whereRef("cycles.set_id", "=", "sets.id")
            .where("cycles.state", "not in", ["delivered", "cancelled"])
            .where("cycles.order_id", "is distinct from", keepOrderId ?? null),
        ),
      ),
    )
    .orderBy("set_types.name")
    .orderBy("sets.serial")
    .execute();
  return rows.map((r) => ({
    id: r.id,
    serial: r.serial,
    giai: r.giai,
    name: r.name,
    setClass: r.set_class,
    loaner: r.set_class === "loaner_set",
    hasIfu: r.ifu_file_id !== null,
  }));
}
