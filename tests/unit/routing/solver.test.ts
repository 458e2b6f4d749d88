import { describe, expect, it } from "vitest";
import { RoutingInputError } from "@/lib/routing/errors";
import { GreatCircleTravel } from "@/lib/routing/geo";
import { solve } from "@/lib/routing/solver";
import type { Problem } from "@/lib/routing/types";
import { validateSolution } from "@/lib/routing/validate";
import { planarTravel, stop, van } from "./helpers";

// A line of places: the unit at x = 0, stops east (positive x) and west (negative x), 1 min per km.
const points = [{ x: 0, y: 0 }, { x: 10, y: 0 }, { x: -10, y: 0 }, { x: 10, y: 1 }, { x: 12, y: 0 }, { x: -12, y: 0 }];
const travel = planarTravel(points);
const day = (p: Partial<Problem> = {}): Problem => ({
  depot: { location: 0, openMin: 0, closeMin: 1000 },
  vehicles: [van("V1"), van("V2")],
  stops: [],
  ...p,
});

describe("solve: what cannot be served", () => {
  it("explains a stop larger than every compartment", () => {
    const problem = day({ stops: [stop("BIG", 1, { soiled: 11 }), stop("OK", 2, { soiled: 1 })] });
    const sol = solve(problem, travel, { seed: 1, maxIterations: 50 });
    expect(sol.unassigned).toEqual([{ stopId: "BIG", reason: "it has 11 soiled carts but the soiled compartment of van V1 holds 10" }]);
    expect(sol.routes.flatMap((r) => r.stops.map((s) => s.stopId))).toEqual(["OK"]);
  });

  it("explains a window that cannot be reached from the unit", () => {
    // Shift from 08:00; the stop is 10 min away and its window is 08:00–08:05.
    const problem = day({
      vehicles: [van("V1", { shiftStartMin: 480, shiftEndMin: 1000 })],
      stops: [stop("EARLY", 1, { windows: [{ startMin: 480, endMin: 485 }] })],
    });
    const sol = solve(problem, travel, { seed: 1, maxIterations: 20 });
    expect(sol.unassigned).toEqual([
      { stopId: "EARLY", reason: "window 08:00–08:05 cannot be reached before it closes: van V1 leaving the unit at 08:00 is there at 08:10 at the earliest" },
    ]);
  });

  it("explains a stop that would keep the van out past its shift", () => {
    const problem = day({ vehicles: [van("V1", { shiftEndMin: 25 })], stops: [stop("FAR", 4, { serviceMin: 5 })] });
    const sol = solve(problem, travel, { seed: 1, maxIterations: 20 });
    expect(sol.unassigned[0].reason).toBe("serving it and driving back ends at 00:29, after van V1 must be back at 00:25");
  });

  it("explains a stop squeezed out by full compartments", () => {
    const problem = day({
      vehicles: [van("V1", { cleanCapacity: 3 })],
      stops: [stop("A", 1, { clean: 2 }), stop("B", 3, { clean: 2 })],
    });
    const sol = solve(problem, travel, { seed: 1, maxIterations: 50 });
    expect(sol.routes[0].stops).toHaveLength(1);
    expect(sol.unassigned).toHaveLength(1);
    expect(sol.unassigned[0].reason).toBe("no van can take it: the clean compartment is full on van V1");
  });
});

describe("solve: objective", () => {
  // East stops E1 (08:00 window) and E2 (16:00 window), a west stop W (12:00 window).
  const clustered = day({
    stops: [
      stop("E1", 1, { windows: [{ startMin: 480, endMin: 490 }] }),
      stop("W", 2, { windows: [{ startMin: 720, endMin: 730 }] }),
      stop("E2", 3, { windows: [{ startMin: 960, endMin: 970 }] }),
    ],
  });

  it("uses as few vans as possible by default, even for more kilometres", () => {
    const sol = solve(clustered, travel, { seed: 2, maxIterations: 300 });
    expect(sol.cost.vehicles).toBe(1);
    // 0 → E1 → W → E2 → 0 = 10 + 20 + √401 + √101 (computed).
    expect(sol.cost.distanceKm).toBeCloseTo(30 + Math.sqrt(401) + Math.sqrt(101), 9);
    expect(validateSolution(clustered, sol, travel)).toEqual([]);
  });

  it("takes the shortest plan when vans are not minimised", () => {
    const sol = solve(clustered, travel, { seed: 2, maxIterations: 300, minimiseVehicles: false });
    expect(sol.cost.vehicles).toBe(2);
    // 0 → E1 → E2 → 0 and 0 → W → 0 = 10 + 1 + √101 + 20 (computed).
    expect(sol.cost.distanceKm).toBeCloseTo(31 + Math.sqrt(101), 9);
  });

  it("serves a soft window late rather than leaving the stop out, and counts the penalty", () => {
    const problem = day({
      vehicles: [van("V1", { shiftStartMin: 480 })],
      stops: [stop("SOFT", 1, { windows: [{ startMin: 480, endMin: 485 }], hard: false })],
    });
    const sol = solve(problem, travel, { seed: 1, maxIterations: 20, latePenaltyPerMin: 3 });
    expect(sol.unassigned).toEqual([]);
    expect(sol.routes[0].stops[0].lateMin).toBe(5);
    expect(sol.cost).toMatchObject({ lateMin: 5, distanceKm: 20, objective: 20 + 3 * 5 });
  });

  it("can minimise drive time instead of distance", () => {
    const sol = solve(clustered, travel, { seed: 2, maxIterations: 100, objective: "driveTime" });
    expect(sol.cost.objective).toBeCloseTo(sol.cost.driveMin, 9);
  });
});

describe("solve: locks", () => {
  it("keeps locked vans, locked positions and fixed sequences", () => {
    const problem = day({
      vehicles: [van("V1", { fixedStops: ["E2", "E1"] }), van("V2")],
      stops: [
        stop("E1", 1),
        stop("W", 2, { lockedVehicle: "V1", lockedPosition: 1 }),
        stop("E2", 3),
        stop("E3", 4, { lockedVehicle: "V2" }),
        stop("W2", 5),
      ],
    });
    problem.vehicles[0].fixedStops = ["W", "E2", "E1"];
    const sol = solve(problem, travel, { seed: 4, maxIterations: 300 });
    expect(validateSolution(problem, sol, travel)).toEqual([]);
    const v1 = sol.routes.find((r) => r.vehicleId === "V1")!.stops.map((s) => s.stopId);
    const v2 = sol.routes.find((r) => r.vehicleId === "V2")!.stops.map((s) => s.stopId);
    expect(v1[0]).toBe("W");
    expect(v1.filter((id) => id === "E1" || id === "E2")).toEqual(["E2", "E1"]);
    expect(v2).toContain("E3");
  });

  it("leaves out a locked stop its van cannot serve, with the reason", () => {
    const problem = day({
      vehicles: [van("V1", { soiledCapacity: 1 }), van("V2")],
      stops: [stop("A", 1, { soiled: 1, lockedVehicle: "V1", lockedPosition: 1 }), stop("B", 2, { soiled: 1, lockedVehicle: "V1", lockedPosition: 2 })],
    });
    const sol = solve(problem, travel, { seed: 1, maxIterations: 20 });
    expect(sol.unassigned).toEqual([{ stopId: "B", reason: "it is locked as stop 2 of van V1, but the stops locked before it fill the van" }]);
    expect(validateSolution(problem, sol, travel)).toEqual([]);
  });
});

describe("solve: input", () => {
  it("lists every problem in the input with the place to fix", () => {
    const problem = day({
      vehicles: [van("V1", { shiftStartMin: 600, shiftEndMin: 500 }), van("V1")],
      stops: [
        stop("A", 1, { windows: [{ startMin: 600, endMin: 540 }] }),
        stop("A", 2, { soiled: 1.5 }),
        stop("C", 3, { lockedPosition: 2 }),
        stop("D", 4, { windows: [] }),
      ],
    });
    let error: unknown;
    try {
      solve(problem, travel, { maxIterations: 1 });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(RoutingInputError);
    expect((error as RoutingInputError).issues).toEqual([
      "vehicles[0] (V1): the shift starts at 600 after it ends at 500",
      'vehicles[1] (V1): id "V1" is used twice',
      "stops[0] (A).windows[0]: starts at 600 after it ends at 540",
      'stops[1] (A): id "A" is used twice',
      "stops[1] (A): soiled must be a whole number of carts ≥ 0",
      "stops[2] (C): lockedPosition needs lockedVehicle too",
      "stops[3] (D): give at least one time window",
    ]);
  });

  it("names the stop whose place the travel model cannot read", () => {
    const problem = day({ stops: [stop("A", 1), { ...stop("GEO", 0), location: { lat: 47.1, lon: 9.2 } }] });
    expect(() => solve(problem, travel, { maxIterations: 1 })).toThrow(/stop GEO: MatrixTravel needs a whole-number index/);
    expect(() => solve(problem, new GreatCircleTravel(), { maxIterations: 1 })).toThrow(/the unit → stop A: GreatCircleTravel needs coordinates/);
  });

  it("rejects position locks with gaps", () => {
    const problem = day({ stops: [stop("A", 1, { lockedVehicle: "V1", lockedPosition: 2 })] });
    expect(() => solve(problem, travel, { maxIterations: 1 })).toThrow(/locked positions must run 1, 2, 3/);
  });

  it("stops within its time budget when no iteration limit is given", () => {
    const problem = day({ stops: [stop("A", 1), stop("B", 2), stop("C", 3)] });
    const sol = solve(problem, travel, { seed: 1, timeBudgetMs: 150 });
    expect(sol.search!.elapsedMs).toBeGreaterThanOrEqual(150);
    expect(sol.search!.iterations).toBeGreaterThan(0);
    expect(validateSolution(problem, sol, travel)).toEqual([]);
  });
});
