import { describe, expect, it } from "vitest";
import { ageBucketOf, daysPastDue } from "@/lib/billing/ageing";
import { ageReceivables, receivablesReport } from "@/lib/reports/money";

// Ageing of open invoices by whole days past due (common practice: 30-day buckets of an aged
// receivables report; the boundaries are our own, shared with the invoice list).

const invoice = (number: string, dueDate: string, amountDueMinor: number, customer = "Tansy Row Practice", currency = "GBP") => ({
  organisationId: 1,
  customer,
  number,
  currency,
  dueDate,
  amountDueMinor,
});

describe("days past due", () => {
  it("counts calendar days from the due date", () => {
    expect(daysPastDue("2026-12-01", "2026-12-01")).toBe(0);
    expect(daysPastDue("2026-11-01", "2026-12-01")).toBe(30);
    expect(daysPastDue("2026-12-10", "2026-12-01")).toBe(-9);
    // Across the end of British Summer Time: still whole days.
    expect(daysPastDue("2026-10-24", "2026-10-26")).toBe(2);
  });

  it("puts each boundary in its bucket", () => {
    expect([0, 1, 30, 31, 60, 61, 90, 91].map(ageBucketOf)).toEqual(["current", "1_30", "1_30", "31_60", "31_60", "61_90", "61_90", "over_90"]);
  });
});

describe("receivables by age", () => {
  const today = "2026-12-01";
  const invoices = [
    invoice("A-1", "2026-12-15", 10_000), // not yet due
    invoice("A-2", "2026-12-01", 500), // due today: not yet overdue
    invoice("A-3", "2026-11-01", 2_500), // 30 days
    invoice("A-4", "2026-10-31", 1_000), // 31 days
    invoice("A-5", "2026-09-01", 700), // 91 days
    invoice("A-6", "2026-09-02", 300), // 90 days
    invoice("B-1", "2026-10-01", 4_200, "Hollin Vet Rooms"), // 61 days
    invoice("B-2", "2026-10-01", 999, "Hollin Vet Rooms", "EUR"), // another currency, never added
    invoice("B-3", "2026-01-01", 0, "Hollin Vet Rooms"), // nothing left to pay: not listed
  ];

  it("sums the amounts due per customer, currency and bucket (worked by hand)", () => {
    expect(ageReceivables(invoices, today)).toEqual([
      { customer: "Hollin Vet Rooms", currency: "EUR", buckets: { current: 0, "1_30": 0, "31_60": 0, "61_90": 999, over_90: 0 }, total: 999 },
      { customer: "Hollin Vet Rooms", currency: "GBP", buckets: { current: 0, "1_30": 0, "31_60": 0, "61_90": 4_200, over_90: 0 }, total: 4_200 },
      { customer: "Tansy Row Practice", currency: "GBP", buckets: { current: 10_500, "1_30": 2_500, "31_60": 1_000, "61_90": 300, over_90: 700 }, total: 15_000 },
    ]);
  });

  it("shows the same sums as decimal amounts, and lists each open invoice with its age", () => {
    const report = receivablesReport(invoices, today);
    const ageing = report.tables.find((t) => t.key === "ageing")!;
    expect(ageing.rows[2]).toEqual({ customer: "Tansy Row Practice", currency: "GBP", current: "105.00", "1_30": "25.00", "31_60": "10.00", "61_90": "3.00", over_90: "7.00", total: "150.00" });
    const listed = report.tables.find((t) => t.key === "invoices")!;
    expect(listed.rows.map((r) => [r.number, r.days_past_due, r.age])).toEqual([
      ["A-5", 91, "Over 90 days"],
      ["A-6", 90, "61–90 days"],
      ["B-1", 61, "61–90 days"],
      ["B-2", 61, "61–90 days"],
      ["A-4", 31, "31–60 days"],
      ["A-3", 30, "1–30 days"],
      ["A-2", 0, "Not yet due"],
      ["A-1", -14, "Not yet due"],
    ]);
    expect(report.notes.join(" ")).toMatch(/Several currencies \(EUR, GBP\)/);
  });
});
