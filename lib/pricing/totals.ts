// EN 16931 document totals and VAT breakdown, in integer minor units.
//
// Amounts are integers of minor units, so every line and total already has exactly two decimals.
// VAT is computed once per category and rate on that group's taxable amount (BR-CO-17), never per
// line, and rounded half away from zero (commercial rounding: EN 16931 leaves the tie rule open).

import { PricingError } from "./errors";
import { applyBasisPoints, assertInteger, sumExact } from "./money";
import {
  VAT_CATEGORY_CODES,
  VAT_RULE_FAMILY,
  type DocumentAllowanceCharge,
  type InvoiceLine,
  type InvoiceTotals,
  type VatBreakdown,
  type VatTreatment,
} from "./types";

/** What the totals need from a line. */
export type TotalsLine = Pick<InvoiceLine, "netAmountMinor" | "vat">;

export interface PaymentAdjustments {
  /** Paid amount (BT-113), already received before this document. */
  prepaidMinor?: number;
  /** Rounding amount (BT-114), added to reach a payable amount in a coin the payer can use. */
  roundingMinor?: number;
}

const ZERO_RATE_CATEGORIES = new Set(["Z", "E", "AE", "K", "G", "O"]);
const REASON_REQUIRED = new Set(["E", "AE", "K", "G", "O"]);

// Throws unless the category and rate agree with EN 16931 (BR-S-05, BR-Z-05, BR-E-05 and siblings).
export function assertVatTreatment(vat: VatTreatment, what: string): void {
  if (!vat || !VAT_CATEGORY_CODES.includes(vat.category)) {
    throw new PricingError("invalid_vat", `${what}: VAT category must be one of ${VAT_CATEGORY_CODES.join(", ")}`, { field: what });
  }
  const rate = vat.rateBasisPoints;
  if (!Number.isSafeInteger(rate) || rate < 0 || rate > 10_000) {
    throw new PricingError("invalid_vat", `${what}: VAT rate must be whole basis points from 0 to 10000 (2000 = 20 %), got ${rate}`, {
      field: what,
    });
  }
  if (vat.category === "S" && rate === 0) {
    throw new PricingError("invalid_vat", `${what}: a standard-rated (S) item needs a VAT rate above zero (BR-S-05)`, { field: what });
  }
  if (ZERO_RATE_CATEGORIES.has(vat.category) && rate !== 0) {
    throw new PricingError("invalid_vat", `${what}: VAT category ${vat.category} must have rate 0 (BR-${VAT_RULE_FAMILY[vat.category]}-05)`, { field: what });
  }
  const reason = vat.exemptionReason?.trim();
  if (REASON_REQUIRED.has(vat.category) && !reason) {
    throw new PricingError("invalid_vat", `${what}: VAT category ${vat.category} needs an exemption reason text (BR-${VAT_RULE_FAMILY[vat.category]}-10)`, {
      field: what,
    });
  }
  if (!REASON_REQUIRED.has(vat.category) && reason) {
    throw new PricingError("invalid_vat", `${what}: VAT category ${vat.category} must not carry an exemption reason (BR-${VAT_RULE_FAMILY[vat.category]}-10)`, {
      field: what,
    });
  }
}

// VAT on one category's taxable amount: taxable × rate / 100, half away from zero (BR-CO-17).
export function vatOnTaxableAmount(taxableAmountMinor: number, rateBasisPoints: number): number {
  return applyBasisPoints(taxableAmountMinor, rateBasisPoints);
}

interface Group {
  category: VatTreatment["category"];
  rateBasisPoints: number;
  exemptionReason?: string;
  amounts: number[];
}

/**
 * Totals of an invoice or credit note: BR-CO-10 line total, BR-CO-11/12 allowance and charge
 * totals, BR-CO-13 total without VAT, BR-CO-17 VAT per category and rate, BR-CO-14 total VAT,
 * BR-CO-15 total with VAT and BR-CO-16 amount due = total with VAT − prepaid + rounding.
 * The breakdown is sorted by category (in `VAT_CATEGORY_CODES` order), then by rate descending.
 */
export function computeInvoiceTotals(
  lines: readonly TotalsLine[],
  documentLevelAllowancesCharges: readonly DocumentAllowanceCharge[] = [],
  payment: PaymentAdjustments = {},
): InvoiceTotals {
  const groups = new Map<string, Group>();
  const addToGroup = (vat: VatTreatment, amount: number, what: string) => {
    assertVatTreatment(vat, what);
    const key = `${vat.category}|${vat.rateBasisPoints}`;
    const reason = vat.exemptionReason?.trim() || undefined;
    let group = groups.get(key);
    if (!group) {
      group = { category: vat.category, rateBasisPoints: vat.rateBasisPoints, exemptionReason: reason, amounts: [] };
      groups.set(key, group);
    } else if (group.exemptionReason !== reason) {
      throw new PricingError(
        "invalid_vat",
        `${what}: VAT category ${vat.category} at this rate already has the exemption reason ${JSON.stringify(group.exemptionReason)}; one breakdown carries one reason`,
        { field: what },
      );
    }
    group.amounts.push(amount);
  };

  const lineAmounts = lines.map((line, index) => {
    const amount = assertInteger(line.netAmountMinor, `line ${index + 1} net amount`);
    addToGroup(line.vat, amount, `line ${index + 1}`);
    return amount;
  });

  const allowances: number[] = [];
  const charges: number[] = [];
  documentLevelAllowancesCharges.forEach((entry, index) => {
    const what = `document ${entry.chargeIndicator ? "charge" : "allowance"} ${index + 1}`;
    const amount = assertInteger(entry.amountMinor, `${what} amount`, { min: 0 });
    if (!entry.reason?.trim() && !entry.reasonCode?.trim()) {
      throw new PricingError("invalid_document", `${what} needs a reason or a reason code (BR-33, BR-38)`, { field: what });
    }
    (entry.chargeIndicator ? charges : allowances).push(amount);
    addToGroup(entry.vat, entry.chargeIndicator ? amount : -amount, what);
  });

  const categories = new Set([...groups.values()].map((group) => group.category));
  if (categories.has("O") && categories.size > 1) {
    throw new PricingError("invalid_vat", "a document with items not subject to VAT (O) cannot hold other VAT categories (BR-O-11)");
  }

  const vatBreakdown: VatBreakdown[] = [...groups.values()]
    .sort(
      (a, b) =>
        VAT_CATEGORY_CODES.indexOf(a.category) - VAT_CATEGORY_CODES.indexOf(b.category) || b.rateBasisPoints - a.rateBasisPoints,
    )
    .map((group) => {
      const taxableAmountMinor = sumExact(group.amounts, `taxable amount of VAT ${group.category}`);
      const breakdown: VatBreakdown = {
        category: group.category,
        rateBasisPoints: group.rateBasisPoints,
        taxableAmountMinor,
        taxAmountMinor: vatOnTaxableAmount(taxableAmountMinor, group.rateBasisPoints),
      };
      if (group.exemptionReason) breakdown.exemptionReason = group.exemptionReason;
      return breakdown;
    });

  const lineTotalMinor = sumExact(lineAmounts, "sum of line net amounts");
  const allowanceTotalMinor = sumExact(allowances, "sum of allowances");
  const chargeTotalMinor = sumExact(charges, "sum of charges");
  const taxExclusiveMinor = sumExact([lineTotalMinor, -allowanceTotalMinor, chargeTotalMinor], "total without VAT");
  const vatTotalMinor = sumExact(
    vatBreakdown.map((entry) => entry.taxAmountMinor),
    "total VAT",
  );
  const taxInclusiveMinor = sumExact([taxExclusiveMinor, vatTotalMinor], "total with VAT");
  const prepaidMinor = assertInteger(payment.prepaidMinor ?? 0, "paid amount");
  const roundingMinor = assertInteger(payment.roundingMinor ?? 0, "rounding amount");
  const payableMinor = sumExact([taxInclusiveMinor, -prepaidMinor, roundingMinor], "amount due");

  return {
    lineTotalMinor,
    allowanceTotalMinor,
    chargeTotalMinor,
    taxExclusiveMinor,
    vatTotalMinor,
    taxInclusiveMinor,
    prepaidMinor,
    roundingMinor,
    payableMinor,
    vatBreakdown,
  };
}
