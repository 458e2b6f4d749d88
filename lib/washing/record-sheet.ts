import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import type { CycleRecordSheet } from "@/lib/cycles/record-pdf";
import { formatDateTime } from "@/lib/format";
import { formatDuration } from "@/lib/machines/requirements";
import { washerChartParts } from "./chart-figures";
import { comparisonRows } from "./figures";
import { getBatchDetail } from "./service";
import { ADVISORY_TEXT, BATCH_STATUS_LABELS } from "./status";

// The one-page cycle record of a washer batch, as plain data for lib/cycles/record-pdf.ts.

const OUTCOME: Record<string, string> = {
  passed: "Passed the record check",
  failed: "Failed the record check; the sets went back to washing",
  aborted: "Aborted after a fault; the sets went back to washing",
  running: "Not decided yet: the batch is running",
  loading: "Not decided yet: the batch is being loaded",
};

/** The batch's sheet, or 404 when there is no such batch. */
export async function batchRecordSheet(db: Kysely<Database>, user: SessionUser, batchId: number, timeZone: string, now = new Date()): Promise<CycleRecordSheet> {
  const batch = await getBatchDetail(db, user, batchId);
  const unit = await db.selectFrom("organisations").select("name").where("kind", "=", "unit").orderBy("id").executeTakeFirst();
  const when = (iso: string | null) => formatDateTime(iso, timeZone);
  const closedBy = batch.status === "passed" || batch.status === "failed" || batch.status === "aborted" ? batch.closedBy : null;
  return {
    what: "Washer batch",
    number: batch.number,
    unitName: unit?.name ?? "Reprocessing unit",
    machine: { code: batch.machine.code, name: batch.machine.name },
    program: { code: batch.program.code, name: batch.program.name, requirementText: batch.program.requirementText },
    facts: [
      { label: "Status", value: BATCH_STATUS_LABELS[batch.status] },
      { label: "Opened", value: when(batch.createdAt) },
      { label: "Started", value: batch.startedAt ? `${when(batch.startedAt)}${batch.startedBy ? ` by ${batch.startedBy}` : ""}` : "Not started" },
      { label: "Ended", value: when(batch.endedAt) },
      { label: "Load", value: `${batch.items.length} set${batch.items.length === 1 ? "" : "s"}, ${batch.loadStu}${batch.machine.capacityStu !== null ? ` of ${batch.machine.capacityStu}` : ""} StU` },
      {
        label: "Record",
        value: batch.figures ? `${batch.figures.sampleCount} samples over ${formatDuration(batch.figures.durationSeconds)}${batch.record ? ` (${batch.record.name})` : ""}` : "None",
      },
    ],
    items: batch.items.map((i) => ({ serial: i.serial, description: i.setTypeName, customer: i.organisationName })),
    checks: batch.figures ? comparisonRows(batch.figures) : [],
    decision: {
      outcome: OUTCOME[batch.status] ?? batch.status,
      by: closedBy,
      at: batch.closedAt ? when(batch.closedAt) : null,
      reasons: batch.reasons,
    },
    curve: batch.chart && batch.figures ? { samples: batch.chart.points, ...washerChartParts(batch.figures) } : null,
    curveMissing: batch.chartProblem ?? "No record yet: the curve is drawn once the batch is closed with its record.",
    advisory: ADVISORY_TEXT,
    printedAt: when(now.toISOString()),
  };
}
