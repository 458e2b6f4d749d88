"use client";

import { useQuery } from "@tanstack/react-query";
import { CreditCard, Download, ExternalLink, Loader2 } from "lucide-react";
import { type ReactNode, useState } from "react";
import { toast } from "sonner";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import type { InvoiceDetail } from "@/lib/billing/invoices";
import { formatMoney } from "@/lib/contracts/format";
import { fetchJson } from "@/lib/fetch-json";
import type { ActionResult } from "@/lib/http/action";
import { formatBasisPoints } from "@/lib/pricing/money";
import { CreditNotesList } from "./credit-notes-list";
import { formatDay, formatPeriod, InvoiceStatusBadge, OverdueBadge } from "./invoice-format";

// One invoice for either audience: its amounts and state, "Pay online" for a clinic manager, the
// lines with the sets each was priced from, VAT and totals, payments, credit notes and reminders.
// It re-reads the invoice every few seconds while an online payment is under way, so the payer
// sees it paid (or the decline reason) as soon as the payment service tells us.

const PENDING_MS = 20 * 60_000;

type PayAction = (input: { invoiceId: number }) => Promise<ActionResult<{ url: string }>>;

export function InvoiceDetailView({
  initial,
  audience,
  timeZone,
  payAction,
  actions,
}: {
  initial: InvoiceDetail;
  audience: "unit" | "clinic";
  timeZone: string;
  /** Given when the viewer may pay online. */
  payAction?: PayAction;
  /** Finance's actions (credit note, void, write off). */
  actions?: ReactNode;
}) {
  const [pendingSince, setPendingSince] = useState<number | null>(null);
  const query = useQuery({
    queryKey: ["invoice", initial.id],
    queryFn: () => fetchJson<InvoiceDetail>(`/api/billing/invoices/${initial.id}`),
    initialData: initial,
    refetchInterval: (q) => {
      const status = q.state.data?.status;
      if (status !== "open" && status !== "uncollectible") return false;
      return pendingSince !== null && Date.now() - pendingSince < PENDING_MS ? 3_000 : 30_000;
    },
    refetchIntervalInBackground: true,
  });
  const invoice = query.data;
  const money = (minor: number) => formatMoney(minor, invoice.currency);
  const payable = (invoice.status === "open" || invoice.status === "uncollectible") && invoice.amountDueMinor > 0;
  const pending = pendingSince !== null && payable;

  return (
    <div className="space-y-6">
      <Card>
        <CardBody className="grid gap-6 md:grid-cols-[1fr_auto]">
          <div className="space-y-3">
            <div className="flex flex-wrap items-center gap-2" data-testid="invoice-status">
              <InvoiceStatusBadge status={invoice.status} />
              <OverdueBadge daysOverdue={invoice.daysOverdue} />
              {pending && (
                <Badge tone="info">
                  <Loader2 className="h-3 w-3 animate-spin" aria-hidden="true" /> Waiting for the payment
                </Badge>
              )}
            </div>
            <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-4">
              <Fact label="Period" value={formatPeriod(invoice.periodStart, timeZone)} />
              <Fact label="Issued" value={formatDay(invoice.issueDate, timeZone)} />
              <Fact label="Due" value={formatDay(invoice.dueDate, timeZone)} />
              <Fact label={invoice.status === "paid" ? "Paid on" : "Customer"} value={invoice.status === "paid" ? formatDay(invoice.paidAt, timeZone) : invoice.organisationName} />
            </dl>
            {invoice.lastPaymentError && payable && (
              <p role="alert" data-testid="payment-error" className="rounded-lg border border-danger-600/30 bg-danger-50 px-3 py-2 text-sm text-danger-700">
                The last online payment did not go through: {invoice.lastPaymentError}
                {audience === "clinic" ? " Nothing was charged. You can try again, with this card or another one." : ""}
              </p>
            )}
            {invoice.status === "paid" && audience === "clinic" && (
              <p className="rounded-lg border border-ok-600/30 bg-ok-50 px-3 py-2 text-sm text-ok-700" data-testid="paid-note">
                Paid in full. Thank you — a receipt has been e-mailed to your organisation&apos;s clinic managers.
              </p>
            )}
          </div>
          <div className="space-y-3 md:min-w-64 md:text-right">
            <div>
              <p className="text-xs font-medium uppercase tracking-wide text-muted">Amount due</p>
              <p className="text-3xl font-semibold tabular-nums text-ink" data-testid="amount-due">
                {money(invoice.amountDueMinor)}
              </p>
              <p className="text-sm text-muted">
                of {money(invoice.totalMinor)} including VAT
                {invoice.amountCreditedMinor > 0 && `, ${money(invoice.amountCreditedMinor)} credited`}
                {invoice.amountPaidMinor > 0 && `, ${money(invoice.amountPaidMinor)} paid`}
              </p>
            </div>
            {payAction && payable && <PayOnline invoice={invoice} payAction={payAction} onStarted={() => setPendingSince(Date.now())} />}
            <div className="flex flex-wrap gap-2 md:justify-end">
              <Button variant="secondary" size="sm" asChild>
                <a href={`/api/billing/invoices/${invoice.id}/invoice.pdf`} download>
                  <Download className="h-4 w-4" aria-hidden="true" /> PDF
                </a>
              </Button>
              {audience === "unit" && (
                <Button variant="secondary" size="sm" asChild>
                  <a href={`/api/billing/invoices/${invoice.id}/invoice.xml`} download>
                    <Download className="h-4 w-4" aria-hidden="true" /> UBL (XML)
                  </a>
                </Button>
              )}
            </div>
            {actions}
          </div>
        </CardBody>
      </Card>

      <Card>
        <CardHeader title="Lines" description="Open a line to see the sets it was priced from: which set, delivered when, and whether it was late." />
        {/* On a phone: one block per line. */}
        <ul className="divide-y divide-line text-sm sm:hidden">
          {invoice.lines.map((line) => (
            <li key={line.id} className="px-5 py-3" data-testid="invoice-line-compact">
              <div className="flex items-start justify-between gap-3">
                <p className="font-medium text-ink">{line.description}</p>
                <p className="shrink-0 font-medium tabular-nums">{money(line.netMinor)}</p>
              </div>
              <p className="text-xs text-muted">
                {line.quantity} × {money(line.unitPriceMinor)} · VAT {formatBasisPoints(line.vatRateBasisPoints)} %
              </p>
              {line.note && <p className="text-xs text-muted">{line.note}</p>}
              {line.cycles.length > 0 && <Evidence line={line} timeZone={timeZone} />}
            </li>
          ))}
          <li className="space-y-1 px-5 py-3">
            <p className="flex justify-between text-muted">
              <span>Total without VAT</span>
              <span className="tabular-nums">{money(invoice.taxExclusiveMinor)}</span>
            </p>
            {invoice.vatBreakdown.map((g) => (
              <p key={`${g.category}-${g.rateBasisPoints}`} className="flex justify-between text-muted">
                <span>VAT {formatBasisPoints(g.rateBasisPoints)} %</span>
                <span className="tabular-nums">{money(g.taxAmountMinor)}</span>
              </p>
            ))}
            <p className="flex justify-between font-semibold text-ink">
              <span>Total with VAT</span>
              <span className="tabular-nums">{money(invoice.totalMinor)}</span>
            </p>
          </li>
        </ul>
        <div className="hidden overflow-x-auto sm:block">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Invoice lines</caption>
            <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wide text-muted">
              <tr>
                <th scope="col" className="px-4 py-3 font-semibold">
                  Description
                </th>
                <th scope="col" className="px-4 py-3 text-right font-semibold">
                  Quantity
                </th>
                <th scope="col" className="whitespace-nowrap px-4 py-3 text-right font-semibold">
                  Unit price
                </th>
                <th scope="col" className="px-4 py-3 text-right font-semibold">
                  VAT
                </th>
                <th scope="col" className="px-4 py-3 text-right font-semibold">
                  Amount
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {invoice.lines.map((line) => (
                <tr key={line.id} className="align-top" data-testid="invoice-line">
                  <td className="px-4 py-3">
                    <p className="font-medium text-ink">{line.description}</p>
                    {line.note && <p className="text-xs text-muted">{line.note}</p>}
                    {line.cycles.length > 0 && <Evidence line={line} timeZone={timeZone} />}
                  </td>
                  <td className="px-4 py-3 text-right tabular-nums">{line.quantity}</td>
                  <td className="whitespace-nowrap px-4 py-3 text-right tabular-nums">{money(line.unitPriceMinor)}</td>
                  <td className="whitespace-nowrap px-4 py-3 text-right tabular-nums">{formatBasisPoints(line.vatRateBasisPoints)} %</td>
                  <td className="whitespace-nowrap px-4 py-3 text-right font-medium tabular-nums">{money(line.netMinor)}</td>
                </tr>
              ))}
            </tbody>
            <tfoot className="border-t border-line-strong text-sm">
              <tr>
                <td colSpan={4} className="px-4 pt-3 text-right text-muted">
                  Total without VAT
                </td>
                <td className="px-4 pt-3 text-right tabular-nums">{money(invoice.taxExclusiveMinor)}</td>
              </tr>
              {invoice.vatBreakdown.map((g) => (
                <tr key={`${g.category}-${g.rateBasisPoints}`}>
                  <td colSpan={4} className="px-4 pt-1 text-right text-muted">
                    VAT {formatBasisPoints(g.rateBasisPoints)} % on {money(g.taxableAmountMinor)}
                  </td>
                  <td className="px-4 pt-1 text-right tabular-nums">{money(g.taxAmountMinor)}</td>
                </tr>
              ))}
              <tr>
                <td colSpan={4} className="px-4 py-3 text-right font-semibold text-ink">
                  Total with VAT
                </td>
                <td className="px-4 py-3 text-right font-semibold tabular-nums text-ink">{money(invoice.totalMinor)}</td>
              </tr>
            </tfoot>
          </table>
        </div>
      </Card>

      {(invoice.payments.length > 0 || invoice.creditNotes.length > 0 || (audience === "unit" && invoice.reminders.length > 0)) && (
        <div className="grid gap-6 lg:grid-cols-2">
          {invoice.payments.length > 0 && (
            <Card>
              <CardHeader title="Payments" />
              <ul className="divide-y divide-line text-sm">
                {invoice.payments.map((p) => (
                  <li key={p.id} className="flex items-center justify-between gap-4 px-5 py-3">
                    <span>
                      Paid online {formatDay(p.paidAt, timeZone)}
                      {audience === "unit" && <span className="block text-xs text-muted">{p.stripePaymentId}</span>}
                    </span>
                    <span className="font-medium tabular-nums">{formatMoney(p.amountMinor, p.currency)}</span>
                  </li>
                ))}
              </ul>
            </Card>
          )}
          {invoice.creditNotes.length > 0 && <CreditNotesList invoiceId={invoice.id} currency={invoice.currency} notes={invoice.creditNotes} audience={audience} timeZone={timeZone} />}
          {audience === "unit" && invoice.reminders.length > 0 && (
            <Card>
              <CardHeader title="Reminders sent" />
              <ul className="divide-y divide-line text-sm">
                {invoice.reminders.map((r) => (
                  <li key={r.daysAfterDue} className="flex justify-between gap-4 px-5 py-3">
                    <span>{r.daysAfterDue} days after the due date</span>
                    <span className="text-muted">
                      {formatDay(r.queuedAt, timeZone)}, {r.recipients} recipient{r.recipients === 1 ? "" : "s"}
                    </span>
                  </li>
                ))}
              </ul>
            </Card>
          )}
        </div>
      )}
    </div>
  );
}

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <dt className="text-xs text-muted">{label}</dt>
      <dd className="font-medium text-ink">{value}</dd>
    </div>
  );
}

function Evidence({ line, timeZone }: { line: InvoiceDetail["lines"][number]; timeZone: string }) {
  const late = line.cycles.filter((c) => c.late).length;
  return (
    <details className="mt-2">
      <summary className="cursor-pointer text-xs font-medium text-lagoon-700 focus:outline-none focus-visible:ring-2 focus-visible:ring-lagoon-300">
        {line.cycles.length} set{line.cycles.length === 1 ? "" : "s"}
        {late > 0 ? `, ${late} late` : ""}
      </summary>
      <ul className="mt-2 max-h-64 space-y-1 overflow-y-auto pr-2 text-xs">
        {line.cycles.map((c) => (
          <li key={c.cycleId} className="flex flex-wrap items-center gap-x-2">
            <span className="font-mono">{c.serial}</span>
            <span className="text-muted">{c.setName}</span>
            <span className="text-muted">· {c.siteName}</span>
            <span className="text-muted">· delivered {formatDay(c.deliveredAt, timeZone)}</span>
            {c.late && <Badge tone="warn">Late: turnaround credit</Badge>}
            {c.state === "recalled" && <Badge tone="danger">Recalled since</Badge>}
          </li>
        ))}
      </ul>
    </details>
  );
}

function PayOnline({ invoice, payAction, onStarted }: { invoice: InvoiceDetail; payAction: PayAction; onStarted: () => void }) {
  const [url, setUrl] = useState<string | null>(invoice.hostedInvoiceUrl);
  const [busy, setBusy] = useState(false);
  const note = <p className="text-xs text-muted md:ml-auto md:max-w-64">The payment service&apos;s page opens in a new tab. This page updates by itself once the payment arrives.</p>;
  if (url) {
    return (
      <div className="space-y-2">
        <Button asChild variant="accent" size="lg" className="w-full md:w-auto">
          <a href={url} target="_blank" rel="noopener noreferrer" onClick={onStarted} data-testid="pay-online">
            <CreditCard className="h-5 w-5" aria-hidden="true" /> Pay online <ExternalLink className="h-4 w-4" aria-hidden="true" />
          </a>
        </Button>
        {note}
      </div>
    );
  }
  // No copy in the payment service yet: make it, then open its page.
  return (
    <div className="space-y-2">
      <Button
        variant="accent"
        size="lg"
        className="w-full md:w-auto"
        disabled={busy}
        data-testid="pay-online"
        onClick={async () => {
          setBusy(true);
          const result = await payAction({ invoiceId: invoice.id });
          setBusy(false);
          if (!result.ok) {
            toast.error(result.error.message);
            return;
          }
          setUrl(result.data.url);
          onStarted();
          window.open(result.data.url, "_blank", "noopener,noreferrer");
        }}
      >
        {busy ? <Loader2 className="h-5 w-5 animate-spin" aria-hidden="true" /> : <CreditCard className="h-5 w-5" aria-hidden="true" />}
        {busy ? "Preparing the payment page…" : "Pay online"}
      </Button>
      {note}
    </div>
  );
}
