import { describe, expect, it } from "vitest";
import { PricingError } from "@/lib/pricing/errors";
import { priceInvoicePeriod } from "@/lib/pricing/price-period";
import type { InvoiceDocument, InvoiceLine, VatTreatment } from "@/lib/pricing/types";
import { PEPPOL_BIS3_CUSTOMIZATION_ID, PEPPOL_BIS3_PROFILE_ID, buildUblInvoice } from "@/lib/pricing/ubl";
import { readUblDocument } from "@/lib/pricing/ubl-read";
import { validateEn16931 } from "@/lib/pricing/validate-en16931";
import { MARCH_2026, basicTrays, cycle, invoiceShell, makeTerms } from "./fixtures";

const S25: VatTreatment = { category: "S", rateBasisPoints: 2500 };

function line(id: string, quantity: number, unitPriceMinor: number, description: string, vat: VatTreatment = S25): InvoiceLine {
  return {
    id,
    kind: "other",
    itemCode: `item-${id}`,
    description,
    quantity,
    unitCode: "DAY",
    unitPriceMinor,
    netAmountMinor: quantity * unitPriceMinor,
    vat,
    cycleIds: [],
  };
}

// The amounts of the Peppol BIS Billing 3.0 base example (CHECKS.md), with our own invented
// parties and wording: lines 7 × 400.00 and −3 × 500.00, a document charge of 25.00 at 25 %.
function peppolBaseExample(): InvoiceDocument {
  return invoiceShell({
    id: "INV-2026-0107",
    currency: "EUR",
    lines: [line("1", 7, 40_000, "Consulting day, sterile store layout"), line("2", -3, 50_000, "Consulting day not delivered")],
    allowancesCharges: [{ chargeIndicator: true, amountMinor: 2500, reason: "Insurance", vat: S25 }],
  });
}

function rulesOf(xml: string): string[] {
  return validateEn16931(readUblDocument(xml)).map((violation) => violation.rule);
}

function replaceOnce(xml: string, from: string, to: string): string {
  expect(xml.split(from)).toHaveLength(2);
  return xml.replace(from, to);
}

describe("UBL invoice export", () => {
  it("writes the Peppol base example with the published totals and passes the EN 16931 checks", () => {
    // Source: Peppol BIS Billing 3.0 base example: LineExtensionAmount 1300, TaxExclusiveAmount
    // 1325, TaxAmount 331.25, TaxInclusiveAmount 1656.25, ChargeTotalAmount 25, PayableAmount 1656.25.
    const xml = buildUblInvoice(peppolBaseExample());
    const view = readUblDocument(xml);
    expect(validateEn16931(view)).toEqual([]);
    expect(view).toMatchObject({
      documentType: "Invoice",
      customizationId: PEPPOL_BIS3_CUSTOMIZATION_ID,
      profileId: PEPPOL_BIS3_PROFILE_ID,
      typeCode: "380",
      currency: "EUR",
      issueDate: "2026-04-02",
      dueDate: "2026-05-02",
    });
    expect(view.totals.lineTotal?.value).toBe("1300.00");
    expect(view.totals.taxExclusive?.value).toBe("1325.00");
    expect(view.totals.chargeTotal?.value).toBe("25.00");
    expect(view.totals.taxInclusive?.value).toBe("1656.25");
    expect(view.totals.payable?.value).toBe("1656.25");
    expect(view.taxTotals[0].taxAmount?.value).toBe("331.25");
    expect(view.taxTotals[0].subtotals).toEqual([
      expect.objectContaining({ taxable: expect.objectContaining({ value: "1325.00" }), tax: expect.objectContaining({ value: "331.25" }), category: "S", rate: "25" }),
    ]);
    expect(view.lines.map((l) => [l.quantity, l.unitCode, l.netAmount?.value, l.price?.value])).toEqual([
      ["7", "DAY", "2800.00", "400.00"],
      ["-3", "DAY", "-1500.00", "500.00"],
    ]);
  });

  it("exports a priced period that passes the checks", () => {
    const cycles = [...basicTrays(1120)].map((c, i) => (i % 200 === 0 ? { ...c, late: true } : c));
    cycles.push(cycle("X1", "major_tray", 3, { serviceLevel: "express" }));
    const priced = priceInvoicePeriod(makeTerms({ minimumMonthlyFeeMinor: 0 }), cycles, MARCH_2026);
    const xml = buildUblInvoice(invoiceShell({ lines: priced.lines, invoicePeriod: { startDate: "2026-03-01", endDate: "2026-03-31" } }));
    const view = readUblDocument(xml);
    expect(validateEn16931(view)).toEqual([]);
    expect(view.lines).toHaveLength(priced.lines.length);
    expect(view.totals.lineTotal?.value).toBe((priced.summary.netMinor / 100).toFixed(2));
  });

  it("fails a broken document with the rule it breaks", () => {
    const xml = buildUblInvoice(peppolBaseExample());
    const payable = replaceOnce(xml, '<cbc:PayableAmount currencyID="EUR">1656.25<', '<cbc:PayableAmount currencyID="EUR">1656.20<');
    expect(rulesOf(payable)).toEqual(["BR-CO-16"]);

    const inclusive = replaceOnce(xml, '<cbc:TaxInclusiveAmount currencyID="EUR">1656.25<', '<cbc:TaxInclusiveAmount currencyID="EUR">1656.30<');
    expect(rulesOf(inclusive)).toEqual(expect.arrayContaining(["BR-CO-15", "BR-CO-16"]));

    const subtotalTax = replaceOnce(
      xml,
      '<cbc:TaxableAmount currencyID="EUR">1325.00</cbc:TaxableAmount>\n      <cbc:TaxAmount currencyID="EUR">331.25<',
      '<cbc:TaxableAmount currencyID="EUR">1325.00</cbc:TaxableAmount>\n      <cbc:TaxAmount currencyID="EUR">331.24<',
    );
    expect(rulesOf(subtotalTax).sort()).toEqual(["BR-CO-14", "BR-CO-17"]);

    const lineAmount = replaceOnce(xml, '<cbc:LineExtensionAmount currencyID="EUR">2800.00<', '<cbc:LineExtensionAmount currencyID="EUR">2700.00<');
    expect(rulesOf(lineAmount)).toEqual(expect.arrayContaining(["BR-CO-10", "PEPPOL-EN16931-R120", "BR-S-08"]));

    const decimals = replaceOnce(xml, '<cbc:LineExtensionAmount currencyID="EUR">2800.00<', '<cbc:LineExtensionAmount currencyID="EUR">2800.000<');
    expect(rulesOf(decimals)).toEqual(["BR-DEC-23"]);

    const sellerName = replaceOnce(xml, "<cbc:RegistrationName>Larkmoor Sterile Services Ltd</cbc:RegistrationName>", "");
    expect(rulesOf(sellerName)).toEqual(["BR-06"]);

    const specification = replaceOnce(xml, `<cbc:CustomizationID>${PEPPOL_BIS3_CUSTOMIZATION_ID}</cbc:CustomizationID>`, "");
    expect(rulesOf(specification)).toEqual(["BR-01"]);

    const currency = replaceOnce(xml, '<cbc:PriceAmount currencyID="EUR">400.00<', '<cbc:PriceAmount currencyID="USD">400.00<');
    expect(rulesOf(currency)).toEqual(["PEPPOL-EN16931-R051"]);

    const noTerms = replaceOnce(xml, "<cbc:DueDate>2026-05-02</cbc:DueDate>", "").replace(/<cac:PaymentTerms>[\s\S]*?<\/cac:PaymentTerms>/, "");
    expect(rulesOf(noTerms)).toEqual(["BR-CO-25"]);
  });

  it("escapes what users typed and reads it back unchanged", () => {
    const name = `Fox & Hound <Sterile> "Partners" 'Ltd' ]]>`;
    const invoice = peppolBaseExample();
    invoice.customer = { ...invoice.customer, name };
    invoice.lines[0] = { ...invoice.lines[0], description: "Trays & <lids>", note: "a & b" };
    const xml = buildUblInvoice(invoice);
    expect(xml).toContain("Fox &amp; Hound &lt;Sterile&gt;");
    const view = readUblDocument(xml);
    expect(view.buyer?.name).toBe(name);
    expect(view.lines[0].itemName).toBe("Trays & <lids>");
    expect(validateEn16931(view)).toEqual([]);
  });

  it("refuses characters XML cannot carry, naming the field", () => {
    const invoice = peppolBaseExample();
    invoice.supplier = { ...invoice.supplier, name: "Larkmoor\u0007 Sterile" };
    expect(() => buildUblInvoice(invoice)).toThrow(/seller name contains the character U\+0007 at position 9/);
  });

  it("refuses documents it cannot write correctly", () => {
    const mismatch = peppolBaseExample();
    mismatch.lines[0] = { ...mismatch.lines[0], netAmountMinor: 279_999 };
    expect(() => buildUblInvoice(mismatch)).toThrow(/line 1: net amount 2799.99 is not quantity 7 × unit price 400.00/);
    expect(() => buildUblInvoice({ ...peppolBaseExample(), lines: [] })).toThrow(/BR-16/);
    expect(() => buildUblInvoice({ ...peppolBaseExample(), dueDate: undefined, paymentTerms: undefined })).toThrow(/BR-CO-25/);
    expect(() => buildUblInvoice({ ...peppolBaseExample(), paymentMeans: { code: "58" } })).toThrow(/BR-61/);
    expect(() => buildUblInvoice({ ...peppolBaseExample(), issueDate: "2026-02-30" })).toThrow(/YYYY-MM-DD/);
    const negativePrice = peppolBaseExample();
    negativePrice.lines[1] = { ...negativePrice.lines[1], quantity: 3, unitPriceMinor: -50_000 };
    expect(() => buildUblInvoice(negativePrice)).toThrow(/BR-27/);
  });
});

describe("reading UBL", () => {
  it("reports where XML is not well-formed", () => {
    try {
      readUblDocument('<?xml version="1.0"?>\n<Invoice>\n  <ID>1</Invoice>');
      throw new Error("expected an error");
    } catch (error) {
      expect(error).toBeInstanceOf(PricingError);
      expect((error as PricingError).message).toMatch(/line 3, column \d+/);
    }
  });

  it("refuses a root that is not a UBL invoice or credit note", () => {
    expect(() => readUblDocument('<Order xmlns="urn:x"><ID>1</ID></Order>')).toThrow(/Invoice or CreditNote/);
    expect(() => readUblDocument('<Invoice xmlns="urn:not-ubl"><ID>1</ID></Invoice>')).toThrow(/namespace/);
  });

  it("reports missing mandatory content of a bare document", () => {
    const bare = '<Invoice xmlns="urn:oasis:names:specification:ubl:schema:xsd:Invoice-2"><ID>1</ID></Invoice>';
    const rules = rulesOf(bare);
    expect(rules).toEqual(
      expect.arrayContaining(["BR-01", "BR-03", "BR-04", "BR-05", "BR-06", "BR-07", "BR-08", "BR-10", "BR-12", "BR-13", "BR-14", "BR-15", "BR-16", "BR-CO-18"]),
    );
    expect(rules).not.toContain("BR-02");
  });
});
