"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { Pencil } from "lucide-react";
import Link from "next/link";
import { useMemo, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { DataTable } from "@/components/ui/data-table";
import { Input, Select } from "@/components/ui/input";
import { useServerTable } from "@/components/ui/use-server-table";
import { formatDayHours, type Weekday } from "@/lib/sites/opening-hours";
import type { SiteView } from "@/lib/sites/queries";
import { SiteDialog } from "./site-dialog";

/** Every site in the caller's scope: address, today's hours, contact; editable by the administrator. */
export function SitesTable({
  organisations,
  today,
  canManage,
  organisationId,
}: {
  organisations: { id: number; name: string }[];
  today: Weekday;
  canManage: boolean;
  organisationId?: number;
}) {
  const [q, setQ] = useState("");
  const [org, setOrg] = useState(organisationId ? String(organisationId) : "");
  const table = useServerTable<SiteView, Record<string, string>>({
    queryKey: "sites",
    url: "/api/sites",
    defaultSort: { id: organisationId ? "name" : "organisation" },
    filters: { q: q.trim(), organisationId: org },
  });
  const columns = useMemo<ColumnDef<SiteView, unknown>[]>(() => {
    const cols: ColumnDef<SiteView, unknown>[] = [
      {
        id: "name",
        header: "Site",
        accessorKey: "name",
        cell: ({ row }) => (
          <div>
            <p className="font-medium">{row.original.name}</p>
            <p className="text-muted">
              {row.original.addressLine1}
              {row.original.isDepot && <> · <Badge tone="info">Unit depot</Badge></>}
              {!row.original.active && <> · <Badge>Switched off</Badge></>}
            </p>
          </div>
        ),
      },
    ];
    if (!organisationId) {
      cols.push({
        id: "organisation",
        header: "Organisation",
        accessorKey: "organisationName",
        cell: ({ row }) => (
          <Link href={`/unit/customers/${row.original.organisationId}`} className="text-lagoon-700 hover:underline">
            {row.original.organisationName}
          </Link>
        ),
      });
    }
    cols.push(
      { id: "town", header: "Town", accessorKey: "town" },
      { id: "postcode", header: "Postcode", accessorKey: "postcode" },
      {
        id: "today",
        header: "Open today",
        enableSorting: false,
        cell: ({ row }) => <span className="tabular-nums">{formatDayHours(row.original.openingHours[today])}</span>,
      },
      {
        id: "contact",
        header: "Contact",
        enableSorting: false,
        cell: ({ row }) => (row.original.contactName ? `${row.original.contactName}${row.original.contactPhone ? `, ${row.original.contactPhone}` : ""}` : "—"),
      },
    );
    if (canManage) {
      cols.push({
        id: "edit",
        header: () => <span className="sr-only">Edit</span>,
        enableSorting: false,
        cell: ({ row }) => (
          <SiteDialog
            organisationId={row.original.organisationId}
            site={row.original}
            trigger={
              <Button variant="ghost" size="sm" aria-label={`Edit ${row.original.name}`}>
                <Pencil className="h-4 w-4" aria-hidden="true" /> Edit
              </Button>
            }
          />
        ),
      });
    }
    return cols;
  }, [today, canManage, organisationId]);

  return (
    <div className="space-y-4">
      <div className={organisationId ? "grid gap-3" : "grid gap-3 sm:grid-cols-[1fr_16rem]"}>
        <Input type="search" aria-label="Search sites" placeholder="Search by site, town, postcode or organisation" value={q} onChange={(e) => { setQ(e.target.value); table.setPage(1); }} />
        {!organisationId && (
          <Select aria-label="Organisation" value={org} onChange={(e) => { setOrg(e.target.value); table.setPage(1); }}>
            <option value="">Every organisation</option>
            {organisations.map((o) => (
              <option key={o.id} value={o.id}>
                {o.name}
              </option>
            ))}
          </Select>
        )}
      </div>
      <DataTable
        caption="Sites"
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
