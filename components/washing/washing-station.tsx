"use client";

import { ArrowLeft, Layers, Play, Square, WashingMachine } from "lucide-react";
import Link from "next/link";
import { useState } from "react";
import { toast } from "sonner";
import { ProcessingNotes } from "@/components/stations/processing-notes";
import { ScanField } from "@/components/stations/scan-field";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import { cn } from "@/lib/cn";
import { fetchJson } from "@/lib/fetch-json";
import { formatDateTime } from "@/lib/format";
import type { BatchRecordInput } from "@/lib/washing/schemas";
import type { BatchView, ScannedSet, WasherOption } from "@/lib/washing/service";
import { AdvisoryNote } from "./advisory-note";
import { BatchResult } from "./batch-result";
import { BatchStatusBadge } from "./batch-status-badge";
import { newClientEventId, postJson } from "@/components/stations/post";
import { RecordForm } from "./record-form";
import { Refusal } from "./refusal";

// The washing station: choose a washer and its program (or continue its open batch), scan the
// sets into the batch, start it, then close it with the washer's record — the result shown beside
// the program's requirement — or abort it after a fault.

const focusScan = () => setTimeout(() => document.getElementById("station-scan")?.focus(), 30);

export function WashingStation({ initialWashers }: { initialWashers: WasherOption[] }) {
  const [washers, setWashers] = useState(initialWashers);
  const [washerId, setWasherId] = useState<number | null>(null);
  const [batch, setBatch] = useState<BatchView | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const washer = washers.find((w) => w.id === washerId) ?? null;

  const refreshWashers = async () => {
    try {
      setWashers((await fetchJson<{ washers: WasherOption[] }>("/api/stations/washing")).washers);
    } catch {
      // The list refreshes on the next visit; the batch on screen is already current.
    }
  };

  const chooseWasher = async (w: WasherOption) => {
    setRefusal(null);
    setWasherId(w.id);
    setBatch(null);
    if (!w.openBatch) return;
    setBusy(true);
    try {
      setBatch((await fetchJson<{ batch: BatchView }>(`/api/stations/washing/batches/${w.openBatch.id}`)).batch);
    } catch (error) {
      setRefusal(error instanceof Error ? error.message : "The batch could not be loaded.");
    } finally {
      setBusy(false);
    }
  };

  const back = async () => {
    setWasherId(null);
    setBatch(null);
    setRefusal(null);
    await refreshWashers();
  };

  return (
    <div className="space-y-6">
      {!washer ? (
        <WasherPicker washers={washers} onChoose={chooseWasher} busy={busy} />
      ) : (
        <>
          <div className="flex flex-wrap items-center justify-between gap-3">
            <Button variant="secondary" size="lg" onClick={back}>
              <ArrowLeft className="h-5 w-5" aria-hidden="true" /> All washers
            </Button>
            <p className="text-lg font-semibold text-ink">
              {washer.code} · {washer.name}
            </p>
          </div>
          {refusal && !batch && <Refusal title="Not possible" message={refusal} />}
          {batch ? (
            <BatchPanel
              key={batch.id}
              batch={batch}
              onChange={async (next) => {
                setBatch(next);
                if (next.status !== "loading") await refreshWashers();
              }}
              onNext={async () => {
                setBatch(null);
                await refreshWashers();
              }}
            />
          ) : (
            <OpenBatch
              washer={washer}
              onOpened={async (opened) => {
                setRefusal(null);
                setBatch(opened);
                await refreshWashers();
                focusScan();
              }}
              onRefused={setRefusal}
            />
          )}
        </>
      )}
    </div>
  );
}

function WasherPicker({ washers, onChoose, busy }: { washers: WasherOption[]; onChoose: (w: WasherOption) => void; busy: boolean }) {
  if (washers.length === 0) {
    return (
      <Card>
        <CardBody className="py-10 text-center text-lg text-muted">No washer-disinfector is switched on. Add or switch one on under Machines.</CardBody>
      </Card>
    );
  }
  return (
    <section aria-labelledby="washers-heading" className="space-y-3">
      <h2 id="washers-heading" className="text-lg font-semibold text-ink">
        Choose the washer
      </h2>
      <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        {washers.map((w) => (
          <li key={w.id}>
            <button
              type="button"
              disabled={busy}
              onClick={() => onChoose(w)}
              className="flex h-full min-h-36 w-full flex-col gap-2 rounded-card border border-line bg-surface p-5 text-left shadow-card transition-colors hover:border-lagoon-400 hover:bg-lagoon-50 focus-visible:outline-none focus-visible:ring-4 focus-visible:ring-lagoon-200"
            >
              <span className="flex items-center gap-3 text-2xl font-semibold text-ink">
                <WashingMachine className="h-8 w-8 text-lagoon-700" aria-hidden="true" />
                {w.code}
              </span>
              <span className="text-base text-ink-soft">{w.name}</span>
              {w.openBatch ? (
                <span className="mt-auto text-base">
                  <BatchStatusBadge status={w.openBatch.status} /> Batch {w.openBatch.number} · {w.openBatch.itemCount} set{w.openBatch.itemCount === 1 ? "" : "s"}
                </span>
              ) : (
                <span className="mt-auto text-base text-muted">Free: open a new batch</span>
              )}
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}

function OpenBatch({ washer, onOpened, onRefused }: { washer: WasherOption; onOpened: (b: BatchView) => void; onRefused: (message: string) => void }) {
  const [programId, setProgramId] = useState<number | null>(washer.programs[0]?.id ?? null);
  const [busy, setBusy] = useState(false);
  const open = async () => {
    if (!programId) return;
    setBusy(true);
    const res = await postJson<{ batch: BatchView }>("/api/stations/washing/batches", { machineId: washer.id, programId });
    setBusy(false);
    if (res.ok) onOpened(res.data.batch);
    else onRefused(res.message);
  };
  if (washer.programs.length === 0) {
    return <Refusal title="No program" message={`${washer.code} has no active washing program. Add one on the machine's page.`} />;
  }
  return (
    <Card>
      <CardHeader title="Open a batch" description="Choose the program the washer will run; the batch is checked against its requirement." />
      <CardBody className="space-y-4">
        <div role="radiogroup" aria-label="Program" className="grid gap-3 sm:grid-cols-2">
          {washer.programs.map((p) => (
            <button
              key={p.id}
              type="button"
              role="radio"
              aria-checked={programId === p.id}
              onClick={() => setProgramId(p.id)}
              className={cn(
                "rounded-lg border-2 p-4 text-left focus-visible:outline-none focus-visible:ring-4 focus-visible:ring-lagoon-200",
                programId === p.id ? "border-lagoon-700 bg-lagoon-50" : "border-line-strong bg-surface hover:bg-paper",
              )}
            >
              <span className="block text-lg font-semibold text-ink">{p.name}</span>
              <span className="block text-sm text-muted">{p.requirementText}</span>
            </button>
          ))}
        </div>
        <Button size="lg" onClick={open} disabled={busy || !programId}>
          <Layers className="h-5 w-5" aria-hidden="true" /> {busy ? "Opening…" : `Open a batch on ${washer.code}`}
        </Button>
      </CardBody>
    </Card>
  );
}

function BatchPanel({ batch, onChange, onNext }: { batch: BatchView; onChange: (b: BatchView) => void; onNext: () => void }) {
  const [refusal, setRefusal] = useState<string | null>(null);
  const [scanned, setScanned] = useState<ScannedSet | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);
  const closed = batch.status === "passed" || batch.status === "failed" || batch.status === "aborted";
  const base = `/api/stations/washing/batches/${batch.id}`;

  const onScan = async (code: string) => {
    setBusy(true);
    setRefusal(null);
    const res = await postJson<{ batch: BatchView; scanned: ScannedSet; alreadyInBatch: boolean }>(`${base}/scan`, { code });
    setBusy(false);
    if (!res.ok) {
      setScanned(null);
      setRefusal(res.message);
      return;
    }
    setScanned(res.data.scanned);
    onChange(res.data.batch);
    if (res.data.alreadyInBatch) toast.info(`${res.data.scanned.serial} is already in this batch`);
  };

  const remove = async (cycleId: number, serial: string) => {
    setBusy(true);
    const res = await postJson<{ batch: BatchView }>(`${base}/remove`, { cycleId });
    setBusy(false);
    if (!res.ok) return setRefusal(res.message);
    if (scanned?.cycleId === cycleId) setScanned(null);
    onChange(res.data.batch);
    toast.success(`${serial} taken out of the batch`);
    focusScan();
  };

  const start = async () => {
    setBusy(true);
    setRefusal(null);
    const res = await postJson<{ batch: BatchView }>(`${base}/start`);
    setBusy(false);
    if (!res.ok) return setRefusal(res.message);
    setScanned(null);
    onChange(res.data.batch);
    toast.success(`Batch ${batch.number} started`);
  };

  const close = async (record: BatchRecordInput) => {
    setBusy(true);
    setRefusal(null);
    setProblems([]);
    const res = await postJson<{ batch: BatchView }>(`${base}/close`, { record, clientEventId: newClientEventId() });
    setBusy(false);
    if (!res.ok) {
      if (res.fields.record?.length) setProblems(res.fields.record);
      else setRefusal(res.message);
      return;
    }
    onChange(res.data.batch);
  };

  const abort = async (reason: string) => {
    setBusy(true);
    setRefusal(null);
    const res = await postJson<{ batch: BatchView }>(`${base}/abort`, { reason, clientEventId: newClientEventId() });
    setBusy(false);
    if (!res.ok) return setRefusal(res.fields.reason?.[0] ?? res.message);
    onChange(res.data.batch);
  };

  return (
    <div className="space-y-6">
      <Card>
        <CardBody className="flex flex-wrap items-start justify-between gap-4">
          <div>
            <p className="text-sm text-muted">Batch</p>
            <p className="text-3xl font-semibold tracking-tight text-ink" data-testid="batch-number">
              {batch.number}
            </p>
            <p className="mt-1 text-base text-ink-soft">
              {batch.program.name} · <span className="text-muted">{batch.program.requirementText}</span>
            </p>
          </div>
          <div className="space-y-1 text-right">
            <p className="text-lg" data-testid="batch-status">
              <BatchStatusBadge status={batch.status} />
            </p>
            <p className="text-sm text-muted">
              {batch.items.length} set{batch.items.length === 1 ? "" : "s"} · {batch.loadStu}
              {batch.machine.capacityStu !== null ? ` of ${batch.machine.capacityStu}` : ""} StU
            </p>
            {batch.startedAt && (
              <p className="text-sm text-muted">
                Started {formatDateTime(batch.startedAt)}
                {batch.startedBy ? ` by ${batch.startedBy}` : ""}
              </p>
            )}
          </div>
        </CardBody>
      </Card>

      {batch.status === "loading" && (
        <>
          <ScanField onScan={onScan} busy={busy} label="Add to batch" />
          {refusal && <Refusal title="Not added" message={refusal} />}
          {scanned && !refusal && <ScannedCard set={scanned} />}
        </>
      )}
      {batch.status !== "loading" && refusal && <Refusal title="Not possible" message={refusal} />}

      {closed && (
        <Card>
          <CardHeader title="Result" description={`Checked against: ${batch.program.requirementText}`} />
          <CardBody>
            <BatchResult status={batch.status} figures={batch.figures} reasons={batch.reasons} requirementText={batch.program.requirementText} size="lg" />
          </CardBody>
        </Card>
      )}

      <BatchItems batch={batch} busy={busy} onRemove={remove} />

      {batch.status === "loading" && (
        <Button size="lg" variant="accent" onClick={start} disabled={busy || batch.items.length === 0} className="w-full sm:w-auto">
          <Play className="h-5 w-5" aria-hidden="true" /> Start the batch
        </Button>
      )}

      {batch.status === "running" && (
        <>
          <Card>
            <CardHeader title="Close with the record" description="When the washer has finished: its time/temperature record decides the advisory check." />
            <CardBody className="space-y-4">
              <RecordForm busy={busy} problems={problems} onSubmit={close} />
              <AdvisoryNote />
            </CardBody>
          </Card>
          <AbortForm busy={busy} onAbort={abort} />
        </>
      )}

      {closed && (
        <div className="flex flex-wrap gap-3">
          <Button size="lg" onClick={onNext}>
            <Layers className="h-5 w-5" aria-hidden="true" /> Next batch
          </Button>
          <Button size="lg" variant="secondary" asChild>
            <Link href={`/unit/batches/${batch.id}`}>Open the batch record</Link>
          </Button>
        </div>
      )}
    </div>
  );
}

function ScannedCard({ set }: { set: ScannedSet }) {
  return (
    <Card data-testid="scanned-set">
      <CardBody className="space-y-3">
        <p className="text-sm font-medium text-ok-700">✓ Added to the batch</p>
        <p className="text-2xl font-semibold text-ink">
          {set.serial} · {set.setTypeName}
        </p>
        <p className="text-base text-muted">
          {set.organisationName} · {set.homeSiteName} · {set.sizeStu} StU
        </p>
        <ProcessingNotes typeName={set.setTypeName} flags={set.flags} notes={set.processingNotes} ifuFileId={set.ifuFileId} />
        <p className="text-base text-ink-soft">Next: scan the next set, or start the batch when the rack is full.</p>
      </CardBody>
    </Card>
  );
}

function BatchItems({ batch, busy, onRemove }: { batch: BatchView; busy: boolean; onRemove: (cycleId: number, serial: string) => void }) {
  return (
    <Card>
      <CardHeader title="Sets in the batch" />
      {batch.items.length === 0 ? (
        <CardBody className="text-base text-muted">No sets yet. Scan each set as it goes into the rack.</CardBody>
      ) : (
        <ul className="divide-y divide-line" data-testid="batch-items">
          {batch.items.map((i) => (
            <li key={i.cycleId} className="flex flex-wrap items-center justify-between gap-3 px-5 py-3">
              <div>
                <p className="text-lg font-semibold text-ink">
                  {i.serial} <span className="font-normal text-ink-soft">· {i.setTypeName}</span>
                </p>
                <p className="text-sm text-muted">
                  {i.organisationName} · {i.sizeStu} StU
                </p>
              </div>
              <div className="flex items-center gap-3">
                <Badge tone={i.state === "washed" ? "ok" : i.state === "reprocess" ? "danger" : "neutral"}>{i.stateLabel}</Badge>
                {batch.status === "loading" && (
                  <Button variant="secondary" size="lg" disabled={busy} onClick={() => onRemove(i.cycleId, i.serial)} aria-label={`Take ${i.serial} out of the batch`}>
                    Take out
                  </Button>
                )}
              </div>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}

function AbortForm({ busy, onAbort }: { busy: boolean; onAbort: (reason: string) => void }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  if (!open) {
    return (
      <Button variant="secondary" size="lg" onClick={() => setOpen(true)}>
        <Square className="h-5 w-5" aria-hidden="true" /> The washer stopped with a fault…
      </Button>
    );
  }
  return (
    <Card>
      <CardHeader title="Abort the batch" description="Every set in it goes back to washing. Say what happened, e.g. the fault the washer showed." />
      <CardBody className="space-y-4">
        <Field id="abort-reason" label="What went wrong">
          <Textarea id="abort-reason" value={reason} onChange={(e) => setReason(e.target.value)} className="text-base" />
        </Field>
        <div className="flex flex-wrap gap-3">
          <Button variant="danger" size="lg" disabled={busy} onClick={() => onAbort(reason)}>
            Abort the batch
          </Button>
          <Button variant="secondary" size="lg" onClick={() => setOpen(false)}>
            Cancel
          </Button>
        </div>
      </CardBody>
    </Card>
  );
}
