import { describe, expect, it } from "vitest";
import { invoiceFromPricedPeriod } from "@/lib/pricing/invoice";
import { addCalendarDays, calendarMonthPeriod } from "@/lib/pricing/period";
import { priceInvoicePeriod } from "@/lib/pricing/price-period";
import { buildUblInvoice } from "@/lib/pricing/ubl";
import { readUblDocument } from "@/lib/pricing/ubl-read";
import { validateEn16931 } from "@/lib/pricing/validate-en16931";
import { CUSTOMER, SUPPLIER, cycle, makeTerms } from "./fixtures";

describe("invoice from a priced period", () => {
  it("dates the invoice from the contract's payment terms and the unit's calendar", () => {
    const terms = makeTerms({ paymentTermsDays: 30 });
    const period = calendarMonthPeriod("2026-03", "Europe/London");
    const priced = priceInvoicePeriod(terms, [cycle("C1", "major_tray", 60)], period);
    const invoice = invoiceFromPricedPeriod(priced, terms, {
      id: "INV-2026-0400",
      issueDate: "2026-04-01",
      timeZone: "Europe/London",
      supplier: SUPPLIER,
      customer: CUSTOMER,
      buyerReference: "PO-1",
    });
    // 1 April + 30 days = 1 May (calendar arithmetic, by hand).
    expect(invoice.dueDate).toBe("2026-05-01");
    // The period ends at 2026-03-31T23:00Z, local midnight of 1 April: the last billed day is 31 March.
    expect(invoice.invoicePeriod).toEqual({ startDate: "2026-03-01", endDate: "2026-03-31" });
    expect(invoice.paymentTerms).toBe("Payment within 30 days of the invoice date");
    expect(validateEn16931(readUblDocument(buildUblInvoice(invoice)))).toEqual([]);
  });

  it("adds calendar days across month and leap-year ends", () => {
    // By hand: 2028 is a leap year.
    expect(addCalendarDays("2028-02-15", 14)).toBe("2028-02-29");
    expect(addCalendarDays("2026-12-20", 14)).toBe("2027-01-03");
    expect(() => addCalendarDays("2026-13-01", 1)).toThrow(/YYYY-MM-DD/);
  });

  it("refuses lines priced under another contract or currency", () => {
    const terms = makeTerms();
    const priced = priceInvoicePeriod(terms, [], { start: "2026-03-01T00:00:00Z", end: "2026-04-01T00:00:00Z" });
    const header = { id: "I", issueDate: "2026-04-01", timeZone: "Europe/London", supplier: SUPPLIER, customer: CUSTOMER };
    expect(() => invoiceFromPricedPeriod(priced, makeTerms({ contractId: "K-other" }), header)).toThrow(/contract K-2026-014/);
    expect(() => invoiceFromPricedPeriod({ ...priced, currency: "EUR" }, terms, header)).toThrow(/EUR/);
    expect(() => invoiceFromPricedPeriod(priced, terms, { ...header, timeZone: "Mars/Olympus" })).toThrow(/time zone/);
  });
});
