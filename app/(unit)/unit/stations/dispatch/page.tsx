import type { Metadata } from "next";
import Link from "next/link";
import { DispatchStation } from "@/components/stations/dispatch-station";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { getDispatchBoard } from "@/lib/stations/dispatch";

export const metadata: Metadata = { title: "Dispatch" };

// The dispatch station; ?run=<id> keeps the van being loaded after a reload.
export default async function DispatchPage({ searchParams }: { searchParams: Promise<{ run?: string | string[] }> }) {
  await requirePermission("stations.operate");
  const { run } = await searchParams;
  const board = await getDispatchBoard(getDb());
  const wanted = typeof run === "string" && /^[1-9]\d{0,15}$/.test(run) ? Number(run) : null;
  const initialRunId = board.runs.some((r) => r.runId === wanted) ? wanted : null;
  return (
    <>
      <PageHeader
        title="Dispatch"
        description="Load released sets onto the van of today's run that delivers them."
        actions={
          <Link href="/unit/stations" className="text-sm font-medium text-lagoon-700 underline">
            Other stations
          </Link>
        }
      />
      <DispatchStation initialBoard={board} initialRunId={initialRunId} />
    </>
  );
}
