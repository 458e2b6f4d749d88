import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { PricingError } from "@/lib/pricing/errors";
import { priceInvoicePeriod } from "@/lib/pricing/price-period";
import { computeInvoiceTotals } from "@/lib/pricing/totals";
import type { ContractTerms, DocumentAllowanceCharge, PricedCycleInput, VatTreatment } from "@/lib/pricing/types";
import { buildUblInvoice } from "@/lib/pricing/ubl";
import { readUblDocument } from "@/lib/pricing/ubl-read";
import { validateEn16931 } from "@/lib/pricing/validate-en16931";
import { MARCH_2026, invoiceShell, makeTerms } from "./fixtures";

// ---- arbitraries ----

const vatArb: fc.Arbitrary<VatTreatment> = fc.oneof(
  fc.constantFrom(500, 550, 775, 2000, 2100, 2500).map((rate) => ({ category: "S" as const, rateBasisPoints: rate })),
  fc.integer({ min: 1, max: 10_000 }).map((rate) => ({ category: "S" as const, rateBasisPoints: rate })),
  fc.constant({ category: "Z" as const, rateBasisPoints: 0 }),
  fc.constant({ category: "E" as const, rateBasisPoints: 0, exemptionReason: "Exempt medical service" }),
);

const amountArb = fc.integer({ min: -100_000_000, max: 100_000_000 });

const lineArb = fc.record({ netAmountMinor: amountArb, vat: vatArb });

const allowanceChargeArb: fc.Arbitrary<DocumentAllowanceCharge> = fc.record({
  chargeIndicator: fc.boolean(),
  amountMinor: fc.integer({ min: 0, max: 10_000_000 }),
  reason: fc.constantFrom("Freight", "Volume rebate"),
  vat: vatArb,
});

const SET_CLASSES = ["basic_tray", "major_tray", "single_pouch", "rigid_container", "loaner_set", "dental_cassette"];
const MINUTES_IN_MARCH = 31 * 24 * 60;

const cycleShapeArb = fc.record({
  setClass: fc.constantFrom(...SET_CLASSES),
  serviceLevel: fc.constantFrom("standard" as const, "express" as const),
  flags: fc.record({
    heavySoil: fc.boolean(),
    outOfHours: fc.boolean(),
    missingInstrumentInvestigation: fc.boolean(),
    lowTemperature: fc.boolean(),
    loaner: fc.boolean(),
  }),
  late: fc.boolean(),
  // A narrow range sometimes, so that several sets share a delivery time.
  minute: fc.oneof(fc.integer({ min: 0, max: 5 }), fc.integer({ min: 0, max: MINUTES_IN_MARCH - 1 })),
});

const cyclesArb: fc.Arbitrary<PricedCycleInput[]> = fc.array(cycleShapeArb, { maxLength: 60 }).map((shapes) =>
  shapes.map(({ minute, ...shape }, index) => ({
    cycleId: `P${index}`,
    ...shape,
    deliveredAt: new Date(Date.UTC(2026, 2, 1) + minute * 60_000).toISOString(),
  })),
);

// Small bands, so that random months cross them.
const termsArb: fc.Arbitrary<ContractTerms> = fc
  .record({ minimum: fc.integer({ min: 0, max: 80_000 }), credit: fc.integer({ min: 0, max: 10_000 }) })
  .map(({ minimum, credit }) => {
    const terms = makeTerms({ minimumMonthlyFeeMinor: minimum, slaCreditBasisPoints: credit });
    terms.rateCard.classes[0].bands = [
      { upToQuantity: 3, unitPriceMinor: 950 },
      { upToQuantity: 8, unitPriceMinor: 890 },
      { upToQuantity: null, unitPriceMinor: 820 },
    ];
    return terms;
  });

const big = (value: number) => BigInt(value);
const sumOf = (values: number[]) => values.reduce((total, value) => total + big(value), 0n);

// ---- properties ----

describe("totals properties", () => {
  it("totals equal the sums of their parts (BR-CO-10, -13, -14, -15, -16)", () => {
    fc.assert(
      fc.property(
        fc.array(lineArb, { maxLength: 30 }),
        fc.array(allowanceChargeArb, { maxLength: 4 }),
        fc.integer({ min: 0, max: 1_000_000 }),
        fc.integer({ min: -99, max: 99 }),
        (lines, allowancesCharges, prepaidMinor, roundingMinor) => {
          const totals = computeInvoiceTotals(lines, allowancesCharges, { prepaidMinor, roundingMinor });
          const allowances = sumOf(allowancesCharges.filter((e) => !e.chargeIndicator).map((e) => e.amountMinor));
          const charges = sumOf(allowancesCharges.filter((e) => e.chargeIndicator).map((e) => e.amountMinor));
          const lineSum = sumOf(lines.map((l) => l.netAmountMinor));
          expect(big(totals.lineTotalMinor)).toBe(lineSum);
          expect(big(totals.allowanceTotalMinor)).toBe(allowances);
          expect(big(totals.chargeTotalMinor)).toBe(charges);
          expect(big(totals.taxExclusiveMinor)).toBe(lineSum - allowances + charges);
          expect(sumOf(totals.vatBreakdown.map((b) => b.taxableAmountMinor))).toBe(big(totals.taxExclusiveMinor));
          expect(big(totals.vatTotalMinor)).toBe(sumOf(totals.vatBreakdown.map((b) => b.taxAmountMinor)));
          expect(totals.taxInclusiveMinor).toBe(totals.taxExclusiveMinor + totals.vatTotalMinor);
          expect(totals.payableMinor).toBe(totals.taxInclusiveMinor - prepaidMinor + roundingMinor);
        },
      ),
    );
  });

  it("VAT per category and rate is the category's taxable amount × rate, rounded half away from zero (BR-CO-17)", () => {
    fc.assert(
      fc.property(fc.array(lineArb, { minLength: 1, maxLength: 30 }), fc.array(allowanceChargeArb, { maxLength: 4 }), (lines, allowancesCharges) => {
        const totals = computeInvoiceTotals(lines, allowancesCharges);
        for (const entry of totals.vatBreakdown) {
          const same = (vat: VatTreatment) => vat.category === entry.category && vat.rateBasisPoints === entry.rateBasisPoints;
          const taxable =
            sumOf(lines.filter((l) => same(l.vat)).map((l) => l.netAmountMinor)) +
            sumOf(allowancesCharges.filter((e) => same(e.vat)).map((e) => (e.chargeIndicator ? e.amountMinor : -e.amountMinor)));
          expect(big(entry.taxableAmountMinor)).toBe(taxable);
          // exact VAT in minor units = taxable × rate / 10 000; the result is within half a unit
          // of it, and an exact half goes away from zero.
          const exactTimes10k = taxable * big(entry.rateBasisPoints);
          const difference = big(entry.taxAmountMinor) * 10_000n - exactTimes10k;
          const magnitude = difference < 0n ? -difference : difference;
          expect(magnitude <= 5000n).toBe(true);
          if (magnitude === 5000n) {
            const abs = (v: bigint) => (v < 0n ? -v : v);
            expect(abs(big(entry.taxAmountMinor) * 10_000n) > abs(exactTimes10k)).toBe(true);
          }
        }
      }),
    );
  });
});

describe("pricing properties", () => {
  it("refuses a cycle id priced twice", () => {
    fc.assert(
      fc.property(
        termsArb,
        cyclesArb.filter((cycles) => cycles.length > 0),
        fc.nat(),
        fc.nat(),
        fc.integer({ min: 0, max: MINUTES_IN_MARCH - 1 }),
        (terms, cycles, pick, at, minute) => {
          const original = cycles[pick % cycles.length];
          const copy = { ...original, deliveredAt: new Date(Date.UTC(2026, 2, 1) + minute * 60_000).toISOString() };
          const input = [...cycles];
          input.splice(at % (input.length + 1), 0, copy);
          try {
            priceInvoicePeriod(terms, input, MARCH_2026);
          } catch (error) {
            expect(error).toBeInstanceOf(PricingError);
            expect((error as PricingError).code).toBe("duplicate_cycle");
            expect((error as PricingError).message).toContain(original.cycleId);
            return;
          }
          throw new Error("a duplicate cycle id was priced");
        },
      ),
    );
  });

  it("gives the same lines and total whatever the order of the input cycles", () => {
    fc.assert(
      fc.property(
        termsArb,
        cyclesArb.chain((cycles) => fc.tuple(fc.constant(cycles), fc.shuffledSubarray(cycles, { minLength: cycles.length, maxLength: cycles.length }))),
        (terms, [cycles, shuffled]) => {
          const a = priceInvoicePeriod(terms, cycles, MARCH_2026);
          const b = priceInvoicePeriod(terms, shuffled, MARCH_2026);
          expect(b.summary.netMinor).toBe(a.summary.netMinor);
          expect(b.lines).toEqual(a.lines);
        },
      ),
    );
  });

  it("puts every input cycle in exactly one processing line's evidence", () => {
    fc.assert(
      fc.property(termsArb, cyclesArb, (terms, cycles) => {
        const result = priceInvoicePeriod(terms, cycles, MARCH_2026);
        const processing = result.lines.filter((line) => line.kind === "processing");
        const evidence = processing.flatMap((line) => line.cycleIds);
        expect([...evidence].sort()).toEqual(cycles.map((c) => c.cycleId).sort());
        for (const line of processing) expect(line.quantity).toBe(line.cycleIds.length);
        for (const line of result.lines) expect(line.netAmountMinor).toBe(line.quantity * line.unitPriceMinor);
        // The minimum applies to processing plus surcharges, before the credit.
        expect(result.summary.minimumFeeBaseMinor + result.summary.minimumFeeTopUpMinor).toBe(
          Math.max(terms.minimumMonthlyFeeMinor, result.summary.minimumFeeBaseMinor),
        );
      }),
    );
  });

  it("exports every priced month as UBL that passes the EN 16931 checks", () => {
    fc.assert(
      fc.property(
        termsArb,
        cyclesArb.filter((cycles) => cycles.length > 0),
        (terms, cycles) => {
          const priced = priceInvoicePeriod(terms, cycles, MARCH_2026);
          const view = readUblDocument(buildUblInvoice(invoiceShell({ lines: priced.lines })));
          expect(validateEn16931(view)).toEqual([]);
          expect(view.totals.lineTotal?.value).toBe((priced.summary.netMinor / 100).toFixed(2));
        },
      ),
      { numRuns: 40 },
    );
  });
});
