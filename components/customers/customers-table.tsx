"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { DataTable } from "@/components/ui/data-table";
import { Input, Select } from "@/components/ui/input";
import { useServerTable } from "@/components/ui/use-server-table";
import type { OrganisationRow } from "@/lib/organisations/service";

/** The unit and its customers, with their site and people counts. */
export function CustomersTable() {
  const [q, setQ] = useState("");
  const [active, setActive] = useState("");
  const table = useServerTable<OrganisationRow, Record<string, string>>({
    queryKey: "organisations",
    url: "/api/organisations",
    defaultSort: { id: "name" },
    filters: { q: q.trim(), active },
  });
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
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-[1fr_12rem]">
        <Input type="search" aria-label="Search by name or code" placeholder="Search by name or code" value={q} onChange={(e) => { setQ(e.target.value); table.setPage(1); }} />
        <Select aria-label="Status" value={active} onChange={(e) => { setActive(e.target.value); table.setPage(1); }}>
          <option value="">Any status</option>
          <option value="yes">Active</option>
          <option value="no">Switched off</option>
        </Select>
      </div>
      <DataTable
        caption="Organisations"
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
