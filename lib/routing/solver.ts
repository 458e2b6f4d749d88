// The van route planner: regret insertion to start, then ruin-and-recreate with string removals
// (after Christiaens & Vanden Berghe, "Slack Induction by String Removals for Vehicle Routing
// Problems", Transportation Science 54(2), 2020), a fleet-reduction phase and simulated annealing.
//
// Objective, compared level by level: fewest unassigned stops, then (unless switched off) fewest
// vans, then travel (km or drive minutes) plus the lateness penalty of soft windows.
//
// Determinism: the same problem, options and seed give the same plan when the search is bounded
// by `maxIterations` alone. With `timeBudgetMs` the number of iterations depends on the machine's
// speed, so results may differ between machines and runs.
import { clock, windowsText } from "./format";
import type { TravelModel } from "./geo";
import { compile, type Compiled } from "./model";
import { mulberry32, randomInt, shuffle } from "./random";
import { RouteState } from "./route-state";
import { buildRoute, simulate } from "./schedule";
import type { CostOptions, Problem, Solution, UnassignedStop } from "./types";

export interface SolveOptions extends CostOptions {
  /** Seed of the pseudo-random search; default 1. */
  seed?: number;
  /** Wall-clock limit of the search. Default 2000 ms unless `maxIterations` is given. */
  timeBudgetMs?: number;
  /** Limit on ruin-and-recreate iterations; alone it makes the result reproducible. */
  maxIterations?: number;
  /** Use as few vans as possible before shortening the runs; default true. */
  minimiseVehicles?: boolean;
  /** Share of the search spent trying to drop vans (when minimising them); default 0.3. */
  fleetShare?: number;
}

/** Weight of one van in insertion costs, far above any travel cost. */
const VAN_WEIGHT = 1e7;
/** Average number of stops removed per iteration (SISR's c̄). */
const AVG_REMOVED = 10;
/** Longest string removed from one run (SISR's L^max). */
const MAX_STRING = 10;
/** Chance of skipping a position during insertion (SISR's blink rate). */
const BLINK = 0.01;

interface Snapshot {
  seqs: number[][];
  pool: number[];
}

interface Key {
  unassigned: number;
  vehicles: number;
  objective: number;
}

class Search {
  readonly routes: RouteState[];
  readonly where: Int32Array;
  pool: number[] = [];
  readonly permanent: UnassignedStop[] = [];
  readonly active: boolean[];
  readonly adjacency: Int32Array[];
  readonly rand: () => number;
  readonly scratch: number[] = [];
  private saved: (RouteState | null)[];
  private savedPool: number[] = [];

  constructor(
    readonly c: Compiled,
    seed: number,
    readonly minimiseVehicles: boolean,
  ) {
    this.rand = mulberry32(seed);
    this.routes = Array.from({ length: c.V }, (_, v) => new RouteState(v));
    this.routes.forEach((r) => r.recompute(c));
    this.saved = new Array(c.V).fill(null);
    this.where = new Int32Array(c.n).fill(-1);
    this.active = new Array(c.V).fill(true);
    const { N, cost } = c;
    this.adjacency = Array.from({ length: c.n }, (_, s) => {
      const others = Array.from({ length: c.n }, (_, t) => t);
      others.sort((a, b) => (a === s ? -1 : b === s ? 1 : cost[(s + 1) * N + a + 1] + cost[(a + 1) * N + s + 1] - cost[(s + 1) * N + b + 1] - cost[(b + 1) * N + s + 1]));
      return Int32Array.from(others);
    });
  }

  key(): Key {
    let vehicles = 0;
    let objective = 0;
    for (const r of this.routes) {
      if (r.seq.length > 0) vehicles++;
      objective += r.cost;
    }
    return { unassigned: this.pool.length + this.permanent.length, vehicles, objective };
  }

  lexLess(a: Key, b: Key): boolean {
    if (a.unassigned !== b.unassigned) return a.unassigned < b.unassigned;
    if (this.minimiseVehicles && a.vehicles !== b.vehicles) return a.vehicles < b.vehicles;
    return a.objective < b.objective - 1e-9;
  }

  // --- Changes with undo -------------------------------------------------------------------

  beginMove(): void {
    this.savedPool = this.pool.slice();
  }

  private touch(v: number): RouteState {
    if (!this.saved[v]) this.saved[v] = this.routes[v].clone();
    return this.routes[v];
  }

  commit(): void {
    this.saved.fill(null);
  }

  rollback(): void {
    for (let v = 0; v < this.c.V; v++) {
      const old = this.saved[v];
      if (!old) continue;
      for (const s of this.routes[v].seq) this.where[s] = -1;
      this.routes[v] = old;
      for (const s of old.seq) this.where[s] = v;
    }
    for (const s of this.pool) this.where[s] = -1;
    this.pool = this.savedPool;
    for (const s of this.pool) this.where[s] = -1;
    this.saved.fill(null);
  }

  insert(s: number, v: number, k: number): void {
    const r = this.touch(v);
    r.seq.splice(k - 1, 0, s);
    r.recompute(this.c);
    this.where[s] = v;
  }

  removeRange(v: number, from: number, count: number, out: number[]): void {
    const r = this.touch(v);
    const gone = r.seq.splice(from, count);
    for (const s of gone) {
      this.where[s] = -1;
      out.push(s);
    }
    r.recompute(this.c);
  }

  // --- Insertion ---------------------------------------------------------------------------

  // Cheapest feasible place for stop s on vehicle v, as [cost, position].
  bestInRoute(s: number, v: number, blink: boolean): [number, number] {
    const c = this.c;
    const r = this.routes[v];
    if (r.soiled + c.soiled[s] > c.capSoiled[v] || r.clean + c.clean[s] > c.capClean[v]) return [Infinity, -1];
    const extra = r.seq.length === 0 && this.minimiseVehicles ? VAN_WEIGHT : 0;
    const [lo, hi] = r.positionRange(c, s);
    let best = Infinity;
    let pos = -1;
    for (let k = lo; k <= hi; k++) {
      if (blink && this.rand() < BLINK) continue;
      const d = r.insertionDelta(c, s, k, this.scratch);
      if (d < best) {
        best = d;
        pos = k;
      }
    }
    return [best + extra, pos];
  }

  allowed(s: number, v: number): boolean {
    const lv = this.c.lockedVehicle[s];
    return this.active[v] && (lv < 0 || lv === v);
  }

  bestInsertion(s: number, blink: boolean): [number, number, number] {
    let best = Infinity;
    let bv = -1;
    let bk = -1;
    for (let v = 0; v < this.c.V; v++) {
      if (!this.allowed(s, v)) continue;
      const [d, k] = this.bestInRoute(s, v, blink);
      if (d < best) {
        best = d;
        bv = v;
        bk = k;
      }
    }
    return [best, bv, bk];
  }

  // Regret-2 construction: place first the stop that would lose most by waiting.
  construct(stops: number[]): void {
    const V = this.c.V;
    const pending = stops.slice();
    const costs = new Float64Array(pending.length * V);
    const posns = new Int32Array(pending.length * V);
    const fill = (i: number, v: number) => {
      const [d, k] = this.allowed(pending[i], v) ? this.bestInRoute(pending[i], v, false) : [Infinity, -1];
      costs[i * V + v] = d;
      posns[i * V + v] = k;
    };
    for (let i = 0; i < pending.length; i++) for (let v = 0; v < V; v++) fill(i, v);
    const alive = new Uint8Array(pending.length).fill(1);
    for (let left = pending.length; left > 0; left--) {
      let pick = -1;
      let pickRegret = -Infinity;
      let pickFirst = 0;
      let pickV = -1;
      for (let i = 0; i < pending.length; i++) {
        if (!alive[i]) continue;
        let first = Infinity;
        let second = Infinity;
        let fv = -1;
        for (let v = 0; v < V; v++) {
          const d = costs[i * V + v];
          if (d < first) {
            second = first;
            first = d;
            fv = v;
          } else if (d < second) second = d;
        }
        if (first === Infinity) continue;
        const regret = second === Infinity ? 1e15 : second - first;
        if (regret > pickRegret + 1e-9 || (Math.abs(regret - pickRegret) <= 1e-9 && first > pickFirst)) {
          pick = i;
          pickRegret = regret;
          pickFirst = first;
          pickV = fv;
        }
      }
      if (pick < 0) break;
      this.insert(pending[pick], pickV, posns[pick * V + pickV]);
      alive[pick] = 0;
      for (let i = 0; i < pending.length; i++) if (alive[i]) fill(i, pickV);
    }
    for (let i = 0; i < pending.length; i++) if (alive[i]) this.pool.push(pending[i]);
    this.commit();
  }

  // --- Ruin and recreate -------------------------------------------------------------------

  ruin(removable: number[]): number[] {
    const c = this.c;
    const removed: number[] = [];
    let assigned = 0;
    let used = 0;
    for (const r of this.routes) {
      if (r.seq.length > r.prefixLen) {
        used++;
        assigned += r.seq.length - r.prefixLen;
      }
    }
    if (used === 0) return removed;
    const lsMax = Math.min(MAX_STRING, assigned / used);
    const ksMax = (4 * Math.min(AVG_REMOVED, c.n)) / (1 + lsMax) - 1;
    const ks = Math.floor(this.rand() * ksMax) + 1;
    const seed = removable[randomInt(this.rand, removable.length)];
    const ruined = new Set<number>();
    for (const s of this.adjacency[seed]) {
      if (ruined.size >= ks) break;
      const v = this.where[s];
      if (v < 0 || ruined.has(v)) continue;
      const r = this.routes[v];
      const pos = r.seq.indexOf(s);
      const free = r.seq.length - r.prefixLen;
      if (pos < r.prefixLen || free <= 0) continue;
      const lt = Math.floor(this.rand() * Math.min(free, lsMax)) + 1;
      ruined.add(v);
      if (lt < free && this.rand() < 0.5) this.removeSplit(v, pos, lt, free, removed);
      else this.removeString(v, pos, lt, removed);
    }
    return removed;
  }

  private removeString(v: number, pos: number, len: number, out: number[]): void {
    const r = this.routes[v];
    const lo = Math.max(r.prefixLen, pos - len + 1);
    const hi = Math.min(pos, r.seq.length - len);
    const from = lo + randomInt(this.rand, hi - lo + 1);
    this.removeRange(v, from, len, out);
  }

  // Removes `len` stops from a string around `pos`, keeping a run of `keep` stops inside it.
  private removeSplit(v: number, pos: number, len: number, free: number, out: number[]): void {
    let keep = 1;
    while (len + keep < free && this.rand() < 0.5) keep++;
    const r = this.routes[v];
    const total = len + keep;
    const lo = Math.max(r.prefixLen, pos - total + 1);
    const hi = Math.min(pos, r.seq.length - total);
    const from = lo + randomInt(this.rand, hi - lo + 1);
    const before = randomInt(this.rand, len + 1);
    // Remove the part after the kept run first so the earlier indices stay valid.
    if (len - before > 0) this.removeRange(v, from + before + keep, len - before, out);
    if (before > 0) this.removeRange(v, from, before, out);
  }

  recreate(removed: number[]): void {
    const c = this.c;
    const list = shuffle(this.rand, removed.concat(this.pool));
    this.pool = [];
    const order = this.rand() * 11;
    if (order < 4) {
      // random order
    } else if (order < 8) list.sort((a, b) => c.soiled[b] + c.clean[b] - c.soiled[a] - c.clean[a]);
    else if (order < 10) list.sort((a, b) => c.cost[b + 1] - c.cost[a + 1]);
    else list.sort((a, b) => c.cost[a + 1] - c.cost[b + 1]);
    for (const s of list) {
      const [d, v, k] = this.bestInsertion(s, true);
      if (d < Infinity) this.insert(s, v, k);
      else this.pool.push(s);
    }
  }

  best: Snapshot = { seqs: [], pool: [] };
  bestKey: Key = { unassigned: Infinity, vehicles: Infinity, objective: Infinity };

  // Keeps the current plan if it beats the best so far.
  considerBest(): void {
    const k = this.key();
    if (this.lexLess(k, this.bestKey)) {
      this.bestKey = k;
      this.best = this.snapshot();
    }
  }

  snapshot(): Snapshot {
    return { seqs: this.routes.map((r) => r.seq.slice()), pool: this.pool.slice() };
  }

  restore(snap: Snapshot): void {
    this.where.fill(-1);
    snap.seqs.forEach((seq, v) => {
      const r = this.routes[v];
      r.seq = seq.slice();
      r.recompute(this.c);
      for (const s of seq) this.where[s] = v;
    });
    this.pool = snap.pool.slice();
    this.saved.fill(null);
  }
}

/** Counts iterations and tells how much of the budget (iterations or time) is used. */
class Budget {
  iterations = 0;
  private readonly started = performance.now();

  constructor(
    private readonly maxIterations: number,
    private readonly budgetMs: number,
  ) {}

  tick(): void {
    this.iterations++;
  }

  elapsedMs(): number {
    return performance.now() - this.started;
  }

  done(): boolean {
    return this.iterations >= this.maxIterations || (Number.isFinite(this.budgetMs) && this.elapsedMs() >= this.budgetMs);
  }

  // Fraction of the budget used so far (0..1); time is only consulted when a time budget is set.
  progress(): number {
    const byIt = Number.isFinite(this.maxIterations) ? this.iterations / this.maxIterations : 0;
    const byTime = Number.isFinite(this.budgetMs) ? this.elapsedMs() / this.budgetMs : 0;
    return Math.min(1, Math.max(byIt, byTime));
  }
}

// Fewest vans that can carry the day's carts in both compartments.
function fleetLowerBound(c: Compiled, stops: number[]): number {
  const need = (caps: Float64Array, loads: Float64Array) => {
    let total = 0;
    for (const s of stops) total += loads[s];
    const sorted = Array.from(caps).sort((a, b) => b - a);
    let k = 0;
    while (total > 0 && k < sorted.length) total -= sorted[k++];
    return k;
  };
  const lockedVans = new Set<number>();
  for (const s of stops) if (c.lockedVehicle[s] >= 0) lockedVans.add(c.lockedVehicle[s]);
  return Math.max(need(c.capSoiled, c.soiled), need(c.capClean, c.clean), lockedVans.size, stops.length > 0 ? 1 : 0);
}

// Why stop s cannot be served at all by vehicle v on its own, or null if it can.
function aloneProblem(c: Compiled, s: number, v: number): { level: number; text: string } | null {
  const stop = c.problem.stops[s];
  const van = c.problem.vehicles[v];
  if (c.soiled[s] > c.capSoiled[v]) return { level: 0, text: `it has ${stop.soiled} soiled carts but the soiled compartment of van ${van.id} holds ${van.soiledCapacity}` };
  if (c.clean[s] > c.capClean[v]) return { level: 0, text: `it needs ${stop.clean} clean carts but the clean compartment of van ${van.id} holds ${van.cleanCapacity}` };
  const detail = { arrival: [] as number[], start: [] as number[] };
  const sim = simulate(c, v, [s], detail);
  if (sim.violations === 0) return null;
  if (c.hard[s] && detail.start[0] > c.lastEnd[s]) {
    return { level: 1, text: `window ${windowsText(stop.windows)} cannot be reached before it closes: van ${van.id} leaving the unit at ${clock(c.vStart[v])} is there at ${clock(detail.arrival[0])} at the earliest` };
  }
  if (sim.end > c.vEnd[v]) return { level: 2, text: `serving it and driving back ends at ${clock(sim.end)}, after van ${van.id} must be back at ${clock(c.vEnd[v])}` };
  return { level: 2, text: `the driver of van ${van.id} could not take the break in time` };
}

// Why stop s, serveable on its own, did not fit into any run of the plan.
function fitProblem(search: Search, s: number): string {
  const c = search.c;
  const soiledFull: string[] = [];
  const cleanFull: string[] = [];
  const timing: string[] = [];
  for (let v = 0; v < c.V; v++) {
    const lv = c.lockedVehicle[s];
    if (lv >= 0 && lv !== v) continue;
    const r = search.routes[v];
    const id = c.problem.vehicles[v].id;
    if (r.soiled + c.soiled[s] > c.capSoiled[v]) soiledFull.push(id);
    else if (r.clean + c.clean[s] > c.capClean[v]) cleanFull.push(id);
    else timing.push(id);
  }
  const vans = (ids: string[]) => `van${ids.length > 1 ? "s" : ""} ${ids.join(", ")}`;
  const parts: string[] = [];
  if (soiledFull.length > 0) parts.push(`the soiled compartment is full on ${vans(soiledFull)}`);
  if (cleanFull.length > 0) parts.push(`the clean compartment is full on ${vans(cleanFull)}`);
  if (timing.length > 0) parts.push(`no place in the run of ${vans(timing)} keeps every hard window, break and shift end`);
  return `no van can take it: ${parts.join("; ")}`;
}

// Sets aside the stops no allowed van could serve even on its own; returns the others.
function setAsideUnserveable(c: Compiled, search: Search): number[] {
  const free: number[] = [];
  const inPrefix = new Set(c.prefix.flat());
  for (let s = 0; s < c.n; s++) {
    if (inPrefix.has(s)) continue;
    const problems: { level: number; text: string }[] = [];
    let ok = false;
    for (let v = 0; v < c.V && !ok; v++) {
      const lv = c.lockedVehicle[s];
      if (lv >= 0 && lv !== v) continue;
      const p = aloneProblem(c, s, v);
      if (p) problems.push(p);
      else ok = true;
    }
    if (ok) free.push(s);
    else {
      // The reason of the van that came closest: capacity < window < shift end or break.
      problems.sort((a, b) => b.level - a.level);
      search.permanent.push({ stopId: c.problem.stops[s].id, reason: problems[0].text });
    }
  }
  return free;
}

// Puts the position-locked stops at the head of their vans' runs, as far as they can be served.
function placeLockedHeads(c: Compiled, search: Search): void {
  c.prefix.forEach((list, v) => {
    const r = search.routes[v];
    const vanId = c.problem.vehicles[v].id;
    let broken: string | null = null;
    for (const s of list) {
      const id = c.problem.stops[s].id;
      if (broken) {
        search.permanent.push({ stopId: id, reason: `it is locked after stop ${broken} on van ${vanId}, which cannot be served` });
        continue;
      }
      const trial = [...r.seq, s];
      const soiled = trial.reduce((a, t) => a + c.soiled[t], 0);
      const clean = trial.reduce((a, t) => a + c.clean[t], 0);
      const alone = aloneProblem(c, s, v);
      const full = soiled > c.capSoiled[v] || clean > c.capClean[v];
      if (alone || full || simulate(c, v, trial).violations > 0) {
        const why = alone ? alone.text : full ? "the stops locked before it fill the van" : "after the stops locked before it, the van cannot keep its hard windows, break and shift end";
        search.permanent.push({ stopId: id, reason: `it is locked as stop ${r.seq.length + 1} of van ${vanId}, but ${why}` });
        broken = id;
        continue;
      }
      r.seq.push(s);
      r.prefixLen = r.seq.length;
      r.recompute(c);
      search.where[s] = v;
    }
  });
}

/**
 * Fleet reduction (SISR's fleet minimisation): empty one run, then ruin and recreate with the
 * other vans only, accepting a change when fewer stops are left out or the left-out stops have
 * been left out less often so far; once all fit, empty the next run.
 */
function reduceFleet(search: Search, free: number[], lower: number, budget: Budget, until: number): void {
  const c = search.c;
  const absences = new Float64Array(c.n);
  const sumAbs = (list: number[]) => list.reduce((a, s) => a + absences[s], 0);
  for (let v = 0; v < c.V; v++) search.active[v] = search.routes[v].seq.length > 0;
  const dropRoute = () => {
    const candidates: number[] = [];
    for (let v = 0; v < c.V; v++) {
      const r = search.routes[v];
      if (search.active[v] && r.prefixLen === 0 && r.seq.length > 0 && !r.seq.some((s) => c.lockedVehicle[s] >= 0)) candidates.push(v);
    }
    if (candidates.length === 0) return false;
    candidates.sort((a, b) => search.routes[a].seq.length - search.routes[b].seq.length);
    const v = search.rand() < 0.5 ? candidates[0] : candidates[randomInt(search.rand, candidates.length)];
    search.beginMove();
    search.removeRange(v, 0, search.routes[v].seq.length, search.pool);
    search.commit();
    search.active[v] = false;
    return true;
  };
  let dropping = dropRoute();
  while (dropping && !budget.done() && budget.progress() < until) {
    budget.tick();
    const beforeCount = search.pool.length;
    const beforeAbs = sumAbs(search.pool);
    search.beginMove();
    search.recreate(search.ruin(free));
    if (search.pool.length < beforeCount || sumAbs(search.pool) < beforeAbs) search.commit();
    else search.rollback();
    for (const s of search.pool) absences[s]++;
    if (search.pool.length === 0) {
      search.considerBest();
      if (search.key().vehicles <= lower) break;
      dropping = dropRoute();
    }
  }
  search.restore(search.best);
  search.active.fill(true);
}

/**
 * Shorter runs: ruin and recreate under simulated annealing on the objective, never accepting
 * more left-out stops or (when minimised) more vans. The temperature falls geometrically from
 * half an average leg to 1 % of that over the rest of the budget.
 */
function anneal(search: Search, free: number[], budget: Budget): void {
  const startKey = search.key();
  const assigned = search.c.n - startKey.unassigned;
  const avgLeg = startKey.objective / Math.max(1, assigned + startKey.vehicles);
  const t0 = 0.5 * avgLeg;
  const tf = 0.005 * avgLeg;
  const p0 = budget.progress();
  let cur = startKey;
  while (!budget.done()) {
    budget.tick();
    const p = Math.min(1, (budget.progress() - p0) / Math.max(1e-9, 1 - p0));
    const temperature = t0 * Math.pow(tf / t0, p);
    search.beginMove();
    search.recreate(search.ruin(free));
    const cand = search.key();
    let accept: boolean;
    if (cand.unassigned !== cur.unassigned) accept = cand.unassigned < cur.unassigned;
    else if (search.minimiseVehicles && cand.vehicles !== cur.vehicles) accept = cand.vehicles < cur.vehicles;
    else accept = cand.objective < cur.objective - temperature * Math.log(search.rand());
    if (accept) {
      search.commit();
      cur = cand;
      search.considerBest();
    } else search.rollback();
  }
  search.restore(search.best);
}

// Proposes a day plan for the vans; see the module comment for the objective and determinism.
export function solve(problem: Problem, travel: TravelModel, options: SolveOptions = {}): Solution {
  const c = compile(problem, travel, options);
  const seed = options.seed ?? 1;
  const minimiseVehicles = options.minimiseVehicles ?? true;
  const fleetShare = options.fleetShare ?? 0.3;
  const budgetMs = options.timeBudgetMs ?? (options.maxIterations === undefined ? 2000 : Infinity);
  const budget = new Budget(options.maxIterations ?? Infinity, budgetMs);
  const search = new Search(c, seed, minimiseVehicles);

  const free = setAsideUnserveable(c, search);
  placeLockedHeads(c, search);
  search.construct(free);
  search.considerBest();
  if (free.length > 0) {
    const lower = fleetLowerBound(c, free);
    if (minimiseVehicles && search.pool.length === 0 && search.bestKey.vehicles > lower) reduceFleet(search, free, lower, budget, fleetShare);
    anneal(search, free, budget);
  }

  // Last chance for left-out stops, then the plan in the problem's own words.
  search.active.fill(true);
  for (const s of search.pool.slice()) {
    const [d, v, k] = search.bestInsertion(s, false);
    if (d < Infinity) {
      search.pool.splice(search.pool.indexOf(s), 1);
      search.insert(s, v, k);
    }
  }
  search.commit();
  const routes = search.routes.filter((r) => r.seq.length > 0).map((r) => buildRoute(c, r.v, r.seq));
  const unassigned: UnassignedStop[] = [
    ...search.permanent,
    ...search.pool.map((s) => ({ stopId: c.problem.stops[s].id, reason: fitProblem(search, s) })),
  ];
  const order = new Map(c.problem.stops.map((s, i) => [s.id, i]));
  unassigned.sort((a, b) => order.get(a.stopId)! - order.get(b.stopId)!);
  const distanceKm = routes.reduce((a, r) => a + r.distanceKm, 0);
  const driveMin = routes.reduce((a, r) => a + r.driveMin, 0);
  const lateMin = routes.reduce((a, r) => a + r.lateMin, 0);
  const objective = search.routes.reduce((a, r) => a + r.cost, 0);
  return {
    routes,
    unassigned,
    cost: { unassigned: unassigned.length, vehicles: routes.length, distanceKm, driveMin, lateMin, objective },
    search: { iterations: budget.iterations, elapsedMs: budget.elapsedMs(), seed },
  };
}
