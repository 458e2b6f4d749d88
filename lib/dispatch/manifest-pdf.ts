import "server-only";
import PDFDocument from "pdfkit";
import type { PlanRunView, PlanStopView } from "./view";
import { ADVISORY_MANIFEST } from "./wording";

// One van's manifest as a PDF (A4, our own plain layout): the run's van, driver and times, then
// every stop in order with its address, window, planned time, what to collect and deliver (set
// names, serials and GIAIs) and the carts. Helvetica is a standard PDF font: nothing embedded.

const FONT = "Helvetica";
const BOLD = "Helvetica-Bold";
const INK = "#1d2a2f";
const MUTED = "#5b6560";
const RULE = "#c9c4b8";


const KIND_WORDS: Record<PlanStopView["kind"], string> = { collection: "Collect", delivery: "Deliver", both: "Collect and deliver" };

/** WinAnsi covers the names we print; characters outside it are replaced so the PDF stays readable. */
const safe = (text: string) => text.replace(/[–—]/g, "-").replace(/[^\x20-\x7e\u00a0-\u00ff]/g, "?");

export async function manifestPdf(m: { day: string; dayLabel: string; run: PlanRunView; status: string }): Promise<Buffer> {
  const pdf = new PDFDocument({
    size: "A4",
    margins: { top: 48, bottom: 48, left: 48, right: 48 },
    info: { Title: `Manifest ${m.run.vanCode} ${m.day}`, Creator: "Steamlane" },
  });
  const done = new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    pdf.on("data", (chunk: Buffer) => chunks.push(chunk));
    pdf.on("end", () => resolve(Buffer.concat(chunks)));
    pdf.on("error", reject);
  });
  const width = pdf.page.width - 96;
  const run = m.run;
  pdf.font(BOLD).fontSize(16).fillColor(INK).text(safe(`Van manifest - ${run.vanCode} ${run.vanName}`));
  pdf.font(FONT).fontSize(10).fillColor(MUTED).text(safe(`${m.dayLabel} · ${run.registration} · driver ${run.driverName} · shift ${run.shift}`));
  pdf.text(
    safe(
      `Leaves ${run.leave ?? "-"}, back ${run.back ?? "-"} · ${run.stops.length} stops · ${run.distanceKm.toFixed(1)} km, ${run.driveMin} min driving · carts: soiled ${run.soiledCarts} of ${run.soiledCapacity}, clean ${run.cleanCarts} of ${run.cleanCapacity}${m.status === "draft" ? " · DRAFT: not yet published" : ""}`,
    ),
  );
  pdf.moveDown(0.4).fontSize(8.5).text(safe(ADVISORY_MANIFEST), { width });
  pdf.moveDown(0.6);
  for (const stop of run.stops) {
    if (pdf.y > pdf.page.height - 160) pdf.addPage();
    const top = pdf.y;
    pdf.moveTo(48, top).lineTo(48 + width, top).strokeColor(RULE).lineWidth(0.6).stroke();
    pdf.moveDown(0.3);
    pdf.font(BOLD).fontSize(11).fillColor(INK).text(safe(`${stop.position}. ${stop.siteName} - ${KIND_WORDS[stop.kind]}`));
    pdf.font(FONT).fontSize(9.5).fillColor(INK).text(safe(`${stop.address} (${stop.organisationName})`));
    pdf.fillColor(MUTED).text(
      safe(
        `Window ${stop.window}${stop.hard ? "" : " (deliver by the end if possible)"} · planned ${stop.start ?? "-"}${stop.lateMin > 0 ? `, ${stop.lateMin} min late` : ""} · ${stop.serviceMin} min at the stop · carts: soiled ${stop.soiledCarts}, clean ${stop.cleanCarts}`,
      ),
    );
    const lines = (title: string, sets: PlanStopView["collect"], refs: string[]) => {
      if (refs.length === 0) return;
      pdf.moveDown(0.2).font(BOLD).fillColor(INK).fontSize(9.5).text(safe(`${title} (${refs.join(", ")}): ${sets.length} set${sets.length === 1 ? "" : "s"}`));
      pdf.font(FONT).fontSize(9);
      for (const s of sets) pdf.text(safe(`[  ]  ${s.serial}  ${s.name}  · GIAI ${s.giai}`), { indent: 12 });
    };
    lines("Collect", stop.collect, stop.orders.filter((o) => o.role === "collect").map((o) => o.reference));
    lines("Deliver", stop.deliver, stop.orders.filter((o) => o.role === "deliver").map((o) => o.reference));
    if (stop.note) pdf.moveDown(0.2).fontSize(8.5).fillColor(MUTED).text(safe(stop.note), { width });
    pdf.moveDown(0.6);
  }
  if (run.stops.length === 0) pdf.font(FONT).fontSize(10).fillColor(MUTED).text("No stops on this run.");
  pdf.end();
  return done;
}
