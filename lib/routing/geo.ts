// Distances and travel times between stops.
import { RoutingInputError } from "./errors";

/** IUGG mean Earth radius R1 (Moritz, Geodetic Reference System 1980). */
export const MEAN_EARTH_RADIUS_KM = 6371.0088;

export interface LatLon {
  lat: number;
  lon: number;
}

/** A place: coordinates in degrees, or an index into a precomputed travel matrix. */
export type Location = LatLon | number;

/** Answers how far and how long between two places; a road-network matrix can stand in for the estimate. */
export interface TravelModel {
  distanceKm(a: Location, b: Location): number;
  minutes(a: Location, b: Location): number;
}

const toRad = (deg: number) => (deg * Math.PI) / 180;

// Great-circle distance by the haversine formula.
export function haversineKm(a: LatLon, b: LatLon, radiusKm: number = MEAN_EARTH_RADIUS_KM): number {
  const dLat = toRad(b.lat - a.lat);
  const dLon = toRad(b.lon - a.lon);
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(toRad(a.lat)) * Math.cos(toRad(b.lat)) * Math.sin(dLon / 2) ** 2;
  return 2 * radiusKm * Math.asin(Math.min(1, Math.sqrt(h)));
}

function asLatLon(loc: Location, model: string): LatLon {
  if (typeof loc === "number") {
    throw new RoutingInputError([`${model} needs coordinates {lat, lon}, but got the matrix index ${loc}`]);
  }
  return loc;
}

export interface GreatCircleOptions {
  /** Road distance ÷ straight-line distance; 1.3 is a common rule of thumb for towns, not a measured value. */
  roadFactor?: number;
  /** Average speed door to door, in km/h. */
  speedKmh?: number;
  radiusKm?: number;
}

/** Estimates road distance as the great-circle distance times a road factor, at a constant speed. */
export class GreatCircleTravel implements TravelModel {
  readonly roadFactor: number;
  readonly speedKmh: number;
  readonly radiusKm: number;

  constructor({ roadFactor = 1.3, speedKmh = 40, radiusKm = MEAN_EARTH_RADIUS_KM }: GreatCircleOptions = {}) {
    const issues: string[] = [];
    if (!(roadFactor >= 1) || !Number.isFinite(roadFactor)) issues.push(`roadFactor must be a number of at least 1, got ${roadFactor}`);
    if (!(speedKmh > 0) || !Number.isFinite(speedKmh)) issues.push(`speedKmh must be a positive number, got ${speedKmh}`);
    if (!(radiusKm > 0) || !Number.isFinite(radiusKm)) issues.push(`radiusKm must be a positive number, got ${radiusKm}`);
    if (issues.length > 0) throw new RoutingInputError(issues);
    this.roadFactor = roadFactor;
    this.speedKmh = speedKmh;
    this.radiusKm = radiusKm;
  }

  distanceKm(a: Location, b: Location): number {
    return haversineKm(asLatLon(a, "GreatCircleTravel"), asLatLon(b, "GreatCircleTravel"), this.radiusKm) * this.roadFactor;
  }

  minutes(a: Location, b: Location): number {
    return (this.distanceKm(a, b) / this.speedKmh) * 60;
  }
}

export interface TravelMatrices {
  /** distanceKm[i][j]: from place i to place j (need not be symmetric). */
  distanceKm: readonly (readonly number[])[];
  /** minutes[i][j]: driving time from place i to place j. */
  minutes: readonly (readonly number[])[];
}

/** Travel read from precomputed matrices (a road-network answer); places are matrix indices. */
export class MatrixTravel implements TravelModel {
  readonly size: number;
  private readonly dist: Float64Array;
  private readonly time: Float64Array;

  constructor({ distanceKm, minutes }: TravelMatrices) {
    const n = distanceKm.length;
    const issues: string[] = [];
    if (minutes.length !== n) issues.push(`the distance matrix has ${n} rows but the time matrix has ${minutes.length}`);
    this.size = n;
    this.dist = new Float64Array(n * n);
    this.time = new Float64Array(n * n);
    for (let i = 0; i < n && issues.length < 10; i++) {
      const dRow = distanceKm[i];
      const tRow = minutes[i] ?? [];
      if (dRow.length !== n || tRow.length !== n) {
        issues.push(`row ${i} must have ${n} entries in both matrices (has ${dRow.length} and ${tRow.length})`);
        continue;
      }
      for (let j = 0; j < n; j++) {
        const d = dRow[j];
        const t = tRow[j];
        if (!(d >= 0) || !Number.isFinite(d)) issues.push(`distanceKm[${i}][${j}] must be a finite number ≥ 0, got ${d}`);
        if (!(t >= 0) || !Number.isFinite(t)) issues.push(`minutes[${i}][${j}] must be a finite number ≥ 0, got ${t}`);
        this.dist[i * n + j] = d;
        this.time[i * n + j] = t;
      }
    }
    if (issues.length > 0) throw new RoutingInputError(issues);
  }

  /** Builds both matrices from points with one distance function and a constant speed (minutes = km ÷ speed × 60, or = distance when `minutesPerUnit` is 1). */
  static fromPoints<P>(points: readonly P[], distance: (a: P, b: P) => number, minutesPerUnit = 1): MatrixTravel {
    const d = points.map((a) => points.map((b) => distance(a, b)));
    return new MatrixTravel({ distanceKm: d, minutes: d.map((row) => row.map((x) => x * minutesPerUnit)) });
  }

  private index(loc: Location): number {
    if (typeof loc !== "number" || !Number.isInteger(loc) || loc < 0 || loc >= this.size) {
      throw new RoutingInputError([
        `MatrixTravel needs a whole-number index from 0 to ${this.size - 1}, got ${typeof loc === "number" ? loc : JSON.stringify(loc)}`,
      ]);
    }
    return loc;
  }

  distanceKm(a: Location, b: Location): number {
    return this.dist[this.index(a) * this.size + this.index(b)];
  }

  minutes(a: Location, b: Location): number {
    return this.time[this.index(a) * this.size + this.index(b)];
  }
}
