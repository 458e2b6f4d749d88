// Checks an invoice or credit note, as read back from its XML (`readUblDocument`), against a
// subset of the EN 16931 business rules, using exact decimal arithmetic on the written values.
//
// Implemented, with the rule ids of the published EN 16931 validation artefacts:
// - mandatory content: BR-01 to BR-16, BR-21 to BR-27, BR-CO-04, BR-CO-18, BR-45 to BR-48,
//   BR-61, BR-CO-25;
// - calculations: BR-CO-10 to BR-CO-17, and per VAT category the taxable amount
//   (BR-S-08, BR-Z-08, BR-E-08, BR-AE-08, BR-IC-08, BR-G-08, BR-O-08, BR-IG-08, BR-IP-08),
//   the presence of a breakdown (BR-S-01 and siblings) and zero tax where the category has none
//   (BR-Z-09 and siblings), and PEPPOL-EN16931-R120 (line amount = quantity × price ÷ base
//   quantity, within 0.02, for lines without line-level allowances or charges);
// - decimals: BR-DEC-01, -05, -09 to -14, -16 to -20, -23 (at most two written decimals);
// - PEPPOL-EN16931-R051: every amount in the document currency (BT-111 excepted);
// - UBL-DT-01: amounts are decimal numbers; "UBL-XSD" marks a value the UBL schema itself refuses
//   (here: a ChargeIndicator that is not a boolean).
// BR-CO-17 accepts any rounding of taxable × rate / 100 to the nearest cent (ties either way),
// since EN 16931 does not fix the tie rule; our own documents round ties away from zero.

import { parseDecimal, type ExactDecimal } from "./money";
import { VAT_CATEGORY_CODES, VAT_RULE_FAMILY, type VatCategoryCode } from "./types";

/** An amount as written: its text, its currencyID attribute and where it was found. */
export interface En16931AmountText {
  value: string;
  currencyId?: string;
  path: string;
}

export interface En16931PartyView {
  name?: string;
  vatId?: string;
  legalRegistrationId?: string;
  endpointId?: string;
  hasPostalAddress: boolean;
  countryCode?: string;
}

export interface En16931AllowanceChargeView {
  path: string;
  chargeIndicator?: string;
  amount?: En16931AmountText;
  reason?: string;
  reasonCode?: string;
  vatCategory?: string;
  vatRate?: string;
}

export interface En16931VatSubtotalView {
  path: string;
  taxable?: En16931AmountText;
  tax?: En16931AmountText;
  category?: string;
  rate?: string;
  exemptionReason?: string;
  exemptionReasonCode?: string;
}

export interface En16931LineView {
  path: string;
  id?: string;
  quantity?: string;
  unitCode?: string;
  netAmount?: En16931AmountText;
  itemName?: string;
  price?: En16931AmountText;
  baseQuantity?: string;
  vatCategory?: string;
  vatRate?: string;
  lineAllowanceChargeCount: number;
}

/** An invoice or credit note, syntax-neutral, with every value as written. */
export interface En16931DocumentView {
  documentType: "Invoice" | "CreditNote";
  customizationId?: string;
  profileId?: string;
  id?: string;
  issueDate?: string;
  dueDate?: string;
  typeCode?: string;
  currency?: string;
  paymentTerms?: string;
  precedingInvoiceId?: string;
  seller?: En16931PartyView;
  buyer?: En16931PartyView;
  paymentMeans: { code?: string; accountId?: string }[];
  allowancesCharges: En16931AllowanceChargeView[];
  taxTotals: { taxAmount?: En16931AmountText; subtotals: En16931VatSubtotalView[] }[];
  totals: {
    lineTotal?: En16931AmountText;
    taxExclusive?: En16931AmountText;
    taxInclusive?: En16931AmountText;
    allowanceTotal?: En16931AmountText;
    chargeTotal?: En16931AmountText;
    prepaid?: En16931AmountText;
    rounding?: En16931AmountText;
    payable?: En16931AmountText;
  };
  lines: En16931LineView[];
}

export interface En16931Violation {
  /** Rule id as in the EN 16931 / Peppol artefacts, e.g. "BR-CO-15". */
  rule: string;
  message: string;
  /** XPath-like location of the offending element, when there is one. */
  path?: string;
}

// ---- exact decimal arithmetic on written values ----

const ZERO: ExactDecimal = { units: 0n, scale: 0 };

function scaled(value: ExactDecimal, scale: number): bigint {
  return value.units * 10n ** BigInt(scale - value.scale);
}

function add(a: ExactDecimal, b: ExactDecimal): ExactDecimal {
  const scale = Math.max(a.scale, b.scale);
  return { units: scaled(a, scale) + scaled(b, scale), scale };
}

function negate(a: ExactDecimal): ExactDecimal {
  return { units: -a.units, scale: a.scale };
}

function multiply(a: ExactDecimal, b: ExactDecimal): ExactDecimal {
  return { units: a.units * b.units, scale: a.scale + b.scale };
}

function compare(a: ExactDecimal, b: ExactDecimal): number {
  const scale = Math.max(a.scale, b.scale);
  const difference = scaled(a, scale) - scaled(b, scale);
  return difference === 0n ? 0 : difference < 0n ? -1 : 1;
}

function absolute(a: ExactDecimal): ExactDecimal {
  return a.units < 0n ? negate(a) : a;
}

function sum(values: ExactDecimal[]): ExactDecimal {
  return values.reduce(add, ZERO);
}

function show(value: ExactDecimal): string {
  const negative = value.units < 0n;
  const digits = (negative ? -value.units : value.units).toString().padStart(value.scale + 1, "0");
  const whole = value.scale === 0 ? digits : `${digits.slice(0, -value.scale)}.${digits.slice(-value.scale)}`;
  return `${negative ? "-" : ""}${whole}`;
}

// Normalised text of a decimal for grouping ("25", "25.0" and "25.00" are one rate).
function rateKey(value: ExactDecimal | undefined): string {
  if (!value) return "none";
  let { units, scale } = value;
  while (scale > 0 && units % 10n === 0n) {
    units /= 10n;
    scale -= 1;
  }
  return `${units}e-${scale}`;
}

// taxable × rate / 100 rounded half away from zero to two decimals, for messages.
function expectedTax(taxable: ExactDecimal, rate: ExactDecimal): ExactDecimal {
  const product = multiply(taxable, rate); // scale: taxable.scale + rate.scale, still "× 100"
  const exactScale = product.scale + 2; // dividing by 100
  const shift = 10n ** BigInt(exactScale - 2);
  const negative = product.units < 0n;
  const magnitude = negative ? -product.units : product.units;
  const rounded = (magnitude * 2n + shift) / (shift * 2n);
  return { units: negative ? -rounded : rounded, scale: 2 };
}

const TAX_FREE_CATEGORIES: readonly VatCategoryCode[] = ["Z", "E", "AE", "K", "G", "O"];

/** Every check run on the view, returning the rules it breaks (empty when it passes them all). */
export function validateEn16931(doc: En16931DocumentView): En16931Violation[] {
  const violations: En16931Violation[] = [];
  const report = (rule: string, message: string, path?: string) => violations.push(path ? { rule, message, path } : { rule, message });
  const base = `/${doc.documentType}`;

  const amount = (value: En16931AmountText | undefined, decimalsRule?: string): ExactDecimal | undefined => {
    if (!value) return undefined;
    const parsed = parseDecimal(value.value);
    if (!parsed) {
      report("UBL-DT-01", `${value.path} is ${JSON.stringify(value.value)}, not a decimal amount`, value.path);
      return undefined;
    }
    if (decimalsRule && parsed.scale > 2) {
      report(decimalsRule, `${value.path} has ${parsed.scale} decimals (${value.value}); at most 2 are allowed`, value.path);
    }
    if (doc.currency) {
      if (value.currencyId === undefined) {
        report("PEPPOL-EN16931-R051", `${value.path} has no currencyID; it must be ${doc.currency}`, value.path);
      } else if (value.currencyId !== doc.currency) {
        report("PEPPOL-EN16931-R051", `${value.path} is in ${value.currencyId}, the document in ${doc.currency}`, value.path);
      }
    }
    return parsed;
  };
  const decimalText = (value: string | undefined, rule: string, what: string, path: string): ExactDecimal | undefined => {
    if (value === undefined) return undefined;
    const parsed = parseDecimal(value);
    if (!parsed) report(rule, `${what} is ${JSON.stringify(value)}, not a decimal number`, path);
    return parsed ?? undefined;
  };

  // ---- document header (BR-01 to BR-11) ----
  if (!doc.customizationId) report("BR-01", "the Specification identifier (BT-24, CustomizationID) is missing", `${base}/cbc:CustomizationID`);
  if (!doc.id) report("BR-02", "the Invoice number (BT-1, ID) is missing", `${base}/cbc:ID`);
  if (!doc.issueDate) report("BR-03", "the Invoice issue date (BT-2) is missing", `${base}/cbc:IssueDate`);
  else if (!/^\d{4}-\d{2}-\d{2}$/.test(doc.issueDate)) {
    report("BR-03", `the Invoice issue date (BT-2) is ${JSON.stringify(doc.issueDate)}, not a YYYY-MM-DD date`, `${base}/cbc:IssueDate`);
  }
  if (!doc.typeCode) report("BR-04", "the Invoice type code (BT-3) is missing", base);
  if (!doc.currency) report("BR-05", "the Invoice currency code (BT-5) is missing", `${base}/cbc:DocumentCurrencyCode`);
  if (!doc.seller?.name) report("BR-06", "the Seller name (BT-27, PartyLegalEntity/RegistrationName) is missing", `${base}/cac:AccountingSupplierParty`);
  if (!doc.buyer?.name) report("BR-07", "the Buyer name (BT-44, PartyLegalEntity/RegistrationName) is missing", `${base}/cac:AccountingCustomerParty`);
  if (!doc.seller?.hasPostalAddress) report("BR-08", "the Seller postal address (BG-5) is missing", `${base}/cac:AccountingSupplierParty`);
  else if (!doc.seller.countryCode) report("BR-09", "the Seller postal address has no country code (BT-40)", `${base}/cac:AccountingSupplierParty`);
  if (!doc.buyer?.hasPostalAddress) report("BR-10", "the Buyer postal address (BG-8) is missing", `${base}/cac:AccountingCustomerParty`);
  else if (!doc.buyer.countryCode) report("BR-11", "the Buyer postal address has no country code (BT-55)", `${base}/cac:AccountingCustomerParty`);

  // ---- totals (BR-12 to BR-15) ----
  const totalsPath = `${base}/cac:LegalMonetaryTotal`;
  const t = doc.totals;
  if (!t.lineTotal) report("BR-12", "the Sum of Invoice line net amount (BT-106) is missing", totalsPath);
  if (!t.taxExclusive) report("BR-13", "the Invoice total amount without VAT (BT-109) is missing", totalsPath);
  if (!t.taxInclusive) report("BR-14", "the Invoice total amount with VAT (BT-112) is missing", totalsPath);
  if (!t.payable) report("BR-15", "the Amount due for payment (BT-115) is missing", totalsPath);
  const lineTotal = amount(t.lineTotal, "BR-DEC-09");
  const allowanceTotal = amount(t.allowanceTotal, "BR-DEC-10");
  const chargeTotal = amount(t.chargeTotal, "BR-DEC-11");
  const taxExclusive = amount(t.taxExclusive, "BR-DEC-12");
  const taxInclusive = amount(t.taxInclusive, "BR-DEC-14");
  const prepaid = amount(t.prepaid, "BR-DEC-16");
  const rounding = amount(t.rounding, "BR-DEC-17");
  const payable = amount(t.payable, "BR-DEC-18");

  // ---- lines (BR-16, BR-21 to BR-27, BR-CO-04, BR-DEC-23, PEPPOL-EN16931-R120) ----
  if (doc.lines.length === 0) report("BR-16", "the document has no line (BG-25)", base);
  const groups = new Map<string, { category: string; rate?: ExactDecimal; amounts: ExactDecimal[] }>();
  const addToGroup = (category: string | undefined, rate: ExactDecimal | undefined, value: ExactDecimal | undefined) => {
    if (!category || !value) return;
    const key = `${category}|${rateKey(rate)}`;
    const group = groups.get(key) ?? { category, rate, amounts: [] };
    group.amounts.push(value);
    groups.set(key, group);
  };
  const lineAmounts: ExactDecimal[] = [];
  let lineAmountsComplete = true;
  for (const line of doc.lines) {
    const where = line.path;
    if (!line.id) report("BR-21", "a line has no identifier (BT-126)", where);
    if (!line.quantity) report("BR-22", "a line has no invoiced quantity (BT-129)", where);
    if (!line.unitCode) report("BR-23", "a line has no unit of measure code (BT-130)", where);
    if (!line.netAmount) report("BR-24", "a line has no net amount (BT-131)", where);
    if (!line.itemName) report("BR-25", "a line has no item name (BT-153)", where);
    if (!line.price) report("BR-26", "a line has no item net price (BT-146)", where);
    if (!line.vatCategory) report("BR-CO-04", "a line has no VAT category code (BT-151)", where);
    const net = amount(line.netAmount, "BR-DEC-23");
    const price = amount(line.price);
    if (price && price.units < 0n) report("BR-27", `the item net price ${show(price)} is negative`, where);
    const quantity = decimalText(line.quantity, "BR-22", "the invoiced quantity", where);
    const lineRate = decimalText(line.vatRate, "BR-CO-04", "the line VAT rate", where);
    if (line.vatCategory === "S" && (!lineRate || lineRate.units <= 0n)) {
      report("BR-S-05", "a standard-rated line needs a VAT rate above zero (BT-152)", where);
    }
    if (net) lineAmounts.push(net);
    else lineAmountsComplete = false;
    addToGroup(line.vatCategory, lineRate, net);
    if (net && price && quantity && line.lineAllowanceChargeCount === 0) {
      const baseQuantity = decimalText(line.baseQuantity ?? "1", "PEPPOL-EN16931-R120", "the price base quantity", where) ?? { units: 1n, scale: 0 };
      if (baseQuantity.units > 0n) {
        const difference = absolute(add(multiply(net, baseQuantity), negate(multiply(quantity, price))));
        const slack = multiply({ units: 2n, scale: 2 }, baseQuantity);
        if (compare(difference, slack) > 0) {
          report(
            "PEPPOL-EN16931-R120",
            `line net amount ${show(net)} is not quantity ${show(quantity)} × price ${show(price)} / base quantity ${show(baseQuantity)}`,
            where,
          );
        }
      }
    }
  }

  // ---- document allowances and charges (BR-31 to BR-38, BR-CO-11, BR-CO-12) ----
  const allowances: ExactDecimal[] = [];
  const charges: ExactDecimal[] = [];
  for (const entry of doc.allowancesCharges) {
    const isCharge = entry.chargeIndicator === "true" || entry.chargeIndicator === "1";
    if (!isCharge && entry.chargeIndicator !== "false" && entry.chargeIndicator !== "0") {
      report("UBL-XSD", `ChargeIndicator must be a boolean (true or false), got ${JSON.stringify(entry.chargeIndicator)}`, entry.path);
      continue;
    }
    const value = amount(entry.amount, isCharge ? "BR-DEC-05" : "BR-DEC-01");
    if (!entry.amount) report(isCharge ? "BR-36" : "BR-31", `a document level ${isCharge ? "charge" : "allowance"} has no amount`, entry.path);
    if (!entry.vatCategory) report(isCharge ? "BR-37" : "BR-32", `a document level ${isCharge ? "charge" : "allowance"} has no VAT category`, entry.path);
    if (!entry.reason && !entry.reasonCode) {
      report(isCharge ? "BR-38" : "BR-33", `a document level ${isCharge ? "charge" : "allowance"} has neither a reason nor a reason code`, entry.path);
    }
    if (!value) continue;
    (isCharge ? charges : allowances).push(value);
    const rate = decimalText(entry.vatRate, isCharge ? "BR-37" : "BR-32", "the VAT rate", entry.path);
    addToGroup(entry.vatCategory, rate, isCharge ? value : negate(value));
  }

  if (lineTotal && lineAmountsComplete && compare(lineTotal, sum(lineAmounts)) !== 0) {
    report("BR-CO-10", `Sum of line net amounts (BT-106) is ${show(lineTotal)}, but the lines add up to ${show(sum(lineAmounts))}`, t.lineTotal?.path);
  }
  if (allowances.length > 0 || allowanceTotal) {
    const expected = sum(allowances);
    if (!allowanceTotal || compare(allowanceTotal, expected) !== 0) {
      report("BR-CO-11", `Sum of allowances (BT-107) is ${allowanceTotal ? show(allowanceTotal) : "missing"}, the allowances add up to ${show(expected)}`, totalsPath);
    }
  }
  if (charges.length > 0 || chargeTotal) {
    const expected = sum(charges);
    if (!chargeTotal || compare(chargeTotal, expected) !== 0) {
      report("BR-CO-12", `Sum of charges (BT-108) is ${chargeTotal ? show(chargeTotal) : "missing"}, the charges add up to ${show(expected)}`, totalsPath);
    }
  }
  if (taxExclusive && lineTotal) {
    const expected = add(add(lineTotal, negate(allowanceTotal ?? ZERO)), chargeTotal ?? ZERO);
    if (compare(taxExclusive, expected) !== 0) {
      report("BR-CO-13", `Total without VAT (BT-109) is ${show(taxExclusive)}, but lines − allowances + charges = ${show(expected)}`, t.taxExclusive?.path);
    }
  }

  // ---- VAT (BR-CO-14, BR-CO-17, BR-CO-18, BR-45 to BR-48, BR-x-01/-08/-09) ----
  const documentTaxTotals = doc.taxTotals.filter((total) => total.subtotals.length > 0 || total.taxAmount?.currencyId === doc.currency);
  const taxTotal = documentTaxTotals[0];
  const vatTotal = taxTotal ? amount(taxTotal.taxAmount, "BR-DEC-13") : undefined;
  const subtotals = taxTotal?.subtotals ?? [];
  if (subtotals.length === 0) report("BR-CO-18", "the document has no VAT breakdown (BG-23)", `${base}/cac:TaxTotal`);
  const subtotalTaxes: ExactDecimal[] = [];
  let subtotalTaxesComplete = true;
  const breakdownKeys = new Set<string>();
  for (const subtotal of subtotals) {
    const where = subtotal.path;
    if (!subtotal.taxable) report("BR-45", "a VAT breakdown has no taxable amount (BT-116)", where);
    if (!subtotal.tax) report("BR-46", "a VAT breakdown has no tax amount (BT-117)", where);
    if (!subtotal.category) report("BR-47", "a VAT breakdown has no VAT category code (BT-118)", where);
    if (subtotal.rate === undefined && subtotal.category !== "O") report("BR-48", "a VAT breakdown has no VAT rate (BT-119)", where);
    const taxable = amount(subtotal.taxable, "BR-DEC-19");
    const tax = amount(subtotal.tax, "BR-DEC-20");
    const rate = decimalText(subtotal.rate, "BR-48", "the VAT category rate", where);
    if (tax) subtotalTaxes.push(tax);
    else subtotalTaxesComplete = false;
    if (!subtotal.category) continue;
    const key = `${subtotal.category}|${rateKey(rate)}`;
    breakdownKeys.add(key);
    const family = VAT_CATEGORY_CODES.includes(subtotal.category as VatCategoryCode) ? VAT_RULE_FAMILY[subtotal.category as VatCategoryCode] : null;
    if (taxable && tax && rate) {
      // |100 × tax − taxable × rate| ≤ 0.5 ⇔ tax is taxable × rate / 100 rounded to the nearest cent.
      const difference = absolute(add(multiply({ units: 100n, scale: 0 }, tax), negate(multiply(taxable, rate))));
      if (compare(difference, { units: 5n, scale: 1 }) > 0) {
        report(
          "BR-CO-17",
          `VAT ${subtotal.category} at ${show(rate)} %: tax amount ${show(tax)} is not ${show(taxable)} × ${show(rate)} / 100 rounded to two decimals (${show(expectedTax(taxable, rate))})`,
          where,
        );
      }
    }
    if (family && taxable) {
      const group = groups.get(key);
      const expected = sum(group?.amounts ?? []);
      if (compare(taxable, expected) !== 0) {
        report(
          `BR-${family}-08`,
          `VAT ${subtotal.category}${rate ? ` at ${show(rate)} %` : ""}: taxable amount ${show(taxable)}, but its lines, allowances and charges come to ${show(expected)}`,
          where,
        );
      }
    }
    if (family && tax && TAX_FREE_CATEGORIES.includes(subtotal.category as VatCategoryCode) && tax.units !== 0n) {
      report(`BR-${family}-09`, `VAT ${subtotal.category} must have a tax amount of 0, got ${show(tax)}`, where);
    }
  }
  for (const group of groups.values()) {
    const key = `${group.category}|${rateKey(group.rate)}`;
    if (breakdownKeys.has(key) || !VAT_CATEGORY_CODES.includes(group.category as VatCategoryCode)) continue;
    const family = VAT_RULE_FAMILY[group.category as VatCategoryCode];
    report(
      `BR-${family}-01`,
      `items with VAT ${group.category}${group.rate ? ` at ${show(group.rate)} %` : ""} have no VAT breakdown of that category and rate`,
      `${base}/cac:TaxTotal`,
    );
  }
  if (vatTotal && subtotalTaxesComplete && subtotals.length > 0 && compare(vatTotal, sum(subtotalTaxes)) !== 0) {
    report("BR-CO-14", `Total VAT (BT-110) is ${show(vatTotal)}, but the VAT breakdown adds up to ${show(sum(subtotalTaxes))}`, taxTotal?.taxAmount?.path);
  }
  if (taxInclusive && taxExclusive) {
    const expected = add(taxExclusive, vatTotal ?? ZERO);
    if (compare(taxInclusive, expected) !== 0) {
      report("BR-CO-15", `Total with VAT (BT-112) is ${show(taxInclusive)}, but total without VAT + VAT = ${show(expected)}`, t.taxInclusive?.path);
    }
  }
  if (payable && taxInclusive) {
    const expected = add(add(taxInclusive, negate(prepaid ?? ZERO)), rounding ?? ZERO);
    if (compare(payable, expected) !== 0) {
      report("BR-CO-16", `Amount due (BT-115) is ${show(payable)}, but total with VAT − paid + rounding = ${show(expected)}`, t.payable?.path);
    }
  }

  // ---- payment (BR-CO-25, BR-61) ----
  if (payable && payable.units > 0n && !doc.dueDate && !doc.paymentTerms) {
    report("BR-CO-25", "the amount due is positive, so a due date (BT-9) or payment terms (BT-20) must be given", base);
  }
  doc.paymentMeans.forEach((means, index) => {
    const path = `${base}/cac:PaymentMeans[${index + 1}]`;
    if (!means.code) report("BR-49", "a payment instruction has no payment means type code (BT-81)", path);
    if ((means.code === "30" || means.code === "58") && !means.accountId) {
      report("BR-61", `payment means ${means.code} is a credit transfer, so the payment account (BT-84) must be given`, path);
    }
  });

  return violations;
}
