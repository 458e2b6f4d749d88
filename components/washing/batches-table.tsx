"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
import { formatBelow } from "@/lib/cycles/format";
import { formatDateTime } from "@/lib/format";
import type { BatchListRow } from "@/lib/washing/service";
import { BATCH_STATUS_LABELS } from "@/lib/washing/status";
import { BatchStatusBadge } from "./batch-status-badge";

const STATUSES = ["loading", "running", "passed", "failed", "aborted"] as const;

/** Washer batches, paged and sorted on the server, filtered by washer, status and number. */
export function BatchesTable({ washers, initialMachineId }: { washers: { id: number; code: string; name: string }[]; initialMachineId?: number }) {
  const [filters, setFilters] = useTableFilters({ q: "", machineId: initialMachineId ? String(initialMachineId) : "", status: "" });

  const columns = useMemo<ColumnDef<BatchListRow, unknown>[]>(
    () => [
      {
        id: "number",
        header: "Batch",
        accessorKey: "number",
        cell: ({ row }) => (
          <Link href={`/unit/batches/${row.original.id}`} className="whitespace-nowrap font-medium text-lagoon-700 underline-offset-2 hover:underline">
            {row.original.number}
          </Link>
        ),
      },
      {
        id: "machine",
        header: "Washer",
        accessorKey: "machineCode",
        cell: ({ row }) => (
          <div>
            <p className="font-medium text-ink">{row.original.machineCode}</p>
            <p className="text-muted">{row.original.machineName}</p>
          </div>
        ),
      },
      { id: "program", header: "Program", accessorKey: "programName" },
      {
        id: "status",
        header: "Status",
        accessorKey: "status",
        cell: ({ row }) => (
          <span className="whitespace-nowrap">
            <BatchStatusBadge status={row.original.status} />
          </span>
        ),
      },
      {
        id: "created_at",
        header: "Date",
        accessorKey: "createdAt",
        cell: ({ row }) => (
          <div className="whitespace-nowrap tabular-nums">
            <p>{formatDateTime(row.original.startedAt ?? row.original.createdAt)}</p>
            {!row.original.startedAt && <p className="text-xs text-muted">opened, not started</p>}
          </div>
        ),
      },
      {
        id: "sets",
        header: "Sets",
        enableSorting: false,
        cell: ({ row }) => <span className="tabular-nums">{row.original.itemCount}</span>,
      },
      {
        id: "a0",
        header: "A0",
        enableSorting: false,
        cell: ({ row }) => <span className="tabular-nums">{row.original.a0 === null ? "—" : formatBelow(row.original.a0, 0)}</span>,
      },
    ],
    [],
  );

  return (
    <ServerTable
      queryKey="washer-batches"
      url="/api/batches"
      filters={filters}
      defaultSort={{ id: "created_at", desc: true }}
      pageSize={25}
      caption="Washer batches"
      columns={columns}
      getRowId={(row) => String(row.id)}
      filterBarClassName="sm:grid-cols-[1fr_14rem_12rem]"
      filterBar={
        <>
          <SearchFilter label="Search by batch number or program" value={filters.q} onChange={(q) => setFilters({ q })} />
          <SelectFilter
            label="Washer"
            anyLabel="Every washer"
            options={washers.map((w) => ({ value: w.id, label: `${w.code} · ${w.name}` }))}
            value={filters.machineId}
            onChange={(machineId) => setFilters({ machineId })}
          />
          <SelectFilter
            label="Status"
            anyLabel="Any status"
            options={STATUSES.map((s) => ({ value: s, label: BATCH_STATUS_LABELS[s] }))}
            value={filters.status}
            onChange={(status) => setFilters({ status })}
          />
        </>
      }
    />
  );
}
