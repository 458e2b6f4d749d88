import PDFDocument from "pdfkit";
import { type ChartAnnotations, chartDomains, linearScale, thinSamples, timeStepSeconds } from "./chart-geometry";
import type { CycleSample } from "./record";

// The one-page cycle record of a washer batch or a steriliser load, in our own plain A4 layout:
// what ran (machine, program, requirement), who started it and when, the load list, the checks
// with their limits, the decision and who made it, and the curve drawn with the chart's own
// geometry (lib/cycles/chart-geometry.ts). It takes plain data, so the batch and the load routes
// share it. Helvetica is one of PDF's standard fonts: nothing is embedded, and its WinAnsi
// encoding lacks a few signs we use on screen (≥, ≤, −), which are spelled out. Pure apart from
// pdfkit.

export interface CycleRecordSheet {
  /** "Washer batch" or "Steriliser load". */
  what: string;
  number: string;
  unitName: string;
  machine: { code: string; name: string };
  program: { code: string; name: string; requirementText: string };
  /** Lines of facts about the run, e.g. { label: "Started", value: "2 Dec 2026, 07:40 by Sol Brackenbury" }. */
  facts: { label: string; value: string }[];
  items: { serial: string; description: string; customer: string }[];
  checks: { label: string; computed: string; required: string; ok: boolean | null }[];
  decision: { outcome: string; by: string | null; at: string | null; reasons: string[] };
  curve: ({ samples: CycleSample[] } & ChartAnnotations) | null;
  /** Why there is no curve, when there is none. */
  curveMissing?: string;
  advisory: string;
  /** When the sheet was printed, as people read it. */
  printedAt: string;
}

const FONT = "Helvetica";
const BOLD = "Helvetica-Bold";
const INK = "#1d2a2f";
const MUTED = "#5b6560";
const RULE = "#c9c4b8";
const CURVE = "#0f5e63";
const LIMIT = "#964b0f";

const REPLACEMENTS: [RegExp, string][] = [
  [/≥/g, ">="],
  [/≤/g, "<="],
  [/−/g, "-"],
  [/→/g, "->"],
  [/✓/g, "yes"],
  [/✕/g, "no"],
  [/[\u202f\u2009\u00a0]/g, " "],
];

/** Text the standard Helvetica can print: signs outside WinAnsi spelled out, anything else unknown dropped. */
export function pdfText(text: string): string {
  let out = text;
  for (const [pattern, replacement] of REPLACEMENTS) out = out.replace(pattern, replacement);
  // WinAnsi: Latin-1 plus a few punctuation marks (dashes, quotes, bullet, ellipsis, euro).
  return out.replace(/[^\u0009\u000a\u0020-\u007e\u00a1-\u00ff\u2013\u2014\u2018\u2019\u201c\u201d\u2022\u2026\u20ac\u00b7]/g, "");
}

/** Renders the sheet as a one-page A4 PDF. */
export async function renderCycleRecordPdf(sheet: CycleRecordSheet): Promise<Buffer> {
  const pdf = new PDFDocument({
    size: "A4",
    margins: { top: 40, bottom: 40, left: 42, right: 42 },
    info: { Title: pdfText(`${sheet.what} ${sheet.number} - cycle record`), Subject: pdfText(`${sheet.machine.code} ${sheet.program.name}`), Creator: "Steamlane" },
  });
  const done = new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    pdf.on("data", (chunk: Buffer) => chunks.push(chunk));
    pdf.on("end", () => resolve(Buffer.concat(chunks)));
    pdf.on("error", reject);
  });
  const left = pdf.page.margins.left;
  const width = pdf.page.width - left - pdf.page.margins.right;
  const pageBottom = pdf.page.height - 40;
  const t = (s: string) => pdfText(s);

  // Header
  pdf.fillColor(INK).font(BOLD).fontSize(15).text(t(`${sheet.what} ${sheet.number}`), left, 40, { width: width - 200, lineBreak: false });
  pdf.font(FONT).fontSize(9).fillColor(MUTED).text(t(sheet.unitName), left + width - 200, 42, { width: 200, align: "right", lineBreak: false });
  pdf.text("Cycle record", left + width - 200, 54, { width: 200, align: "right", lineBreak: false });
  pdf.fontSize(10).fillColor(INK).text(t(`${sheet.machine.code} · ${sheet.machine.name} · ${sheet.program.name} (${sheet.program.code})`), left, 62, { width });
  let y = 80;

  // Advisory note
  pdf.font(FONT).fontSize(7.5);
  const advisoryHeight = pdf.heightOfString(t(sheet.advisory), { width: width - 16 }) + 10;
  pdf.rect(left, y, width, advisoryHeight).lineWidth(0.8).strokeColor(LIMIT).stroke();
  pdf.fillColor(LIMIT).text(t(sheet.advisory), left + 8, y + 5, { width: width - 16 });
  y += advisoryHeight + 10;

  // Facts in two columns, then the decision.
  const facts = [{ label: "Requirement", value: sheet.program.requirementText }, ...sheet.facts];
  const colW = width / 2;
  const factTop = y;
  facts.forEach((f, i) => {
    const cx = left + (i % 2) * colW;
    const cy = factTop + Math.floor(i / 2) * 24;
    pdf.font(FONT).fontSize(7.5).fillColor(MUTED).text(t(f.label), cx, cy, { width: colW - 10, lineBreak: false });
    pdf.font(FONT).fontSize(9).fillColor(INK).text(t(f.value), cx, cy + 9, { width: colW - 10, lineBreak: false, ellipsis: true });
  });
  y = factTop + Math.ceil(facts.length / 2) * 24 + 4;

  pdf.rect(left, y, width, 0.6).fill(RULE);
  y += 6;
  pdf.font(BOLD).fontSize(10).fillColor(INK).text(t(`Decision: ${sheet.decision.outcome}`), left, y, { width, lineBreak: false });
  y += 13;
  const who = [sheet.decision.by ? `by ${sheet.decision.by}` : null, sheet.decision.at].filter(Boolean).join(", ");
  if (who) {
    pdf.font(FONT).fontSize(8.5).fillColor(MUTED).text(t(who), left, y, { width, lineBreak: false });
    y += 11;
  }
  for (const reason of sheet.decision.reasons.slice(0, 4)) {
    pdf.font(FONT).fontSize(8.5).fillColor(INK).text(t(`• ${reason}`), left, y, { width });
    y = pdf.y + 1;
  }
  y += 6;

  // The curve
  const chartH = 208;
  if (sheet.curve && sheet.curve.samples.length >= 2) {
    drawCurve(pdf, sheet.curve, left, y, width, chartH);
  } else {
    pdf.rect(left, y, width, 40).lineWidth(0.6).strokeColor(RULE).stroke();
    pdf.font(FONT).fontSize(9).fillColor(MUTED).text(t(sheet.curveMissing ?? "No record: no curve to draw."), left + 8, y + 15, { width: width - 16 });
  }
  y += (sheet.curve && sheet.curve.samples.length >= 2 ? chartH + 34 : 48) + 4;

  // The checks
  pdf.font(BOLD).fontSize(10).fillColor(INK).text("Checks", left, y);
  y += 14;
  const cols = [0.42, 0.22, 0.24, 0.12].map((f) => f * width);
  const head = ["Measure", "Computed", "Required", "Result"];
  pdf.font(BOLD).fontSize(7.5).fillColor(MUTED);
  let cx = left;
  head.forEach((h, i) => {
    pdf.text(h, cx, y, { width: cols[i]! - 6, lineBreak: false });
    cx += cols[i]!;
  });
  y += 11;
  for (const c of sheet.checks) {
    if (y > pageBottom - 120) break;
    cx = left;
    const cells = [c.label, c.computed, c.required, c.ok === null ? "for information" : c.ok ? "meets" : "MISSES"];
    cells.forEach((cell, i) => {
      pdf
        .font(i === 3 && c.ok === false ? BOLD : FONT)
        .fontSize(8.5)
        .fillColor(INK)
        .text(t(cell), cx, y, { width: cols[i]! - 6, lineBreak: false, ellipsis: true });
      cx += cols[i]!;
    });
    y += 12;
    pdf.rect(left, y - 2, width, 0.4).fill(RULE);
  }
  y += 8;

  // The load list, as much as fits on the page.
  pdf.font(BOLD).fontSize(10).fillColor(INK).text(t(`Load list (${sheet.items.length} set${sheet.items.length === 1 ? "" : "s"})`), left, y);
  y += 14;
  const rowsLeft = Math.max(0, Math.floor((pageBottom - 24 - y) / 11));
  const perColumn = Math.max(1, rowsLeft);
  const twoColumns = sheet.items.length > perColumn;
  const itemW = twoColumns ? width / 2 : width;
  const capacity = twoColumns ? perColumn * 2 : perColumn;
  const shown = sheet.items.length > capacity ? sheet.items.slice(0, capacity - 1) : sheet.items;
  shown.forEach((item, i) => {
    const column = twoColumns ? Math.floor(i / perColumn) : 0;
    const row = twoColumns ? i % perColumn : i;
    pdf
      .font(FONT)
      .fontSize(8)
      .fillColor(INK)
      .text(t(`${item.serial}  ${item.description} · ${item.customer}`), left + column * itemW, y + row * 11, { width: itemW - 8, lineBreak: false, ellipsis: true });
  });
  if (shown.length < sheet.items.length) {
    const i = shown.length;
    const column = twoColumns ? Math.floor(i / perColumn) : 0;
    const row = twoColumns ? i % perColumn : i;
    pdf.font(BOLD).fontSize(8).fillColor(INK).text(`... and ${sheet.items.length - shown.length} more (see the load on screen)`, left + column * itemW, y + row * 11, { width: itemW - 8, lineBreak: false });
  }
  if (sheet.items.length === 0) pdf.font(FONT).fontSize(8.5).fillColor(MUTED).text("No sets.", left, y);

  // Footer
  pdf.page.margins.bottom = 0;
  pdf.font(FONT).fontSize(7).fillColor(MUTED).text(t(`${sheet.unitName} · ${sheet.what} ${sheet.number} · printed ${sheet.printedAt} · page 1 of 1`), left, pdf.page.height - 28, {
    width,
    align: "center",
    lineBreak: false,
  });
  pdf.end();
  return done;
}

/** The curve with its axes, band, hold and figures, in the box at (x0, y0). */
function drawCurve(pdf: PDFKit.PDFDocument, curve: { samples: CycleSample[] } & ChartAnnotations, x0: number, y0: number, w: number, h: number): void {
  const samples = thinSamples(curve.samples, 500);
  const domains = chartDomains(samples, curve.band);
  const plotLeft = x0 + 34;
  const plotRight = x0 + w - (domains.pressure ? 40 : 8);
  const plotTop = y0 + 24;
  const plotBottom = y0 + h;
  const x = linearScale(domains.t0, domains.t1, plotLeft, plotRight);
  const y = linearScale(domains.temp.min, domains.temp.max, plotBottom, plotTop);

  pdf.font(FONT).fontSize(8).fillColor(INK);
  const figures = curve.figures.map((f) => `${f.label} ${f.value}`).join("    ·    ");
  pdf.text(pdfText(figures), x0, y0, { width: w, lineBreak: false, ellipsis: true });

  if (curve.hold) {
    const hx = x(curve.hold.fromT);
    const hw = Math.max(1, x(curve.hold.toT) - hx);
    pdf.save();
    pdf.rect(hx, plotTop, hw, plotBottom - plotTop).fillOpacity(0.12).fill("#000000");
    pdf.restore();
    // Hatching, so the hold reads without the tint.
    pdf.save();
    pdf.rect(hx, plotTop, hw, plotBottom - plotTop).clip();
    for (let d = -h; d < hw + h; d += 7) pdf.moveTo(hx + d, plotBottom).lineTo(hx + d + h, plotTop);
    pdf.lineWidth(0.4).strokeColor("#777777").stroke();
    pdf.restore();
    pdf.font(BOLD).fontSize(7).fillColor(INK).text("hold", hx + 2, plotBottom - 10, { lineBreak: false });
  }

  pdf.lineWidth(0.3).strokeColor(RULE);
  for (const c of domains.temp.ticks) {
    pdf.moveTo(plotLeft, y(c)).lineTo(plotRight, y(c)).stroke();
    pdf.font(FONT).fontSize(6.5).fillColor(MUTED).text(String(c), x0, y(c) - 3, { width: 30, align: "right", lineBreak: false });
  }
  const step = timeStepSeconds(domains.t1 - domains.t0);
  for (let s = 0; s <= domains.t1 - domains.t0 + 1e-9; s += step) {
    pdf.font(FONT).fontSize(6.5).fillColor(MUTED).text(String(Math.round(s / 60)), x(domains.t0 + s) - 10, plotBottom + 3, { width: 20, align: "center", lineBreak: false });
  }
  pdf.text("minutes from the start of the record", plotLeft, plotBottom + 12, { width: plotRight - plotLeft, align: "center", lineBreak: false });
  pdf.text("°C", x0, plotTop - 10, { width: 30, align: "right", lineBreak: false });

  if (curve.band) {
    pdf.save();
    pdf.lineWidth(1).strokeColor(LIMIT).dash(2, { space: 2 });
    for (const c of curve.band.highC !== undefined ? [curve.band.lowC, curve.band.highC] : [curve.band.lowC]) pdf.moveTo(plotLeft, y(c)).lineTo(plotRight, y(c)).stroke();
    pdf.restore();
    const label = curve.bandLabel ?? (curve.band.highC !== undefined ? `${curve.band.lowC}-${curve.band.highC} °C band` : `${curve.band.lowC} °C minimum`);
    pdf.font(BOLD).fontSize(7).fillColor(LIMIT).text(pdfText(label), plotRight - 160, y(curve.band.highC ?? curve.band.lowC) - 9, { width: 158, align: "right", lineBreak: false });
  }
  for (const m of curve.markers ?? []) {
    pdf.save();
    pdf.lineWidth(0.6).strokeColor(MUTED).dash(4, { space: 2 });
    pdf.moveTo(x(m.t), plotTop).lineTo(x(m.t), plotBottom).stroke();
    pdf.restore();
    pdf.font(FONT).fontSize(6.5).fillColor(MUTED).text(pdfText(m.label), x(m.t) + 2, plotTop + 2, { lineBreak: false });
  }

  if (domains.pressure) {
    const yp = linearScale(domains.pressure.min, domains.pressure.max, plotBottom, plotTop);
    for (const p of domains.pressure.ticks) {
      pdf.font(FONT).fontSize(6.5).fillColor(MUTED).text(String(p), plotRight + 3, yp(p) - 3, { width: 34, lineBreak: false });
    }
    pdf.text("kPa abs", plotRight + 3, plotTop - 10, { width: 36, lineBreak: false });
    const withPressure = samples.filter((s) => s.pressureKpaAbs !== undefined);
    if (withPressure.length > 1) {
      pdf.save();
      withPressure.forEach((s, i) => (i === 0 ? pdf.moveTo(x(s.t), yp(s.pressureKpaAbs!)) : pdf.lineTo(x(s.t), yp(s.pressureKpaAbs!))));
      pdf.lineWidth(0.9).strokeColor("#444444").dash(4, { space: 2.5 }).stroke();
      pdf.restore();
    }
  }

  pdf.save();
  samples.forEach((s, i) => (i === 0 ? pdf.moveTo(x(s.t), y(s.tempC)) : pdf.lineTo(x(s.t), y(s.tempC))));
  pdf.lineWidth(1.4).strokeColor(CURVE).lineJoin("round").stroke();
  pdf.restore();

  pdf.lineWidth(0.6).strokeColor("#8a8577");
  pdf.moveTo(plotLeft, plotTop).lineTo(plotLeft, plotBottom).lineTo(plotRight, plotBottom).stroke();
  if (domains.pressure) pdf.moveTo(plotRight, plotTop).lineTo(plotRight, plotBottom).stroke();

  // Legend, by line pattern as well as colour.
  const ly = plotBottom + 24;
  let lx = plotLeft;
  const legend = (label: string, draw: () => void) => {
    draw();
    pdf.font(FONT).fontSize(7).fillColor(INK).text(pdfText(label), lx + 20, ly - 3, { lineBreak: false });
    lx += 26 + pdf.widthOfString(pdfText(label)) + 14;
  };
  legend("temperature (solid)", () => {
    pdf.save().moveTo(lx, ly).lineTo(lx + 16, ly).lineWidth(1.4).strokeColor(CURVE).stroke().restore();
  });
  if (domains.pressure) {
    legend("pressure (dashed)", () => {
      pdf.save().moveTo(lx, ly).lineTo(lx + 16, ly).lineWidth(0.9).strokeColor("#444444").dash(4, { space: 2.5 }).stroke().restore();
    });
  }
  if (curve.band) {
    legend("requirement (dotted)", () => {
      pdf.save().moveTo(lx, ly).lineTo(lx + 16, ly).lineWidth(1).strokeColor(LIMIT).dash(2, { space: 2 }).stroke().restore();
    });
  }
  if (curve.hold) {
    legend("hold (hatched)", () => {
      pdf.save().rect(lx, ly - 4, 16, 8).fillOpacity(0.12).fill("#000000").restore();
    });
  }
}
