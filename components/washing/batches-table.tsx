"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { DataTable } from "@/components/ui/data-table";
import { Input, Select } from "@/components/ui/input";
import { useServerTable } from "@/components/ui/use-server-table";
import { formatBelow } from "@/lib/cycles/format";
import { formatDateTime } from "@/lib/format";
import type { BatchListRow } from "@/lib/washing/service";
import { BATCH_STATUS_LABELS } from "@/lib/washing/status";
import { BatchStatusBadge } from "./batch-status-badge";

const STATUSES = ["loading", "running", "passed", "failed", "aborted"] as const;

/** Washer batches, paged and sorted on the server, filtered by washer, status and number. */
export function BatchesTable({ washers, initialMachineId }: { washers: { id: number; code: string; name: string }[]; initialMachineId?: number }) {
  const [q, setQ] = useState("");
  const [machineId, setMachineId] = useState(initialMachineId ? String(initialMachineId) : "");
  const [status, setStatus] = useState("");
  const table = useServerTable<BatchListRow, Record<string, string>>({
    queryKey: "washer-batches",
    url: "/api/batches",
    defaultSort: { id: "created_at", desc: true },
    filters: { q: q.trim(), machineId, status },
    pageSize: 25,
  });
  const setPage = table.setPage;

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
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-[1fr_14rem_12rem]">
        <Input
          type="search"
          placeholder="Search by batch number or program"
          aria-label="Search by batch number or program"
          value={q}
          onChange={(e) => {
            setQ(e.target.value);
            setPage(1);
          }}
        />
        <Select
          aria-label="Washer"
          value={machineId}
          onChange={(e) => {
            setMachineId(e.target.value);
            setPage(1);
          }}
        >
          <option value="">Every washer</option>
          {washers.map((w) => (
            <option key={w.id} value={w.id}>
              {w.code} · {w.name}
            </option>
          ))}
        </Select>
        <Select
          aria-label="Status"
          value={status}
          onChange={(e) => {
            setStatus(e.target.value);
            setPage(1);
          }}
        >
          <option value="">Any status</option>
          {STATUSES.map((s) => (
            <option key={s} value={s}>
              {BATCH_STATUS_LABELS[s]}
            </option>
          ))}
        </Select>
      </div>
      {table.error && (
        <p role="alert" className="text-sm text-danger-700">
          {table.error.message}
        </p>
      )}
      <DataTable
        caption="Washer batches"
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
  );
}
