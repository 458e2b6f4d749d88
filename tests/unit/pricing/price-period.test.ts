import { describe, expect, it } from "vitest";
import { PricingError } from "@/lib/pricing/errors";
import { calendarMonthPeriod } from "@/lib/pricing/period";
import { priceInvoicePeriod } from "@/lib/pricing/price-period";
import type { PricedCycleInput } from "@/lib/pricing/types";
import { MARCH_2026, NO_FLAGS, basicTrays, cycle, makeTerms } from "./fixtures";

function expectPricingError(run: () => unknown, code: string, ...fragments: string[]): PricingError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(PricingError);
    const pricingError = error as PricingError;
    expect(pricingError.code).toBe(code);
    for (const fragment of fragments) expect(pricingError.message).toContain(fragment);
    return pricingError;
  }
  throw new Error(`expected a PricingError ${code}`);
}

describe("graduated volume bands", () => {
  it("prices each band at its own rate across the boundaries", () => {
    // Worked by hand, bands 1–500 @ 9.50, 501–1000 @ 8.90, over 1000 @ 8.20, 1,120 basic trays:
    //   500 × 950 = 475,000; 500 × 890 = 445,000; 120 × 820 = 98,400
    //   total 475,000 + 445,000 + 98,400 = 1,018,400 minor units (£10,184.00).
    // Graduated ("each band at its own rate") volume pricing: common practice.
    const result = priceInvoicePeriod(makeTerms(), basicTrays(1120), MARCH_2026);
    expect(result.lines.map((line) => [line.quantity, line.unitPriceMinor, line.netAmountMinor])).toEqual([
      [500, 950, 475_000],
      [500, 890, 445_000],
      [120, 820, 98_400],
    ]);
    expect(result.summary.processingMinor).toBe(1_018_400);
    expect(result.summary.netMinor).toBe(1_018_400);
    expect(result.lines.map((line) => line.description)).toEqual([
      "Basic tray, sets 1–500 in the period",
      "Basic tray, sets 501–1000 in the period",
      "Basic tray, sets 1001 and over in the period",
    ]);
    // Sets are counted in delivery order: the 500th delivered is the last of band 1.
    expect(result.lines[0].cycleIds.at(-1)).toBe("C0500");
    expect(result.lines[1].cycleIds[0]).toBe("C0501");
    expect(result.lines[2].cycleIds).toHaveLength(120);
    expect(result.cycles.find((c) => c.cycleId === "C1001")).toMatchObject({ volumePosition: 1001, bandIndex: 2, feeMinor: 820 });
  });

  it("puts exactly 500 sets in the first band and the 501st in the second", () => {
    const atLimit = priceInvoicePeriod(makeTerms(), basicTrays(500), MARCH_2026);
    expect(atLimit.lines.map((line) => [line.quantity, line.unitPriceMinor])).toEqual([[500, 950]]);
    const oneOver = priceInvoicePeriod(makeTerms(), basicTrays(501), MARCH_2026);
    // 500 × 950 + 1 × 890 = 475,890 (by hand)
    expect(oneOver.summary.processingMinor).toBe(475_890);
  });

  it("counts by delivery time, not by input order", () => {
    const trays = basicTrays(501);
    const reversed = [...trays].reverse();
    const result = priceInvoicePeriod(makeTerms(), reversed, MARCH_2026);
    expect(result.lines[1].cycleIds).toEqual(["C0501"]);
  });

  it("starts the bands again in each month", () => {
    const london = "Europe/London";
    const march = calendarMonthPeriod("2026-03", london);
    const april = calendarMonthPeriod("2026-04", london);
    // UK summer time starts at 01:00 GMT on the last Sunday of March, 29 March 2026 (from memory;
    // the IANA tz database encodes it), so April begins at 2026-03-31T23:00Z.
    expect(march).toEqual({ start: "2026-03-01T00:00:00.000Z", end: "2026-03-31T23:00:00.000Z" });
    expect(april.start).toBe("2026-03-31T23:00:00.000Z");

    const marchCycles = basicTrays(600, "M");
    const aprilCycles = [
      ...basicTrays(99, "A").map((c, i) => ({ ...c, deliveredAt: new Date(Date.UTC(2026, 3, 2) + i * 60_000).toISOString() })),
      // 00:30 on 1 April in London, still 31 March in UTC: an April set.
      { ...cycle("A-midnight", "basic_tray", 0), deliveredAt: "2026-03-31T23:30:00Z" },
    ];
    // March: 500 × 950 + 100 × 890 = 475,000 + 89,000 = 564,000 (by hand).
    expect(priceInvoicePeriod(makeTerms(), marchCycles, march).summary.processingMinor).toBe(564_000);
    // April starts from the first band again: 100 × 950 = 95,000.
    const aprilResult = priceInvoicePeriod(makeTerms(), aprilCycles, april);
    expect(aprilResult.lines.map((line) => [line.quantity, line.unitPriceMinor])).toEqual([[100, 950]]);
    expect(aprilResult.lines[0].cycleIds[0]).toBe("A-midnight");
  });

  it("refuses a cycle delivered outside the period", () => {
    const late = { ...cycle("C-april", "basic_tray", 0), deliveredAt: "2026-04-01T00:00:00Z" };
    expectPricingError(() => priceInvoicePeriod(makeTerms(), [late], MARCH_2026), "outside_period", "C-april");
  });
});

describe("surcharges", () => {
  it("prices every surcharge kind, fixed or as a share of the set's fee", () => {
    const flags = (partial: Partial<typeof NO_FLAGS>) => ({ ...NO_FLAGS, ...partial });
    const cycles: PricedCycleInput[] = [
      cycle("X1", "major_tray", 1, { serviceLevel: "express" }),
      cycle("X2", "major_tray", 2, { serviceLevel: "express", flags: flags({ heavySoil: true }) }),
      cycle("X3", "major_tray", 3, { flags: flags({ outOfHours: true, heavySoil: true }) }),
      cycle("X4", "rigid_container", 4, { flags: flags({ heavySoil: true, missingInstrumentInvestigation: true }) }),
      cycle("X5", "single_pouch", 5, { flags: flags({ lowTemperature: true }) }),
      cycle("X6", "major_tray", 6, { flags: flags({ lowTemperature: true }) }),
      cycle("X7", "loaner_set", 7, { flags: flags({ loaner: true }) }),
    ];
    const result = priceInvoicePeriod(makeTerms(), cycles, MARCH_2026);
    const surcharges = result.lines.filter((line) => line.kind === "surcharge");
    // Worked by hand:
    //   express 50 % of the fees of X1, X2: (2450 + 2450) × 0.50 = 2450, one lump-sum line
    //   out of hours 1 × 1500 = 1500
    //   heavy soil 3 × 350 = 1050
    //   missing-instrument investigation 1 × 2500 = 2500
    //   low temperature 20 % of (180 + 2450) = 2630 × 0.20 = 526
    //   loaner handling 1 × 1800 = 1800
    expect(
      surcharges.map((line) => [line.itemCode, line.quantity, line.unitPriceMinor, line.netAmountMinor, line.cycleIds]),
    ).toEqual([
      ["surcharge:express", 1, 2450, 2450, ["X1", "X2"]],
      ["surcharge:out_of_hours", 1, 1500, 1500, ["X3"]],
      ["surcharge:heavy_soil", 3, 350, 1050, ["X2", "X3", "X4"]],
      ["surcharge:missing_instrument_investigation", 1, 2500, 2500, ["X4"]],
      ["surcharge:low_temperature", 1, 526, 526, ["X5", "X6"]],
      ["surcharge:loaner", 1, 1800, 1800, ["X7"]],
    ]);
    expect(surcharges[0].unitCode).toBe("LS");
    expect(surcharges[0].note).toBe("50 % of 49.00 GBP processing fees of 2 set(s)");
    // 2450 + 1500 + 1050 + 2500 + 526 + 1800 = 9826
    expect(result.summary.surchargesMinor).toBe(9826);
    // Processing: 4 × 2450 + 3100 + 180 + 4200 = 9800 + 7480 = 17,280
    expect(result.summary.processingMinor).toBe(17_280);
    expect(result.summary.netMinor).toBe(17_280 + 9826);
    expect(result.cycles.find((c) => c.cycleId === "X2")?.surcharges).toEqual(["express", "heavy_soil"]);
  });

  it("rounds a percentage surcharge half away from zero on the sum of fees", () => {
    // 15 % of 3 × 950 = 2850 × 0.15 = 427.5 → 428, rounded once on the sum (by hand; commercial
    // rounding, half away from zero, is common practice). Truncation would give 427.
    const terms = makeTerms();
    terms.rateCard.surcharges = [{ kind: "express", basis: "percent_of_fee", basisPoints: 1500 }];
    const express = basicTrays(3).map((c) => ({ ...c, serviceLevel: "express" as const }));
    const result = priceInvoicePeriod(terms, express, MARCH_2026);
    expect(result.lines.find((line) => line.kind === "surcharge")?.netAmountMinor).toBe(428);

    // A class priced at 5 minor units, surcharged 10 %: 0.5 → 1; truncation or half-to-even give 0.
    terms.rateCard.classes.push({ setClass: "swab_pack", label: "Swab pack", bands: [{ upToQuantity: null, unitPriceMinor: 5 }] });
    terms.rateCard.surcharges = [{ kind: "express", basis: "percent_of_fee", basisPoints: 1000 }];
    const tiny = priceInvoicePeriod(terms, [cycle("S1", "swab_pack", 1, { serviceLevel: "express" })], MARCH_2026);
    expect(tiny.lines.find((line) => line.kind === "surcharge")?.netAmountMinor).toBe(1);
  });

  it("charges nothing, and warns, for a flag the contract does not price", () => {
    const terms = makeTerms();
    terms.rateCard.surcharges = terms.rateCard.surcharges.filter((rule) => rule.kind !== "heavy_soil");
    const result = priceInvoicePeriod(terms, [cycle("H1", "major_tray", 1, { flags: { ...NO_FLAGS, heavySoil: true } })], MARCH_2026);
    expect(result.lines.map((line) => line.kind)).toEqual(["processing"]);
    expect(result.warnings).toEqual([expect.objectContaining({ code: "surcharge_not_in_contract", kind: "heavy_soil", cycleIds: ["H1"] })]);
  });
});

describe("SLA credit for late sets", () => {
  it("credits a share of each late set's own band price", () => {
    // Late sets at positions 10 (band 1, 950), 700 (band 2, 890) and 1100 (band 3, 820):
    //   (950 + 890 + 820) × 10 % = 2660 × 0.10 = 266 (by hand), one negative line.
    const cycles = basicTrays(1120).map((c) => (["C0010", "C0700", "C1100"].includes(c.cycleId) ? { ...c, late: true } : c));
    const result = priceInvoicePeriod(makeTerms(), cycles, MARCH_2026);
    const credit = result.lines.at(-1);
    expect(credit).toMatchObject({
      kind: "sla_credit",
      quantity: -1,
      unitPriceMinor: 266,
      netAmountMinor: -266,
      cycleIds: ["C0010", "C0700", "C1100"],
    });
    expect(result.summary.slaCreditMinor).toBe(266);
    expect(result.summary.netMinor).toBe(1_018_400 - 266);
  });

  it("rounds the credit half away from zero", () => {
    // 5 % of 950 = 47.5 → 48 (commercial rounding, common practice).
    const result = priceInvoicePeriod(makeTerms({ slaCreditBasisPoints: 500 }), [cycle("L1", "basic_tray", 1, { late: true })], MARCH_2026);
    expect(result.summary.slaCreditMinor).toBe(48);
  });

  it("credits the processing fee only, not the surcharges", () => {
    // Express major tray: fee 2450, express surcharge 1225; credit 10 % × 2450 = 245.
    const result = priceInvoicePeriod(makeTerms(), [cycle("E1", "major_tray", 1, { serviceLevel: "express", late: true })], MARCH_2026);
    expect(result.summary.slaCreditMinor).toBe(245);
  });
});

describe("minimum monthly fee", () => {
  it("tops up processing fees plus surcharges to the minimum, before the credit", () => {
    // Minimum 500.00. Ten major trays 10 × 2450 = 24,500 plus one heavy-soil surcharge 350
    // = 24,850 → top-up 50,000 − 24,850 = 25,150. One late tray: credit 10 % × 2450 = 245.
    // Net: 24,850 + 25,150 − 245 = 49,755 (by hand; minimum before credits is common practice).
    const cycles = Array.from({ length: 10 }, (_, i) =>
      cycle(`T${i + 1}`, "major_tray", i, { late: i === 3, flags: { ...NO_FLAGS, heavySoil: i === 0 } }),
    );
    const result = priceInvoicePeriod(makeTerms({ minimumMonthlyFeeMinor: 50_000 }), cycles, MARCH_2026);
    expect(result.lines.map((line) => [line.kind, line.netAmountMinor])).toEqual([
      ["processing", 24_500],
      ["surcharge", 350],
      ["minimum_fee_top_up", 25_150],
      ["sla_credit", -245],
    ]);
    expect(result.summary).toMatchObject({ minimumFeeBaseMinor: 24_850, minimumFeeTopUpMinor: 25_150, netMinor: 49_755 });
    expect(result.lines.map((line) => line.id)).toEqual(["1", "2", "3", "4"]);
  });

  it("adds no top-up above the minimum and bills the whole minimum for an empty month", () => {
    const above = priceInvoicePeriod(makeTerms({ minimumMonthlyFeeMinor: 2000 }), [cycle("T1", "major_tray", 0)], MARCH_2026);
    expect(above.lines.map((line) => line.kind)).toEqual(["processing"]);
    const empty = priceInvoicePeriod(makeTerms({ minimumMonthlyFeeMinor: 50_000 }), [], MARCH_2026);
    expect(empty.lines.map((line) => [line.kind, line.quantity, line.netAmountMinor])).toEqual([["minimum_fee_top_up", 1, 50_000]]);
  });
});

describe("refused input", () => {
  it("refuses a cycle id given twice", () => {
    const cycles = [cycle("D1", "major_tray", 0), cycle("D1", "major_tray", 5)];
    expectPricingError(() => priceInvoicePeriod(makeTerms(), cycles, MARCH_2026), "duplicate_cycle", "D1");
  });

  it("names the set class and the cycle when the class is not on the rate card", () => {
    const error = expectPricingError(
      () => priceInvoicePeriod(makeTerms(), [cycle("Q7", "ophthalmic_tray", 0)], MARCH_2026),
      "unknown_set_class",
      "Q7",
      "ophthalmic_tray",
    );
    expect(error.details).toMatchObject({ cycleId: "Q7", setClass: "ophthalmic_tray" });
  });

  it("refuses a rate card in another currency than the contract", () => {
    const terms = makeTerms();
    terms.rateCard.currency = "EUR";
    expectPricingError(() => priceInvoicePeriod(terms, [], MARCH_2026), "currency_mismatch", "GBP", "EUR");
  });

  it("refuses a currency without two minor digits", () => {
    const terms = makeTerms({ currency: "JPY" });
    terms.rateCard.currency = "JPY";
    expectPricingError(() => priceInvoicePeriod(terms, [], MARCH_2026), "currency_mismatch", "JPY");
  });

  it("refuses cycles delivered while the contract version was not in force", () => {
    const terms = makeTerms({ validFrom: "2026-03-15T00:00:00Z" });
    expectPricingError(() => priceInvoicePeriod(terms, [cycle("V1", "major_tray", 60)], MARCH_2026), "outside_contract", "V1");
  });

  it("refuses malformed bands, cycles and periods with what to fix", () => {
    const terms = makeTerms();
    terms.rateCard.classes[0].bands = [
      { upToQuantity: 500, unitPriceMinor: 950 },
      { upToQuantity: 400, unitPriceMinor: 890 },
      { upToQuantity: null, unitPriceMinor: 820 },
    ];
    expectPricingError(() => priceInvoicePeriod(terms, [], MARCH_2026), "invalid_terms", "basic_tray", "band 2");
    const fractional = makeTerms();
    fractional.rateCard.classes[1].bands[0].unitPriceMinor = 24.5;
    expectPricingError(() => priceInvoicePeriod(fractional, [], MARCH_2026), "invalid_terms", "major_tray");

    const noZone = { ...cycle("Z1", "major_tray", 0), deliveredAt: "2026-03-02T10:00:00" };
    expectPricingError(() => priceInvoicePeriod(makeTerms(), [noZone], MARCH_2026), "invalid_cycle", "Z1", "deliveredAt");
    const noFlag = { ...cycle("F1", "major_tray", 0), flags: { heavySoil: false } } as unknown as PricedCycleInput;
    expectPricingError(() => priceInvoicePeriod(makeTerms(), [noFlag], MARCH_2026), "invalid_cycle", "F1", "outOfHours");
    expectPricingError(
      () => priceInvoicePeriod(makeTerms(), [], { start: MARCH_2026.end, end: MARCH_2026.start }),
      "invalid_period",
      "after",
    );
  });
});
