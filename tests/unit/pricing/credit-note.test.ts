import { describe, expect, it } from "vitest";
import { computeCreditNote } from "@/lib/pricing/credit-note";
import { priceInvoicePeriod } from "@/lib/pricing/price-period";
import { computeInvoiceTotals } from "@/lib/pricing/totals";
import type { InvoiceDocument } from "@/lib/pricing/types";
import { buildUblCreditNote } from "@/lib/pricing/ubl";
import { readUblDocument } from "@/lib/pricing/ubl-read";
import { validateEn16931 } from "@/lib/pricing/validate-en16931";
import { MARCH_2026, basicTrays, cycle, invoiceShell, makeTerms } from "./fixtures";

// March invoice: 520 basic trays (500 × 9.50 + 20 × 8.90) and two major trays (2 × 24.50), 20 % VAT.
//   lines: 4750.00 + 178.00 + 49.00 = 4977.00; VAT 995.40; total 5972.40 (by hand)
function marchInvoice(): InvoiceDocument {
  const cycles = [...basicTrays(520), cycle("M1", "major_tray", 600), cycle("M2", "major_tray", 601)];
  const priced = priceInvoicePeriod(makeTerms(), cycles, MARCH_2026);
  return invoiceShell({ id: "INV-2026-0311", lines: priced.lines });
}

const base = { id: "CN-2026-0001", issueDate: "2026-04-10", reason: "Sets billed in error" };

describe("credit notes", () => {
  it("credits a whole invoice with the invoice's own totals", () => {
    const invoice = marchInvoice();
    const invoiceTotals = computeInvoiceTotals(invoice.lines);
    expect(invoiceTotals).toMatchObject({ lineTotalMinor: 497_700, vatTotalMinor: 99_540, taxInclusiveMinor: 597_240 });
    const { document, totals } = computeCreditNote({ ...base, invoice, request: { kind: "full" } });
    expect(totals).toEqual(invoiceTotals);
    expect(document.precedingInvoice).toEqual({ id: "INV-2026-0311", issueDate: "2026-04-02" });
    expect(document.lines.map((line) => line.creditsLineId)).toEqual(["1", "2", "3"]);
  });

  it("credits part of a line by quantity, with VAT computed the same way", () => {
    // 20 of the 500 trays at 9.50: 190.00; VAT 20 % = 38.00; total 228.00 (by hand).
    const { totals, document } = computeCreditNote({ ...base, invoice: marchInvoice(), request: { kind: "lines", lines: [{ lineId: "1", quantity: 20 }] } });
    expect(totals).toMatchObject({ lineTotalMinor: 19_000, vatTotalMinor: 3800, payableMinor: 22_800 });
    expect(document.lines[0]).toMatchObject({ quantity: 20, unitPriceMinor: 950, netAmountMinor: 19_000, cycleIds: [] });
  });

  it("credits named cycles of a line", () => {
    // Two trays of the second band (8.90 each): 17.80 + VAT 3.56 = 21.36 (by hand).
    const { totals, document } = computeCreditNote({
      ...base,
      invoice: marchInvoice(),
      request: { kind: "lines", lines: [{ lineId: "2", cycleIds: ["C0505", "C0510"] }] },
    });
    expect(document.lines[0]).toMatchObject({ quantity: 2, netAmountMinor: 1780, cycleIds: ["C0505", "C0510"] });
    expect(totals.payableMinor).toBe(2136);
  });

  it("credits an amount at the invoice's VAT rate, rounding half away from zero", () => {
    // 12.34 at 20 % = 2.468 → 2.47 (computed).
    const { totals } = computeCreditNote({ ...base, invoice: marchInvoice(), request: { kind: "amount", amountMinor: 1234, description: "Goodwill for a late return" } });
    expect(totals).toMatchObject({ taxExclusiveMinor: 1234, vatTotalMinor: 247, payableMinor: 1481 });
  });

  it("refuses to credit beyond what was invoiced, counting earlier credit notes", () => {
    const invoice = marchInvoice();
    const first = computeCreditNote({ ...base, invoice, request: { kind: "lines", lines: [{ lineId: "1", quantity: 490 }] } }).document;
    expect(() =>
      computeCreditNote({ ...base, id: "CN-2", invoice, previousCreditNotes: [first], request: { kind: "lines", lines: [{ lineId: "1", quantity: 20 }] } }),
    ).toThrow(/exceed the invoiced quantity 500 \(already credited 490\)/);
    const byCycle = computeCreditNote({ ...base, invoice, request: { kind: "lines", lines: [{ lineId: "3", cycleIds: ["M1"] }] } }).document;
    expect(() =>
      computeCreditNote({ ...base, id: "CN-3", invoice, previousCreditNotes: [byCycle], request: { kind: "lines", lines: [{ lineId: "3", cycleIds: ["M1"] }] } }),
    ).toThrow(/cycle M1 .* already credited/);
    expect(() => computeCreditNote({ ...base, invoice, request: { kind: "lines", lines: [{ lineId: "3", cycleIds: ["C0001"] }] } })).toThrow(
      /cycle C0001 was not billed on line 3/,
    );
    expect(() => computeCreditNote({ ...base, invoice, request: { kind: "amount", amountMinor: 497_701, description: "Too much" } })).toThrow(
      /more than the 497700 invoiced/,
    );
    expect(() => computeCreditNote({ ...base, invoice, request: { kind: "lines", lines: [{ lineId: "9", quantity: 1 }] } })).toThrow(/no line 9/);
    expect(() => computeCreditNote({ ...base, issueDate: "2026-03-01", invoice, request: { kind: "full" } })).toThrow(/before invoice/);
  });

  it("exports a UBL credit note that passes the EN 16931 checks", () => {
    const { document } = computeCreditNote({ ...base, invoice: marchInvoice(), request: { kind: "lines", lines: [{ lineId: "3", quantity: 1 }] } });
    const xml = buildUblCreditNote(document);
    const view = readUblDocument(xml);
    expect(view).toMatchObject({ documentType: "CreditNote", typeCode: "381", precedingInvoiceId: "INV-2026-0311" });
    // One major tray 24.50 + VAT 4.90 = 29.40 (by hand).
    expect(view.totals.payable?.value).toBe("29.40");
    expect(view.lines[0]).toMatchObject({ quantity: "1", netAmount: expect.objectContaining({ value: "24.50" }) });
    expect(validateEn16931(view)).toEqual([]);
  });
});
