"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { DataTable } from "@/components/ui/data-table";
import { Input, Select } from "@/components/ui/input";
import { useServerTable } from "@/components/ui/use-server-table";
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
  const [q, setQ] = useState("");
  const [status, setStatus] = useState("");
  const [siteId, setSiteId] = useState("");
  const [organisationId, setOrganisationId] = useState("");
  const [from, setFrom] = useState("");
  const [to, setTo] = useState("");
  const table = useServerTable<OrderListRow, Record<string, string>>({
    queryKey: "orders",
    url: "/api/orders",
    defaultSort: { id: "created_at", desc: true },
    filters: { q: q.trim(), status, siteId, organisationId, from, to },
    refetchIntervalMs: 15_000,
  });
  const reset = () => table.setPage(1);
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
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-6">
        <Input type="search" className="lg:col-span-2" aria-label="Search orders" placeholder="Search by reference, site or note" value={q} onChange={(e) => { setQ(e.target.value); reset(); }} />
        <Select aria-label="Status" value={status} onChange={(e) => { setStatus(e.target.value); reset(); }}>
          <option value="">Any status</option>
          {ORDER_STATUSES.map((s) => (
            <option key={s} value={s}>
              {ORDER_STATUS_LABELS[s]}
            </option>
          ))}
        </Select>
        {organisations ? (
          <Select aria-label="Customer" value={organisationId} onChange={(e) => { setOrganisationId(e.target.value); reset(); }}>
            <option value="">Every customer</option>
            {organisations.map((o) => (
              <option key={o.id} value={o.id}>
                {o.name}
              </option>
            ))}
          </Select>
        ) : (
          <Select aria-label="Site" value={siteId} onChange={(e) => { setSiteId(e.target.value); reset(); }}>
            <option value="">Every site</option>
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </Select>
        )}
        <Input type="date" aria-label="Booked from" value={from} onChange={(e) => { setFrom(e.target.value); reset(); }} />
        <Input type="date" aria-label="Booked until" value={to} onChange={(e) => { setTo(e.target.value); reset(); }} />
      </div>
      {table.error && (
        <p role="alert" className="text-sm text-danger-700">
          {table.error.message}
        </p>
      )}
      <DataTable
        caption="Orders"
        columns={columns}
        rows={table.rows}
        total={table.total}
        page={table.page}
        pageSize={table.pageSize}
        sorting={table.sorting}
        onSortingChange={table.setSorting}
        onPageChange={table.setPage}
        loading={table.isFetching}
        getRowId={(r) => String(r.id)}
      />
    </div>
  );
}
