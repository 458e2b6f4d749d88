// Properties of the planner on random small days (fast-check).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { evaluateRoute } from "@/lib/routing/schedule";
import { solve } from "@/lib/routing/solver";
import type { Problem, Stop, Vehicle } from "@/lib/routing/types";
import { validateSolution } from "@/lib/routing/validate";
import { planarTravel } from "./helpers";

const windowArb = fc.record({ startMin: fc.integer({ min: 0, max: 300 }), length: fc.integer({ min: 5, max: 200 }) }).map(({ startMin, length }) => ({ startMin, endMin: startMin + length }));

const stopArb = fc.record({
  x: fc.integer({ min: 0, max: 50 }),
  y: fc.integer({ min: 0, max: 50 }),
  serviceMin: fc.integer({ min: 0, max: 15 }),
  soiled: fc.integer({ min: 0, max: 3 }),
  clean: fc.integer({ min: 0, max: 3 }),
  windows: fc.array(windowArb, { minLength: 1, maxLength: 2 }),
  hard: fc.boolean(),
  /** 0: free, 1: locked to a van, 2: locked to a van and a position, 3: in a van's fixed sequence. */
  lock: fc.constantFrom(0, 0, 0, 1, 2, 3),
  lockVan: fc.nat(),
});

const vanArb = fc.record({
  soiledCapacity: fc.integer({ min: 0, max: 8 }),
  cleanCapacity: fc.integer({ min: 0, max: 8 }),
  shiftStartMin: fc.integer({ min: 0, max: 60 }),
  shiftEndMin: fc.integer({ min: 150, max: 500 }),
  breakMin: fc.option(
    fc.record({ earliestMin: fc.integer({ min: 60, max: 200 }), slack: fc.integer({ min: 0, max: 100 }), durationMin: fc.integer({ min: 0, max: 30 }) }).map((b) => ({ earliestMin: b.earliestMin, latestMin: b.earliestMin + b.slack, durationMin: b.durationMin })),
    { nil: null },
  ),
});

const dayArb = fc.record({
  depot: fc.record({ x: fc.integer({ min: 0, max: 50 }), y: fc.integer({ min: 0, max: 50 }) }),
  stops: fc.array(stopArb, { minLength: 1, maxLength: 7 }),
  vans: fc.array(vanArb, { minLength: 1, maxLength: 3 }),
  seed: fc.integer({ min: 1, max: 1000 }),
});

type Day = typeof dayArb extends fc.Arbitrary<infer D> ? D : never;

function toProblem(day: Day) {
  const vehicles: Vehicle[] = day.vans.map((v, i) => ({ id: `V${i + 1}`, ...v }));
  const positions = new Map<string, number>();
  const stops: Stop[] = day.stops.map((s, i) => {
    const out: Stop = { id: `S${i + 1}`, location: i + 1, serviceMin: s.serviceMin, soiled: s.soiled, clean: s.clean, windows: s.windows, hard: s.hard };
    const vid = vehicles[s.lockVan % vehicles.length].id;
    if (s.lock === 1) out.lockedVehicle = vid;
    if (s.lock === 2) {
      out.lockedVehicle = vid;
      const pos = (positions.get(vid) ?? 0) + 1;
      positions.set(vid, pos);
      out.lockedPosition = pos;
    }
    if (s.lock === 3) {
      const v = vehicles[s.lockVan % vehicles.length];
      v.fixedStops = [...(v.fixedStops ?? []), out.id];
    }
    return out;
  });
  const problem: Problem = { depot: { location: 0, openMin: 0, closeMin: 600 }, vehicles, stops };
  const travel = planarTravel([day.depot, ...day.stops], 1.5);
  return { problem, travel };
}

const opts = (seed: number) => ({ seed, maxIterations: 60 });

describe("planner properties on random small days", () => {
  it("keeps every rule it reports as met and accounts for every stop once", () => {
    const tally = { routed: 0, left: 0, locked: 0, late: 0, breaks: 0 };
    fc.assert(
      fc.property(dayArb, (day) => {
        const { problem, travel } = toProblem(day);
        const sol = solve(problem, travel, opts(day.seed));
        expect(validateSolution(problem, sol, travel)).toEqual([]);
        const routed = sol.routes.flatMap((r) => r.stops.map((s) => s.stopId));
        const left = sol.unassigned.map((u) => u.stopId);
        expect([...routed, ...left].sort()).toEqual(problem.stops.map((s) => s.id).sort());
        for (const u of sol.unassigned) expect(u.reason.length).toBeGreaterThan(10);
        tally.routed += routed.length;
        tally.left += left.length;
        tally.locked += problem.stops.filter((s) => s.lockedVehicle || problem.vehicles.some((v) => v.fixedStops?.includes(s.id))).length;
        tally.late += sol.routes.reduce((a, r) => a + r.stops.filter((x) => x.lateMin > 0).length, 0);
        tally.breaks += sol.routes.filter((r) => r.break).length;
      }),
      { numRuns: 150, seed: 20261201 },
    );
    // The generated days exercise what the property is about: stops routed and left out, locks,
    // soft-window lateness and breaks.
    expect(tally.routed).toBeGreaterThan(50);
    expect(tally.left).toBeGreaterThan(10);
    expect(tally.locked).toBeGreaterThan(20);
    expect(tally.late).toBeGreaterThan(0);
    expect(tally.breaks).toBeGreaterThan(5);
  });

  it("gives the same plan for the same seed", () => {
    fc.assert(
      fc.property(dayArb, (day) => {
        const { problem, travel } = toProblem(day);
        const a = solve(problem, travel, opts(day.seed));
        const b = solve(problem, travel, opts(day.seed));
        expect({ ...b, search: undefined }).toEqual({ ...a, search: undefined });
      }),
      { numRuns: 25, seed: 7 },
    );
  });

  it("leaves out a stop only when no place in any run (or an unused van) can take it", () => {
    fc.assert(
      fc.property(dayArb, (day) => {
        const { problem, travel } = toProblem(day);
        const sol = solve(problem, travel, opts(day.seed));
        for (const u of sol.unassigned) {
          for (const v of problem.vehicles) {
            const ids = sol.routes.find((r) => r.vehicleId === v.id)?.stops.map((s) => s.stopId) ?? [];
            for (let k = 0; k <= ids.length; k++) {
              const trial = [...ids.slice(0, k), u.stopId, ...ids.slice(k)];
              expect(evaluateRoute(problem, travel, v.id, trial).violations.length).toBeGreaterThan(0);
            }
          }
        }
      }),
      { numRuns: 40, seed: 99 },
    );
  });
});
