import type { Metadata } from "next";
import Link from "next/link";
import { ReleaseActions } from "@/components/sterilising/release-actions";
import { ReleaseAdvisory } from "@/components/sterilising/release-advisory";
import { ReleaseChecks } from "@/components/sterilising/release-checks";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { formatDateTime } from "@/lib/format";
import { listAwaitingRelease } from "@/lib/sterilising/loads";

export const metadata: Metadata = { title: "Release" };
export const dynamic = "force-dynamic";

// Release by the quality lead: every load awaiting release with its checks beside their limits.
export default async function ReleasePage() {
  await requirePermission("loads.release");
  const loads = await listAwaitingRelease(getDb());
  return (
    <>
      <PageHeader title="Release" description="Loads whose record is in, waiting for the quality lead's decision. Each check stands beside its limit." />
      <ReleaseAdvisory className="mb-6" />
      {loads.length === 0 ? (
        <Card>
          <CardBody className="py-10 text-center text-lg text-muted">No load is waiting for release.</CardBody>
        </Card>
      ) : (
        <ul className="space-y-6">
          {loads.map((l) => (
            <li key={l.id} data-testid={`release-load-${l.number}`}>
              <Card>
                <CardHeader
                  title={`Load ${l.number}`}
                  description={`${l.machine.code} · ${l.program.name} · finished ${formatDateTime(l.endedAt)} · ${l.items.length} set${l.items.length === 1 ? "" : "s"}`}
                  action={
                    <Link href={`/unit/loads/${l.id}`} className="text-sm font-medium text-lagoon-700 underline">
                      Load record
                    </Link>
                  }
                />
                <CardBody className="space-y-4">
                  {l.containsImplant && <Badge tone="warn">Holds implants</Badge>}
                  <ReleaseChecks assessment={l.assessment} />
                  <p className="text-sm text-muted">Sets: {l.items.map((i) => i.serial).join(", ")}</p>
                  <ReleaseActions
                    loadId={l.id}
                    loadNumber={l.number}
                    status={l.status}
                    containsImplant={l.containsImplant}
                    biResult={l.bi.result}
                    canRelease={l.assessment.blockers.length === 0}
                  />
                </CardBody>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
