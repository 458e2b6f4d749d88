"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { SortingState } from "@tanstack/react-table";
import { useState } from "react";
import { fetchJson, toQueryString } from "@/lib/fetch-json";
import type { Page } from "@/lib/http/paging";

export type TableFilters = Record<string, string | number | undefined>;

/**
 * The state of a table paged on the server: page, sorting and filters go into the query string
 * of `url` (text trimmed); the rows come back through TanStack Query and refresh while the page
 * stays open. Another filter value, or another sorting, goes back to the first page.
 */
export function useServerTable<Row, F extends TableFilters>({
  queryKey,
  url,
  defaultSort,
  filters,
  pageSize = 25,
  refetchIntervalMs = 30_000,
}: {
  queryKey: string;
  url: string;
  defaultSort: { id: string; desc?: boolean };
  filters: F;
  pageSize?: number;
  refetchIntervalMs?: number;
}) {
  const [page, setPage] = useState(1);
  const [sorting, setSorting] = useState<SortingState>([{ id: defaultSort.id, desc: !!defaultSort.desc }]);
  const sent = Object.fromEntries(Object.entries(filters).map(([k, v]) => [k, typeof v === "string" ? v.trim() : v])) as F;
  // Adjusted while rendering (not in an effect), so the old page number is never fetched with the new filters.
  const filterKey = JSON.stringify(sent);
  const [seenFilterKey, setSeenFilterKey] = useState(filterKey);
  if (seenFilterKey !== filterKey) {
    setSeenFilterKey(filterKey);
    setPage(1);
  }
  const params = {
    ...sent,
    page,
    pageSize,
    sort: sorting[0]?.id ?? defaultSort.id,
    dir: sorting[0]?.desc ? "desc" : "asc",
  };
  const query = useQuery({
    queryKey: [queryKey, params],
    queryFn: () => fetchJson<Page<Row>>(`${url}${toQueryString(params)}`),
    placeholderData: keepPreviousData,
    refetchInterval: refetchIntervalMs,
  });
  return {
    page,
    setPage,
    pageSize,
    sorting,
    setSorting: (s: SortingState) => {
      setSorting(s);
      setPage(1);
    },
    rows: query.data?.rows ?? [],
    total: query.data?.total ?? 0,
    isFetching: query.isFetching,
    error: query.error,
  };
}
