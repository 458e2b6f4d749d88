// One van's run inside the search, with the cached timetable that makes insertion checks cheap.
import { EPS, lateness, latestArrival, serviceStart, type Compiled } from "./model";
import { legTotals, simulate } from "./schedule";

/**
 * `dep[p]` is the departure from position p (0 = the unit, p = the p-th stop) of the run without
 * a break, `start[p]` the service start there, and `latest[p]` the latest arrival at position p
 * (m + 1 = back at the unit) that keeps every later hard window and the shift end. A break only
 * delays a run, so a run without its break failing these bounds fails with it too.
 */
export class RouteState {
  seq: number[] = [];
  dep: number[] = [0];
  start: number[] = [0];
  latest: number[] = [0, 0];
  soiled = 0;
  clean = 0;
  travel = 0;
  late = 0;
  /** Travel plus the lateness penalty. */
  cost = 0;
  softStops = 0;
  fixedStops = 0;
  feasible = true;

  constructor(
    readonly v: number,
    /** Stops at the head of the run whose positions are locked. */
    public prefixLen = 0,
  ) {}

  clone(): RouteState {
    const r = new RouteState(this.v, this.prefixLen);
    r.seq = this.seq.slice();
    r.dep = this.dep.slice();
    r.start = this.start.slice();
    r.latest = this.latest.slice();
    r.soiled = this.soiled;
    r.clean = this.clean;
    r.travel = this.travel;
    r.late = this.late;
    r.cost = this.cost;
    r.softStops = this.softStops;
    r.fixedStops = this.fixedStops;
    r.feasible = this.feasible;
    return r;
  }

  // Rebuilds the cached timetable, loads and cost from `seq`.
  recompute(c: Compiled): void {
    const { N, time } = c;
    const seq = this.seq;
    const m = seq.length;
    const v = this.v;
    this.dep.length = m + 1;
    this.start.length = m + 1;
    this.latest.length = m + 2;
    let soiled = 0;
    let clean = 0;
    let soft = 0;
    let fixed = 0;
    let late = 0;
    let t = c.vStart[v];
    let prev = 0;
    this.dep[0] = t;
    this.start[0] = t;
    for (let p = 1; p <= m; p++) {
      const s = seq[p - 1];
      soiled += c.soiled[s];
      clean += c.clean[s];
      if (!c.hard[s]) soft++;
      if (c.fixedRank[s] >= 0) fixed++;
      const st = serviceStart(c, s, t + time[prev * N + s + 1]);
      late += lateness(c, s, st);
      this.start[p] = st;
      t = st + c.service[s];
      this.dep[p] = t;
      prev = s + 1;
    }
    const back = t + time[prev * N];
    let latest = c.vEnd[v];
    this.latest[m + 1] = latest;
    let next = 0;
    for (let p = m; p >= 1; p--) {
      const s = seq[p - 1];
      latest = latestArrival(c, s, latest - c.service[s] - time[(s + 1) * N + next]);
      this.latest[p] = latest;
      next = s + 1;
    }
    this.latest[0] = -Infinity;
    this.soiled = soiled;
    this.clean = clean;
    this.softStops = soft;
    this.fixedStops = fixed;
    this.travel = legTotals(c, seq).travel;
    if (c.breaks[v] && m > 0) {
      const sim = simulate(c, v, seq);
      this.late = sim.late;
      this.feasible = sim.violations === 0;
    } else {
      this.late = late;
      let ok = back <= c.vEnd[v] + EPS;
      for (let p = 1; ok && p <= m; p++) if (c.hard[seq[p - 1]] && lateness(c, seq[p - 1], this.start[p]) > 0) ok = false;
      this.feasible = ok;
    }
    this.cost = this.travel + c.latePenalty * this.late;
  }

  // Positions (1-based, before the stop now there) where stop s may go without breaking a lock.
  positionRange(c: Compiled, s: number): [number, number] {
    let lo = this.prefixLen + 1;
    let hi = this.seq.length + 1;
    const rank = c.fixedRank[s];
    if (rank >= 0 && this.fixedStops > 0) {
      for (let p = 1; p <= this.seq.length; p++) {
        const r = c.fixedRank[this.seq[p - 1]];
        if (r < 0) continue;
        if (r < rank) lo = Math.max(lo, p + 1);
        else if (r > rank) {
          hi = Math.min(hi, p);
          break;
        }
      }
    }
    return [lo, hi];
  }

  // Change in cost of putting stop s at position k, or Infinity if that breaks a hard rule.
  // Capacity is checked by the caller.
  insertionDelta(c: Compiled, s: number, k: number, scratch: number[]): number {
    const { N, time, cost } = c;
    const seq = this.seq;
    const m = seq.length;
    const prev = k >= 2 ? seq[k - 2] + 1 : 0;
    const next = k <= m ? seq[k - 1] + 1 : 0;
    const s1 = s + 1;
    const st = serviceStart(c, s, this.dep[k - 1] + time[prev * N + s1]);
    const l = lateness(c, s, st);
    if (l > 0 && c.hard[s]) return Infinity;
    let arrive = st + c.service[s] + time[s1 * N + next];
    if (arrive > this.latest[k] + EPS) return Infinity;
    const travelDelta = cost[prev * N + s1] + cost[s1 * N + next] - cost[prev * N + next];
    if (c.breaks[this.v]) {
      for (let p = 0; p < k - 1; p++) scratch[p] = seq[p];
      scratch[k - 1] = s;
      for (let p = k - 1; p < m; p++) scratch[p + 1] = seq[p];
      scratch.length = m + 1;
      const sim = simulate(c, this.v, scratch);
      if (sim.violations > 0) return Infinity;
      return travelDelta + c.latePenalty * (sim.late - this.late);
    }
    let lateDelta = l;
    if (this.softStops > 0) {
      for (let p = k; p <= m; p++) {
        const s2 = seq[p - 1];
        const st2 = serviceStart(c, s2, arrive);
        if (st2 === this.start[p]) break;
        lateDelta += lateness(c, s2, st2) - lateness(c, s2, this.start[p]);
        const n2 = p < m ? seq[p] + 1 : 0;
        arrive = st2 + c.service[s2] + time[(s2 + 1) * N + n2];
      }
    }
    return travelDelta + c.latePenalty * lateDelta;
  }
}
