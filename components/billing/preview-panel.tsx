"use client";

import { useQuery } from "@tanstack/react-query";
import { FilePlus2, Info } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Card, CardBody } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Select } from "@/components/ui/input";
import type { RunPreview } from "@/lib/billing/run";
import { createRunAction } from "@/lib/billing/run-actions";
import { formatMoney } from "@/lib/contracts/format";
import { fetchJson } from "@/lib/fetch-json";
import { PreviewCustomerCard } from "./preview-customer";

/** Choose a month, see what its run would bill per customer, and create the draft run. */
export function PreviewPanel({ months, initialMonth }: { months: { value: string; label: string }[]; initialMonth: string }) {
  const router = useRouter();
  const [month, setMonth] = useState(initialMonth);
  const [creating, setCreating] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const preview = useQuery({
    queryKey: ["billing-preview", month],
    queryFn: () => fetchJson<RunPreview>(`/api/billing/preview?period=${encodeURIComponent(month)}`),
  });
  const data = preview.data;
  const ready = data?.customers.filter((c) => c.status === "ready") ?? [];

  const create = async () => {
    if (!data) return;
    setCreating(true);
    setError(null);
    const result = await createRunAction({ period: data.period, token: data.token });
    setCreating(false);
    if (!result.ok) {
      setError(result.error.message);
      await preview.refetch();
      return;
    }
    toast.success(`Draft run for ${data.label} created with ${result.data.invoices.length} invoice${result.data.invoices.length === 1 ? "" : "s"}`);
    router.push(`/unit/billing/runs/${result.data.runId}`);
  };

  return (
    <div className="space-y-6">
      <Card>
        <CardBody className="flex flex-col gap-4 sm:flex-row sm:items-end sm:justify-between">
          <Field id="run-month" label="Month to bill" hint="A local calendar month in the unit's time zone." className="sm:w-72">
            <Select
              id="run-month"
              value={month}
              onChange={(e) => {
                setMonth(e.target.value);
                setError(null);
              }}
            >
              {months.map((m) => (
                <option key={m.value} value={m.value}>
                  {m.label}
                </option>
              ))}
            </Select>
          </Field>
          {data && (
            <div className="text-sm text-ink-soft sm:text-right" aria-live="polite">
              <p>
                {ready.length} invoice{ready.length === 1 ? "" : "s"}
                {data.totals.map((t) => ` · ${formatMoney(t.totalMinor, t.currency)}`).join("")}
              </p>
              {data.customers.length > ready.length && <p className="text-danger-700">{data.customers.length - ready.length} customer(s) cannot be invoiced yet</p>}
            </div>
          )}
          <Button onClick={create} disabled={!data || !data.ended || ready.length === 0 || creating || preview.isFetching}>
            <FilePlus2 className="h-4 w-4" aria-hidden="true" />
            {creating ? "Creating…" : "Create run"}
          </Button>
        </CardBody>
      </Card>
      <FormError message={error} />
      {preview.isPending && <p className="text-sm text-muted">Pricing {months.find((m) => m.value === month)?.label ?? month}…</p>}
      {preview.error && (
        <p role="alert" className="text-sm text-danger-700">
          {preview.error.message}
        </p>
      )}
      {data && !data.ended && (
        <p className="flex gap-2 rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700">
          <Info className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
          {data.label} has not ended: this is how it stands so far. Its run can be created once the month is over.
        </p>
      )}
      {data && data.customers.length === 0 && (
        <p className="rounded-lg border border-line bg-surface px-4 py-6 text-center text-sm text-muted">
          Nothing is left to bill for {data.label}: every set delivered in the month is already on an invoice.
        </p>
      )}
      <section aria-label={data ? `Preview of ${data.label}` : "Preview"} className="space-y-4">
        {data?.customers.map((customer) => (
          <PreviewCustomerCard key={customer.organisationId} customer={customer} />
        ))}
      </section>
    </div>
  );
}
