"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
import { CONTRACT_STATUSES } from "@/lib/contracts/dates";
import { CONTRACT_STATUS_LABELS, formatLocalDate } from "@/lib/contracts/format";
import type { ContractListRow } from "@/lib/contracts/service";
import { ContractStatusBadge } from "./status-badge";

/** Every contract version in the caller's scope, paged, sorted and filtered on the server. */
export function ContractsTable({ customers }: { customers: { id: number; name: string }[] }) {
  const [filters, setFilters] = useTableFilters({ q: "", status: "", organisationId: "" });

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
    <ServerTable
      queryKey="contracts"
      url="/api/contracts"
      filters={filters}
      defaultSort={{ id: "organisation" }}
      pageSize={25}
      caption="Contract versions"
      columns={columns}
      getRowId={(row) => String(row.id)}
      filterBarClassName="sm:grid-cols-[1fr_14rem_12rem]"
      filterBar={
        <>
          <SearchFilter label="Search by reference or customer" value={filters.q} onChange={(q) => setFilters({ q })} />
          <SelectFilter
            label="Customer"
            anyLabel="Every customer"
            options={customers.map((c) => ({ value: c.id, label: c.name }))}
            value={filters.organisationId}
            onChange={(organisationId) => setFilters({ organisationId })}
          />
          <SelectFilter
            label="Status"
            anyLabel="Any status"
            options={CONTRACT_STATUSES.map((s) => ({ value: s, label: CONTRACT_STATUS_LABELS[s] }))}
            value={filters.status}
            onChange={(status) => setFilters({ status })}
          />
        </>
      }
    />
  );
}
