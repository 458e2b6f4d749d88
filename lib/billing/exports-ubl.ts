import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import { PricingError } from "@/lib/pricing/errors";
import { buildUblCreditNote, buildUblInvoice } from "@/lib/pricing/ubl";
import { readUblDocument } from "@/lib/pricing/ubl-read";
import { validateEn16931 } from "@/lib/pricing/validate-en16931";
import { assertStoredTotals, creditNoteDocumentFor, invoiceDocumentFor } from "./exports-document";
import { findInvoiceInScope } from "./invoices";

// UBL 2.1 XML (Peppol BIS Billing 3.0 shape) of one invoice or one credit note, built from what
// is stored, read back with a general XML parser and checked against the EN 16931 rules we
// implement. A document that fails a rule is not handed out: the answer names what to fix.

export interface UblExport {
  filename: string;
  xml: string;
}

function refuse(number: string, problems: string[]): never {
  throw new AppError("validation", `${number} cannot be exported as an e-invoice yet: ${problems.join("; ")}.`, { "": problems });
}

function checked(number: string, build: () => string): string {
  let xml: string;
  try {
    xml = build();
  } catch (error) {
    if (error instanceof PricingError) {
      const hint = error.details.field === "supplier" || /seller/.test(error.message) ? " (the unit's details are on the billing settings page)" : "";
      refuse(number, [`${error.message}${hint}`]);
    }
    throw error;
  }
  const violations = validateEn16931(readUblDocument(xml));
  if (violations.length > 0) refuse(number, violations.map((v) => `${v.rule}: ${v.message}`));
  return xml;
}

const fileSafe = (text: string) => text.replace(/[^A-Za-z0-9._-]+/g, "-");

/** The invoice's UBL in the caller's scope (404 otherwise), or a 422 naming the failed rules. */
export async function invoiceUbl(db: Kysely<Database>, user: SessionUser, invoiceId: number): Promise<UblExport> {
  const invoice = await findInvoiceInScope(db, user, invoiceId);
  const doc = await invoiceDocumentFor(db, invoice);
  assertStoredTotals(invoice, doc);
  return { filename: `${fileSafe(invoice.number)}.xml`, xml: checked(invoice.number, () => buildUblInvoice(doc)) };
}

/** One credit note's UBL, found through its invoice in the caller's scope. */
export async function creditNoteUbl(db: Kysely<Database>, user: SessionUser, invoiceId: number, creditNoteId: number): Promise<UblExport> {
  const invoice = await findInvoiceInScope(db, user, invoiceId);
  const note = await db.selectFrom("credit_notes").selectAll().where("id", "=", creditNoteId).where("invoice_id", "=", invoice.id).executeTakeFirst();
  if (!note) throw notFound("That credit note");
  const doc = creditNoteDocumentFor(note, await invoiceDocumentFor(db, invoice));
  return { filename: `${fileSafe(note.number)}.xml`, xml: checked(note.number, () => buildUblCreditNote(doc)) };
}
