import "server-only";
import type { Kysely } from "kysely";
import PDFDocument from "pdfkit";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { renderGs1DataMatrixPng, renderGs1DataMatrixSvg } from "@/lib/labels/datamatrix";
import { setLabelElements } from "./identifiers";
import {
  CONTENTS_ROWS,
  contentsSummary,
  LABEL_BLANK_FIELDS,
  LABEL_HEIGHT_MM,
  LABEL_WIDTH_MM,
  LABEL_WITH_CONTENTS_HEIGHT_MM,
  layoutContents,
  moreLinesNote,
} from "./label-layout";
import { getSet, getSetContents, type SetContentsLine, type SetView } from "./service";

// A set's label: the data it shows, its DataMatrix symbol, and the label as a PDF for a label
// printer (100 × 50 mm, or 100 × 150 mm with the contents list).

export interface SetLabel {
  set: SetView;
  contents: SetContentsLine[];
}

/** What the label of one set shows, in the caller's scope (404 otherwise). */
export async function getSetLabel(db: Kysely<Database>, user: SessionUser, id: number): Promise<SetLabel> {
  const set = await getSet(db, user, id);
  const contents = await getSetContents(db, user, id);
  return { set, contents };
}

/** The set's GS1 DataMatrix as an SVG document (scaled by whoever places it). */
export function setSymbolSvg(giai: string): string {
  return renderGs1DataMatrixSvg(setLabelElements(giai), { quietZone: 1 });
}

const MM = 72 / 25.4;
const mm = (value: number) => value * MM;

// Helvetica is one of PDF's standard fonts: every reader and label printer driver has it, so
// nothing is embedded. Its WinAnsi encoding covers the Latin text of names, sites and contents.
const FONTS = { regular: "Helvetica", bold: "Helvetica-Bold" } as const;

/** The label as a PDF whose page is the label itself; `withContents` adds the contents list below. */
export async function renderSetLabelPdf(label: SetLabel, options: { withContents: boolean }): Promise<Buffer> {
  const { set } = label;
  const heightMm = options.withContents ? LABEL_WITH_CONTENTS_HEIGHT_MM : LABEL_HEIGHT_MM;
  const symbol = await renderGs1DataMatrixPng(setLabelElements(set.giai), { scale: 8, quietZone: 1 });
  const doc = new PDFDocument({
    size: [mm(LABEL_WIDTH_MM), mm(heightMm)],
    margin: 0,
    info: { Title: `Label ${set.serial}`, Subject: `${set.setTypeName}, ${set.organisationName}`, Creator: "Steamlane" },
  });
  const done = new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on("data", (chunk: Buffer) => chunks.push(chunk));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  const fonts = FONTS;
  doc.fillColor("black").strokeColor("black");

  // Head: the set type's name and code, then a rule.
  doc.font(fonts.bold).fontSize(8.5).text(set.setTypeName, mm(3), mm(3), { width: mm(72), height: mm(5), ellipsis: true, lineBreak: false });
  doc.font(fonts.regular).fontSize(6.5).text(set.setTypeCode, mm(76), mm(3.6), { width: mm(21), align: "right", lineBreak: false });
  doc.lineWidth(0.6).moveTo(mm(3), mm(9)).lineTo(mm(97), mm(9)).stroke();

  // Left: the symbol, with its human-readable interpretation under it.
  doc.image(symbol, mm(4.5), mm(11.5), { width: mm(22), height: mm(22) });
  doc.font(fonts.regular).fontSize(5.6).text(set.humanReadable, mm(2), mm(35), { width: mm(27), align: "center" });

  // Right: serial, customer, home site.
  doc.font(fonts.bold).fontSize(15).text(set.serial, mm(32), mm(10.5), { width: mm(65), lineBreak: false });
  doc.font(fonts.regular).fontSize(7);
  doc.text(set.organisationName, mm(32), mm(18), { width: mm(65), height: mm(3.2), ellipsis: true, lineBreak: false });
  doc.text(set.homeSiteName, mm(32), mm(21.3), { width: mm(65), height: mm(3.2), ellipsis: true, lineBreak: false });

  // Boxes for what is written in by hand at packing and sterilisation, each with its caption.
  LABEL_BLANK_FIELDS.forEach((caption, index) => {
    const x = mm(32 + (index % 2) * 33);
    const top = mm(26.5 + Math.floor(index / 2) * 10);
    doc.lineWidth(0.6).rect(x, top, mm(31), mm(8.5)).stroke();
    doc.font(fonts.regular).fontSize(5.5).text(caption.toUpperCase(), x + mm(0.9), top + mm(0.8), {
      width: mm(29),
      lineBreak: false,
      characterSpacing: 0.3,
    });
  });

  if (options.withContents) drawContents(doc, fonts, label.contents);

  doc.end();
  return done;
}

function drawContents(doc: PDFKit.PDFDocument, fonts: typeof FONTS, lines: SetContentsLine[]) {
  const layout = layoutContents(lines);
  doc.lineWidth(0.6).moveTo(mm(3), mm(50)).lineTo(mm(97), mm(50)).stroke();
  doc.font(fonts.bold).fontSize(7).text(`Contents: ${contentsSummary(layout.instruments, lines.length)}`, mm(3), mm(51.5), {
    width: mm(94),
    lineBreak: false,
  });
  const rowHeight = 3;
  const columnWidth = layout.columns === 2 ? 46 : 94;
  doc.font(fonts.regular).fontSize(6.2);
  const entries = layout.shown.map((line) => ({ quantity: `${line.quantity} ×`, name: line.name }));
  if (layout.hidden > 0) {
    const note = moreLinesNote(layout.hidden);
    entries.push({ quantity: note.count, name: note.text });
  }
  if (lines.length === 0) entries.push({ quantity: "", name: "No contents list in the catalogue yet." });
  entries.forEach((entry, index) => {
    const column = Math.floor(index / CONTENTS_ROWS);
    const x = mm(3 + column * 48);
    const y = mm(56 + (index % CONTENTS_ROWS) * rowHeight);
    doc.text(entry.quantity, x, y, { width: mm(6), align: "right", lineBreak: false });
    doc.text(entry.name, x + mm(7.2), y, { width: mm(columnWidth - 7.2), height: mm(rowHeight), ellipsis: true, lineBreak: false });
  });
}
