import "server-only";
import type { Kysely, Selectable, Transaction } from "kysely";
import type { CreditNotesTable, Database, InvoicesTable } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { localDateOf } from "@/lib/contracts/dates";
import { serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { computeInvoiceTotals } from "@/lib/pricing/totals";
import type { CreditNoteDocument, CreditNoteLine, InvoiceDocument, TradeParty } from "@/lib/pricing/types";
import { invoiceLineRows, toPricingLines } from "./invoices";

// A stored invoice or credit note as an EN 16931 document, for the UBL export, the PDF and the
// credit-note computation. The seller is the unit (its name, VAT number, and the address of its
// depot site); the buyer is the customer organisation, at the address of its first active site.
// Both are reached electronically by e-mail (EAS scheme "EM"): the billing address, else a
// finance user's (seller) or a clinic manager's (buyer) address.

type Executor = Kysely<Database> | Transaction<Database>;

/** A stored date as a calendar date: "YYYY-MM-DD" as is, an instant as its local date. */
export function calendarDate(value: string, timeZone = serverEnv().UNIT_TIME_ZONE): string {
  if (/^\d{4}-\d{2}-\d{2}$/.test(value)) return value;
  const instant = new Date(value);
  if (Number.isNaN(instant.getTime())) throw new AppError("conflict", `The stored date ${JSON.stringify(value)} is not a date.`);
  return localDateOf(instant, timeZone);
}

/** The billing period's inclusive local dates, from its half-open instants. */
export function periodDates(start: string, end: string, timeZone = serverEnv().UNIT_TIME_ZONE): { startDate: string; endDate: string } {
  return {
    startDate: localDateOf(new Date(start), timeZone),
    endDate: localDateOf(new Date(new Date(end).getTime() - 1), timeZone),
  };
}

async function firstSite(db: Executor, organisationId: number, depot: boolean) {
  return db
    .selectFrom("sites")
    .select(["name", "address_line1", "address_line2", "town", "postcode", "contact_name", "contact_phone", "contact_email"])
    .where("organisation_id", "=", organisationId)
    .where("active", "=", 1)
    .orderBy("is_depot", depot ? "desc" : "asc")
    .orderBy("id")
    .executeTakeFirst();
}

async function firstUserEmail(db: Executor, organisationId: number, role: string): Promise<string | undefined> {
  const row = await db
    .selectFrom("users")
    .select("email")
    .where("organisation_id", "=", organisationId)
    .where("role", "=", role)
    .where("status", "=", "active")
    .orderBy("id")
    .executeTakeFirst();
  return row?.email;
}

/** The unit as seller (BG-4). */
export async function sellerParty(db: Executor): Promise<TradeParty> {
  const unit = await db
    .selectFrom("organisations")
    .select(["id", "name", "short_code", "billing_email", "vat_id", "country_code"])
    .where("kind", "=", "unit")
    .orderBy("id")
    .executeTakeFirst();
  if (!unit) throw new AppError("conflict", "The unit's own organisation is missing; add it before invoicing.");
  const site = await firstSite(db, unit.id, true);
  const email = unit.billing_email ?? site?.contact_email ?? (await firstUserEmail(db, unit.id, "finance"));
  return {
    name: unit.name,
    partyId: unit.short_code,
    endpoint: { scheme: "EM", id: email ?? "" },
    ...(unit.vat_id ? { vatId: unit.vat_id } : {}),
    address: {
      ...(site ? { street: site.address_line1, city: site.town, postalCode: site.postcode } : {}),
      ...(site?.address_line2 ? { additionalStreet: site.address_line2 } : {}),
      countryCode: unit.country_code,
    },
    ...(site?.contact_name || site?.contact_phone || email
      ? { contact: { ...(site?.contact_name ? { name: site.contact_name } : {}), ...(site?.contact_phone ? { telephone: site.contact_phone } : {}), ...(email ? { email } : {}) } }
      : {}),
  };
}

/** A customer organisation as buyer (BG-7). */
export async function buyerParty(db: Executor, organisationId: number): Promise<TradeParty> {
  const org = await db
    .selectFrom("organisations")
    .select(["id", "name", "short_code", "billing_email", "vat_id", "country_code"])
    .where("id", "=", organisationId)
    .executeTakeFirstOrThrow();
  const site = await firstSite(db, org.id, false);
  const email = org.billing_email ?? (await firstUserEmail(db, org.id, "clinic_manager"));
  return {
    name: org.name,
    partyId: org.short_code,
    endpoint: { scheme: "EM", id: email ?? "" },
    ...(org.vat_id ? { vatId: org.vat_id } : {}),
    address: {
      ...(site ? { street: site.address_line1, city: site.town, postalCode: site.postcode } : {}),
      ...(site?.address_line2 ? { additionalStreet: site.address_line2 } : {}),
      countryCode: org.country_code,
    },
    ...(email ? { contact: { email } } : {}),
  };
}

export type StoredInvoice = Selectable<InvoicesTable>;

/** Throws unless the stored totals are what the stored lines add up to (BR-CO-10 to BR-CO-15). */
export function assertStoredTotals(invoice: StoredInvoice, doc: InvoiceDocument): void {
  const totals = computeInvoiceTotals(doc.lines);
  const checks: [string, number, number][] = [
    ["sum of lines", invoice.line_total_minor, totals.lineTotalMinor],
    ["total without VAT", invoice.tax_exclusive_minor, totals.taxExclusiveMinor],
    ["VAT", invoice.vat_minor, totals.vatTotalMinor],
    ["total with VAT", invoice.total_minor, totals.taxInclusiveMinor],
  ];
  const wrong = checks.filter(([, stored, computed]) => stored !== computed);
  if (wrong.length > 0) {
    throw new AppError(
      "conflict",
      `Invoice ${invoice.number}: the stored ${wrong.map(([what, stored, computed]) => `${what} (${stored}) is not what its lines give (${computed})`).join("; ")}. It cannot be exported until this is corrected.`,
    );
  }
}

/** The stored invoice as an EN 16931 invoice document (the invoice as issued: nothing prepaid). */
export async function invoiceDocumentFor(db: Executor, invoice: StoredInvoice): Promise<InvoiceDocument> {
  if (!invoice.issue_date) throw new AppError("conflict", `Invoice ${invoice.number} has not been issued yet, so it has no invoice date.`);
  const lines = toPricingLines(await invoiceLineRows(db, invoice.id), invoice.vat_breakdown);
  const contract = invoice.contract_id
    ? await db.selectFrom("contracts").select(["reference", "payment_terms_days"]).where("id", "=", invoice.contract_id).executeTakeFirst()
    : undefined;
  const org = await db.selectFrom("organisations").select("short_code").where("id", "=", invoice.organisation_id).executeTakeFirstOrThrow();
  const issueDate = calendarDate(invoice.issue_date);
  const dueDate = invoice.due_date ? calendarDate(invoice.due_date) : undefined;
  const termsDays = contract?.payment_terms_days;
  return {
    id: invoice.number,
    issueDate,
    ...(dueDate ? { dueDate } : {}),
    currency: invoice.currency,
    buyerReference: contract?.reference ?? org.short_code,
    invoicePeriod: periodDates(invoice.period_start, invoice.period_end),
    supplier: await sellerParty(db),
    customer: await buyerParty(db, invoice.organisation_id),
    paymentMeans: { code: "68", paymentId: invoice.number },
    paymentTerms:
      termsDays === undefined
        ? dueDate
          ? `Payment by ${dueDate}`
          : "Payment due on receipt"
        : termsDays === 0
          ? "Payment due on receipt"
          : `Payment within ${termsDays} days of the invoice date`,
    lines,
  };
}

/** How a credit note's lines are stored: the EN 16931 lines, as the credit-note computation made them. */
export function parseCreditNoteLines(json: string): CreditNoteLine[] {
  const value = JSON.parse(json) as unknown;
  if (!Array.isArray(value)) throw new AppError("conflict", "A stored credit note has no lines.");
  return value as CreditNoteLine[];
}

/** A stored credit note as an EN 16931 credit note document against its invoice's document. */
export function creditNoteDocumentFor(note: Selectable<CreditNotesTable>, invoiceDoc: InvoiceDocument): CreditNoteDocument {
  const settlement =
    note.settlement === "refund"
      ? "Refunded to the card that paid the invoice"
      : note.settlement === "out_of_band"
        ? "Repaid by bank transfer or set off against a later invoice"
        : `Deducted from the amount due on invoice ${invoiceDoc.id}`;
  return {
    id: note.number,
    issueDate: calendarDate(note.created_at),
    currency: invoiceDoc.currency,
    note: note.reason,
    ...(invoiceDoc.buyerReference ? { buyerReference: invoiceDoc.buyerReference } : {}),
    ...(invoiceDoc.invoicePeriod ? { invoicePeriod: { ...invoiceDoc.invoicePeriod } } : {}),
    supplier: invoiceDoc.supplier,
    customer: invoiceDoc.customer,
    paymentTerms: settlement,
    lines: parseCreditNoteLines(note.lines),
    precedingInvoice: { id: invoiceDoc.id, issueDate: invoiceDoc.issueDate },
  };
}

export interface SellerDetails {
  organisationId: number;
  name: string;
  vatId: string | null;
  billingEmail: string | null;
  countryCode: string;
  address: string | null;
}

/** The unit's details as its invoices carry them, for the billing settings page. */
export async function sellerDetails(db: Executor): Promise<SellerDetails> {
  const unit = await db
    .selectFrom("organisations")
    .select(["id", "name", "vat_id", "billing_email", "country_code"])
    .where("kind", "=", "unit")
    .orderBy("id")
    .executeTakeFirst();
  if (!unit) throw new AppError("conflict", "The unit's own organisation is missing.");
  const site = await firstSite(db, unit.id, true);
  return {
    organisationId: unit.id,
    name: unit.name,
    vatId: unit.vat_id,
    billingEmail: unit.billing_email,
    countryCode: unit.country_code,
    address: site ? [site.address_line1, site.address_line2, site.town, site.postcode].filter(Boolean).join(", ") : null,
  };
}

/** Finance sets the unit's VAT number and accounts address (as they appear on every e-invoice), audited. */
export async function updateSellerDetails(
  db: Kysely<Database>,
  user: { id: number },
  input: { vatId: string | null; billingEmail: string | null },
  now = new Date(),
): Promise<SellerDetails> {
  await db.transaction().execute(async (trx) => {
    const before = await sellerDetails(trx);
    await trx
      .updateTable("organisations")
      .set({ vat_id: input.vatId, billing_email: input.billingEmail, updated_at: now.toISOString() })
      .where("id", "=", before.organisationId)
      .execute();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: before.organisationId,
        action: "billing.seller_details_changed",
        entity: "organisation",
        entityId: before.organisationId,
        details: { before: { vatId: before.vatId, billingEmail: before.billingEmail }, after: input },
      },
      now,
    );
  });
  return sellerDetails(db);
}
