import { describe, expect, it } from "vitest";
import { RoutingInputError } from "@/lib/routing/errors";
import { GreatCircleTravel } from "@/lib/routing/geo";
import { solveInWorker } from "@/lib/routing/solve-in-worker";
import { solve } from "@/lib/routing/solver";
import type { Problem } from "@/lib/routing/types";
import { stop, van } from "./helpers";

// The planner in its own thread gives the same plan as in the caller's thread, reports bad input
// the same way, and leaves the caller's thread free while it searches.

/** Forty stops on a 0.02° grid around a depot at 53.0° N, 1.5° W (an invented area). */
function gridDay(): Problem {
  const stops = Array.from({ length: 40 }, (_, i) =>
    stop(`S${i}`, 0, { location: { lat: 53 + 0.02 * Math.floor(i / 8), lon: -1.5 + 0.02 * (i % 8) }, soiled: 1, serviceMin: 5 }),
  );
  return {
    depot: { location: { lat: 53.04, lon: -1.43 }, openMin: 360, closeMin: 1200 },
    vehicles: [van("V1", { soiledCapacity: 25, shiftStartMin: 420, shiftEndMin: 1080 }), van("V2", { soiledCapacity: 25, shiftStartMin: 420, shiftEndMin: 1080 })],
    stops,
  };
}

const settings = { roadFactor: 1.3, speedKmh: 40 };

describe("solveInWorker", () => {
  it("returns the plan solve returns in the caller's thread for the same seed and iterations", async () => {
    const problem = gridDay();
    const here = solve(problem, new GreatCircleTravel(settings), { seed: 5, maxIterations: 300 });
    const there = await solveInWorker(problem, settings, { seed: 5, maxIterations: 300 });
    expect(there.routes.map((r) => [r.vehicleId, r.stops.map((s) => s.stopId)])).toEqual(here.routes.map((r) => [r.vehicleId, r.stops.map((s) => s.stopId)]));
    expect(there.cost).toEqual(here.cost);
  });

  it("rejects bad input with the planner's own error and its list of problems", async () => {
    const problem = { ...gridDay(), vehicles: [van("V1", { soiledCapacity: -1 })] };
    const error = await solveInWorker(problem, settings, { seed: 1, maxIterations: 10 }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(RoutingInputError);
    expect((error as RoutingInputError).issues.length).toBeGreaterThan(0);
    expect(() => solve(problem, new GreatCircleTravel(settings), { seed: 1, maxIterations: 10 })).toThrow((error as Error).message);
  });

  it("leaves the caller's thread free while it searches", async () => {
    // A timer on this thread keeps firing during a 600 ms search; solve() here would let it fire
    // only after the search ended.
    let ticks = 0;
    const timer = setInterval(() => ticks++, 20);
    try {
      const solution = await solveInWorker(gridDay(), settings, { seed: 2, timeBudgetMs: 600 });
      expect(solution.unassigned).toEqual([]);
    } finally {
      clearInterval(timer);
    }
    expect(ticks).toBeGreaterThan(5);
  });
});
