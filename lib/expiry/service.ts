import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { serverEnv } from "@/lib/env";
import { addDays, type ExpiryStatus, expiryStatus, localDateOf } from "./dates";
import { DEFAULT_EXPIRY_DAYS } from "./schemas";

// Sets at the clinic whose sterile pack is nearing its expiry date, or past it: delivered, not
// used for a procedure since, and not on a newer trip to the unit. A newer cycle that was
// cancelled does not count: the set never left, so its pack is still the delivered one.

export interface ExpiringSetRow {
  cycleId: number;
  setId: number;
  serial: string;
  setName: string;
  siteId: number;
  siteName: string;
  deliveredAt: string | null;
  /** Local date "YYYY-MM-DD" printed on the label. */
  expiresOn: string;
  daysLeft: number;
  status: Exclude<ExpiryStatus, "later">;
}

export interface ExpiringList {
  /** The local date the list was made for. */
  today: string;
  days: number;
  rows: ExpiringSetRow[];
}

/** The caller's delivered sets expiring within `days` days from today (inclusive), or already expired. */
export async function listExpiringSets(
  db: Kysely<Database>,
  user: SessionUser,
  options: { now?: Date; days?: number; limit?: number } = {},
): Promise<ExpiringList> {
  const now = options.now ?? new Date();
  const days = options.days ?? DEFAULT_EXPIRY_DAYS;
  const today = localDateOf(now, serverEnv().UNIT_TIME_ZONE);
  const cutoff = addDays(today, days);
  let query = db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("sites", "sites.id", "cycles.site_id")
    .select([
      "cycles.id as cycle_id",
      "cycles.set_id",
      "sets.serial",
      "set_types.name as set_name",
      "cycles.site_id",
      "sites.name as site_name",
      "cycles.delivered_at",
      "cycles.expires_on",
    ])
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .where("cycles.state", "=", "delivered")
    .where("cycles.expires_on", "is not", null)
    .where("cycles.expires_on", "<=", cutoff)
    .where("sets.status", "=", "in_service")
    .where((eb) => eb.not(eb.exists(eb.selectFrom("procedure_uses").select("procedure_uses.id").whereRef("procedure_uses.cycle_id", "=", "cycles.id"))))
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom("cycles as newer")
            .select("newer.id")
            .whereRef("newer.set_id", "=", "cycles.set_id")
            .whereRef("newer.id", ">", "cycles.id")
            .where("newer.state", "!=", "cancelled"),
        ),
      ),
    )
    .orderBy("cycles.expires_on")
    .orderBy("sets.serial");
  if (options.limit) query = query.limit(options.limit);
  const rows = await query.execute();
  return {
    today,
    days,
    rows: rows.map((r) => {
      const { status, daysLeft } = expiryStatus(r.expires_on!, today, days);
      return {
        cycleId: r.cycle_id,
        setId: r.set_id,
        serial: r.serial,
        setName: r.set_name,
        siteId: r.site_id,
        siteName: r.site_name,
        deliveredAt: r.delivered_at,
        expiresOn: r.expires_on!,
        daysLeft,
        status: status === "later" ? "soon" : status,
      };
    }),
  };
}
