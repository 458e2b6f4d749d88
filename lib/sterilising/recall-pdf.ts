import "server-only";
import PDFDocument from "pdfkit";
import { formatDateTime } from "@/lib/format";
import type { RecallView } from "./recalls";
import { RECALL_ADVISORY_TEXT } from "./status";

// The recall report as a PDF (A4, Helvetica — a standard font, nothing embedded): the recall, its
// load and reason, the affected customers, then every set with where it is now and the procedures
// that used it, and the advisory notice.

const FONT = "Helvetica";
const BOLD = "Helvetica-Bold";
/** Helvetica's WinAnsi encoding lacks some characters we write (the en dash is fine; arrows are not). */
const plain = (text: string) => text.replace(/[^\x20-\x7E\u00A0-\u00FF\u2013\u2014\u2018\u2019\u201C\u201D]/g, "?");

export async function renderRecallPdf(recall: RecallView): Promise<Buffer> {
  const pdf = new PDFDocument({ size: "A4", margins: { top: 50, bottom: 56, left: 50, right: 50 }, info: { Title: `Recall ${recall.number}`, Creator: "Steamlane" } });
  const done = new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    pdf.on("data", (chunk: Buffer) => chunks.push(chunk));
    pdf.on("end", () => resolve(Buffer.concat(chunks)));
    pdf.on("error", reject);
  });
  pdf.font(BOLD).fontSize(18).text(plain(`Recall ${recall.number}`));
  pdf.font(FONT).fontSize(10).moveDown(0.3);
  pdf.text(plain(`Load ${recall.load.number} on ${recall.load.machineCode}, raised ${formatDateTime(recall.createdAt)}${recall.createdBy ? ` by ${recall.createdBy}` : ""}. Status: ${recall.status}.`));
  pdf.text(plain(`Reason: ${recall.reason}`));
  pdf.moveDown(0.6).font(BOLD).fontSize(12).text("Affected customers");
  pdf.font(FONT).fontSize(10);
  for (const c of recall.customers) pdf.text(plain(`${c.name}: ${c.sets} set${c.sets === 1 ? "" : "s"}, ${c.outstanding} not back yet`));
  pdf.moveDown(0.6).font(BOLD).fontSize(12).text("Sets");
  for (const i of recall.items) {
    pdf.moveDown(0.3).font(BOLD).fontSize(10).text(plain(`${i.serial} - ${i.setTypeName}`));
    pdf.font(FONT).fontSize(9).text(plain(`${i.organisationName}, ${i.siteName}. At recall: ${i.stateAtRecall}; now: ${i.stateLabel}${i.returnedAt ? ` (back ${formatDateTime(i.returnedAt)})` : ""}.`));
    for (const p of i.procedures) pdf.text(plain(`Used: ${p.theatre}, case ${p.caseReference}, ${formatDateTime(p.usedAt)}`), { indent: 12 });
  }
  pdf.moveDown(1).font(FONT).fontSize(8).fillColor("#555555").text(plain(RECALL_ADVISORY_TEXT));
  pdf.end();
  return done;
}
