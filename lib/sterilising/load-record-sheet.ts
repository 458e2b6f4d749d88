import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import type { ChartAnnotations } from "@/lib/cycles/chart-geometry";
import type { CycleRecordSheet } from "@/lib/cycles/record-pdf";
import { formatDateTime } from "@/lib/format";
import { formatDuration } from "@/lib/machines/requirements";
import type { LoadFigures } from "./checks";
import { getLoadDetail } from "./loads";
import { loadRecordSamples } from "./record";
import { LOAD_STATUS_LABELS, RELEASE_ADVISORY_TEXT } from "./status";

// The one-page cycle record of a steriliser load, as plain data for lib/cycles/record-pdf.ts:
// the run, the load list, the release checks with their limits, the quality lead's decision and
// the curve with the sterilisation band and the plateau.

const OUTCOME: Record<string, string> = {
  loading: "Not decided yet: the load is being put together",
  running: "Not decided yet: the load is running",
  awaiting_release: "Awaiting the quality lead's release",
  released: "Released",
  failed: "Failed; its sets went back to washing",
  aborted: "Aborted",
};

/** The band, plateau and figures the chart and the PDF show for a finished load. Pure. */
export function loadChartParts(figures: LoadFigures): ChartAnnotations {
  const hold =
    figures.plateauStartS !== undefined && figures.plateauStartS !== null && figures.plateauEndS !== undefined && figures.plateauEndS !== null
      ? { fromT: figures.plateauStartS, toT: figures.plateauEndS }
      : undefined;
  const deg = (v: number | null) => (v === null ? "—" : `${v.toFixed(1)} °C`);
  return {
    band: { lowC: figures.band.lowC, highC: figures.band.highC },
    bandLabel: `${figures.band.lowC}–${figures.band.highC} °C sterilisation band`,
    hold,
    figures: [
      { label: "F0", value: `${figures.f0.toFixed(1)} min` },
      { label: "Hold in band", value: formatDuration(figures.holdSeconds) },
      { label: "Min in hold", value: deg(figures.plateauMinTempC) },
      { label: "Max in hold", value: deg(figures.plateauMaxTempC) },
    ],
  };
}

/** The load's sheet, or 404 when there is no such load. */
export async function loadRecordSheet(db: Kysely<Database>, user: SessionUser, loadId: number, timeZone: string, now = new Date()): Promise<CycleRecordSheet> {
  const load = await getLoadDetail(db, loadId);
  const unit = await db.selectFrom("organisations").select("name").where("kind", "=", "unit").orderBy("id").executeTakeFirst();
  const when = (iso: string | null) => formatDateTime(iso, timeZone);
  const samples = load.record ? await loadRecordSamples(db, user, load.record.fileId) : null;
  const reasons = [...load.reasons, ...(load.earlyRelease ? [`Released before the biological indicator was read: ${load.earlyRelease.reason}`] : [])];
  if (load.decision.notes) reasons.push(load.decision.notes);
  return {
    what: "Steriliser load",
    number: load.number,
    unitName: unit?.name ?? "Reprocessing unit",
    machine: { code: load.machine.code, name: load.machine.name },
    program: { code: load.program.code, name: load.program.name, requirementText: load.program.requirementText },
    facts: [
      { label: "Status", value: LOAD_STATUS_LABELS[load.status] },
      { label: "Opened", value: when(load.createdAt) },
      { label: "Started", value: load.startedAt ? `${when(load.startedAt)}${load.startedBy ? ` by ${load.startedBy}` : ""}` : "Not started" },
      { label: "Ended", value: when(load.endedAt) },
      {
        label: "Load",
        value: `${load.items.length} set${load.items.length === 1 ? "" : "s"}, ${load.loadStu}${load.machine.capacityStu !== null ? ` of ${load.machine.capacityStu}` : ""} StU${load.containsImplant ? ", with an implant" : ""}`,
      },
      { label: "Record", value: load.record ? load.record.name : "None" },
    ],
    items: load.items.map((i) => ({ serial: i.serial, description: i.setTypeName, customer: `${i.organisationName}, ${i.siteName}` })),
    checks: load.assessment.checks.map((c) => ({
      label: c.label,
      computed: c.measured,
      required: c.limit,
      ok: c.status === "pass" ? true : c.status === "fail" || c.status === "missing" ? false : null,
    })),
    decision: {
      outcome: OUTCOME[load.status] ?? load.status,
      by: load.decision.by,
      at: load.decision.at ? when(load.decision.at) : null,
      reasons,
    },
    curve: samples && "samples" in samples && load.figures ? { samples: samples.samples, ...loadChartParts(load.figures) } : null,
    curveMissing: samples && "problem" in samples ? samples.problem : "No record yet: the curve is drawn once the load is finished with its record.",
    advisory: RELEASE_ADVISORY_TEXT,
    printedAt: when(now.toISOString()),
  };
}
