// Invented contract terms, parties and cycles for the pricing tests.

import type { ContractTerms, CycleFlags, InvoiceDocument, PricedCycleInput, TradeParty } from "@/lib/pricing/types";

export const NO_FLAGS: CycleFlags = {
  heavySoil: false,
  outOfHours: false,
  missingInstrumentInvestigation: false,
  lowTemperature: false,
  loaner: false,
};

/** A contract in GBP at 20 % VAT with every set class and surcharge kind priced. */
export function makeTerms(overrides: Partial<ContractTerms> = {}): ContractTerms {
  return {
    contractId: "K-2026-014",
    validFrom: "2026-01-01T00:00:00Z",
    validTo: null,
    currency: "GBP",
    vat: { category: "S", rateBasisPoints: 2000 },
    paymentTermsDays: 30,
    turnaroundHours: { standard: 24, express: 5 },
    minimumMonthlyFeeMinor: 0,
    slaCreditBasisPoints: 1000,
    rateCard: {
      currency: "GBP",
      classes: [
        {
          setClass: "basic_tray",
          label: "Basic tray",
          bands: [
            { upToQuantity: 500, unitPriceMinor: 950 },
            { upToQuantity: 1000, unitPriceMinor: 890 },
            { upToQuantity: null, unitPriceMinor: 820 },
          ],
        },
        { setClass: "major_tray", label: "Major tray", bands: [{ upToQuantity: null, unitPriceMinor: 2450 }] },
        { setClass: "single_pouch", label: "Single pouched instrument", bands: [{ upToQuantity: null, unitPriceMinor: 180 }] },
        { setClass: "rigid_container", label: "Rigid container", bands: [{ upToQuantity: null, unitPriceMinor: 3100 }] },
        { setClass: "loaner_set", label: "Loaner set", bands: [{ upToQuantity: null, unitPriceMinor: 4200 }] },
        { setClass: "dental_cassette", label: "Dental cassette", bands: [{ upToQuantity: null, unitPriceMinor: 1250 }] },
      ],
      surcharges: [
        { kind: "express", basis: "percent_of_fee", basisPoints: 5000 },
        { kind: "out_of_hours", basis: "per_set", amountMinor: 1500 },
        { kind: "heavy_soil", basis: "per_set", amountMinor: 350 },
        { kind: "missing_instrument_investigation", basis: "per_set", amountMinor: 2500 },
        { kind: "low_temperature", basis: "percent_of_fee", basisPoints: 2000 },
        { kind: "loaner", basis: "per_set", amountMinor: 1800 },
      ],
    },
    ...overrides,
  };
}

export const MARCH_2026 = { start: "2026-03-01T00:00:00Z", end: "2026-04-01T00:00:00Z" };

/** A cycle delivered `minute` minutes after the start of March 2026 (UTC). */
export function cycle(id: string, setClass: string, minute: number, extra: Partial<PricedCycleInput> = {}): PricedCycleInput {
  return {
    cycleId: id,
    setClass,
    serviceLevel: "standard",
    flags: { ...NO_FLAGS },
    late: false,
    deliveredAt: new Date(Date.UTC(2026, 2, 1) + minute * 60_000).toISOString(),
    ...extra,
  };
}

/** `count` basic trays delivered one minute apart, ids C0001, C0002, … */
export function basicTrays(count: number, prefix = "C"): PricedCycleInput[] {
  return Array.from({ length: count }, (_, index) => cycle(`${prefix}${String(index + 1).padStart(4, "0")}`, "basic_tray", index));
}

export const SUPPLIER: TradeParty = {
  name: "Larkmoor Sterile Services Ltd",
  tradingName: "Larkmoor Sterile Services",
  endpoint: { scheme: "0088", id: "9520000000017" },
  vatId: "GB000000000",
  legalRegistrationId: "00000000",
  address: { street: "4 Kilnworth Yard", city: "Larkmoor", postalCode: "LM1 4QZ", countryCode: "GB" },
  contact: { name: "Billing desk", email: "billing@larkmoor.example" },
};

export const CUSTOMER: TradeParty = {
  name: "Brackenfold Day Surgery LLP",
  endpoint: { scheme: "0088", id: "9520000000024" },
  vatId: "GB000000001",
  address: { street: "Unit 2, Tansy Lane", city: "Brackenfold", postalCode: "BF3 9XR", countryCode: "GB" },
};

/** The document-level fields of an invoice, around the lines a test supplies. */
export function invoiceShell(overrides: Partial<InvoiceDocument> = {}): InvoiceDocument {
  return {
    id: "INV-2026-0001",
    issueDate: "2026-04-02",
    dueDate: "2026-05-02",
    currency: "GBP",
    buyerReference: "PO-88412",
    supplier: SUPPLIER,
    customer: CUSTOMER,
    paymentMeans: { code: "30", paymentId: "INV-2026-0001", account: { id: "GB00LARK00000000000000", name: "Larkmoor Sterile Services Ltd" } },
    paymentTerms: "Payment within 30 days",
    lines: [],
    ...overrides,
  };
}
