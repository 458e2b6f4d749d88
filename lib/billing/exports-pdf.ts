import "server-only";
import type { Kysely } from "kysely";
import PDFDocument from "pdfkit";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { formatMoney } from "@/lib/contracts/format";
import { formatBasisPoints } from "@/lib/pricing/money";
import { computeInvoiceTotals } from "@/lib/pricing/totals";
import type { InvoiceDocument, TradeParty } from "@/lib/pricing/types";
import { assertStoredTotals, invoiceDocumentFor } from "./exports-document";
import { findInvoiceInScope } from "./invoices";

// The invoice as a PDF in our own plain layout (A4): the unit and the customer, the invoice's
// number and dates, its lines with quantities and prices, the VAT breakdown, the totals, what has
// been paid or credited, the payment terms and the online payment link. Helvetica is one of PDF's
// standard fonts: nothing is embedded, and its WinAnsi encoding covers the names we print.

const FONT = "Helvetica";
const BOLD = "Helvetica-Bold";
const INK = "#1d2a2f";
const MUTED = "#5b6560";
const RULE = "#c9c4b8";

const STATUS_WORDS: Record<string, string> = {
  open: "Open",
  paid: "Paid",
  void: "Void",
  uncollectible: "Written off",
  draft: "Draft",
};

export interface InvoicePdf {
  filename: string;
  pdf: Buffer;
}

const day = (iso: string) => {
  const [y, m, d] = iso.split("-").map(Number) as [number, number, number];
  return new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" }).format(new Date(Date.UTC(y, m - 1, d)));
};

function partyLines(party: TradeParty): string[] {
  const a = party.address;
  return [
    a.street,
    a.additionalStreet,
    [a.city, a.postalCode].filter(Boolean).join(" "),
    a.countryCode === "GB" ? "United Kingdom" : a.countryCode,
    party.vatId ? `VAT ${party.vatId}` : undefined,
    party.contact?.email,
  ].filter((line): line is string => Boolean(line && line.trim()));
}

interface Amounts {
  status: string;
  amountPaidMinor: number;
  amountCreditedMinor: number;
  amountDueMinor: number;
  hostedInvoiceUrl: string | null;
}

/** Renders the invoice document and its payment state as a PDF. Pure apart from pdfkit. */
export async function renderInvoicePdf(doc: InvoiceDocument, amounts: Amounts): Promise<Buffer> {
  const pdf = new PDFDocument({
    size: "A4",
    margins: { top: 50, bottom: 56, left: 50, right: 50 },
    info: { Title: `Invoice ${doc.id}`, Subject: `${doc.supplier.name} to ${doc.customer.name}`, Creator: "Steamlane" },
    bufferPages: true,
  });
  const done = new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    pdf.on("data", (chunk: Buffer) => chunks.push(chunk));
    pdf.on("end", () => resolve(Buffer.concat(chunks)));
    pdf.on("error", reject);
  });
  const money = (minor: number) => formatMoney(minor, doc.currency);
  const left = pdf.page.margins.left;
  const width = pdf.page.width - left - pdf.page.margins.right;
  const bottom = () => pdf.page.height - pdf.page.margins.bottom;
  pdf.fillColor(INK).strokeColor(RULE);

  // Head: the seller on the left, the word "Invoice" and its number on the right.
  pdf.font(BOLD).fontSize(16).text(doc.supplier.name, left, 50, { width: width * 0.6 });
  pdf.font(FONT).fontSize(9).fillColor(MUTED);
  for (const line of partyLines(doc.supplier)) pdf.text(line, { width: width * 0.6 });
  pdf.fillColor(INK).font(BOLD).fontSize(20).text("Invoice", left + width * 0.6, 50, { width: width * 0.4, align: "right" });
  pdf.font(FONT).fontSize(10).text(doc.id, { width: width * 0.4, align: "right" });
  pdf.fontSize(9).fillColor(MUTED).text(STATUS_WORDS[amounts.status] ?? amounts.status, { width: width * 0.4, align: "right" });
  pdf.fillColor(INK);

  // The customer and the dates.
  let y = Math.max(pdf.y, 150) + 10;
  pdf.moveTo(left, y).lineTo(left + width, y).stroke();
  y += 12;
  pdf.font(BOLD).fontSize(9).text("Bill to", left, y);
  pdf.font(BOLD).fontSize(11).text(doc.customer.name, left, y + 13, { width: width * 0.55 });
  pdf.font(FONT).fontSize(9).fillColor(MUTED);
  for (const line of partyLines(doc.customer)) pdf.text(line, { width: width * 0.55 });
  pdf.fillColor(INK);
  const facts: [string, string][] = [
    ["Invoice date", day(doc.issueDate)],
    ...(doc.dueDate ? ([["Due date", day(doc.dueDate)]] as [string, string][]) : []),
    ...(doc.invoicePeriod ? ([["Period", `${day(doc.invoicePeriod.startDate)} – ${day(doc.invoicePeriod.endDate)}`]] as [string, string][]) : []),
    ...(doc.buyerReference ? ([["Your reference", doc.buyerReference]] as [string, string][]) : []),
  ];
  let fy = y;
  for (const [label, value] of facts) {
    pdf.font(FONT).fontSize(9).fillColor(MUTED).text(label, left + width * 0.56, fy, { width: width * 0.14 });
    pdf.fillColor(INK).text(value, left + width * 0.7, fy, { width: width * 0.3, align: "right" });
    fy += Math.max(14, pdf.heightOfString(value, { width: width * 0.3 }) + 3);
  }
  y = Math.max(pdf.y, fy) + 18;

  // The lines.
  const cols = [
    { title: "Description", x: 0, w: 0.46, align: "left" as const },
    { title: "Quantity", x: 0.46, w: 0.1, align: "right" as const },
    { title: "Unit price", x: 0.56, w: 0.15, align: "right" as const },
    { title: "VAT", x: 0.71, w: 0.09, align: "right" as const },
    { title: "Amount", x: 0.8, w: 0.2, align: "right" as const },
  ];
  const header = () => {
    pdf.font(BOLD).fontSize(8.5).fillColor(MUTED);
    for (const c of cols) pdf.text(c.title.toUpperCase(), left + c.x * width, y, { width: c.w * width, align: c.align });
    y += 14;
    pdf.moveTo(left, y).lineTo(left + width, y).stroke();
    y += 6;
    pdf.fillColor(INK);
  };
  header();
  for (const line of doc.lines) {
    pdf.font(FONT).fontSize(9);
    const textHeight = pdf.heightOfString(line.description, { width: cols[0]!.w * width - 8 });
    const noteHeight = line.note ? pdf.fontSize(7.5).heightOfString(line.note, { width: cols[0]!.w * width - 8 }) : 0;
    const rowHeight = textHeight + noteHeight + 8;
    if (y + rowHeight > bottom() - 20) {
      pdf.addPage();
      y = pdf.page.margins.top;
      header();
    }
    pdf.font(FONT).fontSize(9).fillColor(INK);
    pdf.text(line.description, left, y, { width: cols[0]!.w * width - 8 });
    if (line.note) pdf.fontSize(7.5).fillColor(MUTED).text(line.note, left, y + textHeight, { width: cols[0]!.w * width - 8 });
    pdf.fontSize(9).fillColor(INK);
    const quantity = String(line.quantity);
    pdf.text(quantity, left + cols[1]!.x * width, y, { width: cols[1]!.w * width, align: "right" });
    pdf.text(money(line.unitPriceMinor), left + cols[2]!.x * width, y, { width: cols[2]!.w * width, align: "right" });
    pdf.text(`${formatBasisPoints(line.vat.rateBasisPoints)} %`, left + cols[3]!.x * width, y, { width: cols[3]!.w * width, align: "right" });
    pdf.text(money(line.netAmountMinor), left + cols[4]!.x * width, y, { width: cols[4]!.w * width, align: "right" });
    y += rowHeight;
    pdf.moveTo(left, y - 3).lineTo(left + width, y - 3).lineWidth(0.3).stroke().lineWidth(1);
  }

  // VAT breakdown and totals, kept together.
  const totals = computeInvoiceTotals(doc.lines, doc.allowancesCharges ?? []);
  const summary: [string, string, boolean][] = [
    ["Total without VAT", money(totals.taxExclusiveMinor), false],
    ...totals.vatBreakdown.map(
      (g) =>
        [`VAT ${g.category === "S" ? "" : `(${g.category}) `}${formatBasisPoints(g.rateBasisPoints)} % on ${money(g.taxableAmountMinor)}`, money(g.taxAmountMinor), false] as [
          string,
          string,
          boolean,
        ],
    ),
    ["Total with VAT", money(totals.taxInclusiveMinor), true],
    ...(amounts.amountCreditedMinor > 0 ? ([["Credited", `- ${money(amounts.amountCreditedMinor)}`, false]] as [string, string, boolean][]) : []),
    ...(amounts.amountPaidMinor > 0 ? ([["Paid", `- ${money(amounts.amountPaidMinor)}`, false]] as [string, string, boolean][]) : []),
    ["Amount due", money(amounts.amountDueMinor), true],
  ];
  if (y + summary.length * 15 + 110 > bottom()) {
    pdf.addPage();
    y = pdf.page.margins.top;
  }
  y += 8;
  for (const [label, value, strong] of summary) {
    pdf.font(strong ? BOLD : FONT).fontSize(strong ? 10 : 9).fillColor(INK);
    pdf.text(label, left + width * 0.4, y, { width: width * 0.4 });
    pdf.text(value, left + width * 0.8, y, { width: width * 0.2, align: "right" });
    y += strong ? 16 : 14;
  }

  // Terms and the payment link.
  y += 14;
  pdf.moveTo(left, y).lineTo(left + width, y).stroke();
  y += 10;
  pdf.font(BOLD).fontSize(9).fillColor(INK).text("Payment", left, y);
  pdf.font(FONT).fontSize(9);
  if (doc.paymentTerms) pdf.text(`${doc.paymentTerms}.`, { width });
  pdf.text(`Please quote ${doc.id} with your payment.`, { width });
  if (amounts.hostedInvoiceUrl && amounts.status !== "paid" && amounts.status !== "void") {
    pdf.text("Pay online: ", { continued: true, width });
    pdf.fillColor("#0f5e63").text(amounts.hostedInvoiceUrl, { link: amounts.hostedInvoiceUrl, underline: true, width });
    pdf.fillColor(INK);
  } else if (amounts.status === "paid") {
    pdf.text("This invoice has been paid. Thank you.", { width });
  }

  // Page numbers at the foot of every page.
  const range = pdf.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    pdf.switchToPage(i);
    // Writing inside the bottom margin would start a new page: lift the margin for the footer.
    pdf.page.margins.bottom = 0;
    pdf.font(FONT).fontSize(7.5).fillColor(MUTED);
    pdf.text(`${doc.supplier.name} · Invoice ${doc.id} · Page ${i - range.start + 1} of ${range.count}`, left, pdf.page.height - 40, {
      width,
      align: "center",
      lineBreak: false,
    });
  }
  pdf.end();
  return done;
}

/** The invoice's PDF in the caller's scope (404 otherwise). */
export async function invoicePdf(db: Kysely<Database>, user: SessionUser, invoiceId: number): Promise<InvoicePdf> {
  const invoice = await findInvoiceInScope(db, user, invoiceId);
  const doc = await invoiceDocumentFor(db, invoice);
  assertStoredTotals(invoice, doc);
  const pdf = await renderInvoicePdf(doc, {
    status: invoice.status,
    amountPaidMinor: invoice.amount_paid_minor,
    amountCreditedMinor: invoice.amount_credited_minor,
    amountDueMinor: invoice.amount_due_minor,
    hostedInvoiceUrl: invoice.hosted_invoice_url,
  });
  return { filename: `${invoice.number.replace(/[^A-Za-z0-9._-]+/g, "-")}.pdf`, pdf };
}
