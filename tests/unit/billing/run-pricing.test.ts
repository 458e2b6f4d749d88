import { describe, expect, it } from "vitest";
import { billingPeriod } from "@/lib/billing/run-periods";
import { type BillableCycle, priceCustomerMonth, type RunTerms } from "@/lib/billing/run-pricing";

// One customer's month priced from plain data. Calendar: Monday–Friday 08:00–18:00, so lateness
// follows the service clock, not the wall clock.

const LONDON = "Europe/London";
const period = billingPeriod("2026-11", LONDON);
const open = [{ start: "08:00", end: "18:00" }];
const day = { mon: open, tue: open, wed: open, thu: open, fri: open, sat: [], sun: [] };

function terms(overrides: Partial<RunTerms> = {}): RunTerms {
  return {
    id: 7,
    reference: "FEN-2026-01",
    contractId: "FEN-2026-01",
    validFrom: "2026-01-01T00:00:00.000Z",
    validTo: null,
    currency: "GBP",
    vat: { category: "S", rateBasisPoints: 2000 },
    paymentTermsDays: 14,
    turnaroundHours: { standard: 10, express: 4 },
    minimumMonthlyFeeMinor: 0,
    slaCreditBasisPoints: 2000,
    rateCard: { currency: "GBP", classes: [{ setClass: "basic_tray", label: "Basic tray", bands: [{ upToQuantity: null, unitPriceMinor: 1000 }] }], surcharges: [] },
    serviceCalendar: {
      timeZone: LONDON,
      hours: day,
      holidays: [],
    },
    clockStopsAt: "delivered",
    ...overrides,
  };
}

let n = 0;
function cycle(receivedAt: string, deliveredAt: string, extra: Partial<BillableCycle> = {}): BillableCycle {
  n += 1;
  return {
    id: n,
    serial: `FEN-${String(n).padStart(4, "0")}`,
    setName: "Basic tray",
    setClass: "basic_tray",
    serviceLevel: "standard",
    heavySoil: false,
    outOfHours: false,
    missingInstrument: false,
    lowTemperature: false,
    loaner: false,
    receivedAt,
    releasedAt: null,
    deliveredAt,
    ...extra,
  };
}

describe("one customer's month", () => {
  it("decides late by the service calendar: received Friday 16:00 with 10 service hours is due Monday 16:00", () => {
    // Friday 6 November 2026 16:00 GMT: 2 hours on Friday, 8 on Monday → due Monday 9 Nov 16:00
    // (the common-practice weekend rule of CHECKS.md, with a 10-hour day).
    const onTime = cycle("2026-11-06T16:00:00.000Z", "2026-11-09T16:00:00.000Z");
    const late = cycle("2026-11-06T16:00:00.000Z", "2026-11-09T16:01:00.000Z");
    const result = priceCustomerMonth({ period, timeZone: LONDON, versions: [terms()], cycles: [onTime, late] });
    expect(result.ok).toBe(true);
    expect(result.evidence.map((e) => [e.serial, e.late, e.dueAt])).toEqual([
      [onTime.serial, false, "2026-11-09T16:00:00.000Z"],
      [late.serial, true, "2026-11-09T16:00:00.000Z"],
    ]);
    if (!result.ok) return;
    // 2 × 1000, credit 20 % of the late set's 1000 = 200; net 1800, VAT 360, total 2160.
    expect(result.lines.map((l) => [l.kind, l.netMinor])).toEqual([
      ["processing", 2000],
      ["sla_credit", -200],
    ]);
    expect(result.totals.taxInclusiveMinor).toBe(2160);
    expect(result.evidence.map((e) => e.feeMinor)).toEqual([1000, 1000]);
  });

  it("treats a cycle with no receipt time as not late, without a due time", () => {
    const result = priceCustomerMonth({ period, timeZone: LONDON, versions: [terms()], cycles: [{ ...cycle("2026-11-02T09:00:00.000Z", "2026-11-03T09:00:00.000Z"), receivedAt: null }] });
    expect(result.evidence[0]).toMatchObject({ late: false, dueAt: null });
  });

  it("says why a customer cannot be invoiced, and prices nothing of it", () => {
    const gap = [terms({ validTo: "2026-11-10T00:00:00.000Z" }), terms({ id: 8, reference: "FEN-2026-02", contractId: "FEN-2026-02", validFrom: "2026-11-12T00:00:00.000Z", currency: "EUR", rateCard: { ...terms().rateCard, currency: "EUR" } })];
    const result = priceCustomerMonth({
      period,
      timeZone: LONDON,
      versions: gap,
      cycles: [
        cycle("2026-11-02T09:00:00.000Z", "2026-11-03T09:00:00.000Z"),
        cycle("2026-11-10T09:00:00.000Z", "2026-11-11T09:00:00.000Z"),
        cycle("2026-11-16T09:00:00.000Z", "2026-11-17T09:00:00.000Z", { setClass: "major_tray" }),
      ],
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.problems).toEqual([
      expect.stringMatching(/^1 set \(FEN-\d+\) was delivered on 2026-11-11, when no contract version was in force\./),
      expect.stringMatching(/bill in different currencies \(FEN-2026-01: GBP, FEN-2026-02: EUR\)/),
      expect.stringMatching(/^1 set of class "major_tray" \(FEN-\d+\) is not priced by the rate card of FEN-2026-02\./),
    ]);
    expect(result.evidence.every((e) => e.feeMinor === null)).toBe(true);
  });

  it("settles the minimum fee against what earlier invoices of the month billed", () => {
    const minimum = terms({ minimumMonthlyFeeMinor: 5000 });
    const cycles = [cycle("2026-11-20T09:00:00.000Z", "2026-11-20T12:00:00.000Z")];
    // Earlier: 2 sets (2000) topped up by 3000 to the 5000 minimum; the new set (1000) still
    // leaves the month under it: top-up due now max(0, 5000 − 3000) = 2000, 3000 invoiced → −1000.
    const under = priceCustomerMonth({
      period,
      timeZone: LONDON,
      versions: [minimum],
      cycles,
      earlier: [{ contractId: 7, classCounts: new Map([["basic_tray", 2]]), baseMinor: 2000, topUpMinor: 3000, invoiceNumbers: ["LSS-2026-11-FEN"] }],
    });
    expect(under.ok && under.lines.map((l) => [l.kind, l.quantity, l.unitPriceMinor, l.netMinor])).toEqual([
      ["processing", 1, 1000, 1000],
      ["minimum_fee_top_up", -1, 1000, -1000],
    ]);
    expect(under.ok && under.totals.taxInclusiveMinor).toBe(0);
    // Without earlier invoices the same month tops up to the minimum as usual.
    const first = priceCustomerMonth({ period, timeZone: LONDON, versions: [minimum], cycles });
    expect(first.ok && first.lines.map((l) => [l.kind, l.netMinor])).toEqual([
      ["processing", 1000],
      ["minimum_fee_top_up", 4000],
    ]);
  });
});
