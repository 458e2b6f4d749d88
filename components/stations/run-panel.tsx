"use client";

import { Layers, Play } from "lucide-react";
import Link from "next/link";
import { type ReactNode, useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Refusal } from "@/components/washing/refusal";
import { formatDateTime } from "@/lib/format";
import { AbortRunForm } from "./abort-run-form";
import { newClientEventId, postJson } from "./post";
import { capitalise, focusScan, isClosed, type MachineNoun, type RunAnswer, type RunNoun, type ScanAnswer, type ScannedIntoRun, type StationRun } from "./run-kind";
import { RunItems } from "./run-items";
import { ScannedSetCard } from "./scanned-set-card";
import { ScanField } from "./scan-field";

/** What the station's own "finish with the record" form gets from the panel. */
export interface FinishFormProps<R extends StationRun> {
  run: R;
  busy: boolean;
  /** Why the machine's record could not be read (the server's field errors on "record"). */
  problems: string[];
  /** Sends the form's fields (the record and whatever else the station asks for). */
  onFinish: (body: Record<string, unknown>) => void;
}

export interface RunPanelProps<N extends RunNoun, R extends StationRun, S extends ScannedIntoRun> {
  run: R;
  noun: N;
  machineNoun: MachineNoun;
  /** The run's route: `${runUrl}/scan`, `/remove`, `/start`, `/${finishPath}` and `/abort` below it. */
  runUrl: string;
  finishPath: "close" | "finish";
  /** The run's record page, linked once it is closed. */
  recordHref: string;
  statusBadge: (status: R["status"]) => ReactNode;
  /** Under the program on the run's card, e.g. a warning about implants. */
  summaryNote?: (run: R) => ReactNode;
  /** Between the scanned set's customer and its processing notes, e.g. where it goes in the chamber. */
  scannedHints?: (set: S) => ReactNode;
  /** The last line of the scanned set's card: what to do next. */
  scannedNextText: string;
  /** The body of the closed run's "Result" card. */
  result: (run: R) => ReactNode;
  emptyItemsText: string;
  itemDetailSuffix?: (item: R["items"][number]) => string;
  itemBadges: (item: R["items"][number]) => ReactNode;
  /** The form that finishes a running run with the machine's record. */
  finishForm: (props: FinishFormProps<R>) => ReactNode;
  onChange: (run: R) => void;
  onNext: () => void;
}

/**
 * One run at a batch-style station: its number, program, status and load in StU; while loading,
 * the scan field, the last scanned set and "Start"; while running, the station's finish form and
 * the abort form; once closed, the result beside the requirement and the way to the next run.
 * A refused step is shown in words, big and red.
 */
export function RunPanel<N extends RunNoun, R extends StationRun, S extends ScannedIntoRun>(props: RunPanelProps<N, R, S>) {
  const { run, noun, machineNoun, runUrl } = props;
  const [refusal, setRefusal] = useState<string | null>(null);
  const [scanned, setScanned] = useState<S | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);
  const Noun = capitalise(noun);
  const loading = run.status === "loading";
  const closed = isClosed(run);

  /** Posts one step of the run; the screen is busy meanwhile and, unless kept, the last refusal goes. */
  const send = async <T,>(path: string, body?: unknown, { keepRefusal = false } = {}) => {
    setBusy(true);
    if (!keepRefusal) setRefusal(null);
    const res = await postJson<T>(`${runUrl}/${path}`, body);
    setBusy(false);
    return res;
  };

  const onScan = async (code: string) => {
    const res = await send<ScanAnswer<N, R, S>>("scan", { code });
    if (!res.ok) {
      setScanned(null);
      setRefusal(res.message);
      return;
    }
    setScanned(res.data.scanned);
    props.onChange(res.data[noun]);
    if (res.data[`alreadyIn${capitalise(noun)}` as const]) toast.info(`${res.data.scanned.serial} is already in this ${noun}`);
  };

  const remove = async (cycleId: number, serial: string) => {
    const res = await send<RunAnswer<N, R>>("remove", { cycleId }, { keepRefusal: true });
    if (!res.ok) return setRefusal(res.message);
    if (scanned?.cycleId === cycleId) setScanned(null);
    props.onChange(res.data[noun]);
    toast.success(`${serial} taken out of the ${noun}`);
    focusScan();
  };

  const start = async () => {
    const res = await send<RunAnswer<N, R>>("start");
    if (!res.ok) return setRefusal(res.message);
    setScanned(null);
    props.onChange(res.data[noun]);
    toast.success(`${Noun} ${run.number} started`);
  };

  const finish = async (body: Record<string, unknown>) => {
    setProblems([]);
    const res = await send<RunAnswer<N, R>>(props.finishPath, { ...body, clientEventId: newClientEventId() });
    if (!res.ok) {
      if (res.fields.record?.length) setProblems(res.fields.record);
      else setRefusal(res.message);
      return;
    }
    props.onChange(res.data[noun]);
  };

  const abort = async (reason: string) => {
    const res = await send<RunAnswer<N, R>>("abort", { reason, clientEventId: newClientEventId() });
    if (!res.ok) return setRefusal(res.fields.reason?.[0] ?? res.message);
    props.onChange(res.data[noun]);
  };

  return (
    <div className="space-y-6">
      <Card>
        <CardBody className="flex flex-wrap items-start justify-between gap-4">
          <div>
            <p className="text-sm text-muted">{Noun}</p>
            <p className="text-3xl font-semibold tracking-tight text-ink" data-testid={`${noun}-number`}>
              {run.number}
            </p>
            <p className="mt-1 text-base text-ink-soft">
              {run.program.name} · <span className="text-muted">{run.program.requirementText}</span>
            </p>
            {props.summaryNote?.(run)}
          </div>
          <div className="space-y-1 text-right">
            <p className="text-lg" data-testid={`${noun}-status`}>
              {props.statusBadge(run.status)}
            </p>
            <p className="text-sm text-muted" data-testid={`${noun}-stu`}>
              {run.items.length} set{run.items.length === 1 ? "" : "s"} · {run.loadStu}
              {run.machine.capacityStu !== null ? ` of ${run.machine.capacityStu}` : ""} StU
            </p>
            {run.startedAt && (
              <p className="text-sm text-muted">
                Started {formatDateTime(run.startedAt)}
                {run.startedBy ? ` by ${run.startedBy}` : ""}
              </p>
            )}
          </div>
        </CardBody>
      </Card>

      {loading && (
        <>
          <ScanField onScan={onScan} busy={busy} label={`Add to ${noun}`} />
          {refusal && <Refusal title="Not added" message={refusal} />}
          {scanned && !refusal && <ScannedSetCard set={scanned} noun={noun} hints={props.scannedHints?.(scanned)} nextText={props.scannedNextText} />}
        </>
      )}
      {!loading && refusal && <Refusal title="Not possible" message={refusal} />}

      {closed && (
        <Card>
          <CardHeader title="Result" description={`Checked against: ${run.program.requirementText}`} />
          {props.result(run)}
        </Card>
      )}

      <RunItems
        noun={noun}
        items={run.items}
        loading={loading}
        busy={busy}
        emptyText={props.emptyItemsText}
        detailSuffix={props.itemDetailSuffix}
        badges={props.itemBadges}
        onRemove={remove}
      />

      {loading && (
        <Button size="lg" variant="accent" onClick={start} disabled={busy || run.items.length === 0} className="w-full sm:w-auto">
          <Play className="h-5 w-5" aria-hidden="true" /> Start the {noun}
        </Button>
      )}

      {run.status === "running" && (
        <>
          {props.finishForm({ run, busy, problems, onFinish: finish })}
          <AbortRunForm noun={noun} machineNoun={machineNoun} busy={busy} onAbort={abort} />
        </>
      )}

      {closed && (
        <div className="flex flex-wrap gap-3">
          <Button size="lg" onClick={props.onNext}>
            <Layers className="h-5 w-5" aria-hidden="true" /> Next {noun}
          </Button>
          <Button size="lg" variant="secondary" asChild>
            <Link href={props.recordHref}>Open the {noun} record</Link>
          </Button>
        </div>
      )}
    </div>
  );
}
