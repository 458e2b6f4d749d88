"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
import { formatStu, formatWeight } from "@/lib/catalogue/measures";
import type { SetTypeListRow } from "@/lib/catalogue/set-types";
import {
  PACKAGING_LABELS,
  PACKAGINGS,
  SET_CLASS_LABELS,
  SET_CLASSES,
  STERILISATION_METHOD_LABELS,
  STERILISATION_METHODS,
} from "@/lib/catalogue/vocabulary";
import { SetTypeBadges } from "./set-type-labels";

/** The status filter has no "any": it starts on the active set types. */
const SET_TYPE_STATUSES = [
  { value: "active", label: "Active" },
  { value: "inactive", label: "Inactive" },
  { value: "all", label: "Active and inactive" },
] as const;

/** The class without its explanation in brackets, for a narrow column. */
function shortClassLabel(setClass: SetTypeListRow["setClass"]): string {
  return (SET_CLASS_LABELS[setClass] ?? setClass).replace(/ \(.*\)$/, "");
}

/** A customer's set types, paged, sorted and filtered on the server; each row links to its card. */
export function SetTypeTable({ organisationId, basePath }: { organisationId?: number; basePath: string }) {
  const [filters, setFilters] = useTableFilters({ q: "", setClass: "", packaging: "", method: "", status: "active" });
  const columns = useMemo<ColumnDef<SetTypeListRow, unknown>[]>(
    () => [
      {
        id: "code",
        header: "Code",
        accessorKey: "code",
        cell: ({ row }) => (
          <Link
            href={`${basePath}/${row.original.id}`}
            className="whitespace-nowrap font-mono text-xs font-semibold text-lagoon-800 underline-offset-2 hover:underline"
          >
            {row.original.code}
          </Link>
        ),
      },
      {
        id: "name",
        header: "Name",
        accessorKey: "name",
        cell: ({ row }) => (
          <div className="min-w-40 space-y-1">
            <Link href={`${basePath}/${row.original.id}`} className="font-medium text-ink hover:underline">
              {row.original.name}
            </Link>
            <div className="flex flex-wrap gap-1">
              <SetTypeBadges setClass={row.original.setClass} hasIfu={row.original.hasIfu} active={row.original.active} />
            </div>
          </div>
        ),
      },
      {
        id: "set_class",
        header: "Class",
        accessorKey: "setClass",
        cell: ({ row }) => <span>{shortClassLabel(row.original.setClass)}</span>,
      },
      {
        id: "packaging",
        header: "Packaging",
        accessorKey: "packaging",
        cell: ({ row }) => (
          <div className="min-w-28">
            <p>{PACKAGING_LABELS[row.original.packaging]}</p>
            <p className="text-muted">{STERILISATION_METHOD_LABELS[row.original.sterilisationMethod]}</p>
          </div>
        ),
      },
      {
        id: "items",
        header: "Contents",
        accessorKey: "instrumentCount",
        cell: ({ row }) => (
          <span className="whitespace-nowrap tabular-nums">
            {row.original.instrumentCount}{" "}
            <span className="text-muted">
              in {row.original.itemCount} line{row.original.itemCount === 1 ? "" : "s"}
            </span>
          </span>
        ),
      },
      {
        id: "weight",
        header: "Weight",
        accessorKey: "weightG",
        cell: ({ row }) => <span className="whitespace-nowrap tabular-nums">{formatWeight(row.original.weightG)}</span>,
      },
      {
        id: "size",
        header: "Size",
        accessorKey: "sizeStu",
        cell: ({ row }) => <span className="whitespace-nowrap tabular-nums">{formatStu(row.original.sizeStu)}</span>,
      },
    ],
    [basePath],
  );

  return (
    <ServerTable
      queryKey="set-types"
      url="/api/set-types"
      filters={{ organisationId, ...filters }}
      defaultSort={{ id: "code" }}
      pageSize={25}
      caption="Set types"
      columns={columns}
      getRowId={(row) => String(row.id)}
      filterBarClassName="sm:grid-cols-2 lg:grid-cols-[1fr_12rem_10rem_10rem_9rem]"
      filterBar={
        <>
          <SearchFilter label="Search by code or name" value={filters.q} onChange={(q) => setFilters({ q })} />
          <SelectFilter
            label="Set class"
            anyLabel="Every class"
            options={SET_CLASSES.map((c) => ({ value: c, label: SET_CLASS_LABELS[c] }))}
            value={filters.setClass}
            onChange={(setClass) => setFilters({ setClass })}
          />
          <SelectFilter
            label="Packaging"
            anyLabel="Any packaging"
            options={PACKAGINGS.map((p) => ({ value: p, label: PACKAGING_LABELS[p] }))}
            value={filters.packaging}
            onChange={(packaging) => setFilters({ packaging })}
          />
          <SelectFilter
            label="Sterilisation method"
            anyLabel="Any method"
            options={STERILISATION_METHODS.map((m) => ({ value: m, label: STERILISATION_METHOD_LABELS[m] }))}
            value={filters.method}
            onChange={(method) => setFilters({ method })}
          />
          <SelectFilter label="Status" options={SET_TYPE_STATUSES} value={filters.status} onChange={(status) => setFilters({ status })} />
        </>
      }
    />
  );
}
