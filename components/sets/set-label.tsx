"use client";

import { Download, Printer } from "lucide-react";
import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import {
  CONTENTS_ROWS,
  contentsSummary,
  type ContentsLine,
  LABEL_BLANK_FIELDS,
  type LabelCycleFields,
  labelFieldLines,
  LABEL_HEIGHT_MM,
  LABEL_WIDTH_MM,
  LABEL_WITH_CONTENTS_HEIGHT_MM,
  layoutContents,
  moreLinesNote,
} from "@/lib/sets/label-layout";

export interface SetLabelData {
  id: number;
  serial: string;
  humanReadable: string;
  setTypeName: string;
  setTypeCode: string;
  organisationName: string;
  homeSiteName: string;
}

/**
 * The printable label of a set: a 100 × 50 mm box (100 × 150 mm with the contents list) with its
 * GS1 DataMatrix, the identifier in human-readable form, the set, its owner and home, and the
 * boxes of packing and sterilisation — filled from the cycle (`cycle`), blank to be written in by
 * hand before. Printing sets the page to the label's size and prints only the label.
 */
export function SetLabelSheet({
  label,
  symbolSvg,
  contents,
  retired,
  cycle = null,
  notice = null,
}: {
  label: SetLabelData;
  symbolSvg: string;
  contents: ContentsLine[];
  retired: boolean;
  cycle?: LabelCycleFields | null;
  notice?: string | null;
}) {
  const [withContents, setWithContents] = useState(false);
  const toggleId = useId();
  const heightMm = withContents ? LABEL_WITH_CONTENTS_HEIGHT_MM : LABEL_HEIGHT_MM;
  const query = new URLSearchParams();
  if (withContents) query.set("contents", "1");
  if (cycle) query.set("cycle", String(cycle.cycleId));
  const pdfUrl = `/api/sets/${label.id}/label.pdf${query.size ? `?${query}` : ""}`;
  const layout = layoutContents(contents);
  const values = labelFieldLines(cycle);
  const lineNotes = cycle?.lineNotes ?? {};

  return (
    <div className="space-y-6">
      <style>{`
        @page { size: ${LABEL_WIDTH_MM}mm ${heightMm}mm; margin: 0; }
        @media print {
          html, body { background: white !important; }
          #main { padding: 0 !important; margin: 0 !important; max-width: none !important; }
          [data-sonner-toaster] { display: none !important; }
        }
      `}</style>

      {retired && (
        <p role="status" className="no-print max-w-2xl rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700">
          This set is retired, so it is not packed or sent out. Return it to service before labelling it for use.
        </p>
      )}
      {notice && (
        <p role="status" data-testid="label-notice" className="no-print max-w-2xl rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700">
          {notice}
        </p>
      )}
      <div className="no-print flex flex-wrap items-center gap-3">
        <Button onClick={() => window.print()}>
          <Printer className="h-4 w-4" aria-hidden="true" />
          Print
        </Button>
        <Button variant="secondary" asChild>
          <a href={pdfUrl} download={`label-${label.serial}.pdf`}>
            <Download className="h-4 w-4" aria-hidden="true" />
            Download PDF
          </a>
        </Button>
        <label htmlFor={toggleId} className="flex cursor-pointer items-center gap-2 text-sm text-ink">
          <input
            id={toggleId}
            type="checkbox"
            className="h-4 w-4 rounded border-line-strong accent-lagoon-700"
            checked={withContents}
            onChange={(e) => setWithContents(e.target.checked)}
          />
          Include the contents list ({LABEL_WIDTH_MM} × {LABEL_WITH_CONTENTS_HEIGHT_MM} mm label)
        </label>
      </div>

      <div className="overflow-x-auto">
        <div className="w-max p-1 sm:[zoom:1.5] print:p-0 print:[zoom:1]">
          <article
            aria-label={`Label of set ${label.serial}`}
            data-testid="set-label"
            className="box-border overflow-hidden bg-white font-sans text-black outline-1 outline-dashed outline-line-strong print:outline-0"
            style={{ width: `${LABEL_WIDTH_MM}mm`, height: `${heightMm}mm`, padding: "3mm" }}
          >
            <header className="flex items-baseline justify-between gap-[2mm] border-b-[0.2mm] border-black" style={{ height: "6mm" }}>
              <p className="truncate font-semibold" style={{ fontSize: "8.5pt" }}>
                {label.setTypeName}
              </p>
              <p className="shrink-0" style={{ fontSize: "6.5pt" }}>
                {label.setTypeCode}
              </p>
            </header>
            <div className="flex gap-[3mm]" style={{ height: "34mm", paddingTop: "1.5mm" }}>
              <div className="flex shrink-0 flex-col items-center" style={{ width: "26mm" }}>
                <div
                  className="[&>svg]:h-full [&>svg]:w-full"
                  style={{ width: "22mm", height: "22mm", marginTop: "0.5mm" }}
                  role="img"
                  aria-label={`GS1 DataMatrix ${label.humanReadable}`}
                  data-testid="set-label-symbol"
                  // The SVG comes from our own DataMatrix renderer (lib/labels/datamatrix.ts): shapes only, no text.
                  dangerouslySetInnerHTML={{ __html: symbolSvg }}
                />
                <p className="text-center leading-tight break-all" style={{ fontSize: "5.6pt", marginTop: "1.3mm" }} data-testid="set-label-hri">
                  {label.humanReadable}
                </p>
                {cycle?.packaging && (
                  <p className="text-center font-semibold leading-tight" style={{ fontSize: "6pt", marginTop: "0.8mm" }} data-testid="set-label-packaging">
                    {cycle.packaging}
                  </p>
                )}
              </div>
              <div className="min-w-0 flex-1">
                <p className="font-bold leading-none tabular-nums" style={{ fontSize: "15pt" }}>
                  {label.serial}
                </p>
                <p className="truncate leading-tight" style={{ fontSize: "7pt", marginTop: "1.3mm" }}>
                  {label.organisationName}
                </p>
                <p className="truncate leading-tight" style={{ fontSize: "7pt" }}>
                  {label.homeSiteName}
                </p>
                <dl className="grid grid-cols-2 gap-[1mm]" style={{ marginTop: "1.2mm" }}>
                  {LABEL_BLANK_FIELDS.map((caption) => (
                    <div
                      key={caption}
                      className="overflow-hidden border-[0.2mm] border-black"
                      style={{ height: "8.5mm", padding: "0.6mm 0.9mm" }}
                      data-testid={`set-label-field-${caption.toLowerCase().replaceAll(" ", "-")}`}
                    >
                      <dt className="uppercase leading-none tracking-wide" style={{ fontSize: "5.5pt" }}>
                        {caption}
                      </dt>
                      {values[caption].length === 0 ? (
                        <dd className="sr-only">left blank, to be filled in by hand</dd>
                      ) : (
                        values[caption].map((line, row) => (
                          <dd key={row} className={`truncate leading-tight ${row === 0 ? "font-semibold" : ""}`} style={{ fontSize: "6.3pt", marginTop: row === 0 ? "0.5mm" : 0 }}>
                            {line}
                          </dd>
                        ))
                      )}
                    </div>
                  ))}
                </dl>
              </div>
            </div>
            <p
              className={`truncate font-bold leading-none ${cycle?.irregularity ? "bg-black text-white" : ""}`}
              style={{ height: "3.8mm", padding: "0.9mm 1mm 0", fontSize: "6.3pt" }}
              data-testid="set-label-irregularity"
            >
              {cycle?.irregularity ?? ""}
            </p>
            {withContents && (
              <section className="border-t-[0.2mm] border-black" style={{ paddingTop: "1.2mm" }} aria-label="Contents">
                <p className="font-semibold" style={{ fontSize: "7pt" }}>
                  Contents: {contentsSummary(layout.instruments, contents.length)}
                </p>
                <ol
                  className={`grid grid-flow-col gap-x-[2mm] ${layout.columns === 2 ? "grid-cols-2" : "grid-cols-1"}`}
                  style={{ gridTemplateRows: `repeat(${CONTENTS_ROWS}, 3mm)`, marginTop: "1.2mm", fontSize: "6.2pt" }}
                >
                  {layout.shown.map((line, index) => (
                    <li key={index} className="flex min-w-0 gap-[1.2mm] leading-[3mm]">
                      <span className="shrink-0 text-right tabular-nums" style={{ width: "6mm" }}>
                        {line.quantity} ×
                      </span>
                      <span className="truncate">
                        {line.name}
                        {lineNotes[line.name] && <strong> — {lineNotes[line.name]}</strong>}
                      </span>
                    </li>
                  ))}
                  {layout.hidden > 0 && (
                    <li className="flex min-w-0 gap-[1.2mm] leading-[3mm]">
                      <span className="shrink-0 text-right tabular-nums" style={{ width: "6mm" }}>
                        {moreLinesNote(layout.hidden).count}
                      </span>
                      <span className="truncate">{moreLinesNote(layout.hidden).text}</span>
                    </li>
                  )}
                  {contents.length === 0 && <li className="leading-[3mm]">No contents list in the catalogue yet.</li>}
                </ol>
              </section>
            )}
          </article>
        </div>
      </div>

      <p className="no-print max-w-2xl text-sm text-muted">
        {cycle?.packedBy
          ? "The boxes are filled from this cycle's records; those still blank are filled in at sterilisation."
          : "The packed-by, load, sterilised-on and use-by boxes are left blank, to be filled in when the set is packed."}{" "}
        Print at actual size (100 %) on {LABEL_WIDTH_MM} × {heightMm} mm labels so the symbol keeps its module size.
      </p>
    </div>
  );
}
