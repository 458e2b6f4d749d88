import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { CycleEvent, CycleState } from "@/lib/cycles/lifecycle";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { loadSessionUser } from "@/lib/auth/session-user";
import { moveStop, planDayWithin } from "@/lib/dispatch/plan";
import { publishPlan } from "@/lib/dispatch/publish";
import { planClock } from "@/lib/dispatch/stops";
import { UNIT_TIME_ZONE } from "@/lib/format";
import { localDay } from "@/lib/runs/shared";
import { WEEKDAYS, weeklyHours } from "@/lib/sites/opening-hours";

// Test data for run sheets: sets brought to a state through the cycle store, and today's plan
// with one driver's run of given stops, planned, arranged and published by the dispatch code.

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

/** Opening hours of the sites made here. */
const ROUND_THE_CLOCK = JSON.stringify(weeklyHours(WEEKDAYS, "00:00", "24:00"));

export interface FreeSet {
  id: number;
  serial: string;
  giai: string;
  typeName: string;
}

/**
 * `count` sets of one customer that are not on a trip, at a site of the test's own: a copy of
 * their demo site (same customer, address and contacts) that is open round the clock, made their
 * home. No demo order goes there, so the planner's stops at it serve only what the test books, on
 * whatever weekday the tests run. `skipSiteIds` are demo sites (or sites made here) to pass over.
 */
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
  const [homeId, sets] = [...bySite.entries()].find(([, s]) => s.length >= count) ?? [];
  if (!homeId || !sets) throw new Error(`no customer site has ${count} free sets`);
  const chosen = sets.slice(0, count);
  const siteId = await db.transaction().execute(async (trx) => {
    const { id: _id, name, ...home } = await trx.selectFrom("sites").selectAll().where("id", "=", homeId).executeTakeFirstOrThrow();
    const iso = new Date().toISOString();
    const { id } = await trx
      .insertInto("sites")
      .values({ ...home, name: `${name} – test bay ${randomUUID().slice(0, 6)}`, opening_hours: ROUND_THE_CLOCK, created_at: iso, updated_at: iso })
      .returning("id")
      .executeTakeFirstOrThrow();
    await trx.updateTable("sets").set({ home_site_id: id, updated_at: iso }).where("id", "in", chosen.map((c) => c.id)).execute();
    return id;
  });
  return {
    siteId,
    /** The demo site the sets came from (pass it in `skipSiteIds` to stay off it). */
    homeSiteId: homeId,
    organisationId: chosen[0]!.organisation_id,
    sets: chosen.map((s): FreeSet => ({ id: s.id, serial: s.serial, giai: s.giai, typeName: s.type_name })),
  };
}

/**
 * A pickup order of the sets, each cycle moved along the main line up to `upTo`. Its collection
 * window is today (the unit's day of `at`), the whole day unless `window` gives minutes after
 * local midnight.
 */
export async function pickupInState(
  db: Db,
  input: { organisationId: number; siteId: number; setIds: number[]; userId: number; upTo: CycleState; at?: Date; window?: { fromMin: number; untilMin: number } },
): Promise<{ orderId: number; cycleIds: number[] }> {
  const at = input.at ?? new Date();
  const iso = at.toISOString();
  const timeZone = process.env.UNIT_TIME_ZONE ?? UNIT_TIME_ZONE;
  const clock = planClock(localDay(at, timeZone), timeZone);
  const localInstant = (minuteOfDay: number) => clock.instantOf(clock.wallMinutes(minuteOfDay)).toISOString();
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
        collection_from: localInstant(input.window?.fromMin ?? 0),
        collection_until: localInstant(input.window?.untilMin ?? 1440),
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
      await moveAlong(trx, cycleId, "booked", input.upTo, input.userId, at);
      cycleIds.push(cycleId);
    }
    return { orderId, cycleIds };
  });
}

/** Moves a cycle along the main line from state `from` up to `upTo`, one event at a time. */
async function moveAlong(db: Db, cycleId: number, from: CycleState, upTo: CycleState, userId: number, at: Date) {
  const first = PATH.findIndex((p) => p.to === from) + 1;
  const last = PATH.findIndex((p) => p.to === upTo);
  for (const step of PATH.slice(first, last + 1)) {
    await applyCycleEvent(db, { cycleId, event: step.event, station: "quality", userId, at });
  }
}

/** Moves cycles on along the main line from where they stand up to `upTo` (for example, dispatched once the run is published). */
export async function advanceCycles(db: Db, input: { cycleIds: number[]; userId: number; upTo: CycleState; at?: Date }): Promise<void> {
  const at = input.at ?? new Date();
  await db.transaction().execute(async (trx) => {
    const rows = await trx.selectFrom("cycles").select(["id", "state"]).where("id", "in", input.cycleIds).execute();
    for (const cycleId of input.cycleIds) {
      const row = rows.find((r) => r.id === cycleId);
      if (!row) throw new Error(`No cycle ${cycleId}.`);
      await moveAlong(trx, cycleId, row.state as CycleState, input.upTo, input.userId, at);
    }
  });
}

export interface StopSpec {
  siteId: number;
  /** What the planner must have made of the orders there. */
  kind: "collection" | "delivery" | "both";
  /** The orders the stop serves: pickups to collect, orders whose sets go back. */
  collectOrderIds?: number[];
  deliverOrderIds?: number[];
}

/** Vans made here have codes starting so; on their runs only the stops placed here stay. */
const VAN_PREFIX = "T";
const DISPATCHER = "dispatch@larkmoor.example";
/** A bounded search keeps the plan reproducible (as the demo seed plans its day). */
const PLAN_SEED = 1;
const PLAN_ITERATIONS = 200;

/**
 * Today's plan, made and published as the dispatcher makes it: the driver's shift today gets a new
 * van, the day is planned from the orders (planDayWithin), each given stop is moved onto that van
 * in the order given (moveStop, which locks it there), and the plan is published (publishPlan,
 * with its expected-time e-mails). Stops the planner put on a van made here that
 * were not placed here are taken off the runs, so such a run holds only what a test asked for.
 * The orders must be due that day: pickups booked for it, sets released and waiting to go back.
 */
export async function publishTodaysRun(db: Db, input: { driverId: number; stops: StopSpec[]; now?: Date; vanName?: string }) {
  const now = input.now ?? new Date();
  const iso = now.toISOString();
  const day = localDay(now, process.env.UNIT_TIME_ZONE ?? UNIT_TIME_ZONE);
  const dispatcherRow = await db.selectFrom("users").select(["id", "session_version"]).where("email", "=", DISPATCHER).executeTakeFirstOrThrow();
  const dispatcher = await loadSessionUser(db, { userId: dispatcherRow.id, sessionVersion: dispatcherRow.session_version });
  if (!dispatcher) throw new Error(`${DISPATCHER} cannot sign in: the demo's dispatcher plans the day.`);

  const vanId = await db.transaction().execute(async (trx) => {
    const code = `${VAN_PREFIX}${randomUUID().slice(0, 6).toUpperCase()}`;
    const { id } = await trx
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
    const shift = await trx.selectFrom("driver_shifts").select("id").where("user_id", "=", input.driverId).where("day", "=", day).executeTakeFirst();
    if (shift) await trx.updateTable("driver_shifts").set({ van_id: id, updated_at: iso }).where("id", "=", shift.id).execute();
    else await trx.insertInto("driver_shifts").values({ user_id: input.driverId, day, start_min: 0, end_min: 1440, van_id: id, created_at: iso, updated_at: iso }).execute();
    return id;
  });

  const { planId } = await db.transaction().execute((trx) => planDayWithin(trx, dispatcher, { day, seed: PLAN_SEED }, now, PLAN_ITERATIONS));
  const planned = await db.selectFrom("route_stops").select(["id", "site_id", "kind"]).where("plan_id", "=", planId).where("status", "=", "planned").execute();
  const links = await db
    .selectFrom("route_stop_orders")
    .innerJoin("route_stops", "route_stops.id", "route_stop_orders.stop_id")
    .select(["route_stop_orders.stop_id", "route_stop_orders.order_id", "route_stop_orders.role"])
    .where("route_stops.plan_id", "=", planId)
    .execute();
  const served = (stopId: number) =>
    links
      .filter((l) => l.stop_id === stopId)
      .map((l) => `${l.role}:${l.order_id}`)
      .sort()
      .join(",");
  const stopIds: number[] = [];
  for (const [index, spec] of input.stops.entries()) {
    const wanted = [...(spec.collectOrderIds ?? []).map((id) => `collect:${id}`), ...(spec.deliverOrderIds ?? []).map((id) => `deliver:${id}`)].sort().join(",");
    const stop = planned.find((p) => p.site_id === spec.siteId && p.kind === spec.kind && served(p.id) === wanted);
    if (!stop) {
      const plan = await db.selectFrom("route_plans").select("summary").where("id", "=", planId).executeTakeFirstOrThrow();
      const found = planned.filter((p) => p.site_id === spec.siteId).map((p) => `${p.kind} ${served(p.id)}`);
      throw new Error(`The plan has no ${spec.kind} stop at site ${spec.siteId} serving exactly ${wanted} (its stops there: ${found.join("; ") || "none"}). Plan summary: ${plan.summary}`);
    }
    await moveStop(db, dispatcher, { stopId: stop.id, vanId, position: index + 1 }, now);
    stopIds.push(stop.id);
  }

  // The planner's own additions to the vans made here go off the runs.
  const extras = await db
    .selectFrom("route_stops")
    .innerJoin("route_runs", "route_runs.id", "route_stops.run_id")
    .innerJoin("vans", "vans.id", "route_runs.van_id")
    .select("route_stops.id")
    .where("route_stops.plan_id", "=", planId)
    .where("route_stops.status", "=", "planned")
    .where("route_stops.locked", "=", 0)
    .where("vans.code", "like", `${VAN_PREFIX}%`)
    .orderBy("route_stops.id")
    .execute();
  for (const extra of extras) await moveStop(db, dispatcher, { stopId: extra.id, vanId: null, position: 1 }, now);

  await publishPlan(db, dispatcher, day, now);
  const run = await db.selectFrom("route_runs").select("id").where("plan_id", "=", planId).where("van_id", "=", vanId).executeTakeFirstOrThrow();
  return { planId, runId: run.id, vanId, stopIds };
}
