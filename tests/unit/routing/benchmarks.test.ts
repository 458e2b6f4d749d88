import { describe, expect, it } from "vitest";
import {
  euc2d,
  parseSolomon,
  parseTsplib,
  parseTsplibTour,
  solomonProblem,
  tourLength,
} from "@/lib/routing/benchmarks";
import { RoutingFormatError } from "@/lib/routing/errors";
import { solve } from "@/lib/routing/solver";
import { solveTsp } from "@/lib/routing/tsp";
import { validateSolution } from "@/lib/routing/validate";
import { readBenchmark } from "./helpers";

// Optimal tour lengths from TSPLIB 95 (G. Reinelt), "bestSolutions" list.
const TSPLIB_OPTIMA: Record<string, number> = { eil51: 426, berlin52: 7542, st70: 675, eil76: 538, kroA100: 21282 };

describe("TSPLIB EUC_2D distances", () => {
  it("rounds to the nearest integer as nint(x) = ⌊x + 0.5⌋", () => {
    // TSPLIB 95 section 2.1: EUC_2D distance is nint(sqrt(xd² + yd²)).
    expect(euc2d({ x: 0, y: 0 }, { x: 3, y: 4 })).toBe(5);
    expect(euc2d({ x: 0, y: 0 }, { x: 1, y: 1 })).toBe(1); // √2 = 1.414 → 1
    expect(euc2d({ x: 0, y: 0 }, { x: 1.5, y: 2 })).toBe(3); // 2.5 → 3
  });

  for (const [name, optimum] of Object.entries(TSPLIB_OPTIMA)) {
    it(`gives the published optimum ${optimum} for the optimal tour of ${name}`, () => {
      const inst = parseTsplib(readBenchmark("tsplib", `${name}.tsp`));
      const tour = parseTsplibTour(readBenchmark("tsplib", `${name}.opt.tour`));
      expect(inst.points).toHaveLength(inst.dimension);
      expect(new Set(tour).size).toBe(inst.dimension);
      expect(tourLength(tour, inst.points, euc2d)).toBe(optimum);
    });
  }
});

describe("solveTsp on TSPLIB instances", () => {
  // The benchmark aims at 2 %; this test only holds the solver to 5 % of the TSPLIB optimum.
  for (const name of ["eil51", "berlin52"]) {
    it(`comes within 5 % of the optimum of ${name}`, () => {
      const inst = parseTsplib(readBenchmark("tsplib", `${name}.tsp`));
      const result = solveTsp(inst.points, euc2d, { seed: 7, maxIterations: 3000 });
      expect(new Set(result.tour).size).toBe(inst.dimension);
      expect(result.tour[0]).toBe(0);
      expect(tourLength(result.tour, inst.points, euc2d)).toBe(result.length);
      expect(result.length).toBeGreaterThanOrEqual(TSPLIB_OPTIMA[name]);
      expect(result.length).toBeLessThanOrEqual(TSPLIB_OPTIMA[name] * 1.05);
    });
  }
});

describe("Solomon c101 with 25 customers", () => {
  it("plans a feasible day with at most 3 vans within 5 % of the best known 191.3", () => {
    // Best known 3 vehicles / 191.3 (Solomon 1987; SINTEF best-known table).
    const { problem, travel } = solomonProblem(parseSolomon(readBenchmark("solomon", "c101-25.txt")));
    expect(problem.stops).toHaveLength(25);
    const sol = solve(problem, travel, { seed: 3, maxIterations: 1500 });
    expect(validateSolution(problem, sol, travel)).toEqual([]);
    expect(sol.unassigned).toEqual([]);
    expect(sol.cost.vehicles).toBeLessThanOrEqual(3);
    expect(sol.cost.distanceKm).toBeLessThanOrEqual(191.3 * 1.05);
  });

  it("plans feasible days for the 100-customer instances R101 and RC201", () => {
    // Feasibility only (every rule checked by validateSolution); the gaps are the benchmark's job.
    for (const file of ["r101.txt", "rc201.txt"]) {
      const { problem, travel } = solomonProblem(parseSolomon(readBenchmark("solomon", file)));
      const sol = solve(problem, travel, { seed: 1, maxIterations: 300 });
      expect(validateSolution(problem, sol, travel)).toEqual([]);
      expect(sol.unassigned).toEqual([]);
      expect(sol.cost.vehicles).toBeLessThanOrEqual(25);
    }
  });

  it("maps the one capacity to the soiled compartment", () => {
    const inst = parseSolomon(readBenchmark("solomon", "c101.txt"));
    expect(inst).toMatchObject({ name: "C101", vehicles: 25, capacity: 200 });
    expect(inst.customers).toHaveLength(101);
    const { problem, travel } = solomonProblem(inst, 10);
    expect(problem.stops).toHaveLength(10);
    expect(problem.vehicles[0]).toMatchObject({ soiledCapacity: 200, cleanCapacity: 0, shiftStartMin: 0, shiftEndMin: 1236 });
    // Customer 1 of C101: (45, 68), demand 10, window 912–967, service 90; depot at (40, 50).
    expect(problem.stops[0]).toMatchObject({ id: "1", soiled: 10, clean: 0, serviceMin: 90, windows: [{ startMin: 912, endMin: 967 }], hard: true });
    expect(travel.distanceKm(0, 1)).toBeCloseTo(Math.hypot(5, 18), 12);
  });
});

describe("benchmark readers", () => {
  it("names the line of a malformed TSPLIB file", () => {
    const bad = "NAME : x\nTYPE : TSP\nDIMENSION : 2\nEDGE_WEIGHT_TYPE : EUC_2D\nNODE_COORD_SECTION\n1 0 0\n2 zero 1\nEOF\n";
    expect(() => parseTsplib(bad)).toThrow(RoutingFormatError);
    expect(() => parseTsplib(bad)).toThrow(/line 7: expected "node x y"/);
    expect(() => parseTsplib(bad.replace("EUC_2D", "GEO"))).toThrow(/GEO is not supported/);
    expect(() => parseTsplib("NAME : x\nDIMENSION : 3\nEDGE_WEIGHT_TYPE : EUC_2D\nNODE_COORD_SECTION\n1 0 0\nEOF")).toThrow(/3 nodes but 1/);
  });

  it("names the line of a malformed Solomon row", () => {
    const text = readBenchmark("solomon", "c101-25.txt");
    const lines = text.split("\n");
    const row = lines.findIndex((l) => /^\s+3\s/.test(l));
    lines[row] = "    3      42         66         10";
    expect(() => parseSolomon(lines.join("\n"))).toThrow(new RegExp(`line ${row + 1}: expected 7 numbers`));
  });

  it("reads a tour up to its -1 terminator", () => {
    expect(parseTsplibTour("NAME : t\nTOUR_SECTION\n1\n3\n2\n-1\nEOF\n")).toEqual([0, 2, 1]);
  });
});
