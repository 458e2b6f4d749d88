// The planner against exact optima computed here: Held–Karp for one-van tours and complete
// enumeration for a two-van day with windows and both compartments.
import { describe, expect, it } from "vitest";
import { mulberry32 } from "@/lib/routing/random";
import { solve } from "@/lib/routing/solver";
import { solveTsp } from "@/lib/routing/tsp";
import type { Problem, Stop } from "@/lib/routing/types";
import { validateSolution } from "@/lib/routing/validate";
import { bruteForce, heldKarp, planarTravel, stop, van } from "./helpers";

const euclid = (a: { x: number; y: number }, b: { x: number; y: number }) => Math.hypot(a.x - b.x, a.y - b.y);

function randomPoints(seed: number, n: number, size = 100) {
  const r = mulberry32(seed);
  return Array.from({ length: n }, () => ({ x: Math.round(r() * size), y: Math.round(r() * size) }));
}

describe("single-van tours against Held–Karp", () => {
  const cases = [
    { seed: 11, n: 8 },
    { seed: 12, n: 9 },
    { seed: 13, n: 10 },
    { seed: 14, n: 10 },
  ];
  for (const { seed, n } of cases) {
    it(`solveTsp and solve() both find the optimum of ${n} random points (seed ${seed})`, () => {
      const points = randomPoints(seed, n);
      const optimum = heldKarp(points.map((a) => points.map((b) => euclid(a, b))));
      const tsp = solveTsp(points, euclid, { seed: 1, maxIterations: 300 });
      expect(tsp.length).toBeCloseTo(optimum, 9);

      const travel = planarTravel(points);
      const problem: Problem = {
        depot: { location: 0, openMin: 0, closeMin: 100_000 },
        vehicles: [van("V1", { soiledCapacity: 100, cleanCapacity: 100, shiftEndMin: 100_000 })],
        stops: points.slice(1).map((_, i) => stop(`S${i + 1}`, i + 1, { soiled: 1, windows: [{ startMin: 0, endMin: 100_000 }] })),
      };
      const sol = solve(problem, travel, { seed: 5, maxIterations: 1500 });
      expect(validateSolution(problem, sol, travel)).toEqual([]);
      expect(sol.cost.distanceKm).toBeCloseTo(optimum, 9);
    });
  }
});

// Six stops, two vans with different compartments, windows (some soft, some double) and a break.
function twoVanDay(seed: number): { problem: Problem; travel: ReturnType<typeof planarTravel> } {
  const r = mulberry32(seed);
  const points = randomPoints(seed * 7 + 1, 7, 40);
  const int = (lo: number, hi: number) => lo + Math.floor(r() * (hi - lo + 1));
  const stops: Stop[] = points.slice(1).map((_, i) => {
    const start = int(0, 200);
    const windows = [{ startMin: start, endMin: start + int(30, 150) }];
    if (r() < 0.3) windows.push({ startMin: start + 200, endMin: start + 260 });
    return stop(`S${i + 1}`, i + 1, { serviceMin: int(5, 15), soiled: int(0, 3), clean: int(0, 3), windows, hard: r() < 0.7 });
  });
  return {
    problem: {
      depot: { location: 0, openMin: 0, closeMin: 480 },
      vehicles: [
        van("V1", { soiledCapacity: int(3, 6), cleanCapacity: int(3, 6), shiftStartMin: 0, shiftEndMin: 420, breakMin: { earliestMin: 100, latestMin: 200, durationMin: 20 } }),
        van("V2", { soiledCapacity: int(3, 6), cleanCapacity: int(2, 5), shiftStartMin: 30, shiftEndMin: 480 }),
      ],
      stops,
    },
    travel: planarTravel(points, 2),
  };
}

describe("two vans, six stops, against complete enumeration", () => {
  for (const seed of [1, 2, 3, 4, 5]) {
    it(`matches the enumerated optimum (seed ${seed})`, () => {
      const { problem, travel } = twoVanDay(seed);
      const optimum = bruteForce(problem, travel);
      const sol = solve(problem, travel, { seed: 9, maxIterations: 2000 });
      expect(validateSolution(problem, sol, travel)).toEqual([]);
      expect(sol.cost.unassigned).toBe(optimum.unassigned);
      expect(sol.cost.vehicles).toBe(optimum.vehicles);
      expect(sol.cost.objective).toBeCloseTo(optimum.objective, 9);
    });
  }
});
