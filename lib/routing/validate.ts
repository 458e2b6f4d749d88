// Checks a plan against every rule of the problem and says, in plain words, what it breaks.
import { checkProblem } from "./model";
import { clock, windowsText } from "./format";
import type { TravelModel } from "./geo";
import { lockViolations } from "./schedule";
import type { Problem, Route, Solution, Stop, Vehicle, Violation } from "./types";

/** Slack on reported times and distances (minutes, relative for distances). */
const TOL = 1e-6;

// Lateness of a service start: 0 inside a window, else minutes since the last window closed.
function expectedLate(stop: Stop, start: number): { inWindow: boolean; early: boolean; late: number } {
  let closedBefore = -Infinity;
  let inWindow = false;
  let early = true;
  for (const w of stop.windows) {
    if (start >= w.startMin - TOL && start <= w.endMin + TOL) inWindow = true;
    if (start >= w.startMin - TOL) early = false;
    if (w.endMin < start && w.endMin > closedBefore) closedBefore = w.endMin;
  }
  if (inWindow) return { inWindow, early: false, late: 0 };
  return { inWindow, early, late: early ? 0 : start - closedBefore };
}

function checkRoute(problem: Problem, vehicle: Vehicle, route: Route, stops: Map<string, Stop>, travel?: TravelModel): Violation[] {
  const out: Violation[] = [];
  const vehicleId = vehicle.id;
  const add = (rule: Violation["rule"], message: string, stopId?: string) => out.push({ rule, vehicleId, stopId, message });
  const members = route.stops.filter((r) => stops.has(r.stopId));
  if (members.length === 0) return out;
  const { depot } = problem;

  // Loads: clean carts all on board from the unit, soiled carts added at each stop.
  const totalClean = members.reduce((a, r) => a + stops.get(r.stopId)!.clean, 0);
  const totalSoiled = members.reduce((a, r) => a + stops.get(r.stopId)!.soiled, 0);
  if (totalSoiled > vehicle.soiledCapacity) add("soiled-capacity", `Van ${vehicleId} collects ${totalSoiled} soiled carts but its soiled compartment holds ${vehicle.soiledCapacity}.`);
  if (totalClean > vehicle.cleanCapacity) add("clean-capacity", `Van ${vehicleId} must load ${totalClean} clean carts but its clean compartment holds ${vehicle.cleanCapacity}.`);
  if (route.soiledCarts !== totalSoiled || route.cleanCarts !== totalClean) {
    add("load-report", `Van ${vehicleId} reports ${route.soiledCarts} soiled and ${route.cleanCarts} clean carts; its stops add up to ${totalSoiled} and ${totalClean}.`);
  }
  let soiled = 0;
  let clean = totalClean;

  const shiftStart = Math.max(vehicle.shiftStartMin, depot.openMin);
  const shiftEnd = Math.min(vehicle.shiftEndMin, depot.closeMin);
  if (route.departMin < shiftStart - TOL) add("shift-start", `Van ${vehicleId} leaves at ${clock(route.departMin)}, before ${clock(shiftStart)} (start of the shift or opening of the unit).`);

  const brk = route.break;
  const planned = vehicle.breakMin ?? null;
  if (planned && !brk) add("break", `The driver of van ${vehicleId} has no break in the run; one of ${planned.durationMin} min must start between ${clock(planned.earliestMin)} and ${clock(planned.latestMin)}.`);
  if (!planned && brk) add("break", `Van ${vehicleId} shows a break but its driver has none planned.`);
  if (planned && brk) {
    if (brk.startMin < planned.earliestMin - TOL || brk.startMin > planned.latestMin + TOL) {
      add("break", `The break of van ${vehicleId} starts at ${clock(brk.startMin)}; it must start between ${clock(planned.earliestMin)} and ${clock(planned.latestMin)}.`);
    }
    if (brk.endMin - brk.startMin < planned.durationMin - TOL) add("break", `The break of van ${vehicleId} lasts ${Math.round(brk.endMin - brk.startMin)} min; it must last ${planned.durationMin}.`);
    if (brk.beforeStopId !== null && !members.some((r) => r.stopId === brk.beforeStopId)) add("break", `The break of van ${vehicleId} is placed before stop ${brk.beforeStopId}, which is not in its run.`);
  }

  let prevLoc = depot.location;
  let prevDepart = route.departMin;
  let distance = 0;
  let drive = 0;
  // The van is ready at the next place no sooner than the drive allows, and after any break on the way.
  const readyAt = (next: Stop | null, beforeId: string | null): number => {
    const nextLoc = next ? next.location : depot.location;
    const legMin = travel ? travel.minutes(prevLoc, nextLoc) : 0;
    if (travel) {
      distance += travel.distanceKm(prevLoc, nextLoc);
      drive += legMin;
    }
    if (brk && planned && brk.beforeStopId === beforeId) {
      if (brk.startMin < prevDepart - TOL) add("break", `The break of van ${vehicleId} starts at ${clock(brk.startMin)}, before the van leaves the previous place at ${clock(prevDepart)}.`);
      return Math.max(prevDepart + legMin, brk.startMin) + (brk.endMin - brk.startMin);
    }
    return prevDepart + legMin;
  };

  for (const rs of members) {
    const stop = stops.get(rs.stopId)!;
    const ready = readyAt(stop, rs.stopId);
    if (rs.arrivalMin < ready - TOL) add("schedule", `Van ${vehicleId} cannot be ready at stop ${rs.stopId} before ${clock(ready)}, but the plan says ${clock(rs.arrivalMin)}.`, rs.stopId);
    if (rs.startMin < rs.arrivalMin - TOL) add("schedule", `Service at stop ${rs.stopId} starts at ${clock(rs.startMin)}, before the van arrives at ${clock(rs.arrivalMin)}.`, rs.stopId);
    if (Math.abs(rs.waitMin - (rs.startMin - rs.arrivalMin)) > TOL) add("schedule", `Stop ${rs.stopId} reports ${rs.waitMin} min of waiting; arrival and start differ by ${rs.startMin - rs.arrivalMin}.`, rs.stopId);
    if (rs.departMin < rs.startMin + stop.serviceMin - TOL) add("schedule", `The van leaves stop ${rs.stopId} at ${clock(rs.departMin)}, before its ${stop.serviceMin} min of service are done.`, rs.stopId);
    const w = expectedLate(stop, rs.startMin);
    if (w.early) add(stop.hard ? "hard-window" : "schedule", `Service at stop ${rs.stopId} starts at ${clock(rs.startMin)}, before its window ${windowsText(stop.windows)} opens.`, rs.stopId);
    else if (stop.hard && !w.inWindow) add("hard-window", `Service at stop ${rs.stopId} starts at ${clock(rs.startMin)}, outside its window ${windowsText(stop.windows)}.`, rs.stopId);
    if (Math.abs(rs.lateMin - w.late) > TOL) add("schedule", `Stop ${rs.stopId} reports ${rs.lateMin} min late; its start at ${clock(rs.startMin)} is ${Math.round(w.late)} min late.`, rs.stopId);
    soiled += stop.soiled;
    clean -= stop.clean;
    if (rs.soiledLoad !== soiled || rs.cleanLoad !== clean) {
      add("load-report", `After stop ${rs.stopId} van ${vehicleId} carries ${soiled} soiled and ${clean} clean carts, not the ${rs.soiledLoad} and ${rs.cleanLoad} reported.`, rs.stopId);
    }
    prevLoc = stop.location;
    prevDepart = rs.departMin;
  }
  const back = readyAt(null, null);
  if (route.endMin < back - TOL) add("schedule", `Van ${vehicleId} cannot be back before ${clock(back)}, but the plan says ${clock(route.endMin)}.`);
  if (route.endMin > shiftEnd + TOL) add("shift-end", `Van ${vehicleId} is back at ${clock(route.endMin)}, after ${clock(shiftEnd)} (end of the shift or closing of the unit).`);
  if (travel) {
    if (Math.abs(route.distanceKm - distance) > TOL * Math.max(1, distance)) add("distance", `Van ${vehicleId} reports ${route.distanceKm} km; its legs add up to ${distance} km.`);
    if (Math.abs(route.driveMin - drive) > TOL * Math.max(1, drive)) add("distance", `Van ${vehicleId} reports ${route.driveMin} min of driving; its legs add up to ${drive} min.`);
  }
  out.push(...lockViolations(problem, vehicleId, members.map((r) => r.stopId)));
  return out;
}

/**
 * Every rule the plan breaks: compartments over capacity, missed hard windows, returns after the
 * shift, breaks, locks, stops missing or repeated. With a travel model it also checks that the
 * reported times allow for the drives and that the distances add up. An empty list means the plan
 * keeps the rules given here; it stays advisory and does not replace the dispatcher's check.
 */
export function validateSolution(problem: Problem, solution: Solution, travel?: TravelModel): Violation[] {
  checkProblem(problem);
  const out: Violation[] = [];
  const stops = new Map(problem.stops.map((s) => [s.id, s]));
  const vehicles = new Map(problem.vehicles.map((v) => [v.id, v]));
  const seenVehicles = new Set<string>();
  const placed = new Map<string, string>();
  const place = (stopId: string, where: string, vehicleId?: string) => {
    if (!stops.has(stopId)) {
      out.push({ rule: "unknown-stop", vehicleId, stopId, message: `${where} lists stop ${stopId}, which is not in the problem.` });
      return;
    }
    const before = placed.get(stopId);
    if (before !== undefined) out.push({ rule: "stop-repeated", vehicleId, stopId, message: `Stop ${stopId} appears in ${before} and again in ${where}.` });
    else placed.set(stopId, where);
  };

  let used = 0;
  let distance = 0;
  for (const route of solution.routes) {
    const vehicle = vehicles.get(route.vehicleId);
    if (!vehicle) {
      out.push({ rule: "unknown-vehicle", vehicleId: route.vehicleId, message: `The plan has a run for van ${route.vehicleId}, which is not in the problem.` });
      continue;
    }
    if (seenVehicles.has(vehicle.id)) out.push({ rule: "duplicate-route", vehicleId: vehicle.id, message: `Van ${vehicle.id} has more than one run.` });
    seenVehicles.add(vehicle.id);
    for (const rs of route.stops) place(rs.stopId, `the run of van ${vehicle.id}`, vehicle.id);
    if (route.stops.length > 0) used++;
    distance += route.distanceKm;
    out.push(...checkRoute(problem, vehicle, route, stops, travel));
  }
  for (const u of solution.unassigned) {
    place(u.stopId, "the unassigned list");
    if (typeof u.reason !== "string" || u.reason.trim() === "") out.push({ rule: "no-reason", stopId: u.stopId, message: `Stop ${u.stopId} is left out without a reason.` });
  }
  for (const s of problem.stops) {
    if (!placed.has(s.id)) out.push({ rule: "stop-missing", stopId: s.id, message: `Stop ${s.id} is neither in a run nor in the unassigned list.` });
  }
  const cost = solution.cost;
  if (cost.unassigned !== solution.unassigned.length || cost.vehicles !== used || Math.abs(cost.distanceKm - distance) > TOL * Math.max(1, distance)) {
    out.push({ rule: "cost-report", message: `The plan's totals (${cost.unassigned} unassigned, ${cost.vehicles} vans, ${cost.distanceKm} km) do not match its runs (${solution.unassigned.length}, ${used}, ${distance}).` });
  }
  return out;
}
