"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { Camera } from "lucide-react";
import Link from "next/link";
import { useMemo } from "react";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
import { formatDateTime } from "@/lib/format";
import { formatWait, PROBLEM_KIND_SHORT, PROBLEM_KINDS, PROBLEM_STATUS_LABELS, PROBLEM_STATUSES } from "@/lib/problems/schemas";
import type { ProblemListRow } from "@/lib/problems/service";
import { ProblemKindBadge, ProblemStatusBadge } from "./problem-badges";

/**
 * Problems in the caller's scope, paged and filtered on the server. The unit's queue starts on the
 * open ones, oldest first; the clinic's list on all of theirs.
 */
export function ProblemsTable({
  basePath,
  organisations,
  ordersPath,
  initialStatus,
  timeZone,
}: {
  basePath: string;
  /** The unit's customers, for the customer filter and column; absent for a clinic. */
  organisations?: { id: number; name: string }[];
  ordersPath: string;
  initialStatus: "" | "open" | "answered";
  timeZone: string;
}) {
  const [filters, setFilters] = useTableFilters<{ q: string; status: string; kind: string; organisationId: string }>({
    q: "",
    status: initialStatus,
    kind: "",
    organisationId: "",
  });
  const columns = useMemo<ColumnDef<ProblemListRow, unknown>[]>(() => {
    const cols: ColumnDef<ProblemListRow, unknown>[] = [
      {
        id: "kind",
        header: "Problem",
        accessorKey: "kind",
        cell: ({ row }) => {
          const p = row.original;
          return (
            <div className="min-w-[13rem] max-w-md space-y-1">
              <div className="flex flex-wrap items-center gap-2">
                <Link href={`${basePath}/${p.id}`} className="font-medium text-lagoon-700 hover:underline">
                  Problem {p.id}
                </Link>
                <ProblemKindBadge kind={p.kind} />
                {p.hasPhoto && <Camera className="h-4 w-4 text-muted" aria-label="with a photo" />}
                {/* On a phone the status column is off to the side: show it here too. */}
                <span className="sm:hidden" aria-hidden="true">
                  <ProblemStatusBadge status={p.status} />
                </span>
              </div>
              <p className="line-clamp-2 text-xs text-muted">{p.summary}</p>
            </div>
          );
        },
      },
    ];
    if (organisations) {
      cols.push({
        id: "customer",
        header: "Customer",
        accessorKey: "organisationName",
        cell: ({ row }) => (
          <div>
            <p>{row.original.organisationName}</p>
            <p className="text-xs text-muted">{row.original.siteName}</p>
          </div>
        ),
      });
    }
    cols.push(
      {
        id: "order",
        header: "Order and set",
        enableSorting: false,
        cell: ({ row }) => {
          const p = row.original;
          return (
            <div className="min-w-[9rem]">
              {p.orderId && p.orderReference ? (
                <Link href={`${ordersPath}/${p.orderId}`} className="text-lagoon-700 hover:underline">
                  {p.orderReference}
                </Link>
              ) : (
                "—"
              )}
              <p className="text-xs text-muted">{p.setSerial ? `${p.setSerial} · ${p.setName ?? ""}` : "The order as a whole"}</p>
              {!organisations && <p className="text-xs text-muted">{p.siteName}</p>}
            </div>
          );
        },
      },
      {
        id: "status",
        header: "Status",
        accessorKey: "status",
        cell: ({ row }) => <ProblemStatusBadge status={row.original.status} />,
      },
      {
        id: "created_at",
        header: "Reported",
        accessorKey: "createdAt",
        cell: ({ row }) => (
          <div className="whitespace-nowrap">
            <p className="tabular-nums">
              {row.original.status === "open" ? `Waiting ${formatWait(row.original.waitedMinutes)}` : `Answered in ${formatWait(row.original.waitedMinutes)}`}
            </p>
            <p className="text-xs tabular-nums text-muted">{formatDateTime(row.original.createdAt, timeZone)}</p>
          </div>
        ),
      },
    );
    return cols;
  }, [basePath, ordersPath, organisations, timeZone]);

  return (
    <ServerTable
      queryKey="problems"
      url="/api/problems"
      filters={filters}
      defaultSort={{ id: "queue" }}
      refetchIntervalMs={20_000}
      caption={organisations ? "Problems reported by customers" : "Problems we reported"}
      columns={columns}
      getRowId={(r) => String(r.id)}
      filterBarClassName="sm:grid-cols-2 lg:grid-cols-5"
      filterBar={
        <>
          <SearchFilter
            className="lg:col-span-2"
            label="Search problems"
            placeholder="Search by order, set, site or words"
            value={filters.q}
            onChange={(q) => setFilters({ q })}
          />
          <SelectFilter
            label="Status"
            anyLabel="Any status"
            options={PROBLEM_STATUSES.map((s) => ({ value: s, label: PROBLEM_STATUS_LABELS[s] }))}
            value={filters.status}
            onChange={(status) => setFilters({ status })}
          />
          <SelectFilter
            label="Kind of problem"
            anyLabel="Every kind"
            options={PROBLEM_KINDS.map((k) => ({ value: k, label: PROBLEM_KIND_SHORT[k] }))}
            value={filters.kind}
            onChange={(kind) => setFilters({ kind })}
          />
          {organisations && (
            <SelectFilter
              label="Customer"
              anyLabel="Every customer"
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
