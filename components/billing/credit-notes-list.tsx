import { Download } from "lucide-react";
import { Card, CardHeader } from "@/components/ui/card";
import type { CreditNoteView } from "@/lib/billing/invoices";
import { formatMoney } from "@/lib/contracts/format";
import { formatDay } from "./invoice-format";

// The credit notes against an invoice: what each credited, why, and how it was settled.

const SETTLEMENT: Record<NonNullable<CreditNoteView["settlement"]>, string> = {
  amount_due: "Deducted from the amount due",
  refund: "Refunded to the card that paid",
  out_of_band: "Repaid outside the payment service",
};

export function CreditNotesList({
  invoiceId,
  currency,
  notes,
  audience,
  timeZone,
}: {
  invoiceId: number;
  currency: string;
  notes: CreditNoteView[];
  audience: "unit" | "clinic";
  timeZone: string;
}) {
  return (
    <Card>
      <CardHeader title="Credit notes" />
      <ul className="divide-y divide-line text-sm">
        {notes.map((n) => (
          <li key={n.id} className="space-y-1 px-5 py-3" data-testid="credit-note">
            <div className="flex items-start justify-between gap-4">
              <span className="font-medium text-ink">{n.number}</span>
              <span className="font-medium tabular-nums">- {formatMoney(n.totalMinor, currency)}</span>
            </div>
            <p className="text-muted">{n.reason}</p>
            <p className="text-xs text-muted">
              {formatDay(n.createdAt, timeZone)}
              {n.settlement ? ` · ${SETTLEMENT[n.settlement]}` : ""}
              {audience === "unit" && n.createdByName ? ` · by ${n.createdByName}` : ""} · {formatMoney(n.netMinor, currency)} + VAT {formatMoney(n.vatMinor, currency)}
            </p>
            {audience === "unit" && (
              <a
                className="inline-flex items-center gap-1 text-xs font-medium text-lagoon-700 hover:underline"
                href={`/api/billing/invoices/${invoiceId}/credit-notes/${n.id}/credit-note.xml`}
                download
              >
                <Download className="h-3 w-3" aria-hidden="true" /> UBL (XML)
              </a>
            )}
          </li>
        ))}
      </ul>
    </Card>
  );
}
