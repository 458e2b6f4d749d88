import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database, RoutePlanStatus, RouteStopKind } from "@/db/schema";
import { serverEnv } from "@/lib/env";
import { notFound } from "@/lib/errors";
import type { PlanSummary } from "./plan";
import { minutesToClock } from "./schemas";
import { clockText, planClock } from "./stops";
import { listShifts, listVans, type ShiftView, type VanView } from "./vans";

// What the dispatcher's screen and the manifests read: a day's plan with its runs, stops and
// the sets at each stop, in small explicit shapes.

type Db = Kysely<Database> | Transaction<Database>;

export interface StopSetLine {
  serial: string;
  giai: string;
  name: string;
}

export interface PlanStopView {
  id: number;
  runId: number | null;
  position: number | null;
  siteId: number;
  siteName: string;
  organisationName: string;
  address: string;
  lat: number;
  lon: number;
  kind: RouteStopKind;
  window: string;
  hard: boolean;
  serviceMin: number;
  soiledCarts: number;
  cleanCarts: number;
  arrival: string | null;
  start: string | null;
  lateMin: number;
  locked: boolean;
  status: string;
  note: string | null;
  /** Why it is not on a run (for stops off the runs). */
  reason: string | null;
  notifiedAt: string | null;
  orders: { orderId: number; reference: string; role: "collect" | "deliver" }[];
  collect: StopSetLine[];
  deliver: StopSetLine[];
}

export interface PlanRunView {
  id: number;
  vanId: number;
  vanCode: string;
  vanName: string;
  registration: string;
  driverName: string;
  shift: string;
  soiledCapacity: number;
  cleanCapacity: number;
  soiledCarts: number;
  cleanCarts: number;
  distanceKm: number;
  driveMin: number;
  leave: string | null;
  back: string | null;
  stops: PlanStopView[];
}

export interface DispatchDayView {
  day: string;
  dayLabel: string;
  vans: VanView[];
  shifts: ShiftView[];
  depot: { name: string; lat: number; lon: number } | null;
  plan: {
    id: number;
    status: RoutePlanStatus;
    seed: number;
    solvedAt: string | null;
    publishedAt: string | null;
    summary: PlanSummary | null;
    runs: PlanRunView[];
    unassigned: PlanStopView[];
  } | null;
}

const KIND_ROLE = { collect: "collect", deliver: "deliver" } as const;

/** Every stop of a plan with its sets, keyed by run id (null: off the runs). */
async function planStops(db: Db, planId: number, day: string, summary: PlanSummary | null): Promise<PlanStopView[]> {
  const tz = serverEnv().UNIT_TIME_ZONE;
  const clock = planClock(day, tz);
  const at = (m: number | null) => (m === null ? null : clockText(m, clock, tz));
  const rows = await db
    .selectFrom("route_stops")
    .innerJoin("sites", "sites.id", "route_stops.site_id")
    .innerJoin("organisations", "organisations.id", "route_stops.organisation_id")
    .select([
      "route_stops.id",
      "route_stops.run_id",
      "route_stops.position",
      "route_stops.kind",
      "route_stops.window_start_min",
      "route_stops.window_end_min",
      "route_stops.hard",
      "route_stops.service_min",
      "route_stops.soiled_carts",
      "route_stops.clean_carts",
      "route_stops.planned_arrival_min",
      "route_stops.planned_start_min",
      "route_stops.late_min",
      "route_stops.locked",
      "route_stops.status",
      "route_stops.note",
      "route_stops.expected_time_notified_at",
      "sites.id as site_id",
      "sites.name as site_name",
      "sites.address_line1",
      "sites.town",
      "sites.postcode",
      "sites.latitude",
      "sites.longitude",
      "organisations.name as organisation_name",
    ])
    .where("route_stops.plan_id", "=", planId)
    .orderBy("route_stops.run_id")
    .orderBy("route_stops.position")
    .orderBy("route_stops.window_start_min")
    .execute();
  const links = await db
    .selectFrom("route_stop_orders")
    .innerJoin("route_stops", "route_stops.id", "route_stop_orders.stop_id")
    .innerJoin("orders", "orders.id", "route_stop_orders.order_id")
    .select(["route_stop_orders.stop_id", "route_stop_orders.role", "orders.id", "orders.reference"])
    .where("route_stops.plan_id", "=", planId)
    .orderBy("orders.reference")
    .execute();
  const orderIds = [...new Set(links.map((l) => l.id))];
  const sets =
    orderIds.length === 0
      ? []
      : await db
          .selectFrom("cycles")
          .innerJoin("sets", "sets.id", "cycles.set_id")
          .innerJoin("set_types", "set_types.id", "sets.set_type_id")
          .select(["cycles.order_id", "cycles.return_order_id", "cycles.state", "cycles.site_id", "sets.serial", "sets.giai", "set_types.name"])
          .where((eb) => eb.or([eb("cycles.order_id", "in", orderIds), eb("cycles.return_order_id", "in", orderIds)]))
          .where("cycles.state", "!=", "cancelled")
          .orderBy("sets.serial")
          .execute();
  return rows.map((r) => {
    const mine = links.filter((l) => l.stop_id === r.id);
    const setsOf = (role: "collect" | "deliver") => {
      const ids = new Set(mine.filter((l) => l.role === KIND_ROLE[role]).map((l) => l.id));
      return sets
        .filter((s) => (role === "collect" ? s.order_id !== null && ids.has(s.order_id) && s.state === "booked" : ids.has(s.return_order_id ?? s.order_id ?? -1) && ["released", "dispatched", "delivered"].includes(s.state)))
        .filter((s) => s.site_id === r.site_id)
        .map((s) => ({ serial: s.serial, giai: s.giai, name: s.name }));
    };
    return {
      id: r.id,
      runId: r.run_id,
      position: r.position,
      siteId: r.site_id,
      siteName: r.site_name,
      organisationName: r.organisation_name,
      address: [r.address_line1, r.town, r.postcode].filter(Boolean).join(", "),
      lat: r.latitude,
      lon: r.longitude,
      kind: r.kind,
      window: `${at(r.window_start_min)}–${at(r.window_end_min)}`,
      hard: r.hard === 1,
      serviceMin: r.service_min,
      soiledCarts: r.soiled_carts,
      cleanCarts: r.clean_carts,
      arrival: at(r.planned_arrival_min),
      start: at(r.planned_start_min),
      lateMin: Math.round(r.late_min ?? 0),
      locked: r.locked === 1,
      status: r.status,
      note: r.note,
      reason: r.run_id === null ? (summary?.unassigned?.[String(r.id)] ?? "Not on any run yet.") : null,
      notifiedAt: r.expected_time_notified_at,
      orders: mine.map((l) => ({ orderId: l.id, reference: l.reference, role: l.role })),
      collect: setsOf("collect"),
      deliver: setsOf("deliver"),
    };
  });
}

function parseSummary(json: string): PlanSummary | null {
  try {
    const parsed = JSON.parse(json) as Partial<PlanSummary>;
    return {
      infeasible: parsed.infeasible ?? [],
      unassigned: parsed.unassigned ?? {},
      violations: parsed.violations ?? [],
      warnings: parsed.warnings ?? [],
      search: parsed.search,
      totals: parsed.totals ?? { distanceKm: 0, driveMin: 0, lateMin: 0, stops: 0, assigned: 0, vans: 0 },
    };
  } catch {
    return null;
  }
}

/** The dispatcher's view of a day: vans, shifts and the plan with its runs. */
export async function getDispatchDay(db: Db, day: string): Promise<DispatchDayView> {
  const tz = serverEnv().UNIT_TIME_ZONE;
  const clock = planClock(day, tz);
  const dayLabel = new Intl.DateTimeFormat("en-GB", { weekday: "long", day: "numeric", month: "long", year: "numeric", timeZone: tz }).format(clock.instantOf(12 * 60));
  const [vans, shifts, depotRow, plan] = await Promise.all([
    listVans(db),
    listShifts(db, day),
    db.selectFrom("sites").select(["name", "latitude", "longitude"]).where("is_depot", "=", 1).where("active", "=", 1).executeTakeFirst(),
    db.selectFrom("route_plans").selectAll().where("day", "=", day).executeTakeFirst(),
  ]);
  const depot = depotRow ? { name: depotRow.name, lat: depotRow.latitude, lon: depotRow.longitude } : null;
  if (!plan) return { day, dayLabel, vans, shifts, depot, plan: null };
  const summary = parseSummary(plan.summary);
  const stops = await planStops(db, plan.id, day, summary);
  const runRows = await db
    .selectFrom("route_runs")
    .innerJoin("vans", "vans.id", "route_runs.van_id")
    .innerJoin("users", "users.id", "route_runs.driver_user_id")
    .innerJoin("driver_shifts", "driver_shifts.id", "route_runs.shift_id")
    .select([
      "route_runs.id",
      "route_runs.van_id",
      "route_runs.distance_km",
      "route_runs.drive_min",
      "route_runs.start_min",
      "route_runs.end_min",
      "vans.code",
      "vans.name as van_name",
      "vans.registration",
      "vans.soiled_capacity_carts",
      "vans.clean_capacity_carts",
      "users.name as driver_name",
      "driver_shifts.start_min as shift_start",
      "driver_shifts.end_min as shift_end",
    ])
    .where("route_runs.plan_id", "=", plan.id)
    .orderBy("vans.code")
    .execute();
  const at = (m: number | null) => (m === null ? null : clockText(m, clock, tz));
  const runs: PlanRunView[] = runRows.map((r) => {
    const mine = stops.filter((s) => s.runId === r.id);
    return {
      id: r.id,
      vanId: r.van_id,
      vanCode: r.code,
      vanName: r.van_name,
      registration: r.registration,
      driverName: r.driver_name,
      shift: `${minutesToClock(r.shift_start)}–${minutesToClock(r.shift_end)}`,
      soiledCapacity: r.soiled_capacity_carts,
      cleanCapacity: r.clean_capacity_carts,
      soiledCarts: mine.reduce((n, s) => n + s.soiledCarts, 0),
      cleanCarts: mine.reduce((n, s) => n + s.cleanCarts, 0),
      distanceKm: r.distance_km,
      driveMin: Math.round(r.drive_min),
      leave: at(r.start_min),
      back: at(r.end_min),
      stops: mine,
    };
  });
  return {
    day,
    dayLabel,
    vans,
    shifts,
    depot,
    plan: {
      id: plan.id,
      status: plan.status,
      seed: plan.seed,
      solvedAt: plan.solved_at,
      publishedAt: plan.published_at,
      summary,
      runs,
      unassigned: stops.filter((s) => s.runId === null),
    },
  };
}

/** One van's run of a day, for its manifest; 404 when the van has no run that day. */
export async function getManifest(db: Db, day: string, vanId: number): Promise<{ day: string; dayLabel: string; run: PlanRunView; depot: DispatchDayView["depot"]; status: RoutePlanStatus }> {
  const view = await getDispatchDay(db, day);
  const run = view.plan?.runs.find((r) => r.vanId === vanId);
  if (!view.plan || !run) throw notFound("That van's run");
  return { day, dayLabel: view.dayLabel, run, depot: view.depot, status: view.plan.status };
}
