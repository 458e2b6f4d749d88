import { describe, expect, it } from "vitest";
import { GreatCircleTravel, haversineKm, MatrixTravel, MEAN_EARTH_RADIUS_KM } from "@/lib/routing/geo";
import { RoutingInputError } from "@/lib/routing/errors";

const BNA = { lat: 36.12, lon: -86.67 };
const LAX = { lat: 33.94, lon: -118.4 };

describe("haversineKm", () => {
  it("matches the published Nashville–Los Angeles distance", () => {
    // Rosetta Code "Haversine formula": BNA → LAX = 2886.4444428 km with R = 6371.0 km.
    expect(haversineKm(BNA, LAX, 6371.0)).toBeCloseTo(2886.4444428, 6);
  });

  it("uses the IUGG mean radius by default and scales with the radius", () => {
    // IUGG mean Earth radius R1 = 6371.0088 km (GRS 80); distance is proportional to R.
    expect(MEAN_EARTH_RADIUS_KM).toBe(6371.0088);
    expect(haversineKm(BNA, LAX)).toBeCloseTo((2886.4444428 * 6371.0088) / 6371.0, 5);
  });

  it("is zero for the same place and symmetric", () => {
    expect(haversineKm(BNA, BNA)).toBe(0);
    expect(haversineKm(LAX, BNA)).toBeCloseTo(haversineKm(BNA, LAX), 9);
  });

  it("gives half the circumference between antipodes", () => {
    // Computed: π·R between antipodal points.
    expect(haversineKm({ lat: 0, lon: 0 }, { lat: 0, lon: 180 }, 6371)).toBeCloseTo(Math.PI * 6371, 6);
  });
});

describe("GreatCircleTravel", () => {
  it("applies the road factor and the speed", () => {
    const t = new GreatCircleTravel({ roadFactor: 1.5, speedKmh: 60, radiusKm: 6371.0 });
    const straight = haversineKm(BNA, LAX, 6371.0);
    expect(t.distanceKm(BNA, LAX)).toBeCloseTo(straight * 1.5, 9);
    expect(t.minutes(BNA, LAX)).toBeCloseTo(straight * 1.5, 9); // 60 km/h: one minute per km
  });

  it("defaults to a road factor of 1.3 at 40 km/h", () => {
    const t = new GreatCircleTravel();
    expect(t.distanceKm(BNA, LAX)).toBeCloseTo(haversineKm(BNA, LAX) * 1.3, 9);
    expect(t.minutes(BNA, LAX)).toBeCloseTo((t.distanceKm(BNA, LAX) / 40) * 60, 9);
  });

  it("refuses matrix indices and bad settings with a clear error", () => {
    const t = new GreatCircleTravel();
    expect(() => t.distanceKm(0, BNA)).toThrow(/needs coordinates/);
    expect(() => new GreatCircleTravel({ speedKmh: 0 })).toThrow(RoutingInputError);
    expect(() => new GreatCircleTravel({ roadFactor: 0.5 })).toThrow(/roadFactor/);
  });
});

describe("MatrixTravel", () => {
  const m = new MatrixTravel({
    distanceKm: [
      [0, 2, 3],
      [2, 0, 4],
      [3, 5, 0],
    ],
    minutes: [
      [0, 6, 9],
      [6, 0, 12],
      [9, 15, 0],
    ],
  });

  it("reads one-way values from the matrices", () => {
    expect(m.distanceKm(1, 2)).toBe(4);
    expect(m.distanceKm(2, 1)).toBe(5);
    expect(m.minutes(2, 1)).toBe(15);
  });

  it("names the bad index or entry", () => {
    expect(() => m.distanceKm(0, 3)).toThrow(/0 to 2, got 3/);
    expect(() => m.minutes({ lat: 1, lon: 2 }, 0)).toThrow(/whole-number index/);
    expect(() => new MatrixTravel({ distanceKm: [[0, -1], [1, 0]], minutes: [[0, 1], [1, 0]] })).toThrow(/distanceKm\[0\]\[1\]/);
    expect(() => new MatrixTravel({ distanceKm: [[0, 1], [1, 0]], minutes: [[0, 1]] })).toThrow(/2 rows/);
  });
});
