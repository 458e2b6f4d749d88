"use client";

import { useQueryClient } from "@tanstack/react-query";
import type { ColumnDef } from "@tanstack/react-table";
import { useMemo } from "react";
import { toast } from "sonner";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { SearchFilter, SelectFilter, ServerTable, useTableFilters } from "@/components/ui/server-table";
import { ROLE_LABELS, type Role } from "@/lib/auth/roles";
import { formatDateTime } from "@/lib/format";
import { resendInvitationAction, setUserStatusAction } from "@/lib/users/actions";
import type { UserListRow } from "@/lib/users/service";

const STATUS: Record<UserListRow["status"], { label: string; tone: BadgeTone }> = {
  active: { label: "Active", tone: "ok" },
  invited: { label: "Invited", tone: "info" },
  disabled: { label: "Switched off", tone: "neutral" },
};

/** People in the caller's scope, paged and sorted on the server, with their account actions. */
export function PeopleTable({
  roles,
  showOrganisation,
  currentUserId,
}: {
  roles: readonly Role[];
  showOrganisation: boolean;
  currentUserId: number;
}) {
  const queryClient = useQueryClient();
  const [filters, setFilters] = useTableFilters({ q: "", role: "", status: "" });
  const columns = useMemo<ColumnDef<UserListRow, unknown>[]>(() => {
    const run = async (label: string, action: () => Promise<{ ok: boolean; error?: { message: string } }>) => {
      const result = await action();
      if (result.ok) toast.success(label);
      else toast.error(result.error?.message ?? "That did not work.");
      await queryClient.invalidateQueries({ queryKey: ["users"] });
    };
    const cols: ColumnDef<UserListRow, unknown>[] = [
      {
        id: "name",
        header: "Name",
        accessorKey: "name",
        cell: ({ row }) => (
          <div>
            <p className="font-medium text-ink">{row.original.name}</p>
            <p className="text-muted">{row.original.email}</p>
          </div>
        ),
      },
      {
        id: "role",
        header: "Role",
        accessorKey: "role",
        cell: ({ row }) => (
          <div>
            <p>{ROLE_LABELS[row.original.role]}</p>
            {row.original.siteName && <p className="text-muted">{row.original.siteName}</p>}
          </div>
        ),
      },
    ];
    if (showOrganisation) {
      cols.push({ id: "organisation", header: "Organisation", accessorKey: "organisationName" });
    }
    cols.push(
      {
        id: "status",
        header: "Status",
        accessorKey: "status",
        cell: ({ row }) => <Badge tone={STATUS[row.original.status].tone}>{STATUS[row.original.status].label}</Badge>,
      },
      {
        id: "last_sign_in_at",
        header: "Last signed in",
        accessorKey: "lastSignInAt",
        cell: ({ row }) => <span className="tabular-nums">{formatDateTime(row.original.lastSignInAt)}</span>,
      },
      {
        id: "actions",
        header: () => <span className="sr-only">Actions</span>,
        enableSorting: false,
        cell: ({ row }) => {
          const u = row.original;
          if (u.id === currentUserId) return <span className="text-xs text-muted">You</span>;
          if (u.status === "invited") {
            return (
              <Button variant="secondary" size="sm" onClick={() => run(`New link sent to ${u.email}`, () => resendInvitationAction({ userId: u.id }))}>
                Resend link
              </Button>
            );
          }
          const next = u.status === "active" ? "disabled" : "active";
          return (
            <Button
              variant={next === "disabled" ? "ghost" : "secondary"}
              size="sm"
              onClick={() =>
                run(next === "disabled" ? `${u.name} can no longer sign in` : `${u.name} can sign in again`, () =>
                  setUserStatusAction({ userId: u.id, status: next }),
                )
              }
            >
              {next === "disabled" ? "Switch off" : "Switch on"}
            </Button>
          );
        },
      },
    );
    return cols;
  }, [showOrganisation, currentUserId, queryClient]);

  return (
    <ServerTable
      queryKey="users"
      url="/api/users"
      filters={filters}
      defaultSort={{ id: "name" }}
      pageSize={20}
      caption="People"
      columns={columns}
      getRowId={(row) => String(row.id)}
      filterBarClassName="sm:grid-cols-[1fr_12rem_12rem]"
      filterBar={
        <>
          <SearchFilter label="Search by name or e-mail" value={filters.q} onChange={(q) => setFilters({ q })} />
          <SelectFilter
            label="Role"
            anyLabel="Every role"
            options={roles.map((r) => ({ value: r, label: ROLE_LABELS[r] }))}
            value={filters.role}
            onChange={(role) => setFilters({ role })}
          />
          <SelectFilter
            label="Status"
            anyLabel="Any status"
            options={(["active", "invited", "disabled"] as const).map((s) => ({ value: s, label: STATUS[s].label }))}
            value={filters.status}
            onChange={(status) => setFilters({ status })}
          />
        </>
      }
    />
  );
}
