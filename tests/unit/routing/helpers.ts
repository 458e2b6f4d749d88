// Shared pieces of the route planner tests: benchmark files, exact solvers, small problems.
import { readFileSync } from "node:fs";
import path from "node:path";
import { MatrixTravel } from "@/lib/routing/geo";
import { evaluateRoute } from "@/lib/routing/schedule";
import type { Problem, Stop, Vehicle } from "@/lib/routing/types";

/** The repository root; shared/ sits beside it (in CI too, beside the fresh clone). */
export const repoRoot = path.resolve(__dirname, "..", "..", "..");
export const benchmarksDir = path.join(repoRoot, "..", "shared", "benchmarks");

export function readBenchmark(...parts: string[]): string {
  return readFileSync(path.join(benchmarksDir, ...parts), "utf8");
}

// Held–Karp dynamic programme: the optimal closed tour length from node 0 over an n×n matrix.
export function heldKarp(d: number[][]): number {
  const n = d.length;
  if (n === 1) return 0;
  const m = n - 1;
  const full = 1 << m;
  const dp = new Float64Array(full * m).fill(Infinity);
  for (let j = 0; j < m; j++) dp[(1 << j) * m + j] = d[0][j + 1];
  for (let set = 1; set < full; set++) {
    for (let j = 0; j < m; j++) {
      const cur = dp[set * m + j];
      if (!(set & (1 << j)) || cur === Infinity) continue;
      for (let k = 0; k < m; k++) {
        if (set & (1 << k)) continue;
        const next = set | (1 << k);
        const v = cur + d[j + 1][k + 1];
        if (v < dp[next * m + k]) dp[next * m + k] = v;
      }
    }
  }
  let best = Infinity;
  for (let j = 0; j < m; j++) best = Math.min(best, dp[(full - 1) * m + j] + d[j + 1][0]);
  return best;
}

function permutations<T>(items: T[]): T[][] {
  if (items.length <= 1) return [items.slice()];
  const out: T[][] = [];
  items.forEach((x, i) => {
    for (const rest of permutations([...items.slice(0, i), ...items.slice(i + 1)])) out.push([x, ...rest]);
  });
  return out;
}

export interface ExactOptimum {
  unassigned: number;
  vehicles: number;
  objective: number;
}

/**
 * Enumerates every assignment of stops to vans (or to nobody) and every order of each van's
 * stops, keeping the runs that break no rule, and returns the best plan by the planner's
 * hierarchy: fewest unassigned, fewest vans, then km + latePenalty × minutes late.
 */
export function bruteForce(problem: Problem, travel: MatrixTravel, latePenaltyPerMin = 5): ExactOptimum {
  const ids = problem.stops.map((s) => s.id);
  const n = ids.length;
  // Best cost of each (van, subset of stops), over every order that keeps all the rules.
  const best = problem.vehicles.map((v) => {
    const costs = new Float64Array(1 << n).fill(Infinity);
    for (let mask = 0; mask < 1 << n; mask++) {
      const members = ids.filter((_, i) => mask & (1 << i));
      if (mask === 0) {
        costs[0] = 0;
        continue;
      }
      for (const order of permutations(members)) {
        const { route, violations } = evaluateRoute(problem, travel, v.id, order, { latePenaltyPerMin });
        if (violations.length > 0) continue;
        costs[mask] = Math.min(costs[mask], route.distanceKm + latePenaltyPerMin * route.lateMin);
      }
    }
    return costs;
  });
  let opt: ExactOptimum = { unassigned: Infinity, vehicles: Infinity, objective: Infinity };
  const V = problem.vehicles.length;
  const assign = new Array(n).fill(-1);
  const visit = (i: number) => {
    if (i === n) {
      const masks = new Array(V).fill(0);
      let unassigned = 0;
      assign.forEach((v, k) => (v < 0 ? unassigned++ : (masks[v] |= 1 << k)));
      let objective = 0;
      let vehicles = 0;
      for (let v = 0; v < V; v++) {
        objective += best[v][masks[v]];
        if (masks[v]) vehicles++;
      }
      if (objective === Infinity) return;
      const better =
        unassigned !== opt.unassigned ? unassigned < opt.unassigned : vehicles !== opt.vehicles ? vehicles < opt.vehicles : objective < opt.objective;
      if (better) opt = { unassigned, vehicles, objective };
      return;
    }
    for (let v = -1; v < V; v++) {
      assign[i] = v;
      visit(i + 1);
    }
  };
  visit(0);
  return opt;
}

/** Planar points with driving minutes = distance × `minutesPerKm`; index 0 is the unit. */
export function planarTravel(points: { x: number; y: number }[], minutesPerKm = 1): MatrixTravel {
  return MatrixTravel.fromPoints(points, (a, b) => Math.hypot(a.x - b.x, a.y - b.y), minutesPerKm);
}

export function stop(id: string, location: number, extra: Partial<Stop> = {}): Stop {
  return { id, location, serviceMin: 0, soiled: 0, clean: 0, windows: [{ startMin: 0, endMin: 10_000 }], hard: true, ...extra };
}

export function van(id: string, extra: Partial<Vehicle> = {}): Vehicle {
  return { id, soiledCapacity: 10, cleanCapacity: 10, shiftStartMin: 0, shiftEndMin: 10_000, ...extra };
}
