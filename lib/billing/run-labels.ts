// The words of invoice runs on screen (shared by server and client components).

export type RunStatusName = "draft" | "approved" | "issuing" | "issued";

export const RUN_STATUS_LABELS: Record<RunStatusName, string> = {
  draft: "Draft — to approve",
  approved: "Approved — to issue",
  issuing: "Issuing — not finished",
  issued: "Issued",
};

export const INVOICE_STATUS_LABELS: Record<string, string> = {
  draft: "Not issued",
  open: "Open",
  paid: "Paid",
  void: "Void",
  uncollectible: "Written off",
};

export const ISSUE_STAGE_LABELS: Record<string, string> = {
  not_started: "Not sent to the payment service yet",
  customer: "Customer made in the payment service",
  invoice: "Draft made in the payment service",
  items: "Lines being added in the payment service",
  finalized: "Finalized, not sent yet",
  issued: "Issued",
};

export const LINE_KIND_LABELS: Record<string, string> = {
  processing: "Processing",
  surcharge: "Surcharge",
  sla_credit: "Turnaround credit",
  minimum_fee_top_up: "Minimum fee",
  other: "Other",
};

/** "20 %" from basis points. */
export function ratePercent(basisPoints: number): string {
  const whole = Math.trunc(basisPoints / 100);
  const fraction = basisPoints % 100;
  return `${fraction === 0 ? whole : `${whole}.${String(fraction).padStart(2, "0").replace(/0$/, "")}`} %`;
}
