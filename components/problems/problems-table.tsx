"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { Camera } from "lucide-react";
import Link from "next/link";
import { useMemo, useState } from "react";
import { DataTable } from "@/components/ui/data-table";
import { Input, Select } from "@/components/ui/input";
import { useServerTable } from "@/components/ui/use-server-table";
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
  const [q, setQ] = useState("");
  const [status, setStatus] = useState<string>(initialStatus);
  const [kind, setKind] = useState("");
  const [organisationId, setOrganisationId] = useState("");
  const table = useServerTable<ProblemListRow, Record<string, string>>({
    queryKey: "problems",
    url: "/api/problems",
    defaultSort: { id: "queue" },
    filters: { q: q.trim(), status, kind, organisationId },
    refetchIntervalMs: 20_000,
  });
  const reset = () => table.setPage(1);
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
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
        <Input
          type="search"
          className="lg:col-span-2"
          aria-label="Search problems"
          placeholder="Search by order, set, site or words"
          value={q}
          onChange={(e) => {
            setQ(e.target.value);
            reset();
          }}
        />
        <Select
          aria-label="Status"
          value={status}
          onChange={(e) => {
            setStatus(e.target.value);
            reset();
          }}
        >
          <option value="">Any status</option>
          {PROBLEM_STATUSES.map((s) => (
            <option key={s} value={s}>
              {PROBLEM_STATUS_LABELS[s]}
            </option>
          ))}
        </Select>
        <Select
          aria-label="Kind of problem"
          value={kind}
          onChange={(e) => {
            setKind(e.target.value);
            reset();
          }}
        >
          <option value="">Every kind</option>
          {PROBLEM_KINDS.map((k) => (
            <option key={k} value={k}>
              {PROBLEM_KIND_SHORT[k]}
            </option>
          ))}
        </Select>
        {organisations && (
          <Select
            aria-label="Customer"
            value={organisationId}
            onChange={(e) => {
              setOrganisationId(e.target.value);
              reset();
            }}
          >
            <option value="">Every customer</option>
            {organisations.map((o) => (
              <option key={o.id} value={o.id}>
                {o.name}
              </option>
            ))}
          </Select>
        )}
      </div>
      {table.error && (
        <p role="alert" className="text-sm text-danger-700">
          {table.error.message}
        </p>
      )}
      <DataTable
        caption={organisations ? "Problems reported by customers" : "Problems we reported"}
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
