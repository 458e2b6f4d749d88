import "server-only";
import { tz } from "@date-fns/tz";
import { format } from "date-fns";
import type { Kysely } from "kysely";
import PDFDocument from "pdfkit";
import { z } from "zod";
import type { CycleRow, Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { CYCLE_STATE_LABELS, type CycleState } from "@/lib/cycles/lifecycle";
import { serverEnv } from "@/lib/env";
import { notFound } from "@/lib/errors";
import { renderGs1DataMatrixPng, renderGs1DataMatrixSvg } from "@/lib/labels/datamatrix";
import { labelIrregularityText } from "@/lib/packing/checklist";
import { currentPackRecord } from "@/lib/packing/records";
import { setLabelElements } from "./identifiers";
import {
  CONTENTS_ROWS,
  contentsSummary,
  LABEL_BLANK_FIELDS,
  LABEL_HEIGHT_MM,
  LABEL_WIDTH_MM,
  LABEL_WITH_CONTENTS_HEIGHT_MM,
  type LabelCycleFields,
  labelDate,
  labelFieldLines,
  layoutContents,
  moreLinesNote,
} from "./label-layout";
import { labelQuerySchema } from "./schemas";
import { getSet, getSetContents, type SetContentsLine, type SetView } from "./service";

// A set's label: the data it shows, its DataMatrix symbol, and the label as a PDF for a label
// printer (100 × 50 mm, or 100 × 150 mm with the contents list). Once the set's cycle is packed
// the label carries the packer, the time, the packaging and any irregularity; once sterilised, the
// load and the dates (see LabelCycleFields for why the symbol keeps the GIAI alone).

export interface SetLabel {
  set: SetView;
  contents: SetContentsLine[];
  /** The cycle the label is for (the open one, else the latest), null for a set never booked. */
  cycle: LabelCycleFields | null;
  /** A word beside the label, never on it: a cycle on hold or recalled, or not packed yet. */
  notice: string | null;
}

/** The label's query: `contents=1` adds the contents list; `cycle=<id>` picks one of the set's cycles. */
export const labelPrintQuerySchema = labelQuerySchema.extend({
  cycle: z
    .string()
    .regex(/^[1-9][0-9]{0,15}$/, "The cycle is a number.")
    .transform(Number)
    .optional(),
});

/** Finds the printed number of a steriliser load from the load id its sterilise scan event carries. */
export type LoadNumberLookup = (db: Kysely<Database>, loadId: number) => Promise<string | null>;
export const defaultLoadNumber: LoadNumberLookup = async (db, loadId) => {
  const row = await db.selectFrom("steriliser_loads").select("number").where("id", "=", loadId).executeTakeFirst();
  return row?.number ?? null;
};

export interface SetLabelOptions {
  /** One of the set's cycles; without it the open cycle, else the latest. */
  cycleId?: number;
  loadNumber?: LoadNumberLookup;
}

/** What the label of one set shows, in the caller's scope (404 otherwise, also for a cycle of another set). */
export async function getSetLabel(db: Kysely<Database>, user: SessionUser, id: number, options: SetLabelOptions = {}): Promise<SetLabel> {
  const set = await getSet(db, user, id);
  const contents = await getSetContents(db, user, id);
  const cycle = await labelCycleRow(db, set.id, options.cycleId);
  if (!cycle) return { set, contents, cycle: null, notice: null };
  const fields = await labelCycleFields(db, cycle, options.loadNumber ?? defaultLoadNumber);
  return { set, contents, cycle: fields, notice: labelNotice(cycle, fields) };
}

async function labelCycleRow(db: Kysely<Database>, setId: number, cycleId: number | undefined): Promise<CycleRow | null> {
  const base = db.selectFrom("cycles").selectAll().where("set_id", "=", setId);
  if (cycleId !== undefined) {
    const row = await base.where("id", "=", cycleId).executeTakeFirst();
    if (!row) throw notFound("That cycle of this set");
    return row;
  }
  const open = await base.where("state", "not in", ["delivered", "cancelled"]).executeTakeFirst();
  if (open) return open;
  return (await base.where("state", "!=", "cancelled").orderBy("booked_at", "desc").orderBy("id", "desc").executeTakeFirst()) ?? null;
}

const stamp = (iso: string, pattern: string) => format(new Date(iso), pattern, { in: tz(serverEnv().UNIT_TIME_ZONE) });

async function labelCycleFields(db: Kysely<Database>, cycle: CycleRow, loadNumber: LoadNumberLookup): Promise<LabelCycleFields> {
  const record = await currentPackRecord(db, cycle.id);
  let load: string | null = null;
  if (cycle.sterilised_at) {
    const event = await db
      .selectFrom("scan_events")
      .select("load_id")
      .where("cycle_id", "=", cycle.id)
      .where("event", "=", "sterilise")
      .orderBy("id", "desc")
      .executeTakeFirst();
    if (event?.load_id) load = await loadNumber(db, event.load_id);
    // Loads recorded after the fact (the demo history) link their cycles through load_items only.
    if (!load) {
      const item = await db
        .selectFrom("load_items as i")
        .innerJoin("steriliser_loads as l", "l.id", "i.load_id")
        .select("l.number")
        .where("i.cycle_id", "=", cycle.id)
        .where("l.status", "in", ["awaiting_release", "released", "failed"])
        .orderBy("i.added_at", "desc")
        .executeTakeFirst();
      load = item?.number ?? null;
    }
  }
  const irregularities = record?.irregularities ?? [];
  const lineNotes: Record<string, string> = {};
  for (const i of irregularities) lineNotes[i.name] = [lineNotes[i.name], `${i.quantity} ${i.kind}`].filter(Boolean).join(", ");
  return {
    cycleId: cycle.id,
    packedBy: record ? (record.packedByName ?? "—") : null,
    packedAt: record ? stamp(record.at, "d MMM yyyy HH:mm") : null,
    packaging: record ? record.packagingLabel : null,
    load,
    sterilisedOn: cycle.sterilised_at ? stamp(cycle.sterilised_at, "d MMM yyyy") : null,
    useBy: labelDate(cycle.expires_on),
    irregularity: labelIrregularityText(irregularities),
    lineNotes,
  };
}

function labelNotice(cycle: CycleRow, fields: LabelCycleFields): string | null {
  const state = cycle.state as CycleState;
  if (state === "on_hold") {
    return `This set is on hold${cycle.hold_reason ? `: ${cycle.hold_reason}` : ""}. Do not send it out until the hold is cleared.`;
  }
  if (state === "recalled") return "This set's cycle is recalled. Do not use or send out the pack.";
  if (!fields.packedBy) return `Not packed yet (${CYCLE_STATE_LABELS[state]?.toLowerCase() ?? state}): the boxes stay blank.`;
  return null;
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

  // Left: the symbol, with its human-readable interpretation and the packaging under it.
  doc.image(symbol, mm(4.5), mm(11), { width: mm(22), height: mm(22) });
  doc.font(fonts.regular).fontSize(5.6).text(set.humanReadable, mm(2), mm(34.3), { width: mm(27), align: "center" });
  if (label.cycle?.packaging) {
    doc.font(fonts.bold).fontSize(6).text(label.cycle.packaging, mm(2), mm(38.8), { width: mm(27), align: "center", lineBreak: false });
  }

  // Right: serial, customer, home site.
  doc.font(fonts.bold).fontSize(15).text(set.serial, mm(32), mm(10.3), { width: mm(65), lineBreak: false });
  doc.font(fonts.regular).fontSize(7);
  doc.text(set.organisationName, mm(32), mm(17.2), { width: mm(65), height: mm(3.2), ellipsis: true, lineBreak: false });
  doc.text(set.homeSiteName, mm(32), mm(20.3), { width: mm(65), height: mm(3.2), ellipsis: true, lineBreak: false });

  // The boxes of packing and sterilisation: filled from the cycle, or blank to be written in by hand.
  const values = labelFieldLines(label.cycle);
  LABEL_BLANK_FIELDS.forEach((caption, index) => {
    const x = mm(32 + (index % 2) * 33);
    const top = mm(24.4 + Math.floor(index / 2) * 9.5);
    doc.lineWidth(0.6).rect(x, top, mm(31), mm(8.5)).stroke();
    doc.font(fonts.regular).fontSize(5.5).text(caption.toUpperCase(), x + mm(0.9), top + mm(0.8), {
      width: mm(29),
      lineBreak: false,
      characterSpacing: 0.3,
    });
    values[caption].forEach((line, row) => {
      doc.font(row === 0 ? fonts.bold : fonts.regular).fontSize(6.3).text(line, x + mm(0.9), top + mm(3.1 + row * 2.6), {
        width: mm(29),
        height: mm(2.6),
        ellipsis: true,
        lineBreak: false,
      });
    });
  });

  // An irregularity the set was packed with: white on a black band across the foot, not to be missed.
  if (label.cycle?.irregularity) {
    doc.rect(mm(3), mm(43.2), mm(94), mm(3.8)).fill("black");
    doc.fillColor("white").font(fonts.bold).fontSize(6.3).text(label.cycle.irregularity, mm(4), mm(44.1), {
      width: mm(92),
      height: mm(2.8),
      ellipsis: true,
      lineBreak: false,
    });
    doc.fillColor("black");
  }

  if (options.withContents) drawContents(doc, fonts, label.contents, label.cycle?.lineNotes ?? {});

  doc.end();
  return done;
}

function drawContents(doc: PDFKit.PDFDocument, fonts: typeof FONTS, lines: SetContentsLine[], notes: Record<string, string>) {
  const layout = layoutContents(lines);
  doc.lineWidth(0.6).moveTo(mm(3), mm(50)).lineTo(mm(97), mm(50)).stroke();
  doc.font(fonts.bold).fontSize(7).text(`Contents: ${contentsSummary(layout.instruments, lines.length)}`, mm(3), mm(51.5), {
    width: mm(94),
    lineBreak: false,
  });
  const rowHeight = 3;
  const columnWidth = layout.columns === 2 ? 46 : 94;
  doc.font(fonts.regular).fontSize(6.2);
  const entries = layout.shown.map((line) => ({ quantity: `${line.quantity} ×`, name: notes[line.name] ? `${line.name} — ${notes[line.name]}` : line.name }));
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
