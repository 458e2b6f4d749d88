import { XMLParser } from "fast-xml-parser";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as creditNoteXmlRoute } from "@/app/api/billing/invoices/[id]/credit-notes/[creditNoteId]/credit-note.xml/route";
import { GET as invoicePdfRoute } from "@/app/api/billing/invoices/[id]/invoice.pdf/route";
import { GET as invoiceXmlRoute } from "@/app/api/billing/invoices/[id]/invoice.xml/route";
import { GET as headersCsvRoute } from "@/app/api/billing/invoices/headers.csv/route";
import { GET as linesCsvRoute } from "@/app/api/billing/invoices/lines.csv/route";
import type { SeedResult } from "@/db/seed/demo";
import { createCreditNote } from "@/lib/billing/credit-notes";
import { safeCell } from "@/lib/billing/exports-csv";
import { readUblDocument } from "@/lib/pricing/ubl-read";
import { validateEn16931 } from "@/lib/pricing/validate-en16931";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

// Finance's exports of the seeded invoices: CSV (with spreadsheet formulas defused), UBL 2.1
// that passes the EN 16931 checks and reads back, and the PDF. No payment service is configured
// in this file: none of the exports may need one.

let t: DemoDatabase;
let seed: SeedResult;
const FINANCE = "finance@larkmoor.example";

const invoiceId = (number: string) => seed.invoices!.invoices[number]!;
const asFinance = (url: string) => requestAs(seed.users[FINANCE]!, url);

beforeAll(async () => {
  delete process.env.STRIPE_SECRET_KEY;
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
});
afterAll(() => t.cleanup());

describe("CSV", () => {
  it("prefixes text cells that a spreadsheet would run as a formula, and keeps amounts as numbers (OWASP CSV injection)", async () => {
    expect(safeCell("=HYPERLINK(\"http://x\")")).toBe("'=HYPERLINK(\"http://x\")");
    expect(safeCell("+44 1632 960410")).toBe("'+44 1632 960410");
    expect(safeCell("-2+3")).toBe("'-2+3");
    expect(safeCell("@SUM(A1)")).toBe("'@SUM(A1)");
    expect(safeCell("\tcmd")).toBe("'\tcmd");
    expect(safeCell("\rcmd")).toBe("'\rcmd");
    expect(safeCell("-15.00")).toBe("-15.00");
    expect(safeCell("Basic tray")).toBe("Basic tray");

    const id = invoiceId("LSS-2026-10-QMH");
    const line = await t.db.selectFrom("invoice_lines").select(["id"]).where("invoice_id", "=", id).orderBy("position").executeTakeFirstOrThrow();
    await t.db.updateTable("invoice_lines").set({ description: '=HYPERLINK("http://evil.example","Click")', note: "@SUM(1+1)" }).where("id", "=", line.id).execute();
    await t.db.updateTable("organisations").set({ name: "+Quillby Moor Health Group" }).where("id", "=", seed.organisations.QMH!).execute();
    try {
      const res = await linesCsvRoute(await asFinance("/api/billing/invoices/lines.csv?organisationId=" + seed.organisations.QMH), params({}));
      expect(res.status).toBe(200);
      expect(res.headers.get("content-type")).toMatch(/text\/csv/);
      const parsed = Papa.parse<string[]>((await res.text()).replace(/^\uFEFF/, ""), { skipEmptyLines: true });
      const [header, ...rows] = parsed.data;
      expect(header).toContain("description");
      const col = (name: string) => header!.indexOf(name);
      const evil = rows.find((r) => r[col("invoice_number")] === "LSS-2026-10-QMH" && r[col("line")] === "1")!;
      expect(evil[col("description")]).toBe("'=HYPERLINK(\"http://evil.example\",\"Click\")");
      expect(evil[col("note")]).toBe("'@SUM(1+1)");
      expect(evil[col("customer")]).toBe("'+Quillby Moor Health Group");
      // The lines add up to the invoice: net amounts are plain decimals, negative credits included.
      const stored = await t.db.selectFrom("invoices").select(["line_total_minor"]).where("id", "=", id).executeTakeFirstOrThrow();
      const sum = rows.filter((r) => r[col("invoice_number")] === "LSS-2026-10-QMH").reduce((s, r) => s + Math.round(Number(r[col("net_amount")]) * 100), 0);
      expect(sum).toBe(stored.line_total_minor);
      for (const r of rows) expect(r[col("net_amount")]).toMatch(/^-?\d+\.\d{2}$/);
    } finally {
      await t.db.updateTable("organisations").set({ name: "Quillby Moor Health Group" }).where("id", "=", seed.organisations.QMH!).execute();
    }
  });

  it("exports one row per invoice with its amounts and age, filtered as the list is", async () => {
    const res = await headersCsvRoute(await asFinance("/api/billing/invoices/headers.csv?status=open"), params({}));
    const parsed = Papa.parse<Record<string, string>>((await res.text()).replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true });
    const open = await t.db.selectFrom("invoices").select(["number", "total_minor"]).where("status", "=", "open").execute();
    expect(parsed.data.map((r) => r.invoice_number).sort()).toEqual(open.map((o) => o.number).sort());
    const overdue = parsed.data.find((r) => r.invoice_number === "LSS-2026-10-MDP")!;
    // Due 15 Nov 2026; today 1 Dec 2026 in the unit's zone → 16 days (worked by hand).
    expect(overdue.due_date).toBe("2026-11-15");
    expect(Number(overdue.days_overdue)).toBeGreaterThanOrEqual(16);
    expect(Math.round(Number(overdue.total_with_vat) * 100)).toBe(open.find((o) => o.number === "LSS-2026-10-MDP")!.total_minor);
  });
});

describe("UBL", () => {
  const parser = new XMLParser({ ignoreAttributes: false, removeNSPrefix: true, parseTagValue: false });

  it("exports an invoice that passes the EN 16931 checks and reads back with its amounts", async () => {
    const id = invoiceId("LSS-2026-11-QMH");
    const res = await invoiceXmlRoute(await asFinance(`/api/billing/invoices/${id}/invoice.xml`), params({ id: String(id) }));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-disposition")).toContain("LSS-2026-11-QMH.xml");
    const xml = await res.text();
    expect(validateEn16931(readUblDocument(xml))).toEqual([]);

    const doc = parser.parse(xml).Invoice;
    const stored = await t.db.selectFrom("invoices").selectAll().where("id", "=", id).executeTakeFirstOrThrow();
    const lines = await t.db.selectFrom("invoice_lines").select("id").where("invoice_id", "=", id).execute();
    const text = (node: unknown) => (typeof node === "object" && node !== null ? (node as { "#text": string })["#text"] : String(node));
    expect(doc.ID).toBe("LSS-2026-11-QMH");
    expect(doc.InvoiceTypeCode).toBe("380");
    expect(doc.DocumentCurrencyCode).toBe("GBP");
    expect(doc.IssueDate).toBe(stored.issue_date);
    expect(doc.DueDate).toBe(stored.due_date);
    expect(text(doc.LegalMonetaryTotal.TaxExclusiveAmount)).toBe((stored.tax_exclusive_minor / 100).toFixed(2));
    expect(text(doc.LegalMonetaryTotal.TaxInclusiveAmount)).toBe((stored.total_minor / 100).toFixed(2));
    expect(text(doc.TaxTotal.TaxAmount)).toBe((stored.vat_minor / 100).toFixed(2));
    expect([doc.InvoiceLine].flat()).toHaveLength(lines.length);
    expect(doc.AccountingSupplierParty.Party.PartyLegalEntity.RegistrationName).toBe("Larkmoor Sterile Services");
    expect(doc.AccountingSupplierParty.Party.PartyTaxScheme.CompanyID).toBe("GB000000000");
    expect(doc.AccountingCustomerParty.Party.PartyLegalEntity.RegistrationName).toBe("Quillby Moor Health Group");
    expect(text(doc.AccountingCustomerParty.Party.EndpointID)).toBe("accounts@quillby.example");
    expect(doc.AccountingCustomerParty.Party.PostalAddress.Country.IdentificationCode).toBe("GB");
  });

  it("exports a credit note against its invoice", async () => {
    const id = invoiceId("LSS-2026-10-ODS");
    const note = await createCreditNote(t.db, await sessionUser(t.db, seed.users[FINANCE]!), id, {
      kind: "amount",
      amountMinor: 2_500,
      description: "Goodwill <credit> & thanks",
      reason: "Delivery left at the wrong door",
    });
    const res = await creditNoteXmlRoute(
      await asFinance(`/api/billing/invoices/${id}/credit-notes/${note.id}/credit-note.xml`),
      params({ id: String(id), creditNoteId: String(note.id) }),
    );
    expect(res.status).toBe(200);
    const xml = await res.text();
    expect(validateEn16931(readUblDocument(xml))).toEqual([]);
    const doc = parser.parse(xml).CreditNote;
    expect(doc.CreditNoteTypeCode).toBe("381");
    expect(doc.BillingReference.InvoiceDocumentReference.ID).toBe("LSS-2026-10-ODS");
    // 25.00 + VAT at 20 % = 30.00.
    expect(doc.LegalMonetaryTotal.TaxInclusiveAmount["#text"]).toBe("30.00");
    expect(doc.CreditNoteLine.Item.Name).toBe("Goodwill <credit> & thanks");
  });

  it("refuses to export without the seller's VAT number, saying what to fix, and changes nothing", async () => {
    const unit = seed.organisations.LSS!;
    const id = invoiceId("LSS-2026-11-PVC");
    const before = await countRows(t.db, ["invoices", "audit_log", "credit_notes"]);
    await t.db.updateTable("organisations").set({ vat_id: null }).where("id", "=", unit).execute();
    try {
      const res = await invoiceXmlRoute(await asFinance(`/api/billing/invoices/${id}/invoice.xml`), params({ id: String(id) }));
      expect(res.status).toBe(422);
      const body = (await res.json()) as { error: { message: string } };
      expect(body.error.message).toMatch(/VAT identifier/);
      expect(body.error.message).toMatch(/billing settings/);
    } finally {
      await t.db.updateTable("organisations").set({ vat_id: "GB000000000" }).where("id", "=", unit).execute();
    }
    expect(await countRows(t.db, ["invoices", "audit_log", "credit_notes"])).toEqual(before);
  });

  it("refuses an invoice whose stored totals disagree with its lines", async () => {
    const id = invoiceId("LSS-2026-11-PVC");
    const row = await t.db.selectFrom("invoices").select("vat_minor").where("id", "=", id).executeTakeFirstOrThrow();
    await t.db.updateTable("invoices").set({ vat_minor: row.vat_minor + 1 }).where("id", "=", id).execute();
    try {
      const res = await invoiceXmlRoute(await asFinance(`/api/billing/invoices/${id}/invoice.xml`), params({ id: String(id) }));
      expect(res.status).toBe(409);
      expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/VAT/);
    } finally {
      await t.db.updateTable("invoices").set({ vat_minor: row.vat_minor }).where("id", "=", id).execute();
    }
  });
});

describe("PDF", () => {
  it("is a PDF document with the invoice's number in its name", async () => {
    const id = invoiceId("LSS-2026-10-MDP");
    const res = await invoicePdfRoute(await asFinance(`/api/billing/invoices/${id}/invoice.pdf`), params({ id: String(id) }));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("content-disposition")).toContain("LSS-2026-10-MDP.pdf");
    const bytes = Buffer.from(await res.arrayBuffer());
    expect(bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(bytes.subarray(-6).toString("latin1")).toMatch(/%%EOF/);
    expect(bytes.toString("latin1")).toMatch(/\n\d+ 0 obj\n\(Invoice LSS-2026-10-MDP\)\nendobj/);
  });
});
