import { describe, expect, it } from "vitest";
import {
  addMonths,
  billingPeriod,
  continueBands,
  localDaysIn,
  monthLabel,
  monthOf,
  partAt,
  partLabel,
  proratedMinimumFee,
  splitPeriod,
} from "@/lib/billing/run-periods";

const LONDON = "Europe/London";

describe("billing months", () => {
  it("are local months as half-open instants, across the change of clocks", () => {
    // British Summer Time ends on Sunday 25 October 2026 (the last Sunday of October; from memory):
    // October starts at 23:00 UTC on 30 September and ends at midnight UTC on 1 November.
    expect(billingPeriod("2026-10", LONDON)).toEqual({ start: "2026-09-30T23:00:00.000Z", end: "2026-11-01T00:00:00.000Z" });
    expect(localDaysIn(billingPeriod("2026-10", LONDON), LONDON)).toBe(31);
    expect(localDaysIn(billingPeriod("2028-02", LONDON), LONDON)).toBe(29);
    expect(monthOf(new Date("2026-09-30T23:30:00Z"), LONDON)).toBe("2026-10");
    expect(addMonths("2026-01", -2)).toBe("2025-11");
    expect(addMonths("2026-11", 2)).toBe("2027-01");
    expect(monthLabel("2026-11")).toBe("November 2026");
  });
});

describe("a month split by a change of contract version", () => {
  const period = billingPeriod("2026-11", LONDON);
  const first = { id: 1, validFrom: "2026-06-01T00:00:00.000Z", validTo: "2026-11-15T00:00:00.000Z" };
  const second = { id: 2, validFrom: "2026-11-15T00:00:00.000Z", validTo: null };

  it("gives one part per version in force, in order, each knowing whether it covers the month", () => {
    const parts = splitPeriod(period, [second, first]);
    expect(parts.map((p) => [p.terms.id, p.start, p.end, p.wholePeriod])).toEqual([
      [1, "2026-11-01T00:00:00.000Z", "2026-11-15T00:00:00.000Z", false],
      [2, "2026-11-15T00:00:00.000Z", "2026-12-01T00:00:00.000Z", false],
    ]);
    expect(parts.map((p) => partLabel(p, LONDON))).toEqual(["1–14 Nov 2026", "15–30 Nov 2026"]);
    expect(partAt(parts, "2026-11-14T23:59:59.999Z")?.terms.id).toBe(1);
    expect(partAt(parts, "2026-11-15T00:00:00.000Z")?.terms.id).toBe(2);
    expect(splitPeriod(period, [{ id: 3, validFrom: "2026-01-01T00:00:00.000Z", validTo: null }])[0]!.wholePeriod).toBe(true);
    expect(splitPeriod(period, [{ id: 4, validFrom: "2025-01-01T00:00:00.000Z", validTo: "2026-01-01T00:00:00.000Z" }])).toEqual([]);
  });

  it("leaves a gap between versions uncovered", () => {
    const parts = splitPeriod(period, [{ ...first, validTo: "2026-11-10T00:00:00.000Z" }, second]);
    expect(partAt(parts, "2026-11-12T09:00:00.000Z")).toBeUndefined();
  });

  it("pro-rates the minimum fee by local days, rounding half away from zero", () => {
    const parts = splitPeriod(period, [first, second]);
    // 3000 × 14/30 = 1400 and 3000 × 16/30 = 1600 (worked by hand).
    expect(parts.map((p) => proratedMinimumFee(3000, p, period, LONDON))).toEqual([1400, 1600]);
    // 1000 × 14/30 = 466.67 → 467; 1000 × 16/30 = 533.33 → 533.
    expect(parts.map((p) => proratedMinimumFee(1000, p, period, LONDON))).toEqual([467, 533]);
    // 45 × 1/30 = 1.5 → 2 (a tie goes away from zero).
    const oneDay = { start: "2026-11-01T00:00:00.000Z", end: "2026-11-02T00:00:00.000Z" };
    expect(proratedMinimumFee(45, oneDay, period, LONDON)).toBe(2);
    expect(proratedMinimumFee(3000, period, period, LONDON)).toBe(3000);
  });
});

describe("volume bands continued after sets already billed in the month", () => {
  const bands = [
    { upToQuantity: 400, unitPriceMinor: 1450 },
    { upToQuantity: 1000, unitPriceMinor: 1320 },
    { upToQuantity: null, unitPriceMinor: 1210 },
  ];
  it("drops exhausted bands and moves the limits down", () => {
    expect(continueBands(bands, 0)).toEqual(bands);
    expect(continueBands(bands, 450)).toEqual([
      { upToQuantity: 550, unitPriceMinor: 1320 },
      { upToQuantity: null, unitPriceMinor: 1210 },
    ]);
    expect(continueBands(bands, 400)).toEqual([
      { upToQuantity: 600, unitPriceMinor: 1320 },
      { upToQuantity: null, unitPriceMinor: 1210 },
    ]);
    expect(continueBands(bands, 5000)).toEqual([{ upToQuantity: null, unitPriceMinor: 1210 }]);
  });
});
