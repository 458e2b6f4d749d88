import PDFDocument from "pdfkit";
import { formatAmount } from "./money";

// The PDFs behind `invoice_pdf` and a credit note's `pdf`: a plain one-page summary in the
// fake's own layout, marked as a test document.

export interface PdfLine {
  description: string;
  quantity: number | null;
  amount: number;
}

export interface PdfDocumentInput {
  title: string;
  number: string | null;
  issuer: string;
  customer: string | null;
  dates: [label: string, value: string][];
  currency: string;
  lines: PdfLine[];
  totals: [label: string, amount: number][];
  status: string;
}

export function renderPdf(input: PdfDocumentInput): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: "A4", margin: 56, info: { Title: `${input.title} ${input.number ?? ""}`.trim() } });
    const chunks: Buffer[] = [];
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);

    doc.fontSize(9).fillColor("#a33").text("TEST DOCUMENT — made by the local payment fake; no money has moved.");
    doc.moveDown();
    doc.fillColor("#000").fontSize(18).text(input.title);
    doc.fontSize(11).text(input.number ? `No. ${input.number}` : "Not numbered");
    doc.moveDown(0.5);
    doc.text(`From: ${input.issuer}`);
    if (input.customer) doc.text(`To: ${input.customer}`);
    for (const [label, value] of input.dates) doc.text(`${label}: ${value}`);
    doc.text(`Status: ${input.status}`);
    doc.moveDown();

    const left = doc.page.margins.left;
    const right = doc.page.width - doc.page.margins.right;
    const row = (a: string, b: string, c: string, bold = false) => {
      const y = doc.y;
      doc.font(bold ? "Helvetica-Bold" : "Helvetica").fontSize(10);
      doc.text(a, left, y, { width: right - left - 170 });
      const after = doc.y;
      doc.text(b, right - 160, y, { width: 50, align: "right" });
      doc.text(c, right - 100, y, { width: 100, align: "right" });
      doc.y = Math.max(after, doc.y);
      doc.moveDown(0.3);
    };
    row("Description", "Qty", "Amount", true);
    for (const l of input.lines) row(l.description, l.quantity === null ? "" : String(l.quantity), formatAmount(l.amount, input.currency));
    doc.moveDown(0.5);
    for (const [label, amount] of input.totals) row(label, "", formatAmount(amount, input.currency), label.toLowerCase().includes("due"));
    doc.end();
  });
}
