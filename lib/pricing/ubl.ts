// UBL 2.1 Invoice and CreditNote XML in the shape of Peppol BIS Billing 3.0.
//
// Totals and the VAT breakdown come from `computeInvoiceTotals`, so the XML always agrees with the
// EN 16931 computations. Everything typed by a user goes through the XML builder as text or an
// attribute value, which escapes it; characters XML 1.0 cannot carry (control characters) are
// refused with the field named, rather than silently dropped.

import { create } from "xmlbuilder2";
import type { XMLBuilder } from "xmlbuilder2/lib/interfaces";
import { PricingError } from "./errors";
import { assertCurrency, formatBasisPoints, formatMinor, multiplyExact } from "./money";
import { isCalendarDate } from "./period";
import { computeInvoiceTotals } from "./totals";
import { VAT_RULE_FAMILY } from "./types";
import type {
  CommercialDocumentBase,
  CreditNoteDocument,
  DocumentAllowanceCharge,
  InvoiceDocument,
  InvoiceLine,
  InvoiceTotals,
  TradeParty,
  VatTreatment,
} from "./types";

export const UBL_NAMESPACES = {
  invoice: "urn:oasis:names:specification:ubl:schema:xsd:Invoice-2",
  creditNote: "urn:oasis:names:specification:ubl:schema:xsd:CreditNote-2",
  cac: "urn:oasis:names:specification:ubl:schema:xsd:CommonAggregateComponents-2",
  cbc: "urn:oasis:names:specification:ubl:schema:xsd:CommonBasicComponents-2",
} as const;

/** Specification identifier (BT-24) of Peppol BIS Billing 3.0. */
export const PEPPOL_BIS3_CUSTOMIZATION_ID = "urn:cen.eu:en16931:2017#compliant#urn:fdc:peppol.eu:2017:poacc:billing:3.0";
/** Business process (BT-23) of Peppol BIS Billing 3.0. */
export const PEPPOL_BIS3_PROFILE_ID = "urn:fdc:peppol.eu:2017:poacc:billing:01:1.0";

/** UNCL1001 document type codes used here. */
export const INVOICE_TYPE_CODE = "380";
export const CREDIT_NOTE_TYPE_CODE = "381";

// Anything outside the XML 1.0 Char production (C0 controls other than tab/CR/LF, lone
// surrogates, U+FFFE and U+FFFF).
const NOT_XML_CHAR = /[^\t\n\r\u0020-\uD7FF\uE000-\uFFFD\u{10000}-\u{10FFFF}]/u;

function documentError(message: string, field?: string): PricingError {
  return new PricingError("invalid_document", message, field ? { field } : {});
}

function clean(value: string | undefined, field: string, required: boolean): string | undefined {
  if (value === undefined || value === null || (typeof value === "string" && value.trim() === "")) {
    if (required) throw documentError(`${field} is required`, field);
    return undefined;
  }
  if (typeof value !== "string") throw documentError(`${field} must be text`, field);
  const bad = NOT_XML_CHAR.exec(value);
  if (bad) {
    const code = bad[0].codePointAt(0)?.toString(16).toUpperCase().padStart(4, "0");
    throw documentError(`${field} contains the character U+${code} at position ${bad.index + 1}, which XML cannot carry; remove it`, field);
  }
  return value.trim();
}

const cbcName = (name: string) => `cbc:${name}`;
const cacName = (name: string) => `cac:${name}`;

function cbc(parent: XMLBuilder, name: string, value: string, attributes?: Record<string, string>): void {
  parent.ele(UBL_NAMESPACES.cbc, cbcName(name), attributes).txt(value);
}

function cbcOptional(parent: XMLBuilder, name: string, value: string | undefined, field: string): void {
  const text = clean(value, field, false);
  if (text !== undefined) cbc(parent, name, text);
}

function cac(parent: XMLBuilder, name: string): XMLBuilder {
  return parent.ele(UBL_NAMESPACES.cac, cacName(name));
}

function amount(parent: XMLBuilder, name: string, minor: number, currency: string): void {
  cbc(parent, name, formatMinor(minor), { currencyID: currency });
}

function taxCategory(parent: XMLBuilder, elementName: string, vat: VatTreatment, withReason: boolean): void {
  const category = cac(parent, elementName);
  cbc(category, "ID", vat.category);
  // BR-O-05 and siblings: "not subject to VAT" carries no rate.
  if (vat.category !== "O") cbc(category, "Percent", formatBasisPoints(vat.rateBasisPoints));
  if (withReason) cbcOptional(category, "TaxExemptionReason", vat.exemptionReason, `VAT ${vat.category} exemption reason`);
  cbc(cac(category, "TaxScheme"), "ID", "VAT");
}

function party(parent: XMLBuilder, wrapper: string, data: TradeParty, role: string): void {
  if (!data) throw documentError(`${role} is required`, role);
  const node = cac(cac(parent, wrapper), "Party");
  const endpointScheme = clean(data.endpoint?.scheme, `${role} electronic address scheme`, true) as string;
  const endpointId = clean(data.endpoint?.id, `${role} electronic address`, true) as string;
  cbc(node, "EndpointID", endpointId, { schemeID: endpointScheme });
  const partyId = clean(data.partyId, `${role} identifier`, false);
  if (partyId) cbc(cac(node, "PartyIdentification"), "ID", partyId);
  const tradingName = clean(data.tradingName, `${role} trading name`, false);
  if (tradingName) cbc(cac(node, "PartyName"), "Name", tradingName);

  const address = data.address;
  if (!address) throw documentError(`${role} postal address is required (BR-08, BR-10)`, `${role} address`);
  const postal = cac(node, "PostalAddress");
  cbcOptional(postal, "StreetName", address.street, `${role} street`);
  cbcOptional(postal, "AdditionalStreetName", address.additionalStreet, `${role} additional street`);
  cbcOptional(postal, "CityName", address.city, `${role} city`);
  cbcOptional(postal, "PostalZone", address.postalCode, `${role} postal code`);
  cbcOptional(postal, "CountrySubentity", address.region, `${role} region`);
  const country = clean(address.countryCode, `${role} country code`, true) as string;
  if (!/^[A-Z]{2}$/.test(country)) throw documentError(`${role} country code must be ISO 3166-1 alpha-2 such as GB, got ${country}`);
  cbc(cac(postal, "Country"), "IdentificationCode", country);

  const vatId = clean(data.vatId, `${role} VAT identifier`, false);
  if (vatId) {
    const scheme = cac(node, "PartyTaxScheme");
    cbc(scheme, "CompanyID", vatId);
    cbc(cac(scheme, "TaxScheme"), "ID", "VAT");
  }
  const legal = cac(node, "PartyLegalEntity");
  cbc(legal, "RegistrationName", clean(data.name, `${role} name`, true) as string);
  cbcOptional(legal, "CompanyID", data.legalRegistrationId, `${role} legal registration identifier`);

  if (data.contact) {
    const name = clean(data.contact.name, `${role} contact name`, false);
    const telephone = clean(data.contact.telephone, `${role} contact telephone`, false);
    const email = clean(data.contact.email, `${role} contact e-mail`, false);
    if (name || telephone || email) {
      const contact = cac(node, "Contact");
      if (name) cbc(contact, "Name", name);
      if (telephone) cbc(contact, "Telephone", telephone);
      if (email) cbc(contact, "ElectronicMail", email);
    }
  }
}

function allowanceCharge(parent: XMLBuilder, entry: DocumentAllowanceCharge, currency: string, index: number): void {
  const what = `document ${entry.chargeIndicator ? "charge" : "allowance"} ${index + 1}`;
  const node = cac(parent, "AllowanceCharge");
  cbc(node, "ChargeIndicator", entry.chargeIndicator ? "true" : "false");
  cbcOptional(node, "AllowanceChargeReasonCode", entry.reasonCode, `${what} reason code`);
  cbcOptional(node, "AllowanceChargeReason", entry.reason, `${what} reason`);
  amount(node, "Amount", entry.amountMinor, currency);
  taxCategory(node, "TaxCategory", entry.vat, false);
}

function taxTotal(parent: XMLBuilder, totals: InvoiceTotals, currency: string): void {
  const node = cac(parent, "TaxTotal");
  amount(node, "TaxAmount", totals.vatTotalMinor, currency);
  for (const entry of totals.vatBreakdown) {
    const subtotal = cac(node, "TaxSubtotal");
    amount(subtotal, "TaxableAmount", entry.taxableAmountMinor, currency);
    amount(subtotal, "TaxAmount", entry.taxAmountMinor, currency);
    taxCategory(
      subtotal,
      "TaxCategory",
      { category: entry.category, rateBasisPoints: entry.rateBasisPoints, exemptionReason: entry.exemptionReason },
      true,
    );
  }
}

function monetaryTotal(parent: XMLBuilder, totals: InvoiceTotals, currency: string, hasAllowances: boolean, hasCharges: boolean): void {
  const node = cac(parent, "LegalMonetaryTotal");
  amount(node, "LineExtensionAmount", totals.lineTotalMinor, currency);
  amount(node, "TaxExclusiveAmount", totals.taxExclusiveMinor, currency);
  amount(node, "TaxInclusiveAmount", totals.taxInclusiveMinor, currency);
  if (hasAllowances) amount(node, "AllowanceTotalAmount", totals.allowanceTotalMinor, currency);
  if (hasCharges) amount(node, "ChargeTotalAmount", totals.chargeTotalMinor, currency);
  if (totals.prepaidMinor !== 0) amount(node, "PrepaidAmount", totals.prepaidMinor, currency);
  if (totals.roundingMinor !== 0) amount(node, "PayableRoundingAmount", totals.roundingMinor, currency);
  amount(node, "PayableAmount", totals.payableMinor, currency);
}

function documentLine(parent: XMLBuilder, elementName: string, quantityName: string, line: InvoiceLine, currency: string): void {
  const where = `line ${line.id}`;
  const node = cac(parent, elementName);
  cbc(node, "ID", clean(line.id, `${where} id`, true) as string);
  cbcOptional(node, "Note", line.note, `${where} note`);
  cbc(node, quantityName, String(line.quantity), { unitCode: line.unitCode ?? "C62" });
  amount(node, "LineExtensionAmount", line.netAmountMinor, currency);
  const item = cac(node, "Item");
  cbc(item, "Name", clean(line.description, `${where} description`, true) as string);
  const itemCode = clean(line.itemCode, `${where} item code`, false);
  if (itemCode) cbc(cac(item, "SellersItemIdentification"), "ID", itemCode);
  taxCategory(item, "ClassifiedTaxCategory", line.vat, false);
  amount(cac(node, "Price"), "PriceAmount", line.unitPriceMinor, currency);
}

function assertLines(lines: readonly InvoiceLine[]): void {
  if (!Array.isArray(lines) || lines.length === 0) throw documentError("a document needs at least one line (BR-16)", "lines");
  const ids = new Set<string>();
  for (const line of lines) {
    const where = `line ${line.id}`;
    if (ids.has(line.id)) throw documentError(`line id ${line.id} is used twice; line ids must be unique`, "lines");
    ids.add(line.id);
    if (!Number.isSafeInteger(line.quantity)) throw documentError(`${where}: quantity must be a whole number`, where);
    if (!Number.isSafeInteger(line.unitPriceMinor) || line.unitPriceMinor < 0) {
      throw documentError(`${where}: unit price must be a whole number of minor units, not negative (BR-27)`, where);
    }
    if (multiplyExact(line.quantity, line.unitPriceMinor, `${where} amount`) !== line.netAmountMinor) {
      throw documentError(
        `${where}: net amount ${formatMinor(line.netAmountMinor)} is not quantity ${line.quantity} × unit price ${formatMinor(line.unitPriceMinor)}`,
        where,
      );
    }
    if (line.unitCode !== undefined && !/^[A-Z0-9]{1,3}$/.test(line.unitCode)) {
      throw documentError(`${where}: unit code must be a UN/ECE Recommendation 20 code such as C62, got ${line.unitCode}`, where);
    }
  }
}

function assertParties(doc: CommercialDocumentBase, totals: InvoiceTotals): void {
  const categories = new Set(totals.vatBreakdown.map((entry) => entry.category));
  if (categories.has("O")) {
    if (doc.supplier?.vatId || doc.customer?.vatId) {
      throw documentError("a document not subject to VAT (O) must not carry seller or buyer VAT identifiers (BR-O-02)");
    }
  } else if (!doc.supplier?.vatId?.trim()) {
    const category = [...categories][0] ?? "S";
    throw documentError(`the seller needs a VAT identifier on a document with VAT category ${category} (BR-${VAT_RULE_FAMILY[category]}-02)`, "supplier");
  }
  if (categories.has("AE") && !doc.customer?.vatId?.trim() && !doc.customer?.legalRegistrationId?.trim()) {
    throw documentError("reverse charge needs the buyer's VAT or legal registration identifier (BR-AE-02)", "customer");
  }
  if (categories.has("K") && !doc.customer?.vatId?.trim()) {
    throw documentError("an intra-community supply needs the buyer's VAT identifier (BR-IC-02)", "customer");
  }
}

function assertHeader(doc: CommercialDocumentBase, dueDate: string | undefined): void {
  clean(doc.id, "document id (BT-1)", true);
  if (!isCalendarDate(doc.issueDate)) throw documentError(`issue date must be written YYYY-MM-DD, got ${JSON.stringify(doc.issueDate)}`, "issueDate");
  if (dueDate !== undefined) {
    if (!isCalendarDate(dueDate)) throw documentError(`due date must be written YYYY-MM-DD, got ${JSON.stringify(dueDate)}`, "dueDate");
    if (dueDate < doc.issueDate) throw documentError(`due date ${dueDate} is before the issue date ${doc.issueDate}`, "dueDate");
  }
  if (doc.invoicePeriod) {
    const { startDate, endDate } = doc.invoicePeriod;
    if (!isCalendarDate(startDate) || !isCalendarDate(endDate)) throw documentError("invoice period dates must be written YYYY-MM-DD", "invoicePeriod");
    if (endDate < startDate) throw documentError("invoice period ends before it starts (BR-29)", "invoicePeriod");
  }
  assertCurrency(doc.currency, "document currency");
  const means = doc.paymentMeans;
  if (means) {
    if (!/^[A-Z0-9]{1,3}$/.test(means.code ?? "")) throw documentError("payment means code must be a UNCL4461 code such as 30 or 58", "paymentMeans");
    if ((means.code === "30" || means.code === "58") && !means.account?.id?.trim()) {
      throw documentError(`payment means ${means.code} (credit transfer) needs the payee account (BR-61)`, "paymentMeans");
    }
  }
}

function paymentMeans(parent: XMLBuilder, doc: CommercialDocumentBase, dueDateInMeans: string | undefined): void {
  const means = doc.paymentMeans;
  if (!means) return;
  const node = cac(parent, "PaymentMeans");
  cbc(node, "PaymentMeansCode", means.code);
  if (dueDateInMeans) cbc(node, "PaymentDueDate", dueDateInMeans);
  cbcOptional(node, "PaymentID", means.paymentId, "payment reference");
  if (means.account) {
    const account = cac(node, "PayeeFinancialAccount");
    cbc(account, "ID", clean(means.account.id, "payment account", true) as string);
    cbcOptional(account, "Name", means.account.name, "payment account name");
    const bank = clean(means.account.bankId, "payment account bank identifier", false);
    if (bank) cbc(cac(account, "FinancialInstitutionBranch"), "ID", bank);
  }
}

interface Shape {
  root: "Invoice" | "CreditNote";
  namespace: string;
  typeCodeElement: string;
  typeCode: string;
  lineElement: string;
  quantityElement: string;
}

const INVOICE_SHAPE: Shape = {
  root: "Invoice",
  namespace: UBL_NAMESPACES.invoice,
  typeCodeElement: "InvoiceTypeCode",
  typeCode: INVOICE_TYPE_CODE,
  lineElement: "InvoiceLine",
  quantityElement: "InvoicedQuantity",
};

const CREDIT_NOTE_SHAPE: Shape = {
  root: "CreditNote",
  namespace: UBL_NAMESPACES.creditNote,
  typeCodeElement: "CreditNoteTypeCode",
  typeCode: CREDIT_NOTE_TYPE_CODE,
  lineElement: "CreditNoteLine",
  quantityElement: "CreditedQuantity",
};

function build(doc: CommercialDocumentBase, shape: Shape, dueDate: string | undefined, precedingInvoice?: { id: string; issueDate: string }): string {
  assertHeader(doc, dueDate);
  assertLines(doc.lines);
  const allowancesCharges = doc.allowancesCharges ?? [];
  const totals = computeInvoiceTotals(doc.lines, allowancesCharges, { prepaidMinor: doc.prepaidMinor, roundingMinor: doc.roundingMinor });
  assertParties(doc, totals);
  const paymentTerms = clean(doc.paymentTerms, "payment terms", false);
  if (totals.payableMinor > 0 && !dueDate && !paymentTerms) {
    throw documentError("a positive amount due needs a due date or payment terms (BR-CO-25)", "paymentTerms");
  }
  const currency = doc.currency;

  const root = create({ version: "1.0", encoding: "UTF-8" }).ele(shape.namespace, shape.root, {
    "xmlns:cac": UBL_NAMESPACES.cac,
    "xmlns:cbc": UBL_NAMESPACES.cbc,
  });
  cbc(root, "CustomizationID", PEPPOL_BIS3_CUSTOMIZATION_ID);
  cbc(root, "ProfileID", PEPPOL_BIS3_PROFILE_ID);
  cbc(root, "ID", clean(doc.id, "document id", true) as string);
  cbc(root, "IssueDate", doc.issueDate);
  if (shape.root === "Invoice" && dueDate) cbc(root, "DueDate", dueDate);
  cbc(root, shape.typeCodeElement, shape.typeCode);
  cbcOptional(root, "Note", doc.note, "note");
  cbc(root, "DocumentCurrencyCode", currency);
  cbcOptional(root, "BuyerReference", doc.buyerReference, "buyer reference");
  if (doc.invoicePeriod) {
    const periodNode = cac(root, "InvoicePeriod");
    cbc(periodNode, "StartDate", doc.invoicePeriod.startDate);
    cbc(periodNode, "EndDate", doc.invoicePeriod.endDate);
  }
  if (precedingInvoice) {
    const reference = cac(cac(root, "BillingReference"), "InvoiceDocumentReference");
    cbc(reference, "ID", clean(precedingInvoice.id, "preceding invoice id (BT-25)", true) as string);
    if (!isCalendarDate(precedingInvoice.issueDate)) throw documentError("preceding invoice issue date must be written YYYY-MM-DD");
    cbc(reference, "IssueDate", precedingInvoice.issueDate);
  }
  party(root, "AccountingSupplierParty", doc.supplier, "seller");
  party(root, "AccountingCustomerParty", doc.customer, "buyer");
  paymentMeans(root, doc, shape.root === "CreditNote" ? dueDate : undefined);
  if (paymentTerms) cbc(cac(root, "PaymentTerms"), "Note", paymentTerms);
  allowancesCharges.forEach((entry, index) => allowanceCharge(root, entry, currency, index));
  taxTotal(root, totals, currency);
  monetaryTotal(
    root,
    totals,
    currency,
    allowancesCharges.some((entry) => !entry.chargeIndicator),
    allowancesCharges.some((entry) => entry.chargeIndicator),
  );
  for (const line of doc.lines) documentLine(root, shape.lineElement, shape.quantityElement, line, currency);
  return root.end({ prettyPrint: true });
}

// A UBL 2.1 Invoice (type 380) in the Peppol BIS Billing 3.0 shape.
export function buildUblInvoice(invoice: InvoiceDocument): string {
  return build(invoice, INVOICE_SHAPE, invoice.dueDate);
}

// A UBL 2.1 CreditNote (type 381) referring to the invoice it credits (BG-3).
export function buildUblCreditNote(creditNote: CreditNoteDocument): string {
  if (!creditNote.precedingInvoice) throw documentError("a credit note needs the invoice it credits (BG-3)", "precedingInvoice");
  return build(creditNote, CREDIT_NOTE_SHAPE, creditNote.dueDate, creditNote.precedingInvoice);
}
