"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { Badge } from "@/components/ui/badge";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
import type { OrganisationRow } from "@/lib/organisations/service";

/** The unit and its customers, with their site and people counts. */
export function CustomersTable() {
  const [filters, setFilters] = useTableFilters({ q: "", active: "" });
  const columns = useMemo<ColumnDef<OrganisationRow, unknown>[]>(
    () => [
      {
        id: "name",
        header: "Organisation",
        accessorKey: "name",
        cell: ({ row }) => (
          <Link href={`/unit/customers/${row.original.id}`} className="font-medium text-lagoon-700 underline-offset-2 hover:underline">
            {row.original.name}
          </Link>
        ),
      },
      { id: "short_code", header: "Code", accessorKey: "shortCode" },
      {
        id: "kind",
        header: "Kind",
        enableSorting: false,
        cell: ({ row }) => (row.original.kind === "unit" ? <Badge tone="info">The unit</Badge> : "Customer"),
      },
      { id: "sites", header: "Sites", accessorKey: "sites" },
      { id: "users", header: "People", accessorKey: "users" },
      {
        id: "active",
        header: "Status",
        enableSorting: false,
        cell: ({ row }) => (row.original.active ? <Badge tone="ok">Active</Badge> : <Badge>Switched off</Badge>),
      },
    ],
    [],
  );
  return (
    <ServerTable
      queryKey="organisations"
      url="/api/organisations"
      filters={filters}
      defaultSort={{ id: "name" }}
      caption="Organisations"
      columns={columns}
      getRowId={(r) => String(r.id)}
      filterBarClassName="sm:grid-cols-[1fr_12rem]"
      filterBar={
        <>
          <SearchFilter label="Search by name or code" value={filters.q} onChange={(q) => setFilters({ q })} />
          <SelectFilter
            label="Status"
            anyLabel="Any status"
            options={[
              { value: "yes", label: "Active" },
              { value: "no", label: "Switched off" },
            ]}
            value={filters.active}
            onChange={(active) => setFilters({ active })}
          />
        </>
      }
    />
  );
}
