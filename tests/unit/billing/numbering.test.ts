import { describe, expect, it } from "vitest";
import { creditNoteNumber, invoiceNumber, nextInvoiceNumber } from "@/lib/billing/numbering";

describe("our invoice and credit note numbers", () => {
  it("name the unit, the month and the customer, with a sequence from the second invoice of a month", () => {
    expect(invoiceNumber({ unitCode: "LSS", month: "2026-11", customerCode: "QMH", sequence: 1 })).toBe("LSS-2026-11-QMH");
    expect(invoiceNumber({ unitCode: "lss", month: "2026-11", customerCode: "qmh", sequence: 3 })).toBe("LSS-2026-11-QMH-3");
    expect(nextInvoiceNumber({ unitCode: "LSS", month: "2026-11", customerCode: "QMH" }, [])).toBe("LSS-2026-11-QMH");
    expect(nextInvoiceNumber({ unitCode: "LSS", month: "2026-11", customerCode: "QMH" }, ["LSS-2026-11-QMH", "LSS-2026-11-QMH-2"])).toBe("LSS-2026-11-QMH-3");
    // Another customer whose code starts the same is not in the way.
    expect(nextInvoiceNumber({ unitCode: "LSS", month: "2026-11", customerCode: "QM" }, ["LSS-2026-11-QMH"])).toBe("LSS-2026-11-QM");
  });

  it("numbers credit notes per invoice", () => {
    expect(creditNoteNumber("LSS-2026-11-QMH", 1)).toBe("LSS-CN-2026-11-QMH-1");
    expect(creditNoteNumber("LSS-2026-11-QMH-2", 2)).toBe("LSS-CN-2026-11-QMH-2-2");
  });

  it("refuses what is not a number of ours", () => {
    expect(() => invoiceNumber({ unitCode: "LSS", month: "2026-13", customerCode: "QMH", sequence: 1 })).toThrow(/YYYY-MM/);
    expect(() => invoiceNumber({ unitCode: "LSS", month: "2026-11", customerCode: "Q M", sequence: 1 })).toThrow(/letters or digits/);
    expect(() => invoiceNumber({ unitCode: "LSS", month: "2026-11", customerCode: "QMH", sequence: 0 })).toThrow(/sequence/);
    expect(() => creditNoteNumber("INV 42", 1)).toThrow(/not one of our invoice numbers/);
  });
});
