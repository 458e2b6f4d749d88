"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { DataTable } from "@/components/ui/data-table";
import { Input, Select } from "@/components/ui/input";
import { useServerTable } from "@/components/ui/use-server-table";
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

/** The class without its explanation in brackets, for a narrow column. */
function shortClassLabel(setClass: SetTypeListRow["setClass"]): string {
  return (SET_CLASS_LABELS[setClass] ?? setClass).replace(/ \(.*\)$/, "");
}

/** A customer's set types, paged, sorted and filtered on the server; each row links to its card. */
export function SetTypeTable({ organisationId, basePath }: { organisationId?: number; basePath: string }) {
  const [q, setQ] = useState("");
  const [setClass, setSetClass] = useState("");
  const [packaging, setPackaging] = useState("");
  const [method, setMethod] = useState("");
  const [status, setStatus] = useState("active");
  const table = useServerTable<SetTypeListRow, Record<string, string | number | undefined>>({
    queryKey: "set-types",
    url: "/api/set-types",
    defaultSort: { id: "code" },
    filters: { organisationId, q: q.trim(), setClass, packaging, method, status },
    pageSize: 25,
  });
  const setPage = table.setPage;
  const filter = (set: (v: string) => void) => (e: { target: { value: string } }) => {
    set(e.target.value);
    setPage(1);
  };

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
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-[1fr_12rem_10rem_10rem_9rem]">
        <Input
          type="search"
          placeholder="Search by code or name"
          aria-label="Search by code or name"
          value={q}
          onChange={filter(setQ)}
        />
        <Select aria-label="Set class" value={setClass} onChange={filter(setSetClass)}>
          <option value="">Every class</option>
          {SET_CLASSES.map((c) => (
            <option key={c} value={c}>
              {SET_CLASS_LABELS[c]}
            </option>
          ))}
        </Select>
        <Select aria-label="Packaging" value={packaging} onChange={filter(setPackaging)}>
          <option value="">Any packaging</option>
          {PACKAGINGS.map((p) => (
            <option key={p} value={p}>
              {PACKAGING_LABELS[p]}
            </option>
          ))}
        </Select>
        <Select aria-label="Sterilisation method" value={method} onChange={filter(setMethod)}>
          <option value="">Any method</option>
          {STERILISATION_METHODS.map((m) => (
            <option key={m} value={m}>
              {STERILISATION_METHOD_LABELS[m]}
            </option>
          ))}
        </Select>
        <Select aria-label="Status" value={status} onChange={filter(setStatus)}>
          <option value="active">Active</option>
          <option value="inactive">Inactive</option>
          <option value="all">Active and inactive</option>
        </Select>
      </div>
      {table.error && (
        <p role="alert" className="text-sm text-danger-700">
          {table.error.message}
        </p>
      )}
      <DataTable
        caption="Set types"
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
