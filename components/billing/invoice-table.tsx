"use client";

import { useQuery } from "@tanstack/react-query";
import type { ColumnDef } from "@tanstack/react-table";
import { Download } from "lucide-react";
import Link from "next/link";
import { useMemo } from "react";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
import type { InvoiceStatus } from "@/db/schema";
import type { AgeBucket, CurrencyTotals, InvoiceListRow, InvoiceSummary } from "@/lib/billing/invoices";
import { formatMoney } from "@/lib/contracts/format";
import { fetchJson, toQueryString } from "@/lib/fetch-json";
import { AGE_LABELS, AGE_ORDER, formatDay, formatPeriod, INVOICE_STATUS, InvoiceStatusBadge, OverdueBadge } from "./invoice-format";

// The invoice list of either audience, paged and sorted on the server: finance sees every
// customer with the ageing of open invoices, totals and the CSV exports; a clinic manager sees
// its own organisation's invoices.

const totalsText = (totals: CurrencyTotals[], pick: (t: CurrencyTotals) => number) =>
  totals.length === 0 ? formatMoney(0, "GBP") : totals.map((t) => formatMoney(pick(t), t.currency)).join(" + ");

export function InvoiceTable({
  audience,
  customers = [],
  statuses,
  timeZone,
}: {
  audience: "unit" | "clinic";
  customers?: { id: number; name: string }[];
  statuses: InvoiceStatus[];
  timeZone: string;
}) {
  const [values, setFilters] = useTableFilters({ q: "", status: "", age: "", organisationId: "" });
  // The summary and the exports ask for the same invoices as the table.
  const filters = { ...values, q: values.q.trim() };
  const basePath = audience === "unit" ? "/unit/billing/invoices" : "/clinic/invoices";
  const summary = useQuery({
    queryKey: ["invoice-summary", filters],
    queryFn: () => fetchJson<InvoiceSummary>(`/api/billing/invoices/summary${toQueryString(filters)}`),
    refetchInterval: 30_000,
  });

  const columns = useMemo<ColumnDef<InvoiceListRow, unknown>[]>(() => {
    const cols: ColumnDef<InvoiceListRow, unknown>[] = [
      {
        id: "number",
        header: "Invoice",
        accessorKey: "number",
        cell: ({ row }) => (
          <div>
            <Link href={`${basePath}/${row.original.id}`} className="whitespace-nowrap font-medium text-lagoon-700 hover:underline">
              {row.original.number}
            </Link>
            <p className="text-muted">{formatPeriod(row.original.periodStart, timeZone)}</p>
          </div>
        ),
      },
    ];
    if (audience === "unit") cols.push({ id: "customer", header: "Customer", accessorKey: "organisationName" });
    cols.push(
      {
        id: "status",
        header: "Status",
        accessorKey: "status",
        cell: ({ row }) => (
          <div className="flex flex-wrap gap-1">
            <InvoiceStatusBadge status={row.original.status} />
            <OverdueBadge daysOverdue={row.original.daysOverdue} />
          </div>
        ),
      },
      { id: "issue_date", header: "Issued", accessorKey: "issueDate", cell: ({ row }) => <span className="whitespace-nowrap tabular-nums">{formatDay(row.original.issueDate, timeZone)}</span> },
      { id: "due_date", header: "Due", accessorKey: "dueDate", cell: ({ row }) => <span className="whitespace-nowrap tabular-nums">{formatDay(row.original.dueDate, timeZone)}</span> },
      {
        id: "total",
        header: "Total",
        accessorKey: "totalMinor",
        cell: ({ row }) => <span className="tabular-nums">{formatMoney(row.original.totalMinor, row.original.currency)}</span>,
      },
      {
        id: "amount_due",
        header: "Amount due",
        accessorKey: "amountDueMinor",
        cell: ({ row }) => <span className="font-medium tabular-nums">{formatMoney(row.original.amountDueMinor, row.original.currency)}</span>,
      },
    );
    return cols;
  }, [audience, basePath, timeZone]);

  const exportQuery = toQueryString(filters);
  return (
    <div className="space-y-4">
      {audience === "unit" && summary.data && (
        <section aria-label="Open invoices by age" className="grid gap-3 sm:grid-cols-3 lg:grid-cols-5">
          {AGE_ORDER.map((bucket) => {
            const entry = summary.data.ageing.find((a) => a.bucket === bucket);
            const count = entry?.totals.reduce((s, t) => s + t.count, 0) ?? 0;
            const selected = values.age === bucket;
            return (
              <button
                key={bucket}
                type="button"
                aria-pressed={selected}
                onClick={() => setFilters(selected ? { age: "" } : { age: bucket, status: "" })}
                className={`rounded-card border px-4 py-3 text-left shadow-card focus:outline-none focus-visible:ring-2 focus-visible:ring-lagoon-300 ${
                  selected ? "border-lagoon-600 bg-lagoon-50" : "border-line bg-surface hover:bg-paper"
                }`}
              >
                <span className="block text-xs font-medium uppercase tracking-wide text-muted">{AGE_LABELS[bucket as AgeBucket]}</span>
                <span className="mt-1 block text-lg font-semibold tabular-nums text-ink">{totalsText(entry?.totals ?? [], (t) => t.amountDueMinor)}</span>
                <span className="block text-xs text-muted">
                  {count} invoice{count === 1 ? "" : "s"}
                </span>
              </button>
            );
          })}
        </section>
      )}
      <ServerTable
        queryKey="invoices"
        url="/api/billing/invoices"
        filters={values}
        defaultSort={{ id: "due_date", desc: true }}
        pageSize={20}
        caption="Invoices"
        columns={columns}
        getRowId={(row) => String(row.id)}
        filterBarClassName={audience === "unit" ? "sm:grid-cols-2 lg:grid-cols-[1fr_12rem_14rem_14rem]" : "sm:grid-cols-[1fr_12rem]"}
        filterBar={
          <>
            <SearchFilter
              label="Search invoices"
              placeholder={audience === "unit" ? "Search number or customer" : "Search by invoice number"}
              value={values.q}
              onChange={(q) => setFilters({ q })}
            />
            <SelectFilter
              label="Status"
              anyLabel="Any status"
              options={statuses.map((s) => ({ value: s, label: INVOICE_STATUS[s].label }))}
              value={values.status}
              onChange={(status) => setFilters({ status })}
            />
            {audience === "unit" && (
              <>
                <SelectFilter
                  label="Age"
                  anyLabel="Any age"
                  options={AGE_ORDER.map((b) => ({ value: b, label: AGE_LABELS[b] }))}
                  value={values.age}
                  onChange={(age) => setFilters({ age })}
                />
                <SelectFilter
                  label="Customer"
                  anyLabel="Every customer"
                  options={customers.map((c) => ({ value: c.id, label: c.name }))}
                  value={values.organisationId}
                  onChange={(organisationId) => setFilters({ organisationId })}
                />
              </>
            )}
          </>
        }
      />
      <div className="flex flex-col gap-3 text-sm text-muted sm:flex-row sm:items-center sm:justify-between">
        {summary.data && (
          <p data-testid="invoice-totals">
            {summary.data.filtered.reduce((s, t) => s + t.count, 0)} invoices matching: total {totalsText(summary.data.filtered, (t) => t.totalMinor)}, due{" "}
            {totalsText(summary.data.filtered, (t) => t.amountDueMinor)}.
          </p>
        )}
        {audience === "unit" && (
          <div className="flex flex-wrap gap-3">
            <a className="inline-flex items-center gap-1 font-medium text-lagoon-700 hover:underline" href={`/api/billing/invoices/headers.csv${exportQuery}`} download>
              <Download className="h-4 w-4" aria-hidden="true" /> Invoices (CSV)
            </a>
            <a className="inline-flex items-center gap-1 font-medium text-lagoon-700 hover:underline" href={`/api/billing/invoices/lines.csv${exportQuery}`} download>
              <Download className="h-4 w-4" aria-hidden="true" /> Invoice lines (CSV)
            </a>
          </div>
        )}
      </div>
    </div>
  );
}
