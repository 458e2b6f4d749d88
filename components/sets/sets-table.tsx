"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { ChevronLeft, ChevronRight } from "lucide-react";
import Link from "next/link";
import { useMemo } from "react";
import { Button } from "@/components/ui/button";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
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
  const [filters, setFilters] = useTableFilters({ q: "", organisationId: "", siteId: "", setTypeId: "", status: "" });
  const chosen = customers.filter((c) => !filters.organisationId || String(c.id) === filters.organisationId);
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

  // With more than one customer to choose from, their sites and set types are grouped under their names.
  const choices = <T,>(pick: (c: SetCustomerOption) => T[], option: (item: T) => { value: number; label: string }) =>
    grouped ? chosen.map((c) => ({ label: c.name, options: pick(c).map(option) })) : chosen.flatMap((c) => pick(c).map(option));

  return (
    <ServerTable
      queryKey="sets"
      url="/api/sets"
      filters={filters}
      defaultSort={{ id: "serial" }}
      pageSize={25}
      caption="Sets"
      columns={columns}
      getRowId={(row) => String(row.id)}
      filterBarClassName="sm:grid-cols-2 lg:grid-cols-[1.4fr_repeat(4,1fr)]"
      filterBar={
        <>
          <SearchFilter
            label="Search by serial, GS1 code or set type"
            placeholder="Serial, GS1 code or set type"
            value={filters.q}
            onChange={(q) => setFilters({ q })}
          />
          {showCustomer && (
            <SelectFilter
              label="Customer"
              anyLabel="Every customer"
              options={customers.map((c) => ({ value: c.id, label: c.name }))}
              value={filters.organisationId}
              onChange={(organisationId) => setFilters({ organisationId, siteId: "", setTypeId: "" })}
            />
          )}
          {siteCount > 1 && (
            <SelectFilter
              label="Home site"
              anyLabel="Every site"
              options={choices((c) => c.sites, (s) => ({ value: s.id, label: s.name }))}
              value={filters.siteId}
              onChange={(siteId) => setFilters({ siteId })}
            />
          )}
          <SelectFilter
            label="Set type"
            anyLabel="Every set type"
            options={choices((c) => c.setTypes, (t) => ({ value: t.id, label: `${t.name} (${t.code})` }))}
            value={filters.setTypeId}
            onChange={(setTypeId) => setFilters({ setTypeId })}
          />
          <SelectFilter
            label="Status"
            anyLabel="Any status"
            options={SET_STATUSES.map((s) => ({ value: s, label: SET_STATUS_LABELS[s] }))}
            value={filters.status}
            onChange={(status) => setFilters({ status })}
          />
        </>
      }
      phoneView={(page) => (
        <SetCards
          rows={page.rows}
          total={page.total}
          page={page.page}
          pageSize={page.pageSize}
          onPageChange={page.setPage}
          basePath={basePath}
          showSite={showSite}
          loading={page.loading}
        />
      )}
    />
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
