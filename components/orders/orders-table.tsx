"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { Badge } from "@/components/ui/badge";
import { DateFilter, SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
import { formatDateTime } from "@/lib/format";
import { ORDER_STATUS_LABELS, ORDER_STATUSES } from "@/lib/orders/schemas";
import type { OrderListRow } from "@/lib/orders/service";
import { OrderStatusBadge } from "./order-status-badge";

/** Orders in the caller's scope, filtered and paged on the server, refreshed while open. */
export function OrdersTable({
  sites,
  organisations,
  basePath,
  timeZone,
}: {
  sites: { id: number; name: string }[];
  organisations?: { id: number; name: string }[];
  basePath: string;
  timeZone: string;
}) {
  const [filters, setFilters] = useTableFilters({ q: "", status: "", siteId: "", organisationId: "", from: "", to: "" });
  const columns = useMemo<ColumnDef<OrderListRow, unknown>[]>(() => {
    const cols: ColumnDef<OrderListRow, unknown>[] = [
      {
        id: "reference",
        header: "Order",
        accessorKey: "reference",
        cell: ({ row }) => (
          <div>
            <Link href={`${basePath}/${row.original.id}`} className="font-medium text-lagoon-700 hover:underline">
              {row.original.reference}
            </Link>
            <p className="text-xs text-muted">
              {row.original.sets} {row.original.sets === 1 ? "set" : "sets"} · {row.original.serviceLevel}
            </p>
          </div>
        ),
      },
    ];
    if (organisations) cols.push({ id: "organisation", header: "Customer", accessorKey: "organisationName", enableSorting: false });
    cols.push(
      { id: "site", header: "Site", accessorKey: "siteName" },
      {
        id: "status",
        header: "Status",
        accessorKey: "status",
        cell: ({ row }) => (
          <div className="flex flex-wrap gap-1">
            <OrderStatusBadge status={row.original.status} />
            {row.original.exceptions > 0 && <Badge tone="warn">{row.original.exceptions} need attention</Badge>}
          </div>
        ),
      },
      {
        id: "collection_from",
        header: "Collection",
        accessorKey: "collectionFrom",
        cell: ({ row }) => <span className="tabular-nums">{formatDateTime(row.original.collectionFrom, timeZone)}</span>,
      },
      {
        id: "promised_return_at",
        header: "Back by",
        accessorKey: "promisedReturnAt",
        cell: ({ row }) => <span className="tabular-nums">{formatDateTime(row.original.promisedReturnAt, timeZone)}</span>,
      },
      {
        id: "created_at",
        header: "Booked",
        accessorKey: "createdAt",
        cell: ({ row }) => <span className="tabular-nums text-muted">{formatDateTime(row.original.createdAt, timeZone)}</span>,
      },
    );
    return cols;
  }, [basePath, organisations, timeZone]);

  return (
    <ServerTable
      queryKey="orders"
      url="/api/orders"
      filters={filters}
      defaultSort={{ id: "created_at", desc: true }}
      refetchIntervalMs={15_000}
      caption="Orders"
      columns={columns}
      getRowId={(r) => String(r.id)}
      filterBarClassName="sm:grid-cols-2 lg:grid-cols-6"
      filterBar={
        <>
          <SearchFilter
            className="lg:col-span-2"
            label="Search orders"
            placeholder="Search by reference, site or note"
            value={filters.q}
            onChange={(q) => setFilters({ q })}
          />
          <SelectFilter
            label="Status"
            anyLabel="Any status"
            options={ORDER_STATUSES.map((s) => ({ value: s, label: ORDER_STATUS_LABELS[s] }))}
            value={filters.status}
            onChange={(status) => setFilters({ status })}
          />
          {organisations ? (
            <SelectFilter
              label="Customer"
              anyLabel="Every customer"
              options={organisations.map((o) => ({ value: o.id, label: o.name }))}
              value={filters.organisationId}
              onChange={(organisationId) => setFilters({ organisationId })}
            />
          ) : (
            <SelectFilter
              label="Site"
              anyLabel="Every site"
              options={sites.map((s) => ({ value: s.id, label: s.name }))}
              value={filters.siteId}
              onChange={(siteId) => setFilters({ siteId })}
            />
          )}
          <DateFilter label="Booked from" value={filters.from} onChange={(from) => setFilters({ from })} />
          <DateFilter label="Booked until" value={filters.to} onChange={(to) => setFilters({ to })} />
        </>
      }
    />
  );
}
