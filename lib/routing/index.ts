// The van route planner: public entry points.
export { GreatCircleTravel, haversineKm, MatrixTravel, MEAN_EARTH_RADIUS_KM } from "./geo";
export type { GreatCircleOptions, LatLon, Location, TravelMatrices, TravelModel } from "./geo";
export { RoutingFormatError, RoutingInputError } from "./errors";
export { evaluateRoute } from "./schedule";
export { solve } from "./solver";
export type { SolveOptions } from "./solver";
export { solveTsp } from "./tsp";
export type { TspOptions, TspResult } from "./tsp";
export { validateSolution } from "./validate";
export type * from "./types";
