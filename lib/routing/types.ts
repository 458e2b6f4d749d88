// The shapes of a day's van-run planning problem and of a proposed plan.
//
// Times are minutes from midnight of the planning day (values past 1440 run into the next day).
// A plan from the planner is a proposal: the dispatcher checks it against the unit's own
// procedures, the vans and the drivers' rules before it is used.
import type { Location } from "./geo";

export type { LatLon, Location } from "./geo";

export interface TimeWindow {
  startMin: number;
  endMin: number;
}

export interface Depot {
  location: Location;
  openMin: number;
  /** Vans must be back (and any break on the way back finished) by this time. */
  closeMin: number;
}

/** A driver break: it starts between `earliestMin` and `latestMin` and lasts `durationMin`. */
export interface DriverBreak {
  earliestMin: number;
  latestMin: number;
  durationMin: number;
}

export interface Vehicle {
  id: string;
  /** Closed carts the soiled compartment holds. */
  soiledCapacity: number;
  /** Closed carts the clean compartment holds. */
  cleanCapacity: number;
  shiftStartMin: number;
  shiftEndMin: number;
  breakMin?: DriverBreak | null;
  /** Stops this van must serve in this relative order; other stops may be placed between them. */
  fixedStops?: string[];
}

export interface Stop {
  id: string;
  location: Location;
  /** Minutes spent at the stop (parking, handover, scanning). */
  serviceMin: number;
  /** Soiled carts collected here. */
  soiled: number;
  /** Clean carts delivered here. */
  clean: number;
  /** One or more windows; the stop is on time when service starts inside one of them. */
  windows: TimeWindow[];
  /** A hard window may not be missed; a soft one may be, at a lateness penalty. */
  hard: boolean;
  /** Only this van may serve the stop. */
  lockedVehicle?: string;
  /** 1-based place in the locked van's run; locked places on one van must be 1, 2, … without gaps. */
  lockedPosition?: number;
}

export interface Problem {
  depot: Depot;
  vehicles: Vehicle[];
  stops: Stop[];
}

export interface RouteStop {
  stopId: string;
  /** When the van is at the stop and the driver is free (after the drive and any break on the way). */
  arrivalMin: number;
  /** When service starts: the arrival, or the opening of the next window. */
  startMin: number;
  waitMin: number;
  departMin: number;
  /** Minutes after the end of the last window (0 when on time). */
  lateMin: number;
  /** Soiled carts on board when leaving the stop. */
  soiledLoad: number;
  /** Clean carts on board when leaving the stop. */
  cleanLoad: number;
}

/** The break as scheduled: it is taken on the drive to `beforeStopId` (null: on the way back to the unit). */
export interface ScheduledBreak {
  startMin: number;
  endMin: number;
  beforeStopId: string | null;
}

export interface Route {
  vehicleId: string;
  /** Leaving the unit, with every clean cart of the run on board. */
  departMin: number;
  stops: RouteStop[];
  break: ScheduledBreak | null;
  /** Back at the unit. */
  endMin: number;
  distanceKm: number;
  driveMin: number;
  lateMin: number;
  soiledCarts: number;
  cleanCarts: number;
}

export interface UnassignedStop {
  stopId: string;
  reason: string;
}

/** Levels of the objective, compared in order: unassigned stops, then vans used, then `objective`. */
export interface SolutionCost {
  unassigned: number;
  vehicles: number;
  distanceKm: number;
  driveMin: number;
  lateMin: number;
  /** Travel (distance or drive time, as chosen) plus the lateness penalty of soft windows. */
  objective: number;
}

/**
 * A proposed day plan. Advisory only: it meets the rules given to the planner, and the
 * dispatcher, the drivers' working-time rules and local regulations have the last word.
 */
export interface Solution {
  routes: Route[];
  unassigned: UnassignedStop[];
  cost: SolutionCost;
  /** How long the planner searched (absent on plans not made by it). */
  search?: { iterations: number; elapsedMs: number; seed: number };
}

export type ViolationRule =
  | "unknown-vehicle"
  | "duplicate-route"
  | "unknown-stop"
  | "stop-repeated"
  | "stop-missing"
  | "no-reason"
  | "soiled-capacity"
  | "clean-capacity"
  | "load-report"
  | "shift-start"
  | "shift-end"
  | "hard-window"
  | "schedule"
  | "break"
  | "locked-vehicle"
  | "locked-position"
  | "fixed-sequence"
  | "distance"
  | "cost-report";

/** One broken rule of a plan, worded for the dispatcher. */
export interface Violation {
  rule: ViolationRule;
  vehicleId?: string;
  stopId?: string;
  message: string;
}

/** A route as computed from a stop sequence, with every rule it breaks (empty when it keeps them all). */
export interface RouteEvaluation {
  route: Route;
  violations: Violation[];
}

export type RoutingObjective = "distance" | "driveTime";

export interface CostOptions {
  /** Travel term of the objective: kilometres (default) or drive minutes. */
  objective?: RoutingObjective;
  /** Cost units (km or minutes, as the objective) per minute late at a soft window; default 5. */
  latePenaltyPerMin?: number;
}
