"use client";

import { useQuery } from "@tanstack/react-query";
import { Card, CardHeader } from "@/components/ui/card";
import { fetchJson, toQueryString } from "@/lib/fetch-json";
import { formatDateTime } from "@/lib/format";
import type { Page } from "@/lib/http/paging";
import type { ProcedureUseRow } from "@/lib/procedures/service";

/** The latest sets recorded as used at the caller's sites, newest first. */
export function RecentUses({ timeZone, showSite }: { timeZone: string; showSite: boolean }) {
  const uses = useQuery({
    queryKey: ["procedure-uses"],
    queryFn: () => fetchJson<Page<ProcedureUseRow>>(`/api/procedures${toQueryString({ page: 1, pageSize: 10, sort: "used_at", dir: "desc" })}`),
    refetchInterval: 30_000,
  });
  const rows = uses.data?.rows ?? [];
  return (
    <Card>
      <CardHeader title="Last recorded uses" description={uses.data ? `${uses.data.total} recorded in all.` : undefined} />
      {uses.error ? (
        <p role="alert" className="px-5 py-4 text-sm text-danger-700">
          {uses.error.message}
        </p>
      ) : rows.length === 0 ? (
        <p className="px-5 py-6 text-sm text-muted">{uses.isLoading ? "Loading…" : "No set has been recorded as used yet."}</p>
      ) : (
        <ul className="divide-y divide-line" aria-label="Last recorded uses">
          {rows.map((u) => (
            <li key={u.id} className="px-5 py-3 text-sm" data-testid="recent-use">
              <div className="flex flex-wrap items-baseline justify-between gap-x-3">
                <span className="font-medium text-ink">{u.serial}</span>
                <span className="tabular-nums text-muted">{formatDateTime(u.usedAt, timeZone)}</span>
              </div>
              <p className="text-ink-soft">{u.setName}</p>
              <p className="text-muted">
                {u.theatre} · case {u.caseReference}
                {showSite && ` · ${u.siteName}`}
                {u.recordedBy && ` · by ${u.recordedBy}`}
              </p>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
