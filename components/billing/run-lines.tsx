import { LINE_KIND_LABELS, ratePercent } from "@/lib/billing/run-labels";
import { formatMoney } from "@/lib/contracts/format";
import { formatDateTime } from "@/lib/format";
import { cn } from "@/lib/cn";

// The lines of an invoice (previewed or stored) with the cycles behind each line, and its totals.

export interface EvidenceRow {
  cycleId: number;
  serial: string;
  setName: string;
  deliveredAt: string | null;
  late: boolean;
  /** When the set was due back under its contract, when known. */
  dueAt?: string | null;
}

export interface LineRow {
  key: string | number;
  position: number;
  kind: string;
  description: string;
  note: string | null;
  quantity: number;
  unitPriceMinor: number;
  netMinor: number;
  vatRateBasisPoints: number;
  cycles: EvidenceRow[];
}

export interface TotalsRow {
  lineTotalMinor: number;
  vatMinor: number;
  totalMinor: number;
  vatBreakdown: { category: string; rateBasisPoints: number; taxableAmountMinor: number; taxAmountMinor: number }[];
}

function Evidence({ line }: { line: LineRow }) {
  if (line.cycles.length === 0) return null;
  const late = line.cycles.filter((c) => c.late).length;
  const summary =
    line.kind === "minimum_fee_top_up"
      ? `Counted from ${line.cycles.length} set${line.cycles.length === 1 ? "" : "s"}`
      : `${line.cycles.length} set${line.cycles.length === 1 ? "" : "s"} behind this line${late > 0 ? `, ${late} late` : ""}`;
  return (
    <details className="mt-1 text-xs">
      <summary className="cursor-pointer text-lagoon-700 hover:underline">{summary}</summary>
      <ul className="mt-2 max-h-72 space-y-1 overflow-y-auto pr-2" aria-label={`Sets behind line ${line.position}`}>
        {line.cycles.map((c) => (
          <li key={c.cycleId} className="flex flex-wrap items-baseline gap-x-2 border-b border-line/60 pb-1 last:border-0">
            <span className="font-mono font-medium text-ink">{c.serial}</span>
            <span className="text-muted">{c.setName}</span>
            <span className="tabular-nums">delivered {formatDateTime(c.deliveredAt)}</span>
            <span className={cn("font-medium", c.late ? "text-danger-700" : "text-ok-700")}>
              {c.late ? "Late" : "On time"}
              {c.dueAt ? <span className="font-normal text-muted"> (due {formatDateTime(c.dueAt)})</span> : null}
            </span>
          </li>
        ))}
      </ul>
    </details>
  );
}

/** The lines as an accessible table; on a narrow screen it scrolls sideways. */
export function RunLines({ caption, currency, lines, totals }: { caption: string; currency: string; lines: LineRow[]; totals: TotalsRow }) {
  const money = (minor: number) => formatMoney(minor, currency);
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[36rem] text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-line text-xs uppercase tracking-wide text-muted">
          <tr>
            <th scope="col" className="py-2 pr-3 font-semibold">
              #
            </th>
            <th scope="col" className="py-2 pr-3 font-semibold">
              Item
            </th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">
              Quantity
            </th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">
              Unit price
            </th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">
              Amount
            </th>
            <th scope="col" className="py-2 text-right font-semibold">
              VAT
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {lines.map((line) => (
            <tr key={line.key} className="align-top">
              <td className="py-2 pr-3 tabular-nums text-muted">{line.position}</td>
              <td className="py-2 pr-3">
                <p className="text-ink">{line.description}</p>
                <p className="text-xs text-muted">
                  {LINE_KIND_LABELS[line.kind] ?? line.kind}
                  {line.note ? ` · ${line.note}` : ""}
                </p>
                <Evidence line={line} />
              </td>
              <td className="py-2 pr-3 text-right tabular-nums">{line.quantity}</td>
              <td className="py-2 pr-3 text-right tabular-nums">{money(line.unitPriceMinor)}</td>
              <td className={cn("py-2 pr-3 text-right tabular-nums", line.netMinor < 0 && "text-ok-700")}>{money(line.netMinor)}</td>
              <td className="py-2 text-right tabular-nums text-muted">{ratePercent(line.vatRateBasisPoints)}</td>
            </tr>
          ))}
        </tbody>
        <tfoot className="border-t border-line-strong text-sm">
          <tr>
            <th scope="row" colSpan={4} className="py-2 pr-3 text-right font-medium text-ink-soft">
              Total without VAT
            </th>
            <td className="py-2 pr-3 text-right tabular-nums">{money(totals.lineTotalMinor)}</td>
            <td />
          </tr>
          {totals.vatBreakdown.map((group) => (
            <tr key={`${group.category}-${group.rateBasisPoints}`}>
              <th scope="row" colSpan={4} className="py-1 pr-3 text-right font-medium text-ink-soft">
                VAT {ratePercent(group.rateBasisPoints)} on {money(group.taxableAmountMinor)}
              </th>
              <td className="py-1 pr-3 text-right tabular-nums">{money(group.taxAmountMinor)}</td>
              <td />
            </tr>
          ))}
          <tr>
            <th scope="row" colSpan={4} className="py-2 pr-3 text-right font-semibold text-ink">
              Total
            </th>
            <td className="py-2 pr-3 text-right font-semibold tabular-nums text-ink">{money(totals.totalMinor)}</td>
            <td />
          </tr>
        </tfoot>
      </table>
    </div>
  );
}
