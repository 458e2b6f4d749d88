import { describe, expect, it } from "vitest";
import { RoutingInputError } from "@/lib/routing/errors";
import { MatrixTravel } from "@/lib/routing/geo";
import { evaluateRoute } from "@/lib/routing/schedule";
import { solve } from "@/lib/routing/solver";
import type { Problem, Solution } from "@/lib/routing/types";
import { validateSolution } from "@/lib/routing/validate";
import { stop, van } from "./helpers";

// Hand-made legs (minutes; km are half the minutes): unit 0, stop A at 1, stop B at 2, stop C at 3.
const minutes = [
  [0, 10, 20, 30],
  [10, 0, 15, 25],
  [20, 15, 0, 12],
  [30, 25, 12, 0],
];
const travel = new MatrixTravel({ distanceKm: minutes.map((r) => r.map((x) => x / 2)), minutes });

function problem(overrides: { a?: object; b?: object; c?: object; v1?: object } = {}): Problem {
  return {
    depot: { location: 0, openMin: 360, closeMin: 1200 },
    vehicles: [van("V1", { soiledCapacity: 3, cleanCapacity: 4, shiftStartMin: 480, shiftEndMin: 1000, ...overrides.v1 }), van("V2", { soiledCapacity: 1, cleanCapacity: 1 })],
    stops: [
      stop("A", 1, { serviceMin: 10, soiled: 2, clean: 1, windows: [{ startMin: 500, endMin: 560 }], ...overrides.a }),
      stop("B", 2, { serviceMin: 5, clean: 3, windows: [{ startMin: 520, endMin: 530 }], ...overrides.b }),
      stop("C", 3, { serviceMin: 0, soiled: 2, ...overrides.c }),
    ],
  };
}

describe("evaluateRoute", () => {
  it("computes arrival, waiting, service, loads and totals of a run (hand-computed)", () => {
    const { route, violations } = evaluateRoute(problem(), travel, "V1", ["A", "B"]);
    expect(violations).toEqual([]);
    // The shift starts at 480, but A opens at 500 and is 10 min away: the van leaves at 490 rather
    // than waiting at A. A: arrive 500, leave 510. B: arrive 525, leave 530. Back 530 + 20 = 550.
    expect(route.departMin).toBe(490);
    expect(route.stops).toEqual([
      { stopId: "A", arrivalMin: 500, startMin: 500, waitMin: 0, departMin: 510, lateMin: 0, soiledLoad: 2, cleanLoad: 3 },
      { stopId: "B", arrivalMin: 525, startMin: 525, waitMin: 0, departMin: 530, lateMin: 0, soiledLoad: 2, cleanLoad: 0 },
    ]);
    expect(route).toMatchObject({ endMin: 550, driveMin: 45, distanceKm: 22.5, lateMin: 0, soiledCarts: 2, cleanCarts: 4, break: null });
  });

  it("reports a missed hard window, and only lateness for a soft one", () => {
    const hard = evaluateRoute(problem({ b: { windows: [{ startMin: 495, endMin: 500 }] } }), travel, "V1", ["A", "B"]);
    expect(hard.violations.map((v) => v.rule)).toEqual(["hard-window"]);
    expect(hard.violations[0].message).toBe("Stop B is reached at 08:45, after its window 08:15–08:20.");
    const soft = evaluateRoute(problem({ b: { windows: [{ startMin: 495, endMin: 500 }], hard: false } }), travel, "V1", ["A", "B"]);
    expect(soft.violations).toEqual([]);
    expect(soft.route.stops[1].lateMin).toBe(25);
    expect(soft.route.lateMin).toBe(25);
  });

  it("waits for the next window when the van arrives between two", () => {
    const p = problem({ b: { windows: [{ startMin: 600, endMin: 700 }, { startMin: 400, endMin: 450 }] } });
    const { route, violations } = evaluateRoute(p, travel, "V1", ["A", "B"]);
    expect(violations).toEqual([]);
    expect(route.stops[1]).toMatchObject({ arrivalMin: 525, startMin: 600, waitMin: 75 });
  });

  it("checks each compartment against its own capacity", () => {
    // Soiled: A 2 + C 2 = 4 > 3. Clean: A 1 + B 3 = 4 fits 4 exactly.
    const over = evaluateRoute(problem({ b: { windows: [{ startMin: 0, endMin: 900 }] } }), travel, "V1", ["A", "B", "C"]);
    expect(over.violations.map((v) => v.rule)).toEqual(["soiled-capacity"]);
    const clean = evaluateRoute(problem({ v1: { cleanCapacity: 3 } }), travel, "V1", ["A", "B"]);
    expect(clean.violations.map((v) => v.rule)).toEqual(["clean-capacity"]);
    expect(clean.violations[0].message).toContain("must load 4 clean carts but its clean compartment holds 3");
  });

  it("reports a return after the shift end", () => {
    const { violations } = evaluateRoute(problem({ v1: { shiftEndMin: 540 } }), travel, "V1", ["A", "B"]);
    expect(violations.map((v) => v.rule)).toEqual(["shift-end"]);
    expect(violations[0].message).toContain("back at 09:10, after 09:00");
  });

  it("puts the break on the leg that keeps the windows and returns earliest (hand-computed)", () => {
    // Break 30 min, starting 08:25–08:35. On the first leg A starts at 08:55 and the van is back
    // at 09:45; on the leg to B it starts when leaving A at 08:30, B is reached at 09:15, back 09:40.
    const p = problem({ b: { windows: [{ startMin: 520, endMin: 600 }] }, v1: { breakMin: { earliestMin: 505, latestMin: 515, durationMin: 30 } } });
    const { route, violations } = evaluateRoute(p, travel, "V1", ["A", "B"]);
    expect(violations).toEqual([]);
    expect(route.break).toEqual({ startMin: 510, endMin: 540, beforeStopId: "B" });
    expect(route.stops[1]).toMatchObject({ arrivalMin: 555, startMin: 555 });
    expect(route.endMin).toBe(580);
  });

  it("takes the break on the way back when the run is done before it", () => {
    const p = problem({ v1: { breakMin: { earliestMin: 600, latestMin: 700, durationMin: 30 } } });
    const { route, violations } = evaluateRoute(p, travel, "V1", ["A"]);
    expect(violations).toEqual([]);
    expect(route.break).toEqual({ startMin: 600, endMin: 630, beforeStopId: null });
    expect(route.endMin).toBe(630);
  });

  it("leaves late enough to arrive as the break ends, but keeps the break's latest start (hand-computed)", () => {
    // A opens at 10:00, 10 min from the unit; the shift starts at 08:00 and the 30 min break
    // starts 08:20–10:00. Leaving at 09:20 the break is 09:20–09:50 and A is reached at 10:00.
    const late = problem({ a: { windows: [{ startMin: 600, endMin: 700 }] }, v1: { breakMin: { earliestMin: 500, latestMin: 600, durationMin: 30 } } });
    const one = evaluateRoute(late, travel, "V1", ["A"]);
    expect(one.violations).toEqual([]);
    expect(one.route).toMatchObject({ departMin: 560, break: { startMin: 560, endMin: 590, beforeStopId: "A" }, endMin: 620 });
    expect(one.route.stops[0]).toMatchObject({ arrivalMin: 600, startMin: 600, waitMin: 0 });
    // With the break to start by 08:40, the van leaves at 08:40 and waits 40 min at A.
    const early = problem({ a: { windows: [{ startMin: 600, endMin: 700 }] }, v1: { breakMin: { earliestMin: 500, latestMin: 520, durationMin: 30 } } });
    const two = evaluateRoute(early, travel, "V1", ["A"]);
    expect(two.violations).toEqual([]);
    expect(two.route).toMatchObject({ departMin: 520, break: { startMin: 520, endMin: 550, beforeStopId: "A" } });
    expect(two.route.stops[0]).toMatchObject({ arrivalMin: 560, startMin: 600, waitMin: 40 });
    expect(validateSolution(early, { ...structuredClone(solve(early, travel, { seed: 1, maxIterations: 50 })) }, travel)).toEqual([]);
  });

  it("reports a break that cannot start in time", () => {
    const p = problem({ v1: { breakMin: { earliestMin: 400, latestMin: 470, durationMin: 15 } } });
    const { violations } = evaluateRoute(p, travel, "V1", ["A"]);
    expect(violations.map((v) => v.rule)).toEqual(["break"]);
  });

  it("reports broken locks", () => {
    const p = problem({ a: { lockedVehicle: "V2" }, c: { lockedVehicle: "V1", lockedPosition: 1 } });
    p.vehicles[0].fixedStops = ["C", "B"];
    p.stops[1].windows = [{ startMin: 0, endMin: 900 }];
    const { violations } = evaluateRoute(p, travel, "V1", ["A", "B", "C"]);
    expect(violations.map((v) => v.rule).sort()).toEqual(["fixed-sequence", "locked-position", "locked-vehicle", "soiled-capacity"]);
  });

  it("rejects unknown vans and stops with the place to fix", () => {
    expect(() => evaluateRoute(problem(), travel, "V9", ["A"])).toThrow(/van "V9" is not one of the vans/);
    expect(() => evaluateRoute(problem(), travel, "V1", ["A", "Z", "A"])).toThrow(RoutingInputError);
    expect(() => evaluateRoute(problem(), travel, "V1", ["A", "Z", "A"])).toThrow(/stop 2 of the run: "Z"[\s\S]*stop 3 of the run: "A" is already/);
  });
});

describe("validateSolution", () => {
  const p = problem({ b: { windows: [{ startMin: 520, endMin: 600 }] }, v1: { breakMin: { earliestMin: 505, latestMin: 515, durationMin: 30 } } });
  p.vehicles[1].soiledCapacity = 2;
  const base = solve(p, travel, { seed: 1, maxIterations: 200 });
  const copy = (): Solution => structuredClone(base);
  const rules = (s: Solution, withTravel = true) => validateSolution(p, s, withTravel ? travel : undefined).map((v) => v.rule);

  it("finds nothing wrong with the planner's own plan", () => {
    expect(base.unassigned).toEqual([]);
    expect(rules(base)).toEqual([]);
  });

  it("finds missing, repeated and unexplained stops", () => {
    const a = copy();
    const r = a.routes.find((x) => x.stops.length > 0)!;
    const gone = r.stops.pop()!;
    expect(rules(a)).toContain("stop-missing");
    a.unassigned.push({ stopId: gone.stopId, reason: " " });
    expect(rules(a)).toContain("no-reason");
    const b = copy();
    b.unassigned.push({ stopId: b.routes[0].stops[0].stopId, reason: "dispatcher's choice" });
    expect(rules(b)).toContain("stop-repeated");
    const c = copy();
    c.unassigned.push({ stopId: "Q", reason: "x" });
    expect(rules(c)).toContain("unknown-stop");
  });

  it("finds a van over capacity, an unknown van and a run given twice", () => {
    const small = structuredClone(p);
    small.vehicles.forEach((v) => (v.soiledCapacity = 1));
    expect(validateSolution(small, base, travel).map((v) => v.rule)).toContain("soiled-capacity");
    const b = copy();
    b.routes[0].vehicleId = "V7";
    expect(rules(b)).toContain("unknown-vehicle");
    const c = copy();
    c.routes.push(structuredClone(c.routes[0]));
    expect(rules(c)).toContain("duplicate-route");
  });

  it("finds times that break a window, the shift or the drives", () => {
    const r = () => {
      const s = copy();
      return { s, route: s.routes.find((x) => x.vehicleId === "V1")! };
    };
    const a = copy();
    const atA = a.routes.flatMap((x) => x.stops).find((x) => x.stopId === "A")!;
    atA.startMin = 300;
    atA.arrivalMin = 300;
    expect(rules(a)).toEqual(expect.arrayContaining(["hard-window", "schedule"]));
    const b = r();
    b.route.endMin = 1100;
    expect(rules(b.s)).toContain("shift-end");
    const c = r();
    c.route.stops[c.route.stops.length - 1].arrivalMin -= 5;
    c.route.stops[c.route.stops.length - 1].startMin -= 5;
    c.route.stops[c.route.stops.length - 1].departMin -= 5;
    expect(rules(c.s, false)).not.toContain("schedule");
    expect(rules(c.s)).toContain("schedule");
    const d = r();
    d.route.distanceKm += 1;
    expect(rules(d.s)).toEqual(expect.arrayContaining(["distance", "cost-report"]));
    const e = r();
    e.route.stops[0].soiledLoad += 1;
    expect(rules(e.s)).toContain("load-report");
  });

  it("finds a missing or misplaced break", () => {
    const a = copy();
    const r = a.routes.find((x) => x.vehicleId === "V1")!;
    r.break = null;
    expect(rules(a)).toContain("break");
    const b = copy();
    b.routes.find((x) => x.vehicleId === "V1")!.break!.startMin = 600;
    expect(rules(b)).toContain("break");
  });

  it("finds a stop on a van it is not locked to", () => {
    const locked = structuredClone(p);
    const onV1 = base.routes.find((x) => x.vehicleId === "V1")!.stops[0].stopId;
    locked.stops.find((s) => s.id === onV1)!.lockedVehicle = "V2";
    expect(validateSolution(locked, base, travel).map((v) => v.rule)).toContain("locked-vehicle");
  });
});
