import { describe, expect, it } from "vitest";
import { addDaysToDate, contractStatus, localDateOf, periodsOverlap, startOfLocalDate, validityInstants } from "@/lib/contracts/dates";
import { describeBand, formatMoney, suggestNextReference, turnaroundSentence } from "@/lib/contracts/format";

const LONDON = "Europe/London";

describe("validity dates as instants", () => {
  // UK summer time (UTC+1) runs from 01:00 UTC on the last Sunday of March to 01:00 UTC on the
  // last Sunday of October: 29 March and 25 October in 2026 (IANA tz database rule "EU"; the
  // dates from memory).
  it("starts a version at local midnight in winter and in summer time", () => {
    expect(startOfLocalDate("2026-01-01", LONDON).toISOString()).toBe("2026-01-01T00:00:00.000Z");
    expect(startOfLocalDate("2026-07-01", LONDON).toISOString()).toBe("2026-06-30T23:00:00.000Z");
    // The day the clocks go forward starts at 00:00 GMT; the next day at 00:00 BST.
    expect(startOfLocalDate("2026-03-29", LONDON).toISOString()).toBe("2026-03-29T00:00:00.000Z");
    expect(startOfLocalDate("2026-03-30", LONDON).toISOString()).toBe("2026-03-29T23:00:00.000Z");
  });

  it("ends a version at the local midnight after its last day (exclusive)", () => {
    expect(validityInstants("2026-07-01", "2026-10-25", LONDON)).toEqual({
      validFrom: "2026-06-30T23:00:00.000Z",
      // 26 October 2026 is after the change back to GMT.
      validTo: "2026-10-26T00:00:00.000Z",
    });
    expect(validityInstants("2026-07-01", null, LONDON).validTo).toBeNull();
  });

  it("reads the local date of an instant around midnight", () => {
    expect(localDateOf(new Date("2026-06-30T22:59:59Z"), LONDON)).toBe("2026-06-30");
    expect(localDateOf(new Date("2026-06-30T23:00:00Z"), LONDON)).toBe("2026-07-01");
    expect(localDateOf(new Date("2026-12-31T23:59:59Z"), LONDON)).toBe("2026-12-31");
    expect(addDaysToDate("2026-12-31", 1)).toBe("2027-01-01");
    expect(addDaysToDate("2028-03-01", -1)).toBe("2028-02-29");
  });
});

describe("overlap and status", () => {
  const v = (validFrom: string, validUntil: string | null) => ({ validFrom, validUntil });
  it("treats the end date as inclusive and an open end as forever", () => {
    expect(periodsOverlap(v("2026-01-01", "2026-12-31"), v("2027-01-01", null))).toBe(false);
    expect(periodsOverlap(v("2026-01-01", "2026-12-31"), v("2026-12-31", null))).toBe(true);
    expect(periodsOverlap(v("2026-01-01", null), v("2030-01-01", "2030-01-31"))).toBe(true);
    expect(periodsOverlap(v("2026-06-01", null), v("2026-01-01", "2026-05-31"))).toBe(false);
    expect(periodsOverlap(v("2026-06-01", null), v("2026-01-01", null))).toBe(true);
  });

  it("derives the status from the unit's today", () => {
    expect(contractStatus(v("2026-12-02", null), "2026-12-01")).toBe("upcoming");
    expect(contractStatus(v("2026-01-01", "2026-12-01"), "2026-12-01")).toBe("current");
    expect(contractStatus(v("2026-01-01", "2026-11-30"), "2026-12-01")).toBe("ended");
  });
});

describe("contract words", () => {
  it("says the turnaround promise in plain words", () => {
    expect(turnaroundSentence("standard", 24, "delivered")).toBe(
      "Standard: back within 24 service hours of receipt, clock stops at delivery to the clinic.",
    );
    expect(turnaroundSentence("express", 1, "released")).toBe("Express: back within 1 service hour of receipt, clock stops at release at the unit.");
  });

  it("describes bands and money", () => {
    const bands = [{ upToQuantity: 500 }, { upToQuantity: 1000 }, { upToQuantity: null }];
    expect(bands.map((_, i) => describeBand(bands, i))).toEqual(["Sets 1–500 in a month", "Sets 501–1000 in a month", "Sets 1001 and over in a month"]);
    expect(describeBand([{ upToQuantity: null }], 0)).toBe("Every set");
    expect(formatMoney(125_000, "GBP")).toBe("£1,250.00");
    expect(formatMoney(950, "EUR")).toBe("€9.50");
    expect(suggestNextReference("QMH-2026-02")).toBe("QMH-2026-03");
    expect(suggestNextReference("K-09")).toBe("K-10");
    expect(suggestNextReference("ALPHA")).toBe("ALPHA-2");
  });
});
