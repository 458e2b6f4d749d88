import type { Metadata } from "next";
import Link from "next/link";
import { LoadStatusBadge } from "@/components/sterilising/load-status-badge";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import type { LoadStatus } from "@/db/schema";
import { requirePermission } from "@/lib/auth/current-user";
import { formatDateTime } from "@/lib/format";
import { listLoads } from "@/lib/sterilising/loads";
import { LOAD_STATUS_LABELS, LOAD_STATUSES } from "@/lib/sterilising/status";

export const metadata: Metadata = { title: "Steriliser loads" };
export const dynamic = "force-dynamic";

const PAGE = 50;

// Steriliser loads, newest first, filtered by status, paged.
export default async function LoadsPage({ searchParams }: { searchParams: Promise<{ status?: string; page?: string }> }) {
  await requirePermission("loads.view");
  const sp = await searchParams;
  const status = (LOAD_STATUSES as readonly string[]).includes(sp.status ?? "") ? (sp.status as LoadStatus) : undefined;
  const page = Math.max(1, Math.min(10_000, Number.parseInt(sp.page ?? "1", 10) || 1));
  const { rows, total } = await listLoads(getDb(), { status, limit: PAGE, offset: (page - 1) * PAGE });
  const href = (p: number, s = status) => `/unit/loads?${new URLSearchParams({ ...(s ? { status: s } : {}), page: String(p) })}`;
  return (
    <>
      <PageHeader title="Steriliser loads" description={`${total} load${total === 1 ? "" : "s"}${status ? ` ${LOAD_STATUS_LABELS[status].toLowerCase()}` : ""}.`} />
      <nav aria-label="Filter by status" className="mb-4 flex flex-wrap gap-2 text-sm">
        <Link href="/unit/loads" className={!status ? "font-semibold text-ink" : "text-lagoon-700 underline"}>
          All
        </Link>
        {LOAD_STATUSES.map((s) => (
          <Link key={s} href={href(1, s)} className={status === s ? "font-semibold text-ink" : "text-lagoon-700 underline"}>
            {LOAD_STATUS_LABELS[s]}
          </Link>
        ))}
      </nav>
      <Card>
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead className="text-xs uppercase text-muted">
              <tr>
                {["Load", "Steriliser", "Program", "Started", "Sets", "F0", "Status"].map((h) => (
                  <th key={h} scope="col" className="px-4 py-3 font-medium">
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {rows.map((r) => (
                <tr key={r.id}>
                  <td className="px-4 py-2 font-medium">
                    <Link href={`/unit/loads/${r.id}`} className="text-lagoon-700 underline-offset-2 hover:underline">
                      {r.number}
                    </Link>
                    {r.containsImplant && <span className="ml-2 text-xs text-warn-700">implants</span>}
                  </td>
                  <td className="px-4 py-2">{r.machineCode}</td>
                  <td className="px-4 py-2">{r.programName}</td>
                  <td className="px-4 py-2">{formatDateTime(r.startedAt ?? r.createdAt)}</td>
                  <td className="px-4 py-2">{r.itemCount}</td>
                  <td className="px-4 py-2">{r.f0 === null ? "—" : `${r.f0.toFixed(1)} min`}</td>
                  <td className="px-4 py-2">
                    <LoadStatusBadge status={r.status} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>
      <div className="mt-4 flex gap-4 text-sm">
        {page > 1 && (
          <Link href={href(page - 1)} className="text-lagoon-700 underline">
            ← Newer
          </Link>
        )}
        {page * PAGE < total && (
          <Link href={href(page + 1)} className="text-lagoon-700 underline">
            Older →
          </Link>
        )}
      </div>
    </>
  );
}
