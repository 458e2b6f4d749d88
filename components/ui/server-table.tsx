"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { type ReactNode, useCallback, useState } from "react";
import { cn } from "@/lib/cn";
import { DataTable } from "./data-table";
import { Input, Select } from "./input";
import { type TableFilters, useServerTable } from "./use-server-table";

// A list paged, sorted and filtered on the server: the filter bar the page puts in its slot, the
// rows fetched with TanStack Query from `url` with the filters, page and sorting in the query
// string, and the DataTable showing them. A change of filter goes back to the first page.

export interface ServerTablePage<Row> {
  rows: Row[];
  total: number;
  page: number;
  pageSize: number;
  setPage: (page: number) => void;
  loading: boolean;
}

export function ServerTable<Row, F extends TableFilters>({
  queryKey,
  url,
  filters,
  defaultSort,
  pageSize,
  refetchIntervalMs,
  caption,
  columns,
  getRowId,
  filterBar,
  filterBarClassName,
  phoneView,
}: {
  /** The first element of the TanStack Query key; invalidate it to refresh the list. */
  queryKey: string;
  /** The route handler answering a page of rows (lib/http/paging). */
  url: string;
  /** The current filter values, sent as query parameters (empty ones are left out). */
  filters: F;
  defaultSort: { id: string; desc?: boolean };
  pageSize?: number;
  refetchIntervalMs?: number;
  caption: string;
  columns: ColumnDef<Row, unknown>[];
  getRowId: (row: Row) => string;
  /** The filter controls, laid out in a grid; `filterBarClassName` sets its columns. */
  filterBar?: ReactNode;
  filterBarClassName?: string;
  /** The same page as cards for phone screens; the table then shows from the small breakpoint up. */
  phoneView?: (page: ServerTablePage<Row>) => ReactNode;
}) {
  const table = useServerTable<Row, F>({ queryKey, url, defaultSort, filters, pageSize, refetchIntervalMs });
  const grid = (
    <DataTable
      caption={caption}
      columns={columns}
      rows={table.rows}
      total={table.total}
      page={table.page}
      pageSize={table.pageSize}
      sorting={table.sorting}
      onSortingChange={table.setSorting}
      onPageChange={table.setPage}
      loading={table.isFetching}
      getRowId={getRowId}
    />
  );
  return (
    <div className="space-y-4">
      {filterBar && <div className={cn("grid gap-3", filterBarClassName)}>{filterBar}</div>}
      {table.error && (
        <p role="alert" className="text-sm text-danger-700">
          {table.error.message}
        </p>
      )}
      {phoneView ? (
        <>
          {phoneView({ rows: table.rows, total: table.total, page: table.page, pageSize: table.pageSize, setPage: table.setPage, loading: table.isFetching })}
          <div className="hidden sm:block">{grid}</div>
        </>
      ) : (
        grid
      )}
    </div>
  );
}

/** The filter values of a table and one setter that changes some of them. */
export function useTableFilters<F extends Record<string, string>>(initial: F): [F, (patch: Partial<F>) => void] {
  const [values, setValues] = useState(initial);
  const change = useCallback((patch: Partial<F>) => setValues((current) => ({ ...current, ...patch })), []);
  return [values, change];
}

/** The free-text search of a filter bar. */
export function SearchFilter({
  label,
  placeholder,
  value,
  onChange,
  className,
}: {
  label: string;
  placeholder?: string;
  value: string;
  onChange: (value: string) => void;
  className?: string;
}) {
  return <Input type="search" className={className} placeholder={placeholder ?? label} aria-label={label} value={value} onChange={(e) => onChange(e.target.value)} />;
}

export interface FilterOption {
  value: string | number;
  label: string;
}

/** Options under a heading of their own (an optgroup). */
export interface FilterOptionGroup {
  label: string;
  options: readonly FilterOption[];
}

/**
 * A choice of a filter bar. With `anyLabel` its first option is "any" (the empty value); an entry
 * with `options` of its own is shown as a group of them.
 */
export function SelectFilter({
  label,
  anyLabel,
  options,
  value,
  onChange,
  className,
}: {
  label: string;
  anyLabel?: string;
  options: readonly (FilterOption | FilterOptionGroup)[];
  value: string;
  onChange: (value: string) => void;
  className?: string;
}) {
  const option = (o: FilterOption) => (
    <option key={o.value} value={o.value}>
      {o.label}
    </option>
  );
  return (
    <Select aria-label={label} className={className} value={value} onChange={(e) => onChange(e.target.value)}>
      {anyLabel !== undefined && <option value="">{anyLabel}</option>}
      {options.map((o, i) =>
        "options" in o ? (
          <optgroup key={`group-${i}`} label={o.label}>
            {o.options.map(option)}
          </optgroup>
        ) : (
          option(o)
        ),
      )}
    </Select>
  );
}

/** A day of a filter bar (YYYY-MM-DD, empty for none). */
export function DateFilter({
  label,
  value,
  onChange,
  className,
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  className?: string;
}) {
  return <Input type="date" className={className} aria-label={label} value={value} onChange={(e) => onChange(e.target.value)} />;
}
