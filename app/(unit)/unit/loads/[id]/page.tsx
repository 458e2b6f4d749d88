import { Download, FileText } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { RecordChart } from "@/components/cycles/record-chart";
import { LoadStatusBadge } from "@/components/sterilising/load-status-badge";
import { ReleaseActions } from "@/components/sterilising/release-actions";
import { ReleaseAdvisory } from "@/components/sterilising/release-advisory";
import { ReleaseChecks } from "@/components/sterilising/release-checks";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { formatDuration } from "@/lib/machines/requirements";
import { getLoadDetail, type LoadDetail } from "@/lib/sterilising/loads";
import { loadRecordSamples } from "@/lib/sterilising/record";

export const metadata: Metadata = { title: "Steriliser load" };
export const dynamic = "force-dynamic";

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[10rem_1fr] gap-3 py-2">
      <dt className="text-sm text-muted">{label}</dt>
      <dd className="text-sm text-ink">{children}</dd>
    </div>
  );
}

// One steriliser load: its run, its sets with where they are, the checks, the record and the decision.
export default async function LoadPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("loads.view");
  const { id } = await params;
  if (!/^[1-9][0-9]{0,15}$/.test(id)) notFound();
  let load: LoadDetail;
  try {
    load = await getLoadDetail(getDb(), Number(id));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
  const record = load.record ? await loadRecordSamples(getDb(), user, load.record.fileId) : null;
  const f = load.figures;
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/unit/loads" className="text-lagoon-700 underline-offset-2 hover:underline">
          ← All steriliser loads
        </Link>
      </p>
      <PageHeader title={`Load ${load.number}`} description={`${load.machine.code} · ${load.machine.name} · ${load.program.name}`} actions={<LoadStatusBadge status={load.status} />} />
      <div className="grid gap-6 lg:grid-cols-[2fr_3fr]">
        <div className="space-y-6">
          <Card>
            <CardHeader title="The run" />
            <CardBody>
              <dl className="divide-y divide-line">
                <Row label="Cycle">{load.program.requirementText}</Row>
                <Row label="Opened">{formatDateTime(load.createdAt)}</Row>
                <Row label="Started">{load.startedAt ? `${formatDateTime(load.startedAt)}${load.startedBy ? ` by ${load.startedBy}` : ""}` : "—"}</Row>
                <Row label="Ended">{formatDateTime(load.endedAt)}</Row>
                <Row label="Sets">
                  {load.items.length} · {load.loadStu}
                  {load.machine.capacityStu !== null ? ` of ${load.machine.capacityStu}` : ""} StU
                </Row>
                <Row label="Implants">{load.containsImplant ? <Badge tone="warn">Yes: biological indicator required</Badge> : "No"}</Row>
                <Row label="Decision">{load.decision.at ? `${formatDateTime(load.decision.at)}${load.decision.by ? ` by ${load.decision.by}` : ""}${load.decision.notes ? ` — ${load.decision.notes}` : ""}` : "—"}</Row>
                {load.earlyRelease && <Row label="Early release">{`${load.earlyRelease.reason}${load.earlyRelease.by ? ` (${load.earlyRelease.by})` : ""}`}</Row>}
                {load.recallId && (
                  <Row label="Recall">
                    <Link href={`/unit/recalls/${load.recallId}`} className="text-lagoon-700 underline">
                      Open the recall
                    </Link>
                  </Row>
                )}
              </dl>
            </CardBody>
          </Card>
          <Card>
            <CardHeader title="Release checks" />
            <CardBody className="space-y-4">
              <ReleaseChecks assessment={load.assessment} />
              <ReleaseAdvisory />
              {can(user.role, "loads.release") && (
                <ReleaseActions
                  loadId={load.id}
                  loadNumber={load.number}
                  status={load.status}
                  containsImplant={load.containsImplant}
                  biResult={load.bi.result}
                  canRelease={load.assessment.blockers.length === 0}
                />
              )}
            </CardBody>
          </Card>
        </div>
        <div className="space-y-6">
          <Card>
            <CardHeader
              title="Cycle record"
              action={
                load.record ? (
                  <div className="flex gap-2">
                    <Button variant="secondary" size="sm" asChild>
                      <a href={`/api/loads/${load.id}/record.pdf`}>
                        <FileText className="h-4 w-4" aria-hidden="true" /> Cycle record (PDF)
                      </a>
                    </Button>
                    <Button variant="secondary" size="sm" asChild>
                      <a href={`/api/files/${load.record.fileId}`}>
                        <Download className="h-4 w-4" aria-hidden="true" /> {load.record.name}
                      </a>
                    </Button>
                  </div>
                ) : undefined
              }
            />
            <CardBody>
              {!record && <p className="text-sm text-muted">No record yet: the load is finished at the sterilising station with the steriliser&apos;s record.</p>}
              {record && "problem" in record && <p className="text-sm text-danger-700">{record.problem}</p>}
              {record && "samples" in record && f && (
                <RecordChart
                  title={`Load ${load.number} record`}
                  samples={record.samples}
                  band={f.band}
                  bandLabel={`${f.band.lowC}–${f.band.highC} °C sterilisation band`}
                  hold={f.plateauStartS != null && f.plateauEndS != null ? { fromT: f.plateauStartS, toT: f.plateauEndS } : undefined}
                  figures={[
                    { label: "F0", value: `${f.f0.toFixed(1)} min` },
                    { label: "Hold", value: formatDuration(Math.floor(f.holdSeconds)) },
                  ]}
                />
              )}
            </CardBody>
          </Card>
          <Card>
            <CardHeader title="Sets in the load" />
            <ul className="divide-y divide-line" data-testid="load-items">
              {load.items.map((i) => (
                <li key={i.cycleId} className="flex flex-wrap items-center justify-between gap-3 px-5 py-3 text-sm">
                  <div>
                    <Link href={`/unit/sets/${i.setId}`} className="font-semibold text-lagoon-700 underline-offset-2 hover:underline">
                      {i.serial}
                    </Link>{" "}
                    · {i.setTypeName}
                    <p className="text-muted">
                      {i.organisationName} · {i.siteName} · {i.placement}
                    </p>
                  </div>
                  <div className="flex items-center gap-2">
                    {i.expiresOn && <span className="text-muted">use by {i.expiresOn}</span>}
                    <Badge tone={i.state === "recalled" ? "danger" : "neutral"}>{i.stateLabel}</Badge>
                  </div>
                </li>
              ))}
            </ul>
          </Card>
        </div>
      </div>
    </>
  );
}
