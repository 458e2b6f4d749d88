import Link from "next/link";
import type { RunListRow } from "@/lib/billing/run";
import { formatMoney } from "@/lib/contracts/format";
import { formatDateTime } from "@/lib/format";
import { RunStatusBadge } from "./run-status-badge";

/** Every invoice run, newest month first, as a table that reads on a phone too. */
export function RunList({ runs }: { runs: RunListRow[] }) {
  if (runs.length === 0) {
    return <p className="rounded-card border border-line bg-surface px-4 py-10 text-center text-sm text-muted">No invoice run yet.</p>;
  }
  return (
    <div className="overflow-hidden rounded-card border border-line bg-surface shadow-card">
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Invoice runs</caption>
          <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wide text-muted">
            <tr>
              <th scope="col" className="px-4 py-3 font-semibold">
                Month
              </th>
              <th scope="col" className="px-4 py-3 font-semibold">
                Status
              </th>
              <th scope="col" className="px-4 py-3 text-right font-semibold">
                Invoices
              </th>
              <th scope="col" className="px-4 py-3 text-right font-semibold">
                Total
              </th>
              <th scope="col" className="hidden px-4 py-3 font-semibold md:table-cell">
                Created
              </th>
              <th scope="col" className="hidden px-4 py-3 font-semibold md:table-cell">
                Approved
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {runs.map((run) => (
              <tr key={run.id} className="hover:bg-paper/50">
                <td className="px-4 py-3">
                  <Link href={`/unit/billing/runs/${run.id}`} className="font-medium text-lagoon-700 hover:underline">
                    {run.label}
                  </Link>
                  <p className="text-xs text-muted">Run {run.id}</p>
                </td>
                <td className="px-4 py-3">
                  <RunStatusBadge status={run.status} />
                </td>
                <td className="px-4 py-3 text-right tabular-nums">
                  {run.openInvoices === run.invoices ? run.invoices : `${run.openInvoices} of ${run.invoices} issued`}
                </td>
                <td className="px-4 py-3 text-right tabular-nums">
                  {run.totals.map((t) => (
                    <span key={t.currency} className="block">
                      {formatMoney(t.totalMinor, t.currency)}
                    </span>
                  ))}
                </td>
                <td className="hidden px-4 py-3 md:table-cell">
                  <span className="tabular-nums">{formatDateTime(run.createdAt)}</span>
                  {run.createdByName && <p className="text-xs text-muted">{run.createdByName}</p>}
                </td>
                <td className="hidden px-4 py-3 md:table-cell">
                  {run.approvedAt ? <span className="tabular-nums">{formatDateTime(run.approvedAt)}</span> : <span className="text-muted">—</span>}
                  {run.approvedByName && <p className="text-xs text-muted">{run.approvedByName}</p>}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
