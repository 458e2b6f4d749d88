// Reads a UBL 2.1 Invoice or CreditNote (any producer, not only ours) with a general XML parser
// into the syntax-neutral view the EN 16931 checks work on. Values stay exactly as written.
// The root element's namespace is checked; namespaces of the elements below it are not (their
// prefixes are dropped), which is enough for checking the business rules.

import { XMLParser, XMLValidator } from "fast-xml-parser";
import { PricingError } from "./errors";
import { UBL_NAMESPACES } from "./ubl";
import type {
  En16931AllowanceChargeView,
  En16931AmountText,
  En16931DocumentView,
  En16931LineView,
  En16931PartyView,
  En16931VatSubtotalView,
} from "./validate-en16931";

type XmlNode = { [key: string]: unknown };

const parser = new XMLParser({
  ignoreAttributes: false,
  attributeNamePrefix: "@_",
  removeNSPrefix: true,
  parseTagValue: false,
  parseAttributeValue: false,
  trimValues: true,
  alwaysCreateTextNode: true,
  isArray: (_name, _path, _isLeaf, isAttribute) => !isAttribute,
});

const rootParser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: "@_", removeNSPrefix: false, parseTagValue: false });

function children(node: XmlNode | undefined, name: string): XmlNode[] {
  const value = node?.[name];
  return Array.isArray(value) ? (value as XmlNode[]) : [];
}

function child(node: XmlNode | undefined, ...names: string[]): XmlNode | undefined {
  let current = node;
  for (const name of names) current = children(current, name)[0];
  return current;
}

function textOf(node: XmlNode | undefined): string | undefined {
  if (node === undefined) return undefined;
  const value = node["#text"];
  if (typeof value === "string") return value;
  if (typeof value === "number") return String(value);
  return undefined;
}

function text(node: XmlNode | undefined, ...names: string[]): string | undefined {
  const value = textOf(child(node, ...names));
  return value === "" ? undefined : value;
}

function amountText(node: XmlNode | undefined, path: string, ...names: string[]): En16931AmountText | undefined {
  const target = child(node, ...names);
  const value = textOf(target);
  if (target === undefined || value === undefined) return undefined;
  const currencyId = target["@_currencyID"];
  return { value, currencyId: typeof currencyId === "string" ? currencyId : undefined, path: `${path}/${names.join("/")}` };
}

function partyView(node: XmlNode | undefined): En16931PartyView | undefined {
  const partyNode = child(node, "Party");
  if (!partyNode) return undefined;
  const address = child(partyNode, "PostalAddress");
  const vatScheme = children(partyNode, "PartyTaxScheme").find((scheme) => text(scheme, "TaxScheme", "ID") === "VAT");
  return {
    name: text(partyNode, "PartyLegalEntity", "RegistrationName"),
    vatId: text(vatScheme, "CompanyID"),
    legalRegistrationId: text(partyNode, "PartyLegalEntity", "CompanyID"),
    endpointId: text(partyNode, "EndpointID"),
    hasPostalAddress: address !== undefined,
    countryCode: text(address, "Country", "IdentificationCode"),
  };
}

function rootNamespace(xml: string, rootName: string): string | undefined {
  const parsed = rootParser.parse(xml) as XmlNode;
  for (const [key, value] of Object.entries(parsed)) {
    if (key === "?xml" || typeof value !== "object" || value === null) continue;
    const [prefix, local] = key.includes(":") ? key.split(":", 2) : [undefined, key];
    if (local !== rootName) continue;
    const attribute = (value as XmlNode)[prefix ? `@_xmlns:${prefix}` : "@_xmlns"];
    return typeof attribute === "string" ? attribute : undefined;
  }
  return undefined;
}

/**
 * Parses UBL XML into the EN 16931 view. Throws `invalid_document` with the line and column for
 * XML that is not well-formed, and when the root is not a UBL Invoice or CreditNote.
 */
export function readUblDocument(xml: string): En16931DocumentView {
  const wellFormed = XMLValidator.validate(xml);
  if (wellFormed !== true) {
    const { line, col, msg } = wellFormed.err;
    throw new PricingError("invalid_document", `the XML is not well-formed at line ${line}, column ${col}: ${msg}`, { line, column: col });
  }
  const parsed = parser.parse(xml) as XmlNode;
  const documentType = children(parsed, "Invoice").length > 0 ? "Invoice" : children(parsed, "CreditNote").length > 0 ? "CreditNote" : null;
  if (documentType === null) {
    throw new PricingError("invalid_document", "the root element must be a UBL Invoice or CreditNote");
  }
  const expectedNamespace = documentType === "Invoice" ? UBL_NAMESPACES.invoice : UBL_NAMESPACES.creditNote;
  const namespace = rootNamespace(xml, documentType);
  if (namespace !== expectedNamespace) {
    throw new PricingError(
      "invalid_document",
      `the ${documentType} element must be in the namespace ${expectedNamespace}, found ${namespace ?? "none"}`,
    );
  }
  const root = children(parsed, documentType)[0];
  const base = `/${documentType}`;
  const lineElement = documentType === "Invoice" ? "InvoiceLine" : "CreditNoteLine";
  const quantityElement = documentType === "Invoice" ? "InvoicedQuantity" : "CreditedQuantity";

  const allowancesCharges: En16931AllowanceChargeView[] = children(root, "AllowanceCharge").map((node, index) => {
    const path = `${base}/cac:AllowanceCharge[${index + 1}]`;
    return {
      path,
      chargeIndicator: text(node, "ChargeIndicator"),
      amount: amountText(node, path, "Amount"),
      reason: text(node, "AllowanceChargeReason"),
      reasonCode: text(node, "AllowanceChargeReasonCode"),
      vatCategory: text(node, "TaxCategory", "ID"),
      vatRate: text(node, "TaxCategory", "Percent"),
    };
  });

  const taxTotals = children(root, "TaxTotal").map((node, index) => {
    const path = `${base}/cac:TaxTotal[${index + 1}]`;
    const subtotals: En16931VatSubtotalView[] = children(node, "TaxSubtotal").map((subtotal, subIndex) => {
      const subPath = `${path}/cac:TaxSubtotal[${subIndex + 1}]`;
      return {
        path: subPath,
        taxable: amountText(subtotal, subPath, "TaxableAmount"),
        tax: amountText(subtotal, subPath, "TaxAmount"),
        category: text(subtotal, "TaxCategory", "ID"),
        rate: text(subtotal, "TaxCategory", "Percent"),
        exemptionReason: text(subtotal, "TaxCategory", "TaxExemptionReason"),
        exemptionReasonCode: text(subtotal, "TaxCategory", "TaxExemptionReasonCode"),
      };
    });
    return { taxAmount: amountText(node, path, "TaxAmount"), subtotals };
  });

  const totalsNode = child(root, "LegalMonetaryTotal");
  const totalsPath = `${base}/cac:LegalMonetaryTotal`;
  const lines: En16931LineView[] = children(root, lineElement).map((node, index) => {
    const path = `${base}/cac:${lineElement}[${index + 1}]`;
    const quantity = child(node, quantityElement);
    const unitCode = quantity?.["@_unitCode"];
    return {
      path,
      id: text(node, "ID"),
      quantity: textOf(quantity) || undefined,
      unitCode: typeof unitCode === "string" && unitCode !== "" ? unitCode : undefined,
      netAmount: amountText(node, path, "LineExtensionAmount"),
      itemName: text(node, "Item", "Name"),
      price: amountText(node, path, "Price", "PriceAmount"),
      baseQuantity: text(node, "Price", "BaseQuantity"),
      vatCategory: text(node, "Item", "ClassifiedTaxCategory", "ID"),
      vatRate: text(node, "Item", "ClassifiedTaxCategory", "Percent"),
      lineAllowanceChargeCount: children(node, "AllowanceCharge").length,
    };
  });

  const paymentMeans = children(root, "PaymentMeans");
  return {
    documentType,
    customizationId: text(root, "CustomizationID"),
    profileId: text(root, "ProfileID"),
    id: text(root, "ID"),
    issueDate: text(root, "IssueDate"),
    dueDate: text(root, "DueDate") ?? paymentMeans.map((node) => text(node, "PaymentDueDate")).find(Boolean),
    typeCode: text(root, documentType === "Invoice" ? "InvoiceTypeCode" : "CreditNoteTypeCode"),
    currency: text(root, "DocumentCurrencyCode"),
    paymentTerms: text(root, "PaymentTerms", "Note"),
    precedingInvoiceId: text(root, "BillingReference", "InvoiceDocumentReference", "ID"),
    seller: partyView(child(root, "AccountingSupplierParty")),
    buyer: partyView(child(root, "AccountingCustomerParty")),
    paymentMeans: paymentMeans.map((node) => ({
      code: text(node, "PaymentMeansCode"),
      accountId: text(node, "PayeeFinancialAccount", "ID"),
    })),
    allowancesCharges,
    taxTotals,
    totals: {
      lineTotal: amountText(totalsNode, totalsPath, "LineExtensionAmount"),
      taxExclusive: amountText(totalsNode, totalsPath, "TaxExclusiveAmount"),
      taxInclusive: amountText(totalsNode, totalsPath, "TaxInclusiveAmount"),
      allowanceTotal: amountText(totalsNode, totalsPath, "AllowanceTotalAmount"),
      chargeTotal: amountText(totalsNode, totalsPath, "ChargeTotalAmount"),
      prepaid: amountText(totalsNode, totalsPath, "PrepaidAmount"),
      rounding: amountText(totalsNode, totalsPath, "PayableRoundingAmount"),
      payable: amountText(totalsNode, totalsPath, "PayableAmount"),
    },
    lines,
  };
}
