// The timetable and loads of one van's run, computed from its stop sequence.
//
// Loading rule: every clean cart of a run is loaded at the unit before leaving, and soiled carts
// are only picked up. So the clean load starts at the run's total and only falls, the soiled load
// starts at 0 and only rises, and each compartment's peak is its total: a run keeps both
// compartments within capacity at every point exactly when Σ clean ≤ clean capacity and
// Σ soiled ≤ soiled capacity. The planner checks those two sums.
//
// Break rule: a van with a break takes it on one leg of its run (possibly the drive back): the
// break starts at max(departure from the previous place, its earliest start), must start by its
// latest start, and the van is ready at the next place at max(arrival, earliest start) + duration.
// Of all legs the planner picks the one with the fewest broken rules, then least lateness, then
// the earliest return.
import { compile, EPS, lateness, serviceStart, type Compiled } from "./model";
import { RoutingInputError } from "./errors";
import { clock, windowsText } from "./format";
import type { TravelModel } from "./geo";
import type { CostOptions, Problem, Route, RouteEvaluation, RouteStop, Violation } from "./types";

export interface ScheduleSummary {
  /** Broken hard rules: missed hard windows, return after the shift end, break started too late. */
  violations: number;
  late: number;
  end: number;
  /** Leg the break is taken on (m = drive back), or -1. */
  breakLeg: number;
  breakStart: number;
}

export interface ScheduleDetail {
  arrival: number[];
  start: number[];
}

function run(c: Compiled, v: number, seq: readonly number[], breakLeg: number, out?: ScheduleDetail): ScheduleSummary {
  const N = c.N;
  const b = c.breaks[v];
  const m = seq.length;
  let t = c.vStart[v];
  let prev = 0;
  let violations = 0;
  let late = 0;
  let breakStart = NaN;
  let end = t;
  for (let k = 0; k <= m; k++) {
    const node = k < m ? seq[k] + 1 : 0;
    const drive = c.time[prev * N + node];
    let ready = t + drive;
    if (k === breakLeg && b) {
      breakStart = t > b.earliest ? t : b.earliest;
      if (breakStart > b.latest + EPS) violations++;
      ready = (ready > b.earliest ? ready : b.earliest) + b.duration;
    }
    if (k < m) {
      const s = seq[k];
      const st = serviceStart(c, s, ready);
      const l = lateness(c, s, st);
      if (l > 0) {
        late += l;
        if (c.hard[s]) violations++;
      }
      if (out) {
        out.arrival[k] = ready;
        out.start[k] = st;
      }
      t = st + c.service[s];
      prev = node;
    } else {
      end = ready;
    }
  }
  if (end > c.vEnd[v] + EPS) violations++;
  return { violations, late, end, breakLeg: b ? breakLeg : -1, breakStart };
}

const better = (a: ScheduleSummary, b: ScheduleSummary) =>
  a.violations !== b.violations ? a.violations < b.violations : a.late !== b.late ? a.late < b.late - EPS : a.end < b.end - EPS;

const scratch: number[] = [];

// Timetable of `seq` on vehicle v, placing the break on its best leg.
export function simulate(c: Compiled, v: number, seq: readonly number[], out?: ScheduleDetail): ScheduleSummary {
  const b = c.breaks[v];
  const m = seq.length;
  if (!b || m === 0) return run(c, v, seq, -1, out);
  // Departure times without a break: the break start on leg k is max(dep[k], earliest), which
  // never falls as k grows, so the scan stops at the first leg that starts the break too late.
  const N = c.N;
  let t = c.vStart[v];
  let prev = 0;
  for (let k = 0; k <= m; k++) {
    scratch[k] = t;
    if (k < m) {
      const s = seq[k];
      t = serviceStart(c, s, t + c.time[prev * N + s + 1]) + c.service[s];
      prev = s + 1;
    }
  }
  let best: ScheduleSummary | null = null;
  for (let k = 0; k <= m; k++) {
    if (k > 0 && Math.max(scratch[k], b.earliest) > b.latest + EPS) break;
    const r = run(c, v, seq, k);
    if (!best || better(r, best)) best = r;
    // Nothing beats a run that keeps every rule and is back when it would be without a break.
    if (best.violations === 0 && best.late === 0 && best.end <= scratch[m] + c.time[(seq[m - 1] + 1) * N] + EPS) break;
  }
  return out ? run(c, v, seq, best!.breakLeg, out) : best!;
}

export interface LegTotals {
  distanceKm: number;
  driveMin: number;
  travel: number;
}

// Distance, drive time and the objective's travel term over the run's legs.
export function legTotals(c: Compiled, seq: readonly number[]): LegTotals {
  const N = c.N;
  let distanceKm = 0;
  let driveMin = 0;
  let travel = 0;
  let prev = 0;
  for (let k = 0; k <= seq.length; k++) {
    const node = k < seq.length ? seq[k] + 1 : 0;
    const i = prev * N + node;
    distanceKm += c.dist[i];
    driveMin += c.time[i];
    travel += c.cost[i];
    prev = node;
  }
  return { distanceKm, driveMin, travel };
}

// The Route record of a sequence on vehicle v.
export function buildRoute(c: Compiled, v: number, seq: readonly number[]): Route {
  const detail: ScheduleDetail = { arrival: [], start: [] };
  const sum = simulate(c, v, seq, detail);
  const { stops } = c.problem;
  let soiled = 0;
  let clean = 0;
  for (const s of seq) clean += c.clean[s];
  const cleanCarts = clean;
  const routeStops: RouteStop[] = seq.map((s, k) => {
    soiled += c.soiled[s];
    clean -= c.clean[s];
    const start = detail.start[k];
    return {
      stopId: stops[s].id,
      arrivalMin: detail.arrival[k],
      startMin: start,
      waitMin: start - detail.arrival[k],
      departMin: start + c.service[s],
      lateMin: lateness(c, s, start),
      soiledLoad: soiled,
      cleanLoad: clean,
    };
  });
  const totals = legTotals(c, seq);
  const b = c.breaks[v];
  // The van leaves no earlier than it must: waiting at the first stop becomes time at the unit,
  // and the first stop's start and every planned time after it stay as they are. With the break
  // on the way to the first stop, the van leaves late enough to arrive as the break ends, but
  // never so late that the break would start after its latest start.
  let departMin = c.vStart[v];
  let breakStart = sum.breakStart;
  const first = routeStops[0];
  if (first && first.waitMin > EPS) {
    const drive = c.time[seq[0] + 1];
    const onFirstLeg = b && sum.breakLeg === 0 ? b : null;
    const delay = onFirstLeg
      ? Math.min(first.startMin - onFirstLeg.duration - drive - departMin, onFirstLeg.latest - departMin)
      : first.startMin - drive - departMin;
    if (delay > EPS) {
      departMin += delay;
      if (onFirstLeg) {
        breakStart = Math.max(departMin, onFirstLeg.earliest);
        first.arrivalMin = Math.max(departMin + drive, onFirstLeg.earliest) + onFirstLeg.duration;
      } else {
        first.arrivalMin = departMin + drive;
      }
      first.waitMin = first.startMin - first.arrivalMin;
    }
  }
  return {
    vehicleId: c.problem.vehicles[v].id,
    departMin,
    stops: routeStops,
    break:
      b && sum.breakLeg >= 0
        ? {
            startMin: breakStart,
            endMin: breakStart + b.duration,
            beforeStopId: sum.breakLeg < seq.length ? stops[seq[sum.breakLeg]].id : null,
          }
        : null,
    endMin: sum.end,
    distanceKm: totals.distanceKm,
    driveMin: totals.driveMin,
    lateMin: sum.late,
    soiledCarts: soiled,
    cleanCarts,
  };
}

// Every rule a route of the compiled problem breaks, worded for the dispatcher.
export function routeViolations(c: Compiled, v: number, seq: readonly number[], route: Route): Violation[] {
  const out: Violation[] = [];
  const vehicle = c.problem.vehicles[v];
  const vehicleId = vehicle.id;
  const stops = c.problem.stops;
  if (route.soiledCarts > vehicle.soiledCapacity) {
    out.push({ rule: "soiled-capacity", vehicleId, message: `Van ${vehicleId} collects ${route.soiledCarts} soiled carts but its soiled compartment holds ${vehicle.soiledCapacity}.` });
  }
  if (route.cleanCarts > vehicle.cleanCapacity) {
    out.push({ rule: "clean-capacity", vehicleId, message: `Van ${vehicleId} must load ${route.cleanCarts} clean carts but its clean compartment holds ${vehicle.cleanCapacity}.` });
  }
  route.stops.forEach((rs, k) => {
    const s = seq[k];
    if (c.hard[s] && rs.lateMin > 0) {
      out.push({ rule: "hard-window", vehicleId, stopId: rs.stopId, message: `Stop ${rs.stopId} is reached at ${clock(rs.startMin)}, after its window ${windowsText(stops[s].windows)}.` });
    }
  });
  if (route.endMin > c.vEnd[v] + EPS) {
    out.push({ rule: "shift-end", vehicleId, message: `Van ${vehicleId} is back at ${clock(route.endMin)}, after ${clock(c.vEnd[v])} (end of the shift or closing of the unit).` });
  }
  const b = vehicle.breakMin;
  if (b && route.break && route.break.startMin > b.latestMin + EPS) {
    out.push({ rule: "break", vehicleId, message: `The driver of van ${vehicleId} cannot start the break before ${clock(route.break.startMin)}; it must start by ${clock(b.latestMin)}.` });
  }
  out.push(...lockViolations(c.problem, vehicleId, route.stops.map((r) => r.stopId)));
  return out;
}

// Lock rules for one van's ordered stop ids: locked van, locked position, fixed order.
export function lockViolations(problem: Problem, vehicleId: string, ids: readonly string[]): Violation[] {
  const out: Violation[] = [];
  const byId = new Map(problem.stops.map((s) => [s.id, s]));
  ids.forEach((id, k) => {
    const s = byId.get(id);
    if (!s) return;
    const fixedVan = problem.vehicles.find((v) => v.fixedStops?.includes(id))?.id;
    const lockedTo = s.lockedVehicle ?? fixedVan;
    if (lockedTo !== undefined && lockedTo !== vehicleId) {
      out.push({ rule: "locked-vehicle", vehicleId, stopId: id, message: `Stop ${id} is locked to van ${lockedTo} but is on van ${vehicleId}.` });
    }
    if (s.lockedPosition !== undefined && lockedTo === vehicleId && s.lockedPosition !== k + 1) {
      out.push({ rule: "locked-position", vehicleId, stopId: id, message: `Stop ${id} is locked as stop ${s.lockedPosition} of van ${vehicleId} but is stop ${k + 1}.` });
    }
  });
  const vehicle = problem.vehicles.find((v) => v.id === vehicleId);
  const fixed = vehicle?.fixedStops ?? [];
  const order = ids.filter((id) => fixed.includes(id));
  const expected = fixed.filter((id) => order.includes(id));
  if (order.join("\u0000") !== expected.join("\u0000")) {
    out.push({ rule: "fixed-sequence", vehicleId, message: `Van ${vehicleId} visits its fixed stops as ${order.join(" → ")} instead of ${expected.join(" → ")}.` });
  }
  return out;
}

// Timetable, loads and broken rules of one van's run as the dispatcher arranged it.
export function evaluateRoute(
  problem: Problem,
  travel: TravelModel,
  vehicleId: string,
  stopIds: readonly string[],
  options: CostOptions = {},
): RouteEvaluation {
  const c = compile(problem, travel, options);
  const v = c.vehicleIndex.get(vehicleId);
  const issues: string[] = [];
  if (v === undefined) issues.push(`van "${vehicleId}" is not one of the vans`);
  const seen = new Set<string>();
  const seq: number[] = [];
  stopIds.forEach((id, k) => {
    const s = c.stopIndex.get(id);
    if (s === undefined) issues.push(`stop ${k + 1} of the run: "${id}" is not one of the stops`);
    else if (seen.has(id)) issues.push(`stop ${k + 1} of the run: "${id}" is already in the run`);
    else seq.push(s);
    seen.add(id);
  });
  if (issues.length > 0) throw new RoutingInputError(issues);
  const route = buildRoute(c, v!, seq);
  return { route, violations: routeViolations(c, v!, seq, route) };
}
