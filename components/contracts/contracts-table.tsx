"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { DataTable } from "@/components/ui/data-table";
import { Input, Select } from "@/components/ui/input";
import { useServerTable } from "@/components/ui/use-server-table";
import { CONTRACT_STATUSES } from "@/lib/contracts/dates";
import { CONTRACT_STATUS_LABELS, formatLocalDate } from "@/lib/contracts/format";
import type { ContractListRow } from "@/lib/contracts/service";
import { ContractStatusBadge } from "./status-badge";

/** Every contract version in the caller's scope, paged, sorted and filtered on the server. */
export function ContractsTable({ customers }: { customers: { id: number; name: string }[] }) {
  const [q, setQ] = useState("");
  const [status, setStatus] = useState("");
  const [organisationId, setOrganisationId] = useState("");
  const table = useServerTable<ContractListRow, Record<string, string>>({
    queryKey: "contracts",
    url: "/api/contracts",
    defaultSort: { id: "organisation" },
    filters: { q: q.trim(), status, organisationId },
    pageSize: 25,
  });
  const setPage = table.setPage;

  const columns = useMemo<ColumnDef<ContractListRow, unknown>[]>(
    () => [
      { id: "organisation", header: "Customer", accessorKey: "organisationName" },
      {
        id: "reference",
        header: "Reference",
        accessorKey: "reference",
        cell: ({ row }) => (
          <Link href={`/unit/contracts/${row.original.id}`} className="font-medium text-lagoon-700 underline-offset-2 hover:underline">
            {row.original.reference}
          </Link>
        ),
      },
      {
        id: "valid_from",
        header: "Valid from",
        accessorKey: "validFrom",
        cell: ({ row }) => <span className="whitespace-nowrap tabular-nums">{formatLocalDate(row.original.validFrom, { short: true })}</span>,
      },
      {
        id: "valid_until",
        header: "Valid until",
        accessorKey: "validUntil",
        cell: ({ row }) => (
          <span className="whitespace-nowrap tabular-nums">
            {row.original.validUntil ? formatLocalDate(row.original.validUntil, { short: true }) : "Open-ended"}
          </span>
        ),
      },
      {
        id: "status",
        header: "Status",
        accessorKey: "status",
        cell: ({ row }) => <ContractStatusBadge status={row.original.status} />,
      },
      { id: "currency", header: "Currency", accessorKey: "currency", enableSorting: false },
      {
        id: "hours",
        header: "Standard / express",
        enableSorting: false,
        cell: ({ row }) => (
          <span className="whitespace-nowrap tabular-nums">
            {row.original.turnaroundStandardHours} h / {row.original.turnaroundExpressHours} h
          </span>
        ),
      },
    ],
    [],
  );

  return (
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-[1fr_14rem_12rem]">
        <Input
          type="search"
          placeholder="Search by reference or customer"
          aria-label="Search by reference or customer"
          value={q}
          onChange={(e) => {
            setQ(e.target.value);
            setPage(1);
          }}
        />
        <Select
          aria-label="Customer"
          value={organisationId}
          onChange={(e) => {
            setOrganisationId(e.target.value);
            setPage(1);
          }}
        >
          <option value="">Every customer</option>
          {customers.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
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
          {CONTRACT_STATUSES.map((s) => (
            <option key={s} value={s}>
              {CONTRACT_STATUS_LABELS[s]}
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
        caption="Contract versions"
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
