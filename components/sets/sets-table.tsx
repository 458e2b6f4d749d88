"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { ChevronLeft, ChevronRight } from "lucide-react";
import Link from "next/link";
import { useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { DataTable } from "@/components/ui/data-table";
import { Input, Select } from "@/components/ui/input";
import { useServerTable } from "@/components/ui/use-server-table";
import { formatDateTime } from "@/lib/format";
import { SET_STATUS_LABELS, SET_STATUSES } from "@/lib/sets/schemas";
import type { SetCustomerOption, SetListRow } from "@/lib/sets/service";
import { SetStatusBadge } from "./status-badge";

/** Sets in the caller's scope, paged and sorted on the server, with filters by customer, site, set type and status. */
export function SetsTable({
  customers,
  basePath,
  showCustomer,
}: {
  customers: SetCustomerOption[];
  basePath: string;
  showCustomer: boolean;
}) {
  const [q, setQ] = useState("");
  const [organisationId, setOrganisationId] = useState("");
  const [siteId, setSiteId] = useState("");
  const [setTypeId, setSetTypeId] = useState("");
  const [status, setStatus] = useState("");
  const table = useServerTable<SetListRow, Record<string, string>>({
    queryKey: "sets",
    url: "/api/sets",
    defaultSort: { id: "serial" },
    filters: { q: q.trim(), organisationId, siteId, setTypeId, status },
    pageSize: 25,
  });
  const setPage = table.setPage;
  const chosen = customers.filter((c) => !organisationId || String(c.id) === organisationId);
  const grouped = chosen.length > 1;
  const siteCount = chosen.reduce((n, c) => n + c.sites.length, 0);
  // Someone who sees one site only (clinic staff) needs no site column.
  const showSite = customers.reduce((n, c) => n + c.sites.length, 0) > 1;

  const columns = useMemo<ColumnDef<SetListRow, unknown>[]>(() => {
    const cols: ColumnDef<SetListRow, unknown>[] = [
      {
        id: "serial",
        header: "Serial",
        accessorKey: "serial",
        cell: ({ row }) => (
          <div>
            <Link href={`${basePath}/${row.original.id}`} className="font-semibold text-lagoon-700 underline-offset-2 hover:underline">
              {row.original.serial}
            </Link>
            <p className="font-mono text-xs text-muted">{row.original.giai}</p>
          </div>
        ),
      },
      {
        id: "set_type",
        header: "Set type",
        accessorKey: "setTypeName",
        cell: ({ row }) => (
          <div>
            <p className="text-ink">{row.original.setTypeName}</p>
            <p className="text-xs text-muted">
              {row.original.setTypeCode} · {row.original.setClassLabel}
            </p>
          </div>
        ),
      },
    ];
    if (showCustomer) cols.push({ id: "organisation", header: "Customer", accessorKey: "organisationName" });
    if (showSite) cols.push({ id: "home_site", header: "Home site", accessorKey: "homeSiteName" });
    cols.push(
      {
        id: "status",
        header: "Status",
        accessorKey: "status",
        cell: ({ row }) => (
          <span className="whitespace-nowrap">
            <SetStatusBadge status={row.original.status} />
          </span>
        ),
      },
      {
        id: "created_at",
        header: "Added",
        accessorKey: "createdAt",
        cell: ({ row }) => <span className="whitespace-nowrap tabular-nums">{formatDateTime(row.original.createdAt)}</span>,
      },
    );
    return cols;
  }, [basePath, showCustomer, showSite]);

  const reset = () => setPage(1);
  return (
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-[1.4fr_repeat(4,1fr)]">
        <Input
          type="search"
          placeholder="Serial, GS1 code or set type"
          aria-label="Search by serial, GS1 code or set type"
          value={q}
          onChange={(e) => {
            setQ(e.target.value);
            reset();
          }}
        />
        {showCustomer && (
          <Select
            aria-label="Customer"
            value={organisationId}
            onChange={(e) => {
              setOrganisationId(e.target.value);
              setSiteId("");
              setSetTypeId("");
              reset();
            }}
          >
            <option value="">Every customer</option>
            {customers.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </Select>
        )}
        {siteCount > 1 && (
          <Select aria-label="Home site" value={siteId} onChange={(e) => { setSiteId(e.target.value); reset(); }}>
            <option value="">Every site</option>
            {chosen.map((c) =>
              grouped ? (
                <optgroup key={c.id} label={c.name}>
                  {c.sites.map((s) => (
                    <option key={s.id} value={s.id}>
                      {s.name}
                    </option>
                  ))}
                </optgroup>
              ) : (
                c.sites.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))
              ),
            )}
          </Select>
        )}
        <Select aria-label="Set type" value={setTypeId} onChange={(e) => { setSetTypeId(e.target.value); reset(); }}>
          <option value="">Every set type</option>
          {chosen.map((c) =>
            grouped ? (
              <optgroup key={c.id} label={c.name}>
                {c.setTypes.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name} ({t.code})
                  </option>
                ))}
              </optgroup>
            ) : (
              c.setTypes.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name} ({t.code})
                </option>
              ))
            ),
          )}
        </Select>
        <Select aria-label="Status" value={status} onChange={(e) => { setStatus(e.target.value); reset(); }}>
          <option value="">Any status</option>
          {SET_STATUSES.map((s) => (
            <option key={s} value={s}>
              {SET_STATUS_LABELS[s]}
            </option>
          ))}
        </Select>
      </div>
      {table.error && (
        <p role="alert" className="text-sm text-danger-700">
          {table.error.message}
        </p>
      )}
      <SetCards
        rows={table.rows}
        total={table.total}
        page={table.page}
        pageSize={table.pageSize}
        onPageChange={setPage}
        basePath={basePath}
        showSite={showSite}
        loading={table.isFetching}
      />
      <div className="hidden sm:block">
        <DataTable
          caption="Sets"
          columns={columns}
          rows={table.rows}
          total={table.total}
          page={table.page}
          pageSize={table.pageSize}
          sorting={table.sorting}
          onSortingChange={table.setSorting}
          onPageChange={table.setPage}
          loading={table.isFetching}
          getRowId={(row) => String(row.id)}
        />
      </div>
    </div>
  );
}

/** The same page of sets as a list of cards, for phone screens. */
function SetCards({
  rows,
  total,
  page,
  pageSize,
  onPageChange,
  basePath,
  showSite,
  loading,
}: {
  rows: SetListRow[];
  total: number;
  page: number;
  pageSize: number;
  onPageChange: (page: number) => void;
  basePath: string;
  showSite: boolean;
  loading: boolean;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  return (
    <div className="space-y-3 sm:hidden" aria-busy={loading}>
      {rows.length === 0 ? (
        <p className="rounded-card border border-line bg-surface px-4 py-8 text-center text-sm text-muted">
          {loading ? "Loading…" : "Nothing matches these filters."}
        </p>
      ) : (
        <ul className="divide-y divide-line overflow-hidden rounded-card border border-line bg-surface shadow-card" data-testid="set-cards">
          {rows.map((row) => (
            <li key={row.id} className="px-4 py-3">
              <div className="flex items-start justify-between gap-3">
                <div className="min-w-0">
                  <Link href={`${basePath}/${row.id}`} className="font-semibold text-lagoon-700 underline-offset-2 hover:underline">
                    {row.serial}
                  </Link>
                  <p className="text-sm text-ink">{row.setTypeName}</p>
                  <p className="text-xs text-muted">
                    {row.setTypeCode}
                    {showSite ? ` · ${row.homeSiteName}` : ""}
                  </p>
                </div>
                <span className="shrink-0 whitespace-nowrap">
                  <SetStatusBadge status={row.status} />
                </span>
              </div>
            </li>
          ))}
        </ul>
      )}
      <div className="flex items-center justify-between text-sm text-muted">
        <span>{total === 0 ? "No sets" : `${(page - 1) * pageSize + 1}–${Math.min(page * pageSize, total)} of ${total}`}</span>
        <div className="flex items-center gap-2">
          <Button variant="secondary" size="sm" disabled={page <= 1} onClick={() => onPageChange(page - 1)} aria-label="Previous page">
            <ChevronLeft className="h-4 w-4" aria-hidden="true" />
          </Button>
          <span>
            {page} / {pages}
          </span>
          <Button variant="secondary" size="sm" disabled={page >= pages} onClick={() => onPageChange(page + 1)} aria-label="Next page">
            <ChevronRight className="h-4 w-4" aria-hidden="true" />
          </Button>
        </div>
      </div>
    </div>
  );
}
