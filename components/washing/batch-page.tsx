import { Download, FileText } from "lucide-react";
import Link from "next/link";
import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { RecordChart } from "@/components/cycles/record-chart";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { formatDuration } from "@/lib/machines/requirements";
import { washerChartParts } from "@/lib/washing/chart-figures";
import { type BatchDetail, getBatchDetail } from "@/lib/washing/service";
import { AdvisoryNote } from "./advisory-note";
import { BatchResult } from "./batch-result";
import { BatchStatusBadge } from "./batch-status-badge";

async function loadOr404(user: SessionUser, rawId: string): Promise<BatchDetail> {
  if (!/^[1-9][0-9]{0,15}$/.test(rawId)) notFound();
  try {
    return await getBatchDetail(getDb(), user, Number(rawId));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[9rem_1fr] gap-3 py-2">
      <dt className="text-sm text-muted">{label}</dt>
      <dd className="text-sm text-ink">{children}</dd>
    </div>
  );
}

/** One washer batch: its run, its sets, the computed figures and decision, and the temperature curve. */
export async function BatchPage({ user, rawId }: { user: SessionUser; rawId: string }) {
  const batch = await loadOr404(user, rawId);
  const closed = batch.status === "passed" || batch.status === "failed" || batch.status === "aborted";
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/unit/batches" className="text-lagoon-700 underline-offset-2 hover:underline">
          ← All washer batches
        </Link>
      </p>
      <PageHeader
        title={`Batch ${batch.number}`}
        description={`${batch.machine.code} · ${batch.machine.name} · ${batch.program.name}`}
        actions={<BatchStatusBadge status={batch.status} />}
      />
      <div className="grid gap-6 lg:grid-cols-[2fr_3fr]">
        <div className="space-y-6">
          <Card>
            <CardHeader title="The run" />
            <CardBody>
              <dl className="divide-y divide-line">
                <Row label="Washer">
                  <Link href={`/unit/machines/${batch.machine.id}`} className="text-lagoon-700 underline-offset-2 hover:underline">
                    {batch.machine.code} · {batch.machine.name}
                  </Link>
                </Row>
                <Row label="Program">
                  {batch.program.name} <span className="text-muted">({batch.program.code})</span>
                </Row>
                <Row label="Requirement">{batch.program.requirementText}</Row>
                <Row label="Opened">{formatDateTime(batch.createdAt)}</Row>
                <Row label="Started">
                  {batch.startedAt ? `${formatDateTime(batch.startedAt)}${batch.startedBy ? ` by ${batch.startedBy}` : ""}` : "Not started"}
                </Row>
                <Row label="Ended">{formatDateTime(batch.endedAt)}</Row>
                <Row label="Closed">{batch.closedAt ? `${formatDateTime(batch.closedAt)}${batch.closedBy ? ` by ${batch.closedBy}` : ""}` : "Not closed"}</Row>
                <Row label="Load">
                  {batch.items.length} set{batch.items.length === 1 ? "" : "s"}, {batch.loadStu}
                  {batch.machine.capacityStu !== null ? ` of ${batch.machine.capacityStu}` : ""} StU
                </Row>
                {batch.figures && <Row label="Record">{`${batch.figures.sampleCount} samples over ${formatDuration(batch.figures.durationSeconds)}`}</Row>}
              </dl>
              <div className="mt-3 flex flex-wrap gap-2">
                {batch.record && (
                  <Button variant="secondary" asChild>
                    <a href={`/api/files/${batch.record.fileId}`} download>
                      <Download className="h-4 w-4" aria-hidden="true" /> {batch.record.name}
                    </a>
                  </Button>
                )}
                {batch.status !== "loading" && (
                  <Button variant="secondary" asChild>
                    <a href={`/api/batches/${batch.id}/record.pdf`} download data-testid="batch-record-pdf">
                      <FileText className="h-4 w-4" aria-hidden="true" /> Cycle record (PDF)
                    </a>
                  </Button>
                )}
              </div>
            </CardBody>
          </Card>
          <Card>
            <CardHeader title="Sets in the batch" description="Each set with the state its cycle is in now." />
            {batch.items.length === 0 ? (
              <CardBody className="text-sm text-muted">No sets.</CardBody>
            ) : (
              <ul className="divide-y divide-line" data-testid="batch-items">
                {batch.items.map((i) => (
                  <li key={i.cycleId} className="flex flex-wrap items-center justify-between gap-2 px-5 py-3 text-sm">
                    <div>
                      <Link href={`/unit/sets/${i.setId}`} className="font-medium text-lagoon-700 underline-offset-2 hover:underline">
                        {i.serial}
                      </Link>
                      <span className="text-ink-soft"> · {i.setTypeName}</span>
                      <p className="text-muted">
                        {i.organisationName} · {i.sizeStu} StU
                      </p>
                    </div>
                    <Badge tone={i.state === "reprocess" ? "danger" : "neutral"}>{i.stateLabel}</Badge>
                  </li>
                ))}
              </ul>
            )}
          </Card>
        </div>
        <div className="space-y-6">
          <Card>
            <CardHeader title="Result" description={`Checked against: ${batch.program.requirementText}`} />
            <CardBody>
              {closed ? (
                <BatchResult status={batch.status} figures={batch.figures} reasons={batch.reasons} requirementText={batch.program.requirementText} />
              ) : (
                <div className="space-y-3">
                  <p className="text-sm text-muted">The batch is {batch.status}; it is checked when it is closed with its record at the washing station.</p>
                  <AdvisoryNote />
                </div>
              )}
            </CardBody>
          </Card>
          <Card>
            <CardHeader title="Temperature curve" description="The load temperature over the record, the hold shaded." />
            <CardBody>
              {batch.chart && batch.figures ? (
                <RecordChart samples={batch.chart.points} title={`Batch ${batch.number}, ${batch.program.name}`} {...washerChartParts(batch.figures)} />
              ) : (
                <p className="text-sm text-muted">{batch.chartProblem ?? "No record yet: the curve appears once the batch is closed with its record."}</p>
              )}
            </CardBody>
          </Card>
        </div>
      </div>
    </>
  );
}
