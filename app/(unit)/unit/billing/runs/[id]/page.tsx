import { ArrowLeft } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { RunActions } from "@/components/billing/run-actions";
import { RunInvoices } from "@/components/billing/run-invoices";
import { RunStatusBadge } from "@/components/billing/run-status-badge";
import { Card, CardBody } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { getRunDetail, type RunDetail } from "@/lib/billing/run";
import { formatMoney } from "@/lib/contracts/format";
import { AppError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { parseId } from "@/lib/http/route";

export const metadata: Metadata = { title: "Invoice run" };

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div>
      <p className="text-xs font-medium uppercase tracking-wide text-muted">{label}</p>
      <div className="mt-1 text-sm text-ink">{children}</div>
    </div>
  );
}

export default async function RunPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("billing.view");
  const { id } = await params;
  let run: RunDetail;
  try {
    run = await getRunDetail(getDb(), user, parseId(id, "That invoice run"));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
  const total = run.totals.map((t) => formatMoney(t.totalMinor, t.currency)).join(" + ");
  return (
    <>
      <Link href="/unit/billing" className="mb-3 inline-flex items-center gap-1 text-sm text-lagoon-700 hover:underline">
        <ArrowLeft className="h-4 w-4" aria-hidden="true" />
        All runs
      </Link>
      <PageHeader
        title={`Invoice run: ${run.label}`}
        description="Every invoice of the run with its lines and the delivered sets behind each line."
      />
      <div className="space-y-6">
        <Card>
          <CardBody className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
            <Fact label="Status">
              <RunStatusBadge status={run.status} />
            </Fact>
            <Fact label="Invoices">
              {run.openInvoices === run.invoices ? `${run.invoices}` : `${run.openInvoices} of ${run.invoices} issued`} · {total}
            </Fact>
            <Fact label="Created">
              {formatDateTime(run.createdAt)}
              {run.createdByName ? ` by ${run.createdByName}` : ""}
            </Fact>
            <Fact label="Approved">
              {run.approvedAt ? `${formatDateTime(run.approvedAt)}${run.approvedByName ? ` by ${run.approvedByName}` : ""}` : "Not yet"}
              {run.approvedBy !== null && run.approvedBy === run.createdBy && <p className="text-xs text-muted">by the person who created it</p>}
            </Fact>
          </CardBody>
        </Card>
        {can(user.role, "billing.manage") && (
          <RunActions
            runId={run.id}
            label={run.label}
            status={run.status}
            invoices={run.invoices}
            total={total}
            createdBySelf={run.createdBy === user.id}
          />
        )}
        <RunInvoices invoices={run.invoiceList} />
      </div>
    </>
  );
}
