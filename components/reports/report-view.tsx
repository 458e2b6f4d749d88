"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { ColumnDef } from "@tanstack/react-table";
import { Download, Printer } from "lucide-react";
import { useMemo, useState } from "react";
import { DataTable } from "@/components/ui/data-table";
import { Button } from "@/components/ui/button";
import { Input, Select } from "@/components/ui/input";
import { fetchJson, toQueryString } from "@/lib/fetch-json";
import type { Cell, Report, ReportTable as Table } from "@/lib/reports/types";
import { ReportChart } from "./report-chart";

// One report on screen: its filters, its chart and every table under it, each table with its CSV
// export from the same route handler (so the file holds exactly the rows shown).

export interface ReportFilterOptions {
  customers?: { id: number; name: string }[];
  sites?: { id: number; name: string; organisationId: number }[];
  /** Which filters this report takes. */
  period?: boolean;
  grain?: boolean;
  capacity?: boolean;
}

interface ReportAnswer {
  report: Report;
  filters: { from: string; to: string; organisationId: number | null; siteId: number | null; grain: string };
}

function ReportTableView({ table, csvHref }: { table: Table; csvHref: string }) {
  const columns = useMemo<ColumnDef<Record<string, Cell>, unknown>[]>(
    () =>
      table.columns.map((c) => ({
        id: c.key,
        header: c.label,
        enableSorting: false,
        accessorFn: (row) => row[c.key],
        cell: ({ getValue }) => {
          const value = getValue() as Cell;
          return <span className={c.numeric ? "block text-right tabular-nums" : undefined}>{value === null || value === "" ? "—" : String(value)}</span>;
        },
      })),
    [table],
  );
  const slug = `report-table-${table.key}`;
  return (
    <section aria-labelledby={`${slug}-title`} className="report-table space-y-2" data-table={table.key}>
      <div className="flex items-end justify-between gap-3">
        <h2 id={`${slug}-title`} className="text-base font-semibold text-ink">
          {table.title}
        </h2>
        <a className="no-print inline-flex items-center gap-1 text-sm font-medium text-lagoon-700 hover:underline" href={csvHref} download data-csv={table.key}>
          <Download className="h-4 w-4" aria-hidden="true" /> CSV
        </a>
      </div>
      <DataTable
        columns={columns}
        rows={table.rows}
        total={table.rows.length}
        page={1}
        pageSize={Math.max(1, table.rows.length)}
        sorting={[]}
        onSortingChange={() => {}}
        onPageChange={() => {}}
        caption={table.title}
        getRowId={(row) => table.columns.map((c) => String(row[c.key] ?? "")).join("|")}
      />
    </section>
  );
}

// Printed, a report keeps each chart whole, drops shadows and colours of the page, and prints
// every table row (the on-screen paging never hides any).
const PRINT_CSS = `@media print {
  .report-chart, .report-table section, figure { break-inside: avoid; box-shadow: none !important; }
  .report-table table { font-size: 9pt; }
  .report-table th, .report-table td { padding: 2pt 4pt !important; }
  .report-chart { border-color: #000 !important; }
}`;

export function ReportView({
  name,
  endpoint,
  options,
  defaultFrom,
  defaultTo,
  caution,
}: {
  name: string;
  /** "/api/reports" for the unit, "/api/reports/clinic" for a customer. */
  endpoint: string;
  options: ReportFilterOptions;
  defaultFrom: string;
  defaultTo: string;
  caution?: string;
}) {
  const [from, setFrom] = useState(defaultFrom);
  const [to, setTo] = useState(defaultTo);
  const [customer, setCustomer] = useState("");
  const [site, setSite] = useState("");
  const [grain, setGrain] = useState<"week" | "month">("week");
  const [days, setDays] = useState("14");
  const [loadsPerDay, setLoadsPerDay] = useState("8");

  const params: Record<string, string> = {};
  if (options.period !== false) Object.assign(params, { from, to });
  if (customer) params.customer = customer;
  if (site) params.site = site;
  if (options.grain) params.grain = grain;
  if (options.capacity) Object.assign(params, { days, loadsPerDay });
  const url = `${endpoint}/${name}`;
  const query = useQuery({
    queryKey: ["report", url, params],
    queryFn: () => fetchJson<ReportAnswer>(`${url}${toQueryString(params)}`),
    placeholderData: keepPreviousData,
  });
  const report = query.data?.report;
  const sites = (options.sites ?? []).filter((s) => !customer || String(s.organisationId) === customer);

  return (
    <div className="space-y-6">
      <style href="steamlane-report-print" precedence="default">{PRINT_CSS}</style>
      <form className="no-print flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()} aria-label="Report filters">
        {options.period !== false && (
          <>
            <label className="text-sm">
              <span className="mb-1 block font-medium text-ink">From</span>
              <Input type="date" name="from" value={from} max={to} onChange={(e) => setFrom(e.target.value)} />
            </label>
            <label className="text-sm">
              <span className="mb-1 block font-medium text-ink">To</span>
              <Input type="date" name="to" value={to} min={from} onChange={(e) => setTo(e.target.value)} />
            </label>
          </>
        )}
        {options.customers && options.customers.length > 0 && (
          <label className="text-sm">
            <span className="mb-1 block font-medium text-ink">Customer</span>
            <Select
              name="customer"
              value={customer}
              onChange={(e) => {
                setCustomer(e.target.value);
                setSite("");
              }}
            >
              <option value="">All customers</option>
              {options.customers.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                </option>
              ))}
            </Select>
          </label>
        )}
        {sites.length > 1 && (
          <label className="text-sm">
            <span className="mb-1 block font-medium text-ink">Site</span>
            <Select name="site" value={site} onChange={(e) => setSite(e.target.value)}>
              <option value="">All sites</option>
              {sites.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </Select>
          </label>
        )}
        {options.grain && (
          <label className="text-sm">
            <span className="mb-1 block font-medium text-ink">Per</span>
            <Select name="grain" value={grain} onChange={(e) => setGrain(e.target.value as "week" | "month")}>
              <option value="week">Week</option>
              <option value="month">Month</option>
            </Select>
          </label>
        )}
        {options.capacity && (
          <>
            <label className="text-sm">
              <span className="mb-1 block font-medium text-ink">Next days</span>
              <Input type="number" name="days" min={1} max={60} value={days} onChange={(e) => setDays(e.target.value)} className="w-24" />
            </label>
            <label className="text-sm">
              <span className="mb-1 block font-medium text-ink">Loads per steriliser per day (assumed)</span>
              <Input type="number" name="loadsPerDay" min={1} max={48} step="0.5" value={loadsPerDay} onChange={(e) => setLoadsPerDay(e.target.value)} className="w-28" />
            </label>
          </>
        )}
        <Button type="button" variant="secondary" onClick={() => window.print()}>
          <Printer className="h-4 w-4" aria-hidden="true" /> Print
        </Button>
      </form>

      {query.error && (
        <p role="alert" className="rounded-lg border border-danger-600 bg-danger-50 px-4 py-3 text-sm text-danger-700">
          {(query.error as Error).message}
        </p>
      )}
      {!report && !query.error && <p className="text-sm text-muted">Loading the report…</p>}
      {report && (
        <div className="space-y-6" aria-busy={query.isFetching}>
          <div className="space-y-1 text-sm text-ink-soft">
            {report.notes.map((note) => (
              <p key={note}>{note}</p>
            ))}
          </div>
          {caution && (
            <p role="note" className="rounded-lg border border-line-strong bg-paper px-4 py-3 text-sm text-ink">
              {caution}
            </p>
          )}
          {report.charts.map((chart) => (
            <ReportChart key={chart.title} chart={chart} />
          ))}
          {report.tables.map((table) => (
            <ReportTableView key={table.key} table={table} csvHref={`${url}${toQueryString({ ...params, format: "csv", table: table.key })}`} />
          ))}
        </div>
      )}
    </div>
  );
}
