// Readers for the published benchmark formats the planner is checked against:
// TSPLIB 95 (G. Reinelt, Universität Heidelberg) and Solomon's VRPTW instances (Operations
// Research 35(2), 1987). Text in, data out; reading the files is the caller's job.
import { RoutingFormatError } from "./errors";
import { MatrixTravel } from "./geo";
import type { Problem, Stop, Vehicle } from "./types";

export interface Point2 {
  x: number;
  y: number;
}

export interface TsplibInstance {
  name: string;
  dimension: number;
  edgeWeightType: "EUC_2D";
  /** Node i (0-based) is TSPLIB node i + 1. */
  points: Point2[];
}

// TSPLIB EUC_2D: the Euclidean distance rounded to the nearest integer, nint(x) = ⌊x + 0.5⌋.
export function euc2d(a: Point2, b: Point2): number {
  return Math.floor(Math.hypot(a.x - b.x, a.y - b.y) + 0.5);
}

export function euclidean(a: Point2, b: Point2): number {
  return Math.hypot(a.x - b.x, a.y - b.y);
}

const numbersOf = (line: string) => line.trim().split(/\s+/).filter(Boolean).map(Number);

// Reads a TSPLIB .tsp file with EUC_2D node coordinates.
export function parseTsplib(text: string): TsplibInstance {
  const lines = text.split(/\r?\n/);
  const header = new Map<string, string>();
  let k = 0;
  for (; k < lines.length; k++) {
    const line = lines[k].trim();
    if (line === "") continue;
    if (line.startsWith("NODE_COORD_SECTION")) break;
    const m = /^([A-Z_]+)\s*:\s*(.*)$/.exec(line);
    if (!m) throw new RoutingFormatError(k + 1, `expected "KEY : value" or NODE_COORD_SECTION, got "${line}"`);
    header.set(m[1], m[2].trim());
  }
  if (k >= lines.length) throw new RoutingFormatError(lines.length, "NODE_COORD_SECTION is missing");
  const type = header.get("EDGE_WEIGHT_TYPE");
  if (type !== "EUC_2D") throw new RoutingFormatError(k + 1, `EDGE_WEIGHT_TYPE ${type ?? "(missing)"} is not supported; only EUC_2D is`);
  const dimension = Number(header.get("DIMENSION"));
  if (!Number.isInteger(dimension) || dimension < 1) throw new RoutingFormatError(k + 1, `DIMENSION must be a whole number, got ${header.get("DIMENSION")}`);
  const points: Point2[] = new Array(dimension);
  let seen = 0;
  for (k++; k < lines.length; k++) {
    const line = lines[k].trim();
    if (line === "" ) continue;
    if (line === "EOF") break;
    const nums = numbersOf(line);
    if (nums.length !== 3 || nums.some((x) => !Number.isFinite(x))) throw new RoutingFormatError(k + 1, `expected "node x y", got "${line}"`);
    const [id, x, y] = nums;
    if (!Number.isInteger(id) || id < 1 || id > dimension) throw new RoutingFormatError(k + 1, `node ${id} is outside 1…${dimension}`);
    if (points[id - 1]) throw new RoutingFormatError(k + 1, `node ${id} appears twice`);
    points[id - 1] = { x, y };
    seen++;
  }
  if (seen !== dimension) throw new RoutingFormatError(k, `DIMENSION says ${dimension} nodes but ${seen} were given`);
  return { name: header.get("NAME") ?? "", dimension, edgeWeightType: "EUC_2D", points };
}

// Reads a TSPLIB .tour file into 0-based node indices.
export function parseTsplibTour(text: string): number[] {
  const lines = text.split(/\r?\n/);
  let k = lines.findIndex((l) => l.trim().startsWith("TOUR_SECTION"));
  if (k < 0) throw new RoutingFormatError(lines.length, "TOUR_SECTION is missing");
  const tour: number[] = [];
  for (k++; k < lines.length; k++) {
    const line = lines[k].trim();
    if (line === "") continue;
    if (line === "-1" || line === "EOF") break;
    for (const x of numbersOf(line)) {
      if (x === -1) return tour;
      if (!Number.isInteger(x) || x < 1) throw new RoutingFormatError(k + 1, `expected a node number, got "${line}"`);
      tour.push(x - 1);
    }
  }
  return tour;
}

// Length of a closed tour under a distance function.
export function tourLength<P>(tour: readonly number[], points: readonly P[], distance: (a: P, b: P) => number): number {
  let total = 0;
  for (let i = 0; i < tour.length; i++) total += distance(points[tour[i]], points[tour[(i + 1) % tour.length]]);
  return total;
}

export interface SolomonCustomer {
  id: number;
  x: number;
  y: number;
  demand: number;
  ready: number;
  due: number;
  service: number;
}

export interface SolomonInstance {
  name: string;
  vehicles: number;
  capacity: number;
  /** Row 0 is the depot. */
  customers: SolomonCustomer[];
}

// Reads a Solomon VRPTW instance (vehicle block, then one row per customer, depot first).
export function parseSolomon(text: string): SolomonInstance {
  const lines = text.split(/\r?\n/);
  let k = 0;
  while (k < lines.length && lines[k].trim() === "") k++;
  if (k >= lines.length) throw new RoutingFormatError(1, "the file is empty");
  const name = lines[k].trim();
  const vIdx = lines.findIndex((l) => /NUMBER\s+CAPACITY/i.test(l));
  if (vIdx < 0) throw new RoutingFormatError(k + 1, 'the "NUMBER CAPACITY" header of the vehicle block is missing');
  let j = vIdx + 1;
  while (j < lines.length && lines[j].trim() === "") j++;
  const vNums = numbersOf(lines[j] ?? "");
  if (vNums.length !== 2 || vNums.some((x) => !Number.isInteger(x) || x < 0)) throw new RoutingFormatError(j + 1, `expected "vehicles capacity", got "${(lines[j] ?? "").trim()}"`);
  const cIdx = lines.findIndex((l) => /CUST\s+NO/i.test(l));
  if (cIdx < 0) throw new RoutingFormatError(j + 1, 'the "CUST NO." header of the customer block is missing');
  const customers: SolomonCustomer[] = [];
  for (let i = cIdx + 1; i < lines.length; i++) {
    const line = lines[i].trim();
    if (line === "") continue;
    const nums = numbersOf(line);
    if (nums.length !== 7 || nums.some((x) => !Number.isFinite(x))) throw new RoutingFormatError(i + 1, `expected 7 numbers (id x y demand ready due service), got "${line}"`);
    const [id, x, y, demand, ready, due, service] = nums;
    if (ready > due) throw new RoutingFormatError(i + 1, `customer ${id}: ready time ${ready} is after due date ${due}`);
    customers.push({ id, x, y, demand, ready, due, service });
  }
  if (customers.length === 0) throw new RoutingFormatError(cIdx + 1, "no customer rows");
  if (customers[0].id !== 0) throw new RoutingFormatError(cIdx + 2, `the first row must be the depot (customer 0), got ${customers[0].id}`);
  return { name, vehicles: vNums[0], capacity: vNums[1], customers };
}

/**
 * A Solomon instance as a planning problem: the single capacity becomes the soiled compartment
 * (clean capacity 0, no clean carts), windows are hard, and distance and travel time are both
 * the unrounded Euclidean distance. `customers` keeps only the first k customers.
 */
export function solomonProblem(instance: SolomonInstance, customers?: number): { problem: Problem; travel: MatrixTravel } {
  const rows = customers === undefined ? instance.customers : instance.customers.slice(0, customers + 1);
  const depot = rows[0];
  const stops: Stop[] = rows.slice(1).map((r, i) => ({
    id: String(r.id),
    location: i + 1,
    serviceMin: r.service,
    soiled: r.demand,
    clean: 0,
    windows: [{ startMin: r.ready, endMin: r.due }],
    hard: true,
  }));
  const vehicles: Vehicle[] = Array.from({ length: instance.vehicles }, (_, i) => ({
    id: `V${i + 1}`,
    soiledCapacity: instance.capacity,
    cleanCapacity: 0,
    shiftStartMin: depot.ready,
    shiftEndMin: depot.due,
  }));
  return {
    problem: { depot: { location: 0, openMin: depot.ready, closeMin: depot.due }, vehicles, stops },
    travel: MatrixTravel.fromPoints(rows, euclidean),
  };
}
