import { Badge, type BadgeTone } from "@/components/ui/badge";
import { INVOICE_STATUS_LABELS, RUN_STATUS_LABELS, type RunStatusName } from "@/lib/billing/run-labels";

const RUN_TONES: Record<RunStatusName, BadgeTone> = { draft: "warn", approved: "info", issuing: "danger", issued: "ok" };
const INVOICE_TONES: Record<string, BadgeTone> = { draft: "neutral", open: "info", paid: "ok", void: "neutral", uncollectible: "danger" };

/** Where a run stands: to approve, to issue, part-issued, issued. */
export function RunStatusBadge({ status }: { status: RunStatusName }) {
  return <Badge tone={RUN_TONES[status]}>{RUN_STATUS_LABELS[status]}</Badge>;
}

/** An invoice's own status. */
export function RunInvoiceStatusBadge({ status }: { status: string }) {
  return <Badge tone={INVOICE_TONES[status] ?? "neutral"}>{INVOICE_STATUS_LABELS[status] ?? status}</Badge>;
}
