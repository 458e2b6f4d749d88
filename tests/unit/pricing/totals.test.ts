import { describe, expect, it } from "vitest";
import { PricingError } from "@/lib/pricing/errors";
import { formatBasisPoints, formatMinor, roundHalfAwayFromZero } from "@/lib/pricing/money";
import { computeInvoiceTotals } from "@/lib/pricing/totals";
import type { VatTreatment } from "@/lib/pricing/types";

const S25: VatTreatment = { category: "S", rateBasisPoints: 2500 };
const S20: VatTreatment = { category: "S", rateBasisPoints: 2000 };

describe("EN 16931 totals", () => {
  it("reproduces the Peppol BIS Billing 3.0 base example", () => {
    // Source: Peppol BIS Billing 3.0 base example (CHECKS.md): lines 7 × 400 = 2800 and
    // −3 × 500 = −1500 (sum 1300), document charge 25 at 25 % (taxable 1325), VAT 331.25,
    // total with VAT 1656.25, amount due 1656.25.
    const totals = computeInvoiceTotals(
      [
        { netAmountMinor: 7 * 40_000, vat: S25 },
        { netAmountMinor: -3 * 50_000, vat: S25 },
      ],
      [{ chargeIndicator: true, amountMinor: 2500, reason: "Insurance", vat: S25 }],
    );
    expect(totals).toEqual({
      lineTotalMinor: 130_000,
      allowanceTotalMinor: 0,
      chargeTotalMinor: 2500,
      taxExclusiveMinor: 132_500,
      vatTotalMinor: 33_125,
      taxInclusiveMinor: 165_625,
      prepaidMinor: 0,
      roundingMinor: 0,
      payableMinor: 165_625,
      vatBreakdown: [{ category: "S", rateBasisPoints: 2500, taxableAmountMinor: 132_500, taxAmountMinor: 33_125 }],
    });
    expect(formatMinor(totals.taxInclusiveMinor)).toBe("1656.25");
  });

  it("rounds VAT half away from zero on an exact .5", () => {
    // 2.50 at 21 % = 0.525 → 0.53 (half-to-even would give 0.52); computed, commercial rounding
    // being common practice where EN 16931 leaves the method open.
    const vat = (taxable: number, rate: number) =>
      computeInvoiceTotals([{ netAmountMinor: taxable, vat: { category: "S", rateBasisPoints: rate } }]).vatTotalMinor;
    expect(vat(250, 2100)).toBe(53);
    expect(vat(-250, 2100)).toBe(-53);
    // 10.10 at 5 % = 0.505 → 0.51 (computed).
    expect(vat(1010, 500)).toBe(51);
    // 10.09 at 5 % = 0.5045 → 0.50: below the half, down (computed).
    expect(vat(1009, 500)).toBe(50);
  });

  it("computes VAT once on each category's taxable amount, not per line (BR-CO-17)", () => {
    // Two lines of 1.50 at 25 %: per line 0.375 → 0.38 twice = 0.76; on the sum 3.00 × 25 % = 0.75.
    const totals = computeInvoiceTotals([
      { netAmountMinor: 150, vat: S25 },
      { netAmountMinor: 150, vat: S25 },
    ]);
    expect(totals.vatTotalMinor).toBe(75);
  });

  it("keeps one breakdown per category and rate, allowances reducing their own category", () => {
    // S 20 %: 100.00 + 50.00 − allowance 10.00 = 140.00 → VAT 28.00
    // S 5 %: 40.00 → VAT 2.00; Z: 30.00 → VAT 0 (computed)
    const totals = computeInvoiceTotals(
      [
        { netAmountMinor: 10_000, vat: S20 },
        { netAmountMinor: 3000, vat: { category: "Z", rateBasisPoints: 0 } },
        { netAmountMinor: 4000, vat: { category: "S", rateBasisPoints: 500 } },
        { netAmountMinor: 5000, vat: S20 },
      ],
      [{ chargeIndicator: false, amountMinor: 1000, reason: "Volume rebate", reasonCode: "95", vat: S20 }],
    );
    expect(totals.vatBreakdown).toEqual([
      { category: "S", rateBasisPoints: 2000, taxableAmountMinor: 14_000, taxAmountMinor: 2800 },
      { category: "S", rateBasisPoints: 500, taxableAmountMinor: 4000, taxAmountMinor: 200 },
      { category: "Z", rateBasisPoints: 0, taxableAmountMinor: 3000, taxAmountMinor: 0 },
    ]);
    expect(totals).toMatchObject({ lineTotalMinor: 22_000, allowanceTotalMinor: 1000, taxExclusiveMinor: 21_000, vatTotalMinor: 3000 });
  });

  it("takes prepaid and rounding amounts into the amount due (BR-CO-16)", () => {
    // 100.00 + 20 % = 120.00; paid 50.00; rounding +0.01 → due 70.01 (computed).
    const totals = computeInvoiceTotals([{ netAmountMinor: 10_000, vat: S20 }], [], { prepaidMinor: 5000, roundingMinor: 1 });
    expect(totals).toMatchObject({ taxInclusiveMinor: 12_000, payableMinor: 7001 });
  });

  it("refuses VAT treatments EN 16931 forbids", () => {
    const run = (vat: VatTreatment) => () => computeInvoiceTotals([{ netAmountMinor: 100, vat }]);
    expect(run({ category: "S", rateBasisPoints: 0 })).toThrow(/BR-S-05/);
    expect(run({ category: "Z", rateBasisPoints: 2000 })).toThrow(/BR-Z-05/);
    expect(run({ category: "E", rateBasisPoints: 0 })).toThrow(/BR-E-10/);
    expect(run({ category: "K", rateBasisPoints: 0, exemptionReason: "Intra-community supply" })).not.toThrow();
    expect(run({ category: "S", rateBasisPoints: 20.5 })).toThrow(PricingError);
    expect(() =>
      computeInvoiceTotals([
        { netAmountMinor: 100, vat: { category: "O", rateBasisPoints: 0, exemptionReason: "Not subject to VAT" } },
        { netAmountMinor: 100, vat: S20 },
      ]),
    ).toThrow(/BR-O-11/);
    expect(() => computeInvoiceTotals([{ netAmountMinor: 10.5, vat: S20 }])).toThrow(/whole number/);
    expect(() => computeInvoiceTotals([], [{ chargeIndicator: true, amountMinor: -5, reason: "Freight", vat: S20 }])).toThrow(/at least 0/);
  });
});

describe("integer helpers", () => {
  it("rounds ties away from zero and everything else to nearest", () => {
    expect([5n, 15n, 25n, -5n, -15n, 14n, -14n, 16n].map((n) => roundHalfAwayFromZero(n, 10n))).toEqual([1n, 2n, 3n, -1n, -2n, 1n, -1n, 2n]);
  });

  it("writes VAT rates as UBL percentages", () => {
    expect([2500, 550, 775, 2000, 1250, 0].map(formatBasisPoints)).toEqual(["25", "5.5", "7.75", "20", "12.5", "0"]);
    expect([165_625, -150_000, 5, -5, 0].map(formatMinor)).toEqual(["1656.25", "-1500.00", "0.05", "-0.05", "0.00"]);
  });
});
