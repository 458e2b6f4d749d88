// The planning problem compiled into flat arrays (node 0 is the unit, node s + 1 is stop s),
// checked for bad input on the way.
import { RoutingInputError } from "./errors";
import type { Location, TravelModel } from "./geo";
import type { CostOptions, Problem } from "./types";

/** Tolerance on time comparisons, in minutes. */
export const EPS = 1e-9;

export interface CompiledBreak {
  earliest: number;
  latest: number;
  duration: number;
}

export interface Compiled {
  problem: Problem;
  /** Stops. */
  n: number;
  /** Nodes: the unit plus the stops. */
  N: number;
  /** Vehicles. */
  V: number;
  dist: Float64Array;
  time: Float64Array;
  /** The travel term of the objective per leg (distance or time). */
  cost: Float64Array;
  latePenalty: number;
  service: Float64Array;
  soiled: Float64Array;
  clean: Float64Array;
  hard: Uint8Array;
  winStart: Float64Array[];
  winEnd: Float64Array[];
  lastEnd: Float64Array;
  vStart: Float64Array;
  vEnd: Float64Array;
  capSoiled: Float64Array;
  capClean: Float64Array;
  breaks: (CompiledBreak | null)[];
  /** Vehicle index a stop is locked to, or -1. */
  lockedVehicle: Int32Array;
  /** Rank of a stop in its vehicle's fixed sequence, or -1. */
  fixedRank: Int32Array;
  /** Per vehicle, the position-locked stops in place order (positions 1..k). */
  prefix: number[][];
  stopIndex: Map<string, number>;
  vehicleIndex: Map<string, number>;
}

const isNum = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);
const isCount = (x: unknown): x is number => isNum(x) && Number.isInteger(x) && x >= 0;

function checkLocation(loc: Location, where: string, issues: string[]): void {
  if (typeof loc === "number") {
    if (!Number.isInteger(loc) || loc < 0) issues.push(`${where}: a matrix index must be a whole number ≥ 0, got ${loc}`);
    return;
  }
  if (loc === null || typeof loc !== "object" || !isNum(loc.lat) || !isNum(loc.lon)) {
    issues.push(`${where}: give {lat, lon} in degrees or a matrix index`);
    return;
  }
  if (loc.lat < -90 || loc.lat > 90) issues.push(`${where}: latitude ${loc.lat} is outside −90…90`);
  if (loc.lon < -180 || loc.lon > 180) issues.push(`${where}: longitude ${loc.lon} is outside −180…180`);
}

// Checks the problem and throws one RoutingInputError listing everything to fix.
export function checkProblem(problem: Problem): void {
  const issues: string[] = [];
  const { depot, vehicles, stops } = problem;
  if (!depot) {
    throw new RoutingInputError(["depot is missing"]);
  }
  checkLocation(depot.location, "depot.location", issues);
  if (!isNum(depot.openMin) || !isNum(depot.closeMin)) issues.push("depot: openMin and closeMin must be numbers of minutes");
  else if (depot.openMin > depot.closeMin) issues.push(`depot: opens at ${depot.openMin} after it closes at ${depot.closeMin}`);
  if (!Array.isArray(vehicles) || vehicles.length === 0) issues.push("vehicles: give at least one van");
  if (!Array.isArray(stops)) issues.push("stops must be a list");
  if (issues.length > 0) throw new RoutingInputError(issues);

  const vehicleIds = new Map<string, number>();
  vehicles.forEach((v, i) => {
    const at = `vehicles[${i}]${typeof v.id === "string" ? ` (${v.id})` : ""}`;
    if (typeof v.id !== "string" || v.id === "") issues.push(`${at}: id must be a non-empty string`);
    else if (vehicleIds.has(v.id)) issues.push(`${at}: id "${v.id}" is used twice`);
    else vehicleIds.set(v.id, i);
    if (!isCount(v.soiledCapacity)) issues.push(`${at}: soiledCapacity must be a whole number of carts ≥ 0`);
    if (!isCount(v.cleanCapacity)) issues.push(`${at}: cleanCapacity must be a whole number of carts ≥ 0`);
    if (!isNum(v.shiftStartMin) || !isNum(v.shiftEndMin)) issues.push(`${at}: shiftStartMin and shiftEndMin must be numbers`);
    else if (v.shiftStartMin > v.shiftEndMin) issues.push(`${at}: the shift starts at ${v.shiftStartMin} after it ends at ${v.shiftEndMin}`);
    const b = v.breakMin;
    if (b) {
      if (!isNum(b.earliestMin) || !isNum(b.latestMin) || !isNum(b.durationMin)) issues.push(`${at}: breakMin needs earliestMin, latestMin and durationMin`);
      else {
        if (b.earliestMin > b.latestMin) issues.push(`${at}: the break's earliest start ${b.earliestMin} is after its latest start ${b.latestMin}`);
        if (b.durationMin < 0) issues.push(`${at}: the break lasts ${b.durationMin} minutes; give 0 or more`);
      }
    }
  });

  const stopIds = new Map<string, number>();
  stops.forEach((s, i) => {
    const at = `stops[${i}]${typeof s.id === "string" ? ` (${s.id})` : ""}`;
    if (typeof s.id !== "string" || s.id === "") issues.push(`${at}: id must be a non-empty string`);
    else if (stopIds.has(s.id)) issues.push(`${at}: id "${s.id}" is used twice`);
    else stopIds.set(s.id, i);
    checkLocation(s.location, `${at}.location`, issues);
    if (!isNum(s.serviceMin) || s.serviceMin < 0) issues.push(`${at}: serviceMin must be a number ≥ 0`);
    if (!isCount(s.soiled)) issues.push(`${at}: soiled must be a whole number of carts ≥ 0`);
    if (!isCount(s.clean)) issues.push(`${at}: clean must be a whole number of carts ≥ 0`);
    if (typeof s.hard !== "boolean") issues.push(`${at}: hard must be true or false`);
    if (!Array.isArray(s.windows) || s.windows.length === 0) issues.push(`${at}: give at least one time window`);
    else
      s.windows.forEach((w, k) => {
        if (!isNum(w.startMin) || !isNum(w.endMin)) issues.push(`${at}.windows[${k}]: startMin and endMin must be numbers`);
        else if (w.startMin > w.endMin) issues.push(`${at}.windows[${k}]: starts at ${w.startMin} after it ends at ${w.endMin}`);
      });
    if (s.lockedVehicle !== undefined && !vehicleIds.has(s.lockedVehicle)) issues.push(`${at}: lockedVehicle "${s.lockedVehicle}" is not one of the vans`);
    if (s.lockedPosition !== undefined) {
      if (s.lockedVehicle === undefined) issues.push(`${at}: lockedPosition needs lockedVehicle too`);
      if (!Number.isInteger(s.lockedPosition) || s.lockedPosition < 1) issues.push(`${at}: lockedPosition must be a whole number from 1`);
    }
  });

  // Fixed sequences: known stops, one van each, consistent with the stops' own locks.
  const fixedOn = new Map<string, string>();
  vehicles.forEach((v) => {
    (v.fixedStops ?? []).forEach((id, k) => {
      const at = `vehicle ${v.id}: fixedStops[${k}]`;
      const si = stopIds.get(id);
      if (si === undefined) return issues.push(`${at}: "${id}" is not one of the stops`);
      if (fixedOn.has(id)) return issues.push(`${at}: "${id}" is already in the fixed sequence of van ${fixedOn.get(id)}`);
      fixedOn.set(id, v.id);
      const lv = stops[si].lockedVehicle;
      if (lv !== undefined && lv !== v.id) issues.push(`${at}: "${id}" is locked to van ${lv}`);
    });
  });

  // Position locks on one van must be 1..k without gaps or repeats, and agree with the fixed order.
  const positions = new Map<string, { pos: number; id: string }[]>();
  stops.forEach((s) => {
    if (s.lockedPosition === undefined || s.lockedVehicle === undefined) return;
    const list = positions.get(s.lockedVehicle) ?? [];
    list.push({ pos: s.lockedPosition, id: s.id });
    positions.set(s.lockedVehicle, list);
  });
  for (const [vid, list] of positions) {
    list.sort((a, b) => a.pos - b.pos);
    list.forEach((e, k) => {
      if (e.pos !== k + 1) {
        issues.push(`van ${vid}: stop ${e.id} is locked at position ${e.pos}, but the locked positions must run 1, 2, 3… without gaps or repeats (${list.map((x) => `${x.id}@${x.pos}`).join(", ")})`);
      }
    });
    const fixed = vehicles[vehicleIds.get(vid)!].fixedStops ?? [];
    const lockedInFixed = fixed.filter((id) => list.some((e) => e.id === id));
    const expected = list.filter((e) => fixed.includes(e.id)).map((e) => e.id);
    const firstFree = fixed.findIndex((id) => !list.some((e) => e.id === id));
    const lockedAfterFree = firstFree >= 0 && fixed.slice(firstFree).some((id) => list.some((e) => e.id === id));
    if (lockedInFixed.join("\u0000") !== expected.join("\u0000") || lockedAfterFree) {
      issues.push(`van ${vid}: the fixed sequence must list its position-locked stops first, in position order`);
    }
  }
  if (issues.length > 0) throw new RoutingInputError(issues);
}

function leg(travel: TravelModel, a: Location, b: Location, what: string, issues: string[]): [number, number] {
  let d: number;
  let t: number;
  try {
    d = travel.distanceKm(a, b);
    t = travel.minutes(a, b);
  } catch (e) {
    if (e instanceof RoutingInputError) {
      issues.push(`${what}: ${e.issues.join("; ")}`);
      return [0, 0];
    }
    throw e;
  }
  if (!isNum(d) || d < 0 || !isNum(t) || t < 0) {
    issues.push(`${what}: the travel model answered ${d} km and ${t} min; both must be finite and ≥ 0`);
    return [0, 0];
  }
  return [d, t];
}

// Checks the problem, asks the travel model for every leg and lays everything out in arrays.
export function compile(problem: Problem, travel: TravelModel, options: CostOptions = {}): Compiled {
  checkProblem(problem);
  const latePenalty = options.latePenaltyPerMin ?? 5;
  if (!isNum(latePenalty) || latePenalty < 0) throw new RoutingInputError([`latePenaltyPerMin must be a number ≥ 0, got ${latePenalty}`]);
  const objective = options.objective ?? "distance";
  if (objective !== "distance" && objective !== "driveTime") throw new RoutingInputError([`objective must be "distance" or "driveTime", got ${String(objective)}`]);

  const { depot, vehicles, stops } = problem;
  const n = stops.length;
  const N = n + 1;
  const V = vehicles.length;
  const locs: Location[] = [depot.location, ...stops.map((s) => s.location)];
  const names = ["the unit", ...stops.map((s) => `stop ${s.id}`)];
  const dist = new Float64Array(N * N);
  const time = new Float64Array(N * N);
  const issues: string[] = [];
  for (let i = 0; i < N && issues.length < 10; i++) {
    for (let j = 0; j < N; j++) {
      if (i === j) continue;
      const [d, t] = leg(travel, locs[i], locs[j], `${names[i]} → ${names[j]}`, issues);
      dist[i * N + j] = d;
      time[i * N + j] = t;
      if (issues.length >= 10) break;
    }
  }
  if (issues.length > 0) throw new RoutingInputError(issues);

  const stopIndex = new Map(stops.map((s, i) => [s.id, i]));
  const vehicleIndex = new Map(vehicles.map((v, i) => [v.id, i]));
  const winStart: Float64Array[] = [];
  const winEnd: Float64Array[] = [];
  const lastEnd = new Float64Array(n);
  stops.forEach((s, i) => {
    // Sorted and merged, so the first window that has not closed is the one to aim for.
    const ws = [...s.windows].sort((a, b) => a.startMin - b.startMin || a.endMin - b.endMin);
    const merged: [number, number][] = [];
    for (const w of ws) {
      const last = merged[merged.length - 1];
      if (last && w.startMin <= last[1]) last[1] = Math.max(last[1], w.endMin);
      else merged.push([w.startMin, w.endMin]);
    }
    winStart.push(Float64Array.from(merged.map((w) => w[0])));
    winEnd.push(Float64Array.from(merged.map((w) => w[1])));
    lastEnd[i] = merged[merged.length - 1][1];
  });

  const lockedVehicle = new Int32Array(n).fill(-1);
  const fixedRank = new Int32Array(n).fill(-1);
  const prefix: number[][] = vehicles.map(() => []);
  stops.forEach((s, i) => {
    if (s.lockedVehicle !== undefined) lockedVehicle[i] = vehicleIndex.get(s.lockedVehicle)!;
  });
  vehicles.forEach((v, vi) => {
    (v.fixedStops ?? []).forEach((id, k) => {
      const si = stopIndex.get(id)!;
      fixedRank[si] = k;
      lockedVehicle[si] = vi;
    });
  });
  stops
    .map((s, i) => ({ s, i }))
    .filter(({ s }) => s.lockedPosition !== undefined)
    .sort((a, b) => a.s.lockedPosition! - b.s.lockedPosition!)
    .forEach(({ i }) => prefix[lockedVehicle[i]].push(i));

  return {
    problem,
    n,
    N,
    V,
    dist,
    time,
    cost: objective === "distance" ? dist : time,
    latePenalty,
    service: Float64Array.from(stops.map((s) => s.serviceMin)),
    soiled: Float64Array.from(stops.map((s) => s.soiled)),
    clean: Float64Array.from(stops.map((s) => s.clean)),
    hard: Uint8Array.from(stops.map((s) => (s.hard ? 1 : 0))),
    winStart,
    winEnd,
    lastEnd,
    vStart: Float64Array.from(vehicles.map((v) => Math.max(v.shiftStartMin, depot.openMin))),
    vEnd: Float64Array.from(vehicles.map((v) => Math.min(v.shiftEndMin, depot.closeMin))),
    capSoiled: Float64Array.from(vehicles.map((v) => v.soiledCapacity)),
    capClean: Float64Array.from(vehicles.map((v) => v.cleanCapacity)),
    breaks: vehicles.map((v) =>
      v.breakMin ? { earliest: v.breakMin.earliestMin, latest: v.breakMin.latestMin, duration: v.breakMin.durationMin } : null,
    ),
    lockedVehicle,
    fixedRank,
    prefix,
    stopIndex,
    vehicleIndex,
  };
}

// Service start for arrival `a` at stop s: the arrival, or the opening of the next window;
// after the last window it is the arrival itself (late).
export function serviceStart(c: Compiled, s: number, a: number): number {
  const ws = c.winStart[s];
  const we = c.winEnd[s];
  for (let w = 0; w < ws.length; w++) {
    if (a <= we[w] + EPS) return a > ws[w] ? a : ws[w];
  }
  return a;
}

// Minutes after the last window's end at which service starts (0 when on time).
export function lateness(c: Compiled, s: number, start: number): number {
  const l = start - c.lastEnd[s];
  return l > EPS ? l : 0;
}

// Latest arrival at stop s from which service can start no later than X (−∞ if none).
export function latestArrival(c: Compiled, s: number, X: number): number {
  if (!c.hard[s] && X >= c.lastEnd[s]) return X;
  const ws = c.winStart[s];
  const we = c.winEnd[s];
  let best = -Infinity;
  for (let w = 0; w < ws.length; w++) {
    if (ws[w] <= X + EPS) {
      const v = we[w] < X ? we[w] : X;
      if (v > best) best = v;
    }
  }
  return best;
}
