import { AlertTriangle, Info } from "lucide-react";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody } from "@/components/ui/card";
import type { PreviewCustomer } from "@/lib/billing/run";
import { formatMoney } from "@/lib/contracts/format";
import { RunLines } from "./run-lines";

/** One customer in the preview: its would-be invoice, or why it cannot be invoiced. */
export function PreviewCustomerCard({ customer }: { customer: PreviewCustomer }) {
  const evidence = new Map(customer.cycles.map((c) => [c.cycleId, c]));
  const headingId = `preview-${customer.organisationId}`;
  return (
    <Card aria-labelledby={headingId} data-testid={`preview-${customer.shortCode}`}>
      <header className="flex flex-col gap-2 border-b border-line px-5 py-4 sm:flex-row sm:items-start sm:justify-between">
        <div>
          <h3 id={headingId} className="text-base font-semibold text-ink">
            {customer.name}
          </h3>
          <p className="mt-0.5 text-sm text-muted">
            {customer.cycles.length} delivered set{customer.cycles.length === 1 ? "" : "s"} to bill
            {customer.lateCount > 0 ? `, ${customer.lateCount} late` : ""}
            {customer.contractReference ? ` · contract ${customer.contractReference}` : ""}
            {customer.paymentTermsDays !== null ? ` · due ${customer.paymentTermsDays} days after issue` : ""}
          </p>
        </div>
        <div className="flex flex-col items-start gap-1 sm:items-end">
          {customer.status === "ready" ? (
            <>
              <Badge tone="info">Invoice {customer.invoiceNumber}</Badge>
              <span className="text-lg font-semibold tabular-nums text-ink">{formatMoney(customer.totals!.totalMinor, customer.currency!)}</span>
            </>
          ) : (
            <Badge tone="danger">No invoice</Badge>
          )}
        </div>
      </header>
      <CardBody className="space-y-4">
        {customer.problems.length > 0 && (
          <div className="rounded-lg border border-danger-600/30 bg-danger-50 px-3 py-2 text-sm text-danger-700">
            <p className="flex items-center gap-2 font-medium">
              <AlertTriangle className="h-4 w-4" aria-hidden="true" />
              Left out of the run until this is fixed; its sets wait for a later run.
            </p>
            <ul className="mt-1 list-disc space-y-1 pl-6">
              {customer.problems.map((p) => (
                <li key={p}>{p}</li>
              ))}
            </ul>
          </div>
        )}
        {customer.warnings.length > 0 && (
          <ul className="space-y-1 text-sm text-warn-700">
            {customer.warnings.map((w) => (
              <li key={w} className="flex gap-2">
                <Info className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
                {w}
              </li>
            ))}
          </ul>
        )}
        {customer.parts.length > 1 && (
          <p className="text-sm text-ink-soft">
            The contract changed during the month; each version prices its own days:{" "}
            {customer.parts.map((p) => `${p.reference} for ${p.label} (${p.cycles} sets)`).join("; ")}.
          </p>
        )}
        {customer.status === "ready" && customer.totals && (
          <RunLines
            caption={`Lines of ${customer.invoiceNumber}`}
            currency={customer.currency!}
            totals={customer.totals}
            lines={customer.lines.map((line) => ({
              ...line,
              key: line.position,
              cycles: line.cycleIds.map((id) => evidence.get(id)).filter((c) => c !== undefined),
            }))}
          />
        )}
      </CardBody>
    </Card>
  );
}
