import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { CycleEvent } from "@/lib/cycles/lifecycle";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { createSets } from "@/lib/sets/service";
import type { DemoDatabase } from "./demo-database";
import { sessionUser } from "./session";

// Sets of a test's own on the demo database, and their trips to "delivered": every move goes
// through applyCycleEvent, as the stations make it.

/** The moves of a whole trip, from the pickup to the delivery at the clinic. */
export const TO_DELIVERED: readonly CycleEvent[] = ["collect", "receive", "wash_passed", "pack", "sterilise", "release", "dispatch", "deliver"];

/** When a trip made by deliveredCycle starts; each move follows the last by an hour. */
const TRIP_START = new Date("2026-11-20T08:00:00Z");

/**
 * Opens a cycle for the set and takes it through a whole trip to "delivered", or only up to and
 * including the move `upTo`. With `expiresOn` (null clears it) the cycle gets the label's expiry
 * date, which sterilisation records do not set yet. Returns the cycle's id.
 */
export async function deliveredCycle(db: Kysely<Database>, setId: number, options: { expiresOn?: string | null; upTo?: CycleEvent } = {}): Promise<number> {
  const set = await db.selectFrom("sets").select(["organisation_id", "home_site_id"]).where("id", "=", setId).executeTakeFirstOrThrow();
  const cycleId = await openCycle(db, {
    organisationId: set.organisation_id,
    siteId: set.home_site_id,
    setId,
    orderId: null,
    serviceLevel: "standard",
    heavySoil: false,
    outOfHours: false,
    loaner: false,
    neededBackBy: null,
    promisedAt: null,
    userId: null,
    at: TRIP_START,
  });
  let minutes = 0;
  for (const event of TO_DELIVERED) {
    minutes += 60;
    await applyCycleEvent(db, { cycleId, event, station: event === "deliver" ? "clinic" : "receiving", userId: null, at: new Date(TRIP_START.getTime() + minutes * 60_000) });
    if (event === options.upTo) break;
  }
  if (options.expiresOn !== undefined) await db.updateTable("cycles").set({ expires_on: options.expiresOn }).where("id", "=", cycleId).execute();
  return cycleId;
}

export interface FreshSet {
  id: number;
  serial: string;
  giai: string;
  /** The set type's name. */
  name: string;
}

/**
 * New sets with no history at a demo site (named as in the seed), of the first active set type of
 * its customer by code that is not a loaner set, added by the unit's administrator at `now`.
 */
export async function freshSets(t: DemoDatabase, siteName: string, count: number, now: Date): Promise<FreshSet[]> {
  const siteId = t.seed.sites[siteName];
  if (siteId === undefined) throw new Error(`The demo has no site named "${siteName}".`);
  const admin = await sessionUser(t.db, t.seed.users["admin@larkmoor.example"]!);
  const site = await t.db.selectFrom("sites").select(["id", "organisation_id"]).where("id", "=", siteId).executeTakeFirstOrThrow();
  const type = await t.db
    .selectFrom("set_types")
    .select(["id", "name"])
    .where("organisation_id", "=", site.organisation_id)
    .where("set_class", "!=", "loaner_set")
    .where("active", "=", 1)
    .orderBy("code")
    .executeTakeFirstOrThrow();
  const { sets } = await createSets(t.db, admin, { organisationId: site.organisation_id, setTypeId: type.id, homeSiteId: site.id, count }, now);
  return sets.map((s) => ({ ...s, name: type.name }));
}
