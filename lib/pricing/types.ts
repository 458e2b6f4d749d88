// Types shared by the pricing engine, the EN 16931 totals, credit notes and the UBL export.
//
// Money is always an integer number of minor units (cents, pence) of the contract's currency.
// Percentages are integer basis points: 1 % = 100 bp, so 25 % = 2500 and 5.5 % = 550. Basis
// points keep every computation in integers and cover every VAT rate in use in Europe (none has
// more than two decimals).

/** How quickly the customer asked for a set back (DESIGN.md: pickup orders). */
export type ServiceLevel = "standard" | "express";

export const SERVICE_LEVELS: readonly ServiceLevel[] = ["standard", "express"];

/**
 * Surcharges a rate card can price. The order of this list is the order of the surcharge lines
 * on an invoice.
 */
export const SURCHARGE_KINDS = [
  "express",
  "out_of_hours",
  "heavy_soil",
  "missing_instrument_investigation",
  "low_temperature",
  "loaner",
] as const;

export type SurchargeKind = (typeof SURCHARGE_KINDS)[number];

/**
 * One band of a graduated (tiered) monthly volume price. `upToQuantity` is the cumulative count
 * of sets of the class in the month up to which this band applies (inclusive); the last band has
 * `null` (no upper limit). Each band is priced at its own rate: with bands up to 500 at 950 and
 * up to 1000 at 890, the 501st set costs 890 and the first 500 still cost 950 each.
 */
export interface VolumeBand {
  upToQuantity: number | null;
  unitPriceMinor: number;
}

/** The processing fee of one set class, e.g. `basic_tray`, `loaner_set`, `dental_cassette`. */
export interface SetClassRate {
  setClass: string;
  /** Shown on the invoice line, e.g. "Basic tray". */
  label: string;
  /** At least one band; a flat price is a single band with `upToQuantity: null`. */
  bands: VolumeBand[];
}

/**
 * A surcharge is either a fixed amount per set that carries it, or a percentage of that set's
 * processing fee (the band price the set was counted at, see `PricedCycle.feeMinor`). Surcharges
 * never compound: each percentage applies to the processing fee alone.
 */
export type SurchargeRule =
  | { kind: SurchargeKind; label?: string; basis: "per_set"; amountMinor: number }
  | { kind: SurchargeKind; label?: string; basis: "percent_of_fee"; basisPoints: number };

export interface RateCard {
  /** ISO 4217 code the amounts of this card are in; must equal the contract's currency. */
  currency: string;
  classes: SetClassRate[];
  /** At most one rule per kind; a kind without a rule is not charged (the result warns). */
  surcharges: SurchargeRule[];
}

/**
 * VAT category codes of EN 16931 (UNCL5305 subset): S standard rate, Z zero rated, E exempt,
 * AE reverse charge, K intra-community supply, G export outside the EU, O not subject to VAT,
 * L Canary Islands (IGIC), M Ceuta and Melilla (IPSI).
 */
export type VatCategoryCode = "S" | "Z" | "E" | "AE" | "K" | "G" | "O" | "L" | "M";

export const VAT_CATEGORY_CODES: readonly VatCategoryCode[] = ["S", "Z", "E", "AE", "K", "G", "O", "L", "M"];

/** The infix EN 16931 uses in the rule ids of each category, e.g. K → BR-IC-08. */
export const VAT_RULE_FAMILY: Record<VatCategoryCode, string> = {
  S: "S",
  Z: "Z",
  E: "E",
  AE: "AE",
  K: "IC",
  G: "G",
  O: "O",
  L: "IG",
  M: "IP",
};

/** The VAT treatment of a line, allowance or charge. */
export interface VatTreatment {
  category: VatCategoryCode;
  /** 2000 = 20 %. Must be > 0 for S and 0 for Z, E, AE, K, G and O (EN 16931 BR-x-05). */
  rateBasisPoints: number;
  /** Required by EN 16931 for E, AE, K, G and O (BR-E-10 and siblings), e.g. "Reverse charge". */
  exemptionReason?: string;
}

/** The parts of a contract version that pricing needs. */
export interface ContractTerms {
  contractId: string;
  /** Start of the validity of this contract version, ISO-8601 instant, inclusive. */
  validFrom: string;
  /** End of validity, ISO-8601 instant, exclusive; `null` while open-ended. */
  validTo: string | null;
  /** ISO 4217 alphabetic code with two minor digits (EN 16931 amounts carry two decimals). */
  currency: string;
  vat: VatTreatment;
  paymentTermsDays: number;
  /** Agreed turnaround per service level; the turnaround clock uses it to decide `late`. */
  turnaroundHours: Record<ServiceLevel, number>;
  /** Floor on processing fees plus surcharges in one billing period, before SLA credits. */
  minimumMonthlyFeeMinor: number;
  /** Credit per late set as a share of that set's processing fee, e.g. 1000 = 10 %. */
  slaCreditBasisPoints: number;
  rateCard: RateCard;
}

export interface CycleFlags {
  heavySoil: boolean;
  outOfHours: boolean;
  missingInstrumentInvestigation: boolean;
  lowTemperature: boolean;
  loaner: boolean;
}

/** One delivered cycle to bill. Whether it was late is decided by the turnaround clock. */
export interface PricedCycleInput {
  cycleId: string;
  setClass: string;
  serviceLevel: ServiceLevel;
  flags: CycleFlags;
  late: boolean;
  /** ISO-8601 instant (with Z or an offset) or a Date. */
  deliveredAt: string | Date;
}

/** A billing period, half-open [start, end), as ISO-8601 instants or Dates. */
export interface BillingPeriod {
  start: string | Date;
  end: string | Date;
}

export type InvoiceLineKind = "processing" | "surcharge" | "sla_credit" | "minimum_fee_top_up" | "other";

/**
 * One invoice line (EN 16931 BG-25). Always `netAmountMinor === quantity * unitPriceMinor` and
 * `unitPriceMinor >= 0` (BR-27); a negative line has a negative quantity.
 */
export interface InvoiceLine {
  /** Line identifier (BT-126), unique within the document. */
  id: string;
  kind: InvoiceLineKind;
  /** Seller's item identifier (BT-155), e.g. `set:basic_tray` or `surcharge:express`. */
  itemCode: string;
  /** Item name (BT-153). */
  description: string;
  /** Free-text line note (BT-127), e.g. how a percentage line was computed. */
  note?: string;
  /** Invoiced quantity (BT-129), an integer. */
  quantity: number;
  /** UN/ECE Recommendation 20 unit code (BT-130); `C62` ("one") unless given. */
  unitCode?: string;
  unitPriceMinor: number;
  netAmountMinor: number;
  vat: VatTreatment;
  /** The cycles this line was priced from (empty for lines not priced from cycles). */
  cycleIds: string[];
}

/** A document-level allowance (BG-20) or charge (BG-21). The amount is never negative. */
export interface DocumentAllowanceCharge {
  chargeIndicator: boolean;
  amountMinor: number;
  reason: string;
  /** UNCL5189 (allowances) or UNCL7161 (charges) code, if any. */
  reasonCode?: string;
  vat: VatTreatment;
}

/** VAT breakdown of one category and rate (BG-23). */
export interface VatBreakdown {
  category: VatCategoryCode;
  rateBasisPoints: number;
  /** BT-116: Σ line net + charges − allowances of this category and rate. */
  taxableAmountMinor: number;
  /** BT-117: taxable × rate / 100, rounded half away from zero to a minor unit (BR-CO-17). */
  taxAmountMinor: number;
  exemptionReason?: string;
}

/** Document totals (BG-22) and the VAT breakdown. */
export interface InvoiceTotals {
  /** BT-106, BR-CO-10. */
  lineTotalMinor: number;
  /** BT-107, BR-CO-11. */
  allowanceTotalMinor: number;
  /** BT-108, BR-CO-12. */
  chargeTotalMinor: number;
  /** BT-109, BR-CO-13. */
  taxExclusiveMinor: number;
  /** BT-110, BR-CO-14. */
  vatTotalMinor: number;
  /** BT-112, BR-CO-15. */
  taxInclusiveMinor: number;
  /** BT-113. */
  prepaidMinor: number;
  /** BT-114. */
  roundingMinor: number;
  /** BT-115, BR-CO-16. */
  payableMinor: number;
  vatBreakdown: VatBreakdown[];
}

export interface PostalAddress {
  street?: string;
  additionalStreet?: string;
  city?: string;
  postalCode?: string;
  region?: string;
  /** ISO 3166-1 alpha-2. */
  countryCode: string;
}

/** Seller (BG-4) or buyer (BG-7). */
export interface TradeParty {
  /** Legal name (BT-27 / BT-44). */
  name: string;
  tradingName?: string;
  /** Electronic address (BT-34 / BT-49) with its EAS scheme, as Peppol requires. */
  endpoint: { scheme: string; id: string };
  /** Party identifier (BT-29 / BT-46). */
  partyId?: string;
  /** VAT identifier with country prefix (BT-31 / BT-48). */
  vatId?: string;
  /** Legal registration identifier (BT-30 / BT-47). */
  legalRegistrationId?: string;
  address: PostalAddress;
  contact?: { name?: string; telephone?: string; email?: string };
}

/** Payment instructions (BG-16). `code` is UNCL4461, e.g. 30 credit transfer, 58 SEPA, 68 online. */
export interface PaymentMeans {
  code: string;
  /** Remittance information (BT-83). */
  paymentId?: string;
  /** Payment account (BT-84), required for codes 30 and 58 (BR-61). */
  account?: { id: string; name?: string; bankId?: string };
}

/** The document-level data of an invoice or credit note. */
export interface CommercialDocumentBase {
  /** BT-1. */
  id: string;
  /** BT-2, YYYY-MM-DD. */
  issueDate: string;
  /** ISO 4217 (BT-5). */
  currency: string;
  /** BT-10; Peppol requires it or an order reference. */
  buyerReference?: string;
  note?: string;
  /** BG-14, dates YYYY-MM-DD, both inclusive. */
  invoicePeriod?: { startDate: string; endDate: string };
  supplier: TradeParty;
  customer: TradeParty;
  paymentMeans?: PaymentMeans;
  /** BT-20. */
  paymentTerms?: string;
  lines: InvoiceLine[];
  allowancesCharges?: DocumentAllowanceCharge[];
  /** BT-113. */
  prepaidMinor?: number;
  /** BT-114. */
  roundingMinor?: number;
}

export interface InvoiceDocument extends CommercialDocumentBase {
  /** BT-9, YYYY-MM-DD. */
  dueDate?: string;
}

/** A credit note line, remembering which invoice line it credits (if any). */
export interface CreditNoteLine extends InvoiceLine {
  creditsLineId?: string;
}

export interface CreditNoteDocument extends CommercialDocumentBase {
  lines: CreditNoteLine[];
  /** Preceding invoice reference (BG-3). */
  precedingInvoice: { id: string; issueDate: string };
  /** Due date of a refund, if any; in UBL it goes to PaymentMeans/PaymentDueDate. */
  dueDate?: string;
}
