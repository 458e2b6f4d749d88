"use client";

import { CheckCircle2, Send, Trash2, XCircle, RotateCw, CircleDashed } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Dialog, DialogContent } from "@/components/ui/dialog";
import type { ActionResult } from "@/lib/http/action";
import type { IssueRunResult } from "@/lib/billing/run-issue";
import { approveRunAction, discardRunAction, issueRunAction } from "@/lib/billing/run-actions";
import type { RunStatusName } from "@/lib/billing/run-labels";

type Step = "approve" | "discard" | "issue";

const OUTCOME = {
  issued: { label: "Issued", icon: CheckCircle2, className: "text-ok-700" },
  already_issued: { label: "Already issued", icon: CheckCircle2, className: "text-muted" },
  failed: { label: "Failed", icon: XCircle, className: "text-danger-700" },
  not_attempted: { label: "Left for a retry", icon: CircleDashed, className: "text-warn-700" },
} as const;

/** The next step of a run — approve or discard a draft, issue, resume — and what issuing did. */
export function RunActions({
  runId,
  label,
  status,
  invoices,
  total,
  createdBySelf,
}: {
  runId: number;
  label: string;
  status: RunStatusName;
  invoices: number;
  total: string;
  createdBySelf: boolean;
}) {
  const router = useRouter();
  const [open, setOpen] = useState<Step | null>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [result, setResult] = useState<IssueRunResult | null>(null);

  const run = async (step: Step) => {
    setBusy(true);
    setError(null);
    const action: (input: { runId: number }) => Promise<ActionResult<unknown>> =
      step === "approve" ? approveRunAction : step === "discard" ? discardRunAction : issueRunAction;
    const outcome = await action({ runId });
    setBusy(false);
    if (!outcome.ok) {
      setError(outcome.error.message);
      return;
    }
    setOpen(null);
    if (step === "discard") {
      toast.success(`The draft run for ${label} was discarded; its sets can be billed again.`);
      router.push("/unit/billing");
      return;
    }
    if (step === "approve") toast.success(`The run for ${label} is approved and can be issued.`);
    if (step === "issue") {
      const issued = outcome.data as IssueRunResult;
      setResult(issued);
      if (issued.status === "issued") toast.success(`Every invoice of ${label} is issued.`);
      else toast.error(`${issued.remaining} invoice${issued.remaining === 1 ? " is" : "s are"} not issued yet; see below.`);
    }
    router.refresh();
  };

  const confirm: Record<Step, { title: string; description: string; button: string }> = {
    approve: {
      title: `Approve the run for ${label}`,
      description: `${invoices} invoice${invoices === 1 ? "" : "s"}, ${total} in all. Once approved the run can be issued and no longer discarded.${
        createdBySelf ? " You created this run yourself: check its lines and evidence before approving." : ""
      }`,
      button: "Approve run",
    },
    discard: {
      title: `Discard the draft run for ${label}`,
      description: "Its invoices are deleted and their sets can be billed by a new run. Nothing has been sent to anyone.",
      button: "Discard draft",
    },
    issue: {
      title: status === "issuing" ? `Resume issuing ${label}` : `Issue the run for ${label}`,
      description:
        status === "issuing"
          ? "Continues with the invoices not issued yet. Nothing already created in the payment service is created again."
          : `Creates ${invoices} invoice${invoices === 1 ? "" : "s"} in the payment service and sends each to its customer. This can take a while.`,
      button: status === "issuing" ? "Resume issuing" : "Issue invoices",
    },
  };

  const dialog = open && (
    <Dialog open onOpenChange={(o) => !o && !busy && setOpen(null)}>
      <DialogContent title={confirm[open].title} description={confirm[open].description}>
        <div className="space-y-4">
          <FormError message={error} />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" disabled={busy} onClick={() => setOpen(null)}>
              Cancel
            </Button>
            <Button variant={open === "discard" ? "danger" : "primary"} disabled={busy} onClick={() => run(open)}>
              {busy ? (open === "issue" ? "Issuing…" : "Working…") : confirm[open].button}
            </Button>
          </div>
        </div>
      </DialogContent>
    </Dialog>
  );

  if (status === "issued" && !result) return null;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap gap-2 empty:hidden">
        {status === "draft" && (
          <>
            <Button variant="secondary" onClick={() => setOpen("discard")}>
              <Trash2 className="h-4 w-4" aria-hidden="true" />
              Discard draft
            </Button>
            <Button onClick={() => setOpen("approve")}>
              <CheckCircle2 className="h-4 w-4" aria-hidden="true" />
              Approve
            </Button>
          </>
        )}
        {status === "approved" && (
          <Button variant="accent" onClick={() => setOpen("issue")}>
            <Send className="h-4 w-4" aria-hidden="true" />
            Issue
          </Button>
        )}
        {status === "issuing" && (
          <Button variant="accent" onClick={() => setOpen("issue")}>
            <RotateCw className="h-4 w-4" aria-hidden="true" />
            Resume issuing
          </Button>
        )}
      </div>
      {dialog}
      {result && (
        <section aria-live="polite" aria-label="What issuing did" className="rounded-card border border-line bg-surface p-4 text-sm shadow-card">
          <h2 className="font-semibold text-ink">
            Issuing: {result.issued} issued, {result.failed} failed, {result.remaining} not issued yet
          </h2>
          <ul className="mt-2 space-y-2">
            {result.invoices.map((r) => {
              const o = OUTCOME[r.outcome];
              const Icon = o.icon;
              return (
                <li key={r.invoiceId} className="flex gap-2">
                  <Icon className={`mt-0.5 h-4 w-4 shrink-0 ${o.className}`} aria-hidden="true" />
                  <span>
                    <span className="font-medium text-ink">{r.number}</span> ({r.organisationName}): <span className={o.className}>{o.label}</span>
                    {r.stripeNumber ? `, payment service number ${r.stripeNumber}` : ""}
                    {r.reason ? <span className="block text-muted">{r.reason}</span> : null}
                  </span>
                </li>
              );
            })}
          </ul>
        </section>
      )}
    </div>
  );
}
