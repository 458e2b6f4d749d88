"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { Pencil } from "lucide-react";
import Link from "next/link";
import { useMemo } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
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
  const [filters, setFilters] = useTableFilters({ q: "", organisationId: organisationId ? String(organisationId) : "" });
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
    <ServerTable
      queryKey="sites"
      url="/api/sites"
      filters={filters}
      defaultSort={{ id: organisationId ? "name" : "organisation" }}
      caption="Sites"
      columns={columns}
      getRowId={(r) => String(r.id)}
      filterBarClassName={organisationId ? undefined : "sm:grid-cols-[1fr_16rem]"}
      filterBar={
        <>
          <SearchFilter
            label="Search sites"
            placeholder="Search by site, town, postcode or organisation"
            value={filters.q}
            onChange={(q) => setFilters({ q })}
          />
          {!organisationId && (
            <SelectFilter
              label="Organisation"
              anyLabel="Every organisation"
              options={organisations.map((o) => ({ value: o.id, label: o.name }))}
              value={filters.organisationId}
              onChange={(organisationId) => setFilters({ organisationId })}
            />
          )}
        </>
      }
    />
  );
}
