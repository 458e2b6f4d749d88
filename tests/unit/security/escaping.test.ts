import fs from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { XMLParser } from "fast-xml-parser";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { renderInvoicePdf } from "@/lib/billing/exports-pdf";
import { safeCell, toCsv } from "@/lib/csv";
import { escapeHtml } from "@/lib/mail/html";
import { bookingConfirmedMail } from "@/lib/mail/order-templates";
import { problemAnsweredMail } from "@/lib/mail/problem-templates";
import { invitationMail, recallMail } from "@/lib/mail/templates";
import type { InvoiceLine } from "@/lib/pricing/types";
import { buildUblInvoice } from "@/lib/pricing/ubl";
import { readUblDocument } from "@/lib/pricing/ubl-read";
import { pdfText } from "../../support/pdf-text";
import { CUSTOMER, invoiceShell } from "../pricing/fixtures";

// What users typed comes out of every export as text, never as markup, a formula or a command:
// CSV (formula injection), UBL XML, PDF and e-mail HTML.

const HOSTILE = `<script>alert("x")</script> & 'quoted' "double" =HYPERLINK("http://evil.example") ]]> <!-- --> \u202Eevil\u202C`;
const ROOT = path.resolve(__dirname, "../../..");
const FORMULA_START = /^[=+\-@\t\r]/;

describe("CSV exports", () => {
  it("prefixes cells that a spreadsheet would evaluate and leaves our numbers as numbers", () => {
    // The characters are those OWASP lists for CSV injection: = + - @ tab and carriage return.
    for (const cell of ["=1+1", "+1", "-1+2", "@SUM(A1)", "\tx", "\rx"]) expect(safeCell(cell)).toBe(`'${cell}`);
    expect(safeCell("-12.50")).toBe("-12.50");
    expect(safeCell(-3)).toBe("-3");
    expect(safeCell(null)).toBe("");
    expect(safeCell("Basic tray")).toBe("Basic tray");
  });

  it("writes any text so that reading the file back gives each cell as typed, and no cell starts a formula", () => {
    fc.assert(
      fc.property(fc.array(fc.array(fc.oneof(fc.string({ unit: "grapheme" }), fc.string(), fc.constantFrom("=1+1", "-2", "@x", "\t=x", "a,b", 'say "hi"', "two\nlines"))), { minLength: 1, maxLength: 5 }), (rows) => {
        const width = Math.max(1, ...rows.map((r) => r.length));
        const header = Array.from({ length: width }, (_, i) => `c${i}`);
        const padded = rows.map((r) => [...r, ...Array(width - r.length).fill("")]);
        const text = toCsv(header, padded);
        expect(text.startsWith("\uFEFF")).toBe(true);
        const parsed = Papa.parse<string[]>(text.slice(1), { newline: "\r\n", delimiter: "," });
        const data = parsed.data.slice(1, 1 + padded.length);
        expect(data.length).toBe(padded.length);
        data.forEach((row, r) =>
          row.forEach((cell, c) => {
            const typed = String(padded[r]![c]);
            if (FORMULA_START.test(cell)) expect(cell).toMatch(/^-?\d+(\.\d+)?$/);
            expect(cell === typed || cell === `'${typed}`).toBe(true);
          }),
        );
      }),
      { numRuns: 200 },
    );
  });

  it("is the one writer of every CSV export: no other module calls papaparse's unparse, except the machine record formats", () => {
    // The time/temperature record writers produce numbers and fixed words that our own parsers read back.
    const machineFormats = new Set(["lib/cycles/csv.ts", "lib/washing/entered.ts"]);
    const offenders: string[] = [];
    const walk = (dir: string) => {
      for (const e of fs.readdirSync(path.join(ROOT, dir), { withFileTypes: true })) {
        const rel = `${dir}/${e.name}`;
        if (e.isDirectory()) walk(rel);
        else if (/\.(ts|tsx)$/.test(e.name) && rel !== "lib/csv.ts" && !machineFormats.has(rel)) {
          if (/\.unparse\(/.test(fs.readFileSync(path.join(ROOT, rel), "utf8"))) offenders.push(rel);
        }
      }
    };
    for (const dir of ["app", "lib", "components"]) walk(dir);
    expect(offenders).toEqual([]);
  });
});

const hostileLine = (): InvoiceLine => ({
  id: "1",
  kind: "other",
  itemCode: "item-1",
  description: HOSTILE,
  quantity: 2,
  unitCode: "C62",
  unitPriceMinor: 1250,
  netAmountMinor: 2500,
  vat: { category: "S", rateBasisPoints: 2000 },
  cycleIds: [],
});

describe("UBL invoices", () => {
  it("escapes <, >, &, quotes and CDATA ends in user text, and reads it back exactly", () => {
    const doc = invoiceShell({ lines: [hostileLine()], customer: { ...CUSTOMER, name: `Ward <7> & "Co" 'theatres'` }, buyerReference: `PO<1>&"2"` });
    const xml = buildUblInvoice(doc);
    expect(xml).not.toContain("<script>");
    expect(xml).not.toContain(`Ward <7>`);
    const parsed = new XMLParser({ processEntities: true }).parse(xml);
    expect(parsed.Invoice).toBeDefined();
    const read = readUblDocument(xml);
    expect(read.lines[0]!.itemName).toBe(HOSTILE);
    expect(JSON.stringify(read)).toContain(JSON.stringify(`Ward <7> & "Co" 'theatres'`).slice(1, -1));
  });
});

describe("PDF invoices", () => {
  it("draws user text as text: no script, action or link objects appear, and the words come back out", async () => {
    const doc = invoiceShell({ lines: [hostileLine()], customer: { ...CUSTOMER, name: "Ward (7) \\ /JavaScript /OpenAction" } });
    const pdf = await renderInvoicePdf(doc, { status: "open", amountPaidMinor: 0, amountCreditedMinor: 0, amountDueMinor: 3000, hostedInvoiceUrl: null });
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const raw = pdf.toString("latin1");
    // User text sits inside escaped string literals (the document's title names the customer);
    // outside them, no object may name an action.
    expect(raw).toContain("Ward \\(7\\) \\\\ /JavaScript");
    const outsideStrings = raw.replace(/\((?:\\[\s\S]|[^\\()])*\)/g, "()");
    for (const name of ["/JavaScript", "/JS ", "/OpenAction", "/Launch", "/AA "]) expect(outsideStrings).not.toContain(name);
    // A PDF reader (PDF.js) reads the drawn text back; the words the user typed are there as text.
    const text = await pdfText(pdf);
    expect(text).toContain("/JavaScript /OpenAction");
    expect(text).toContain("<script>alert");
  });
});

describe("e-mail HTML", () => {
  const noRawMarkup = (html: string) => {
    expect(html).not.toContain("<script>");
    expect(html).not.toContain("=HYPERLINK(\"http");
    expect(html).toContain(escapeHtml("<script>alert(\"x\")</script>"));
  };

  it("escapes everything people typed in the invitation, recall, problem and order messages", () => {
    noRawMarkup(
      invitationMail({
        inviteeName: HOSTILE,
        inviterName: HOSTILE,
        organisationName: HOSTILE,
        roleLabel: "Clinic staff",
        link: `https://steamlane.example/accept-invite/abc?x="><script>`,
        expiresAt: new Date("2026-12-05T10:00:00Z"),
        timeZone: "Europe/London",
      }).html,
    );
    noRawMarkup(
      recallMail({
        organisationName: HOSTILE,
        recallNumber: "R-0001",
        loadNumber: "L-0001",
        reason: HOSTILE,
        sets: [{ serial: "QMH-000001", typeName: HOSTILE, siteName: HOSTILE }],
        link: "https://steamlane.example/clinic/recalls/1",
      }).html,
    );
    noRawMarkup(
      problemAnsweredMail({
        recipientName: HOSTILE,
        problemNumber: 4,
        kindLabel: "Other",
        orderReference: "QMH-0001",
        setLabel: HOSTILE,
        siteName: HOSTILE,
        reportedAt: "1 December 2026",
        description: `${HOSTILE}\n\n${HOSTILE}`,
        answer: HOSTILE,
        answeredByName: HOSTILE,
        answeredAt: "2 December 2026",
        link: "https://steamlane.example/clinic/problems/4",
      }).html,
    );
    noRawMarkup(
      bookingConfirmedMail(
        {
          recipientName: HOSTILE,
          reference: "QMH-0001",
          siteName: HOSTILE,
          link: "https://steamlane.example/clinic/orders/1",
          sets: [{ serial: "QMH-000001", name: HOSTILE }],
          extras: [{ description: HOSTILE, quantity: 2 }],
        },
        { collection: "Tuesday 09:00–12:00", promised: "Thursday 08:00" },
      ).html,
    );
  });
});
