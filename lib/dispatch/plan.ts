import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { assertCan } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { evaluateRoute, GreatCircleTravel, type Problem, type Solution, solve, type Stop, type Vehicle, type Violation } from "@/lib/routing";
import { solveInWorker } from "@/lib/routing/solve-in-worker";
import { parseOpeningHours } from "@/lib/sites/opening-hours";
import { buildDayStops, type CollectionInput, type DayStop, type DeliveryInput, planClock, type StopSite, type UnplannableVisit } from "./stops";

// A day's plan of van runs: the stops built from the orders, the planner's proposal, the
// dispatcher's moves and locks, and the figures of every run. The plan is advisory: the
// dispatcher, the drivers' working-time rules and local regulations have the last word.
//
// Decisions:
// - Stops are rebuilt from the orders each time the day is planned; a stop that still serves the
//   same orders at the same site keeps its row (and its lock and e-mailed time).
// - The planner runs outside the write transaction (it searches for up to PLAN_BUDGET_MS); the
//   write then checks that the plan's stops are still the ones it planned.
// - Locked stops keep their van; the locked stops of one van keep their order (fixed sequence),
//   and a run's locked prefix keeps its exact places.
// - Any change after publishing turns the plan back into a draft until it is published again.

type Db = Kysely<Database> | Transaction<Database>;

export const PLAN_BUDGET_MS = 1500;
export const DEFAULT_ROAD_FACTOR = 1.3;
/** Average speed door to door in town and on country roads; a planning default, not measured. */
export const DEFAULT_SPEED_KMH = 40;

export interface PlanSummary {
  /** Orders that cannot be visited that day, with the reason. */
  infeasible: UnplannableVisit[];
  /** Why each stop off the runs is off them, by stop id. */
  unassigned: Record<string, string>;
  /** Broken rules of the runs as they stand, worded for the dispatcher. */
  violations: Violation[];
  totals: { distanceKm: number; driveMin: number; lateMin: number; stops: number; assigned: number; vans: number };
  search?: { iterations: number; elapsedMs: number; seed: number };
  /** Vans with a shift whose driver has no van, or vans on a plan whose shift went. */
  warnings: string[];
}

const timeZone = () => serverEnv().UNIT_TIME_ZONE;

/** The orders of a day, read for the stops builder. Skips orders already on another day's plan. */
export async function loadDayInput(db: Db, day: string) {
  const clock = planClock(day, timeZone());
  const dayStart = new Date(clock.midnight).toISOString();
  const dayEnd = clock.instantOf(clock.wallMinutes(1440)).toISOString();
  const siteRows = await db
    .selectFrom("sites")
    .innerJoin("organisations", "organisations.id", "sites.organisation_id")
    .select(["sites.id", "sites.organisation_id", "sites.name", "sites.opening_hours", "sites.latitude", "sites.longitude", "sites.is_depot"])
    .where("sites.active", "=", 1)
    .execute();
  const depot = siteRows.find((s) => s.is_depot === 1);
  if (!depot) throw new AppError("conflict", "No depot site is set up: the runs need the unit's address to start from.");
  const sites: (StopSite & { lat: number; lon: number })[] = siteRows
    .filter((s) => s.is_depot !== 1)
    .map((s) => ({ id: s.id, organisationId: s.organisation_id, name: s.name, openingHours: parseOpeningHours(s.opening_hours), lat: s.latitude, lon: s.longitude }));

  const onOtherPlan = (role: "collect" | "deliver") =>
    db
      .selectFrom("route_stop_orders")
      .innerJoin("route_stops", "route_stops.id", "route_stop_orders.stop_id")
      .innerJoin("route_plans", "route_plans.id", "route_stops.plan_id")
      .select("route_stop_orders.order_id")
      .where("route_stop_orders.role", "=", role)
      .where("route_plans.day", "!=", day)
      .where("route_stops.status", "!=", "not_served");

  const pickupRows = await db
    .selectFrom("orders")
    .innerJoin("cycles", "cycles.order_id", "orders.id")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["orders.id", "orders.reference", "orders.site_id", "orders.collection_from", "orders.collection_until", "cycles.id as cycle_id", "sets.id as set_id", "sets.serial", "set_types.name as set_name"])
    .where("orders.kind", "=", "pickup")
    .where("orders.status", "=", "booked")
    .where("cycles.state", "=", "booked")
    .where("orders.collection_from", "<", dayEnd)
    .where("orders.collection_until", ">", dayStart)
    .where("orders.id", "not in", onOtherPlan("collect"))
    .orderBy("orders.id")
    .orderBy("sets.serial")
    .execute();
  const collections = new Map<number, CollectionInput>();
  for (const r of pickupRows) {
    const c = collections.get(r.id) ?? { orderId: r.id, reference: r.reference, siteId: r.site_id, collectionFrom: r.collection_from!, collectionUntil: r.collection_until!, sets: [] };
    c.sets.push({ cycleId: r.cycle_id, setId: r.set_id, serial: r.serial, name: r.set_name });
    collections.set(r.id, c);
  }

  const releasedRows = await db
    .selectFrom("cycles")
    .innerJoin("orders", (j) => j.on((eb) => eb("orders.id", "=", eb.fn.coalesce("cycles.return_order_id", "cycles.order_id"))))
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select([
      "orders.id as order_id",
      "orders.reference",
      "cycles.site_id",
      "cycles.id as cycle_id",
      "sets.id as set_id",
      "sets.serial",
      "set_types.name as set_name",
      (eb) => eb.fn.coalesce("cycles.needed_back_by", "orders.needed_back_by").as("needed_back_by"),
    ])
    .where("cycles.state", "=", "released")
    .where("cycles.keep_in_store", "=", 0)
    .where("orders.id", "not in", onOtherPlan("deliver"))
    .orderBy("orders.id")
    .orderBy("sets.serial")
    .execute();
  const deliveries: DeliveryInput[] = releasedRows.map((r) => ({
    orderId: r.order_id,
    reference: r.reference,
    siteId: r.site_id,
    neededBackBy: r.needed_back_by,
    set: { cycleId: r.cycle_id, setId: r.set_id, serial: r.serial, name: r.set_name },
  }));
  return { sites, depot: { id: depot.id, lat: depot.latitude, lon: depot.longitude, openingHours: parseOpeningHours(depot.opening_hours) }, collections: [...collections.values()], deliveries };
}

function stopKey(siteId: number, kind: string, orders: { role: string; order_id: number }[]): string {
  return `${siteId}|${kind}|${orders.map((o) => `${o.role}:${o.order_id}`).sort().join(",")}`;
}

async function getPlan(db: Db, day: string) {
  return db.selectFrom("route_plans").selectAll().where("day", "=", day).executeTakeFirst();
}

/** Brings the plan's stops in line with the orders; returns what cannot be visited. */
async function syncStops(trx: Transaction<Database>, planId: number, built: DayStop[]) {
  const existing = await trx.selectFrom("route_stops").select(["id", "site_id", "kind", "status"]).where("plan_id", "=", planId).execute();
  const links = await trx
    .selectFrom("route_stop_orders")
    .innerJoin("route_stops", "route_stops.id", "route_stop_orders.stop_id")
    .select(["route_stop_orders.stop_id", "route_stop_orders.order_id", "route_stop_orders.role"])
    .where("route_stops.plan_id", "=", planId)
    .execute();
  const byKey = new Map<string, number>();
  for (const s of existing) byKey.set(stopKey(s.site_id, s.kind, links.filter((l) => l.stop_id === s.id)), s.id);
  const kept = new Set<number>();
  for (const stop of built) {
    const values = {
      window_start_min: stop.windowStartMin,
      window_end_min: stop.windowEndMin,
      hard: stop.hard ? 1 : 0,
      service_min: stop.serviceMin,
      soiled_carts: stop.soiledCarts,
      clean_carts: stop.cleanCarts,
      note: stop.notes.join(" ") || null,
    };
    const id = byKey.get(stop.key);
    if (id !== undefined) {
      kept.add(id);
      await trx.updateTable("route_stops").set(values).where("id", "=", id).execute();
      continue;
    }
    const row = await trx
      .insertInto("route_stops")
      .values({ ...values, plan_id: planId, organisation_id: stop.organisationId, site_id: stop.siteId, kind: stop.kind })
      .returning("id")
      .executeTakeFirstOrThrow();
    await trx
      .insertInto("route_stop_orders")
      .values(stop.orders.map((o) => ({ stop_id: row.id, order_id: o.orderId, role: o.role })))
      .execute();
    kept.add(row.id);
  }
  // Stops whose orders moved on (collected, cancelled) or regrouped; served stops stay as history.
  const gone = existing.filter((s) => !kept.has(s.id) && s.status === "planned").map((s) => s.id);
  if (gone.length > 0) {
    const scanned = await trx.selectFrom("stop_scans").select("stop_id").where("stop_id", "in", gone).execute();
    const removable = gone.filter((id) => !scanned.some((s) => s.stop_id === id));
    if (removable.length > 0) {
      await trx.deleteFrom("route_stop_orders").where("stop_id", "in", removable).execute();
      await trx.deleteFrom("route_stops").where("id", "in", removable).execute();
    }
  }
}

interface PlanModel {
  planId: number;
  problem: Problem;
  travel: GreatCircleTravel;
  /** Current run of each van: stop ids in order. */
  runs: Map<string, string[]>;
  /** Van id → its shift and driver. */
  shifts: Map<string, { shiftId: number; userId: number }>;
  warnings: string[];
}

/** The routing problem of a plan as it stands in the tables. */
async function planModel(db: Db, plan: { id: number; day: string; road_factor: number; speed_kmh: number }): Promise<PlanModel> {
  const clock = planClock(plan.day, timeZone());
  const depot = await db.selectFrom("sites").select(["latitude", "longitude"]).where("is_depot", "=", 1).where("active", "=", 1).executeTakeFirst();
  if (!depot) throw new AppError("conflict", "No depot site is set up: the runs need the unit's address to start from.");
  const shiftRows = await db
    .selectFrom("driver_shifts")
    .innerJoin("users", "users.id", "driver_shifts.user_id")
    .leftJoin("vans", "vans.id", "driver_shifts.van_id")
    .select([
      "driver_shifts.id",
      "driver_shifts.user_id",
      "users.name",
      "driver_shifts.van_id",
      "driver_shifts.start_min",
      "driver_shifts.end_min",
      "driver_shifts.break_earliest_min",
      "driver_shifts.break_latest_min",
      "driver_shifts.break_duration_min",
      "vans.active as van_active",
      "vans.code as van_code",
      "vans.soiled_capacity_carts",
      "vans.clean_capacity_carts",
    ])
    .where("driver_shifts.day", "=", plan.day)
    .orderBy("vans.code")
    .execute();
  const warnings: string[] = [];
  const vehicles: Vehicle[] = [];
  const shifts = new Map<string, { shiftId: number; userId: number }>();
  for (const s of shiftRows) {
    if (s.van_id === null) {
      warnings.push(`${s.name} has a shift but no van: give the shift a van to use it.`);
      continue;
    }
    if (s.van_active !== 1) {
      warnings.push(`${s.name}'s van ${s.van_code} is out of service: choose another van for the shift.`);
      continue;
    }
    const id = String(s.van_id);
    shifts.set(id, { shiftId: s.id, userId: s.user_id });
    vehicles.push({
      id,
      soiledCapacity: s.soiled_capacity_carts ?? 0,
      cleanCapacity: s.clean_capacity_carts ?? 0,
      shiftStartMin: clock.wallMinutes(s.start_min),
      shiftEndMin: clock.wallMinutes(s.end_min),
      breakMin:
        s.break_duration_min > 0 && s.break_earliest_min !== null && s.break_latest_min !== null
          ? { earliestMin: clock.wallMinutes(s.break_earliest_min), latestMin: clock.wallMinutes(s.break_latest_min), durationMin: s.break_duration_min }
          : null,
    });
  }
  const allStops = await db
    .selectFrom("route_stops")
    .innerJoin("sites", "sites.id", "route_stops.site_id")
    .leftJoin("route_runs", "route_runs.id", "route_stops.run_id")
    .select([
      "route_stops.id",
      "route_stops.position",
      "route_stops.locked",
      "route_stops.window_start_min",
      "route_stops.window_end_min",
      "route_stops.hard",
      "route_stops.service_min",
      "route_stops.soiled_carts",
      "route_stops.clean_carts",
      "route_stops.status",
      "sites.latitude",
      "sites.longitude",
      "route_runs.van_id",
    ])
    .where("route_stops.plan_id", "=", plan.id)
    .where("route_stops.status", "=", "planned")
    .orderBy("route_runs.van_id")
    .orderBy("route_stops.position")
    .execute();
  const runs = new Map<string, string[]>(vehicles.map((v) => [v.id, []]));
  const stops: Stop[] = [];
  for (const s of allStops) {
    const van = s.van_id === null ? null : String(s.van_id);
    const onRun = van !== null && runs.has(van);
    if (onRun) runs.get(van)!.push(String(s.id));
    stops.push({
      id: String(s.id),
      location: { lat: s.latitude, lon: s.longitude },
      serviceMin: s.service_min,
      soiled: s.soiled_carts,
      clean: s.clean_carts,
      windows: [{ startMin: s.window_start_min, endMin: s.window_end_min }],
      hard: s.hard === 1,
      ...(s.locked === 1 && onRun ? { lockedVehicle: van! } : {}),
    });
  }
  // Locks: the van's locked stops keep their relative order; a locked prefix keeps its places.
  const byId = new Map(stops.map((s) => [s.id, s]));
  for (const v of vehicles) {
    const seq = runs.get(v.id)!;
    const locked = seq.filter((id) => byId.get(id)!.lockedVehicle === v.id);
    if (locked.length > 0) v.fixedStops = locked;
    for (let i = 0; i < seq.length && byId.get(seq[i]!)!.lockedVehicle === v.id; i++) byId.get(seq[i]!)!.lockedPosition = i + 1;
  }
  const travel = new GreatCircleTravel({ roadFactor: plan.road_factor, speedKmh: plan.speed_kmh });
  const dayEnd = clock.wallMinutes(1440);
  return {
    planId: plan.id,
    problem: { depot: { location: { lat: depot.latitude, lon: depot.longitude }, openMin: 0, closeMin: dayEnd }, vehicles, stops },
    travel,
    runs,
    shifts,
    warnings,
  };
}

/** Writes every run's timetable and figures from the stop order in `runs`; returns the broken rules. */
async function writeRuns(trx: Transaction<Database>, model: PlanModel, runs: Map<string, string[]>): Promise<Violation[]> {
  const violations: Violation[] = [];
  const existingRuns = await trx.selectFrom("route_runs").select(["id", "van_id"]).where("plan_id", "=", model.planId).execute();
  const runIdOf = new Map(existingRuns.map((r) => [String(r.van_id), r.id]));
  // Runs of vans that lost their shift hold no stops any more.
  const stale = existingRuns.filter((r) => !model.shifts.has(String(r.van_id))).map((r) => r.id);
  if (stale.length > 0) {
    await trx.updateTable("route_stops").set({ run_id: null, position: null, locked: 0 }).where("run_id", "in", stale).where("status", "=", "planned").execute();
    await trx.deleteFrom("route_runs").where("id", "in", stale).where((eb) => eb.not(eb.exists(eb.selectFrom("route_stops").select("id").whereRef("route_stops.run_id", "=", "route_runs.id")))).execute();
  }
  for (const vehicle of model.problem.vehicles) {
    const seq = runs.get(vehicle.id) ?? [];
    const { route, violations: broken } = evaluateRoute(model.problem, model.travel, vehicle.id, seq);
    violations.push(...broken);
    const shift = model.shifts.get(vehicle.id)!;
    const figures = {
      driver_user_id: shift.userId,
      shift_id: shift.shiftId,
      distance_km: Math.round(route.distanceKm * 100) / 100,
      drive_min: Math.round(route.driveMin * 10) / 10,
      start_min: seq.length > 0 ? route.departMin : null,
      end_min: seq.length > 0 ? route.endMin : null,
    };
    let runId = runIdOf.get(vehicle.id);
    if (runId === undefined) {
      ({ id: runId } = await trx.insertInto("route_runs").values({ ...figures, plan_id: model.planId, van_id: Number(vehicle.id) }).returning("id").executeTakeFirstOrThrow());
    } else {
      await trx.updateTable("route_runs").set(figures).where("id", "=", runId).execute();
    }
    for (const [k, rs] of route.stops.entries()) {
      await trx
        .updateTable("route_stops")
        .set({
          run_id: runId,
          position: k + 1,
          planned_arrival_min: Math.round(rs.arrivalMin * 10) / 10,
          planned_start_min: Math.round(rs.startMin * 10) / 10,
          late_min: Math.round(rs.lateMin * 10) / 10,
        })
        .where("id", "=", Number(rs.stopId))
        .execute();
    }
  }
  for (const stop of model.problem.stops) {
    if ([...runs.values()].some((seq) => seq.includes(stop.id))) continue;
    await trx
      .updateTable("route_stops")
      .set({ run_id: null, position: null, planned_arrival_min: null, planned_start_min: null, late_min: null, locked: 0 })
      .where("id", "=", Number(stop.id))
      .execute();
  }
  return violations;
}

async function writeSummary(
  trx: Transaction<Database>,
  planId: number,
  extra: Partial<PlanSummary>,
  violations: Violation[],
  warnings: string[],
  now: Date,
) {
  const plan = await trx.selectFrom("route_plans").select("summary").where("id", "=", planId).executeTakeFirstOrThrow();
  const before = JSON.parse(plan.summary || "{}") as Partial<PlanSummary>;
  const runs = await trx.selectFrom("route_runs").select(["distance_km", "drive_min", "id"]).where("plan_id", "=", planId).execute();
  const stops = await trx.selectFrom("route_stops").select(["id", "run_id", "late_min"]).where("plan_id", "=", planId).execute();
  const used = new Set(stops.filter((s) => s.run_id !== null).map((s) => s.run_id));
  const offRuns = new Set(stops.filter((s) => s.run_id === null).map((s) => String(s.id)));
  const reasons = { ...(before.unassigned ?? {}), ...(extra.unassigned ?? {}) };
  const summary: PlanSummary = {
    infeasible: extra.infeasible ?? before.infeasible ?? [],
    unassigned: Object.fromEntries([...offRuns].map((id) => [id, reasons[id] ?? "Not on any run."])),
    violations,
    warnings,
    search: extra.search ?? before.search,
    totals: {
      distanceKm: Math.round(runs.filter((r) => used.has(r.id)).reduce((n, r) => n + r.distance_km, 0) * 100) / 100,
      driveMin: Math.round(runs.filter((r) => used.has(r.id)).reduce((n, r) => n + r.drive_min, 0)),
      lateMin: Math.round(stops.reduce((n, s) => n + (s.late_min ?? 0), 0)),
      stops: stops.length,
      assigned: stops.filter((s) => s.run_id !== null).length,
      vans: used.size,
    },
  };
  await trx.updateTable("route_plans").set({ summary: JSON.stringify(summary), status: "draft", solved_at: now.toISOString() }).where("id", "=", planId).execute();
}

/** The plan's current runs as a Solution (for checks such as validateSolution). */
export async function currentSolution(db: Db, day: string): Promise<{ problem: Problem; solution: Solution; travel: GreatCircleTravel }> {
  const plan = await getPlan(db, day);
  if (!plan) throw notFound("The plan for that day");
  const model = await planModel(db, plan);
  const routes = model.problem.vehicles
    .filter((v) => (model.runs.get(v.id) ?? []).length > 0)
    .map((v) => evaluateRoute(model.problem, model.travel, v.id, model.runs.get(v.id)!).route);
  const assigned = new Set(routes.flatMap((r) => r.stops.map((s) => s.stopId)));
  const reasons = (JSON.parse(plan.summary || "{}") as Partial<PlanSummary>).unassigned ?? {};
  const unassigned = model.problem.stops.filter((s) => !assigned.has(s.id)).map((s) => ({ stopId: s.id, reason: reasons[s.id] ?? "Not on any run." }));
  const distanceKm = routes.reduce((n, r) => n + r.distanceKm, 0);
  const driveMin = routes.reduce((n, r) => n + r.driveMin, 0);
  const lateMin = routes.reduce((n, r) => n + r.lateMin, 0);
  return {
    problem: model.problem,
    travel: model.travel,
    solution: { routes, unassigned, cost: { unassigned: unassigned.length, vehicles: routes.length, distanceKm, driveMin, lateMin, objective: distanceKm + 5 * lateMin } },
  };
}

async function assertNotStarted(db: Db, planId: number) {
  const served = await db.selectFrom("route_stops").select("id").where("plan_id", "=", planId).where("status", "!=", "planned").executeTakeFirst();
  if (served) throw new AppError("conflict", "The day's runs have started (a stop is already served): move stops by hand instead of planning again.");
}

/**
 * Plans a day: builds its stops from the orders, asks the planner for runs (keeping locked
 * stops where they are) and stores them as a draft.
 */
export async function planDay(db: Kysely<Database>, user: SessionUser, input: { day: string; seed: number }, now = new Date(), budgetMs = PLAN_BUDGET_MS) {
  assertCan(user, "routes.plan");
  const tz = timeZone();
  // 1. The stops, from the orders, in one transaction.
  const planId = await db.transaction().execute(async (trx) => {
    let plan = await getPlan(trx, input.day);
    if (!plan) {
      plan = await trx
        .insertInto("route_plans")
        .values({ day: input.day, status: "draft", seed: input.seed, road_factor: DEFAULT_ROAD_FACTOR, speed_kmh: DEFAULT_SPEED_KMH, created_by: user.id, created_at: now.toISOString() })
        .returningAll()
        .executeTakeFirstOrThrow();
    }
    await assertNotStarted(trx, plan.id);
    const input_ = await loadDayInput(trx, input.day);
    const { stops, infeasible } = buildDayStops(input_.sites, input_.collections, input_.deliveries, { day: input.day, timeZone: tz });
    await syncStops(trx, plan.id, stops);
    await trx.updateTable("route_plans").set({ seed: input.seed, summary: JSON.stringify({ infeasible }) }).where("id", "=", plan.id).execute();
    return plan.id;
  });
  // 2. The planner, outside any transaction.
  const plan = (await db.selectFrom("route_plans").selectAll().where("id", "=", planId).executeTakeFirstOrThrow());
  const model = await planModel(db, plan);
  if (model.problem.vehicles.length === 0) {
    throw new AppError("conflict", "No driver has a shift with a van on this day: add the drivers' shifts first.");
  }
  // In a worker thread: the search takes its whole budget, and the server answers others meanwhile.
  const travel = { roadFactor: model.travel.roadFactor, speedKmh: model.travel.speedKmh };
  const solution = await solveInWorker(model.problem, travel, { seed: input.seed, timeBudgetMs: budgetMs });
  const stopIds = model.problem.stops.map((s) => s.id).sort().join(",");
  // 3. The runs, in one transaction, if the stops are still the ones planned.
  await db.transaction().execute(async (trx) => {
    const again = await planModel(trx, plan);
    if (again.problem.stops.map((s) => s.id).sort().join(",") !== stopIds) {
      throw new AppError("conflict", "The day's stops changed while planning. Plan again.");
    }
    const runs = new Map(solution.routes.map((r) => [r.vehicleId, r.stops.map((s) => s.stopId)]));
    const violations = await writeRuns(trx, again, runs);
    const unassigned = Object.fromEntries(solution.unassigned.map((u) => [u.stopId, u.reason]));
    await writeSummary(trx, planId, { search: solution.search, unassigned }, violations, again.warnings, now);
    await recordAudit(trx, { actorUserId: user.id, action: "route_plan.plan", entity: "route_plan", entityId: planId, details: { day: input.day, seed: input.seed } }, now);
  });
  return { planId, unassigned: solution.unassigned.length, routes: solution.routes.length };
}

/**
 * The same as planDay, all in the caller's transaction, with the search bounded by iterations so
 * that it is reproducible: for scripts such as the demo seed.
 */
export async function planDayWithin(
  trx: Transaction<Database>,
  user: { id: number; role: SessionUser["role"] },
  input: { day: string; seed: number },
  now: Date,
  maxIterations: number,
) {
  assertCan(user, "routes.plan");
  let plan = await getPlan(trx, input.day);
  if (!plan) {
    plan = await trx
      .insertInto("route_plans")
      .values({ day: input.day, status: "draft", seed: input.seed, road_factor: DEFAULT_ROAD_FACTOR, speed_kmh: DEFAULT_SPEED_KMH, created_by: user.id, created_at: now.toISOString() })
      .returningAll()
      .executeTakeFirstOrThrow();
  }
  const dayInput = await loadDayInput(trx, input.day);
  const { stops, infeasible } = buildDayStops(dayInput.sites, dayInput.collections, dayInput.deliveries, { day: input.day, timeZone: timeZone() });
  await syncStops(trx, plan.id, stops);
  const model = await planModel(trx, plan);
  if (model.problem.vehicles.length === 0) throw new AppError("conflict", "No driver has a shift with a van on this day: add the drivers' shifts first.");
  const solution = solve(model.problem, model.travel, { seed: input.seed, maxIterations });
  const violations = await writeRuns(trx, model, new Map(solution.routes.map((r) => [r.vehicleId, r.stops.map((s) => s.stopId)])));
  const unassigned = Object.fromEntries(solution.unassigned.map((u) => [u.stopId, u.reason]));
  await trx.updateTable("route_plans").set({ seed: input.seed }).where("id", "=", plan.id).execute();
  await writeSummary(trx, plan.id, { infeasible, unassigned, search: solution.search }, violations, model.warnings, now);
  return { planId: plan.id, unassigned: solution.unassigned.length, routes: solution.routes.length };
}

async function stopInPlan(trx: Db, stopId: number) {
  const stop = await trx
    .selectFrom("route_stops")
    .innerJoin("route_plans", "route_plans.id", "route_stops.plan_id")
    .select(["route_stops.id", "route_stops.plan_id", "route_stops.status", "route_stops.run_id", "route_plans.day", "route_plans.road_factor", "route_plans.speed_kmh"])
    .where("route_stops.id", "=", stopId)
    .executeTakeFirst();
  if (!stop) throw notFound("That stop");
  if (stop.status !== "planned") throw new AppError("conflict", "That stop has already been served; it stays where it is.");
  return stop;
}

/** Moves a stop to a van's run at a place (or off the runs), locks it there and recomputes the runs. */
export async function moveStop(db: Kysely<Database>, user: SessionUser, input: { stopId: number; vanId: number | null; position: number }, now = new Date()) {
  assertCan(user, "routes.plan");
  return db.transaction().execute(async (trx) => {
    const stop = await stopInPlan(trx, input.stopId);
    const model = await planModel(trx, { id: stop.plan_id, day: stop.day, road_factor: stop.road_factor, speed_kmh: stop.speed_kmh });
    const id = String(stop.id);
    if (input.vanId !== null && !model.shifts.has(String(input.vanId))) {
      const van = await trx.selectFrom("vans").select("code").where("id", "=", input.vanId).executeTakeFirst();
      if (!van) throw notFound("That van");
      throw new AppError("validation", `Van ${van.code} has no driver's shift on ${stop.day}: add a shift with that van first, or choose another van.`, {
        vanId: [`Van ${van.code} has no driver's shift that day.`],
      });
    }
    const runs = new Map([...model.runs].map(([v, seq]) => [v, seq.filter((s) => s !== id)]));
    if (input.vanId !== null) {
      const seq = runs.get(String(input.vanId))!;
      seq.splice(Math.min(input.position, seq.length + 1) - 1, 0, id);
    }
    await trx.updateTable("route_stops").set({ locked: input.vanId === null ? 0 : 1 }).where("id", "=", stop.id).execute();
    const violations = await writeRuns(trx, model, runs);
    const unassigned = input.vanId === null ? { [id]: "Taken off the runs by the dispatcher." } : {};
    await writeSummary(trx, stop.plan_id, { unassigned }, violations, model.warnings, now);
    await recordAudit(trx, { actorUserId: user.id, action: "route_stop.move", entity: "route_stop", entityId: stop.id, details: { vanId: input.vanId, position: input.position } }, now);
    return { violations };
  });
}

/** Locks a stop to its van and place (or unlocks it) for the next planning. */
export async function lockStop(db: Kysely<Database>, user: SessionUser, input: { stopId: number; locked: boolean }, now = new Date()) {
  assertCan(user, "routes.plan");
  await db.transaction().execute(async (trx) => {
    const stop = await stopInPlan(trx, input.stopId);
    if (input.locked && stop.run_id === null) throw new AppError("validation", "Put the stop on a van's run before locking it.");
    await trx.updateTable("route_stops").set({ locked: input.locked ? 1 : 0 }).where("id", "=", stop.id).execute();
    await recordAudit(trx, { actorUserId: user.id, action: input.locked ? "route_stop.lock" : "route_stop.unlock", entity: "route_stop", entityId: stop.id }, now);
  });
}
