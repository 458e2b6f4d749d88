import type { InvoiceStatus } from "@/db/schema";
import type { AgeBucket } from "@/lib/billing/invoices";
import { Badge, type BadgeTone } from "@/components/ui/badge";

// The words of the invoice screens: statuses, age buckets, dates as people read them.

export const INVOICE_STATUS: Record<InvoiceStatus, { label: string; tone: BadgeTone }> = {
  draft: { label: "Draft", tone: "neutral" },
  open: { label: "Open", tone: "info" },
  paid: { label: "Paid", tone: "ok" },
  void: { label: "Void", tone: "neutral" },
  uncollectible: { label: "Written off", tone: "danger" },
};

export const AGE_LABELS: Record<AgeBucket, string> = {
  current: "Not yet due",
  "1_30": "1–30 days overdue",
  "31_60": "31–60 days overdue",
  "61_90": "61–90 days overdue",
  over_90: "Over 90 days overdue",
};

export const AGE_ORDER: AgeBucket[] = ["current", "1_30", "31_60", "61_90", "over_90"];

const DATE = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

/** A calendar date ("2026-11-15") or an instant's date, e.g. "15 Nov 2026". */
export function formatDay(value: string | null | undefined, timeZone = "Europe/London"): string {
  if (!value) return "—";
  if (/^\d{4}-\d{2}-\d{2}$/.test(value)) return DATE.format(new Date(`${value}T12:00:00Z`));
  return new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone }).format(new Date(value));
}

/** The billing month of a period, e.g. "November 2026". */
export function formatPeriod(start: string, timeZone = "Europe/London"): string {
  return new Intl.DateTimeFormat("en-GB", { month: "long", year: "numeric", timeZone }).format(new Date(start));
}

export function InvoiceStatusBadge({ status }: { status: InvoiceStatus }) {
  const s = INVOICE_STATUS[status];
  return <Badge tone={s.tone}>{s.label}</Badge>;
}

/** "Overdue 16 days" for an open invoice past its due date; nothing otherwise. */
export function OverdueBadge({ daysOverdue }: { daysOverdue: number | null }) {
  if (daysOverdue === null || daysOverdue <= 0) return null;
  return <Badge tone="warn">{`Overdue ${daysOverdue} day${daysOverdue === 1 ? "" : "s"}`}</Badge>;
}
