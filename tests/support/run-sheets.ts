import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { CycleEvent, CycleState } from "@/lib/cycles/lifecycle";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { UNIT_TIME_ZONE } from "@/lib/format";
import { localDay } from "@/lib/runs/shared";

// Test data for run sheets: sets brought to a state through the cycle store, and a published
// plan for today with one driver's run and its stops, written as the planner would leave it.

type Db = Kysely<Database>;

const PATH: { event: CycleEvent; to: CycleState }[] = [
  { event: "collect", to: "collected" },
  { event: "receive", to: "received" },
  { event: "wash_passed", to: "washed" },
  { event: "pack", to: "packed" },
  { event: "sterilise", to: "sterilised" },
  { event: "release", to: "released" },
  { event: "dispatch", to: "dispatched" },
];

export interface FreeSet {
  id: number;
  serial: string;
  giai: string;
  typeName: string;
}

/** A customer site with at least `count` sets at home there that are not on a trip, and those sets. */
export async function freeSetsAtOneSite(db: Db, count: number, skipSiteIds: number[] = []) {
  const rows = await db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("organisations", "organisations.id", "sets.organisation_id")
    .select(["sets.id", "sets.serial", "sets.giai", "sets.organisation_id", "sets.home_site_id", "set_types.name as type_name"])
    .where("sets.status", "=", "in_service")
    .where("organisations.kind", "=", "customer")
    .where("set_types.set_class", "!=", "loaner_set")
    .where((eb) =>
      eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))),
    )
    .orderBy("sets.home_site_id")
    .orderBy("sets.serial")
    .execute();
  const bySite = new Map<number, typeof rows>();
  for (const r of rows) {
    if (skipSiteIds.includes(r.home_site_id)) continue;
    bySite.set(r.home_site_id, [...(bySite.get(r.home_site_id) ?? []), r]);
  }
  const [siteId, sets] = [...bySite.entries()].find(([, s]) => s.length >= count) ?? [];
  if (!siteId || !sets) throw new Error(`no customer site has ${count} free sets`);
  return {
    siteId,
    organisationId: sets[0]!.organisation_id,
    sets: sets.slice(0, count).map((s): FreeSet => ({ id: s.id, serial: s.serial, giai: s.giai, typeName: s.type_name })),
  };
}

/** A pickup order of the sets, each cycle moved along the main line up to `upTo`. */
export async function pickupInState(
  db: Db,
  input: { organisationId: number; siteId: number; setIds: number[]; userId: number; upTo: CycleState; at?: Date },
): Promise<{ orderId: number; cycleIds: number[] }> {
  const at = input.at ?? new Date();
  const iso = at.toISOString();
  return db.transaction().execute(async (trx) => {
    const { id: orderId } = await trx
      .insertInto("orders")
      .values({
        organisation_id: input.organisationId,
        site_id: input.siteId,
        reference: `T-${randomUUID().slice(0, 8).toUpperCase()}`,
        kind: "pickup",
        status: "booked",
        service_level: "standard",
        collection_from: iso,
        collection_until: iso,
        created_by: input.userId,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const cycleIds: number[] = [];
    for (const setId of input.setIds) {
      const cycleId = await openCycle(trx, {
        organisationId: input.organisationId,
        siteId: input.siteId,
        setId,
        orderId,
        serviceLevel: "standard",
        heavySoil: false,
        outOfHours: false,
        loaner: false,
        neededBackBy: null,
        promisedAt: null,
        userId: input.userId,
        at,
      });
      const last = PATH.findIndex((p) => p.to === input.upTo);
      for (const step of PATH.slice(0, last + 1)) {
        await applyCycleEvent(trx, { cycleId, event: step.event, station: "quality", userId: input.userId, at });
      }
      cycleIds.push(cycleId);
    }
    return { orderId, cycleIds };
  });
}

export interface StopSpec {
  organisationId: number;
  siteId: number;
  kind: "collection" | "delivery" | "both";
  collectOrderIds?: number[];
  deliverOrderIds?: number[];
  windowStartMin?: number;
  windowEndMin?: number;
  plannedStartMin?: number;
}

/** Today's plan (made, or the existing one), published, with a run of a new van for the driver and its stops in order. */
export async function publishTodaysRun(db: Db, input: { driverId: number; stops: StopSpec[]; now?: Date; vanName?: string }) {
  const now = input.now ?? new Date();
  const iso = now.toISOString();
  const day = localDay(now, process.env.UNIT_TIME_ZONE ?? UNIT_TIME_ZONE);
  return db.transaction().execute(async (trx) => {
    const code = `T${randomUUID().slice(0, 6).toUpperCase()}`;
    const { id: vanId } = await trx
      .insertInto("vans")
      .values({
        code,
        name: input.vanName ?? `Van ${code}`,
        registration: `LM26 ${code.slice(1, 4)}`,
        soiled_capacity_carts: 6,
        clean_capacity_carts: 6,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    let shift = await trx.selectFrom("driver_shifts").select("id").where("user_id", "=", input.driverId).where("day", "=", day).executeTakeFirst();
    shift ??= await trx
      .insertInto("driver_shifts")
      .values({ user_id: input.driverId, day, start_min: 0, end_min: 1440, van_id: vanId, created_at: iso, updated_at: iso })
      .returning("id")
      .executeTakeFirstOrThrow();
    let plan = await trx.selectFrom("route_plans").select("id").where("day", "=", day).executeTakeFirst();
    plan ??= await trx
      .insertInto("route_plans")
      .values({ day, status: "published", seed: 1, road_factor: 1.3, speed_kmh: 40, created_at: iso, solved_at: iso, published_at: iso })
      .returning("id")
      .executeTakeFirstOrThrow();
    await trx.updateTable("route_plans").set({ status: "published", published_at: iso }).where("id", "=", plan.id).execute();
    const { id: runId } = await trx
      .insertInto("route_runs")
      .values({ plan_id: plan.id, van_id: vanId, driver_user_id: input.driverId, shift_id: shift.id, start_min: 7 * 60 + 30, end_min: 13 * 60 })
      .returning("id")
      .executeTakeFirstOrThrow();
    const stopIds: number[] = [];
    for (const [index, s] of input.stops.entries()) {
      const start = s.windowStartMin ?? 8 * 60 + index * 45;
      const { id } = await trx
        .insertInto("route_stops")
        .values({
          plan_id: plan.id,
          run_id: runId,
          position: index + 1,
          organisation_id: s.organisationId,
          site_id: s.siteId,
          kind: s.kind,
          window_start_min: start,
          window_end_min: s.windowEndMin ?? start + 120,
          service_min: 10,
          planned_arrival_min: s.plannedStartMin ?? start + 15,
          planned_start_min: s.plannedStartMin ?? start + 15,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      for (const orderId of s.collectOrderIds ?? []) await trx.insertInto("route_stop_orders").values({ stop_id: id, order_id: orderId, role: "collect" }).execute();
      for (const orderId of s.deliverOrderIds ?? []) await trx.insertInto("route_stop_orders").values({ stop_id: id, order_id: orderId, role: "deliver" }).execute();
      stopIds.push(id);
    }
    return { planId: plan.id, runId, vanId, stopIds };
  });
}
