import { AlertTriangle, ExternalLink } from "lucide-react";
import { Card, CardBody } from "@/components/ui/card";
import type { RunInvoice } from "@/lib/billing/run";
import { ISSUE_STAGE_LABELS } from "@/lib/billing/run-labels";
import { formatLocalDate, formatMoney } from "@/lib/contracts/format";
import { formatDateTime } from "@/lib/format";
import { RunLines } from "./run-lines";
import { RunInvoiceStatusBadge } from "./run-status-badge";

/** The invoices of a run: status, the payment service's number and page, lines and evidence. */
export function RunInvoices({ invoices }: { invoices: RunInvoice[] }) {
  return (
    <div className="space-y-4">
      {invoices.map((invoice) => (
        <Card key={invoice.id} aria-labelledby={`invoice-${invoice.id}`} data-testid={`run-invoice-${invoice.number}`}>
          <header className="flex flex-col gap-3 border-b border-line px-5 py-4 sm:flex-row sm:items-start sm:justify-between">
            <div>
              <h3 id={`invoice-${invoice.id}`} className="text-base font-semibold text-ink">
                {invoice.number} · {invoice.organisationName}
              </h3>
              <p className="mt-0.5 text-sm text-muted">
                {invoice.status === "draft"
                  ? ISSUE_STAGE_LABELS[invoice.stage]
                  : `Issued ${invoice.issueDate ? formatLocalDate(invoice.issueDate) : "—"}, due ${invoice.dueDate ? formatLocalDate(invoice.dueDate) : "—"}`}
                {invoice.status === "draft" && invoice.stage === "items" ? ` (${invoice.itemsDone} of ${invoice.lines.length} lines)` : ""}
              </p>
            </div>
            <div className="flex flex-col items-start gap-1 sm:items-end">
              <div className="flex items-center gap-2">
                <RunInvoiceStatusBadge status={invoice.status} />
                <span className="text-lg font-semibold tabular-nums text-ink">{formatMoney(invoice.totals.totalMinor, invoice.currency)}</span>
              </div>
              {invoice.stripeNumber && (
                <p className="text-sm text-ink-soft">
                  Payment service number <span className="font-mono font-medium" data-testid="stripe-number">{invoice.stripeNumber}</span>
                </p>
              )}
              {invoice.hostedInvoiceUrl && invoice.status !== "draft" && (
                <a href={invoice.hostedInvoiceUrl} target="_blank" rel="noreferrer" className="inline-flex items-center gap-1 text-sm text-lagoon-700 hover:underline">
                  Payment page
                  <ExternalLink className="h-3.5 w-3.5" aria-hidden="true" />
                  <span className="sr-only">(opens in a new tab)</span>
                </a>
              )}
            </div>
          </header>
          <CardBody className="space-y-3">
            {invoice.lastFailure && (
              <p className="flex gap-2 rounded-lg border border-danger-600/30 bg-danger-50 px-3 py-2 text-sm text-danger-700">
                <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
                <span>
                  Last attempt, {formatDateTime(invoice.lastFailure.at)}: {invoice.lastFailure.reason}
                </span>
              </p>
            )}
            <details>
              <summary className="cursor-pointer text-sm font-medium text-lagoon-700 hover:underline">
                {invoice.lines.length} line{invoice.lines.length === 1 ? "" : "s"} and the sets behind them
              </summary>
              <div className="mt-3">
                <RunLines
                  caption={`Lines of ${invoice.number}`}
                  currency={invoice.currency}
                  totals={invoice.totals}
                  lines={invoice.lines.map((line) => ({ ...line, key: line.id }))}
                />
              </div>
            </details>
          </CardBody>
        </Card>
      ))}
    </div>
  );
}
