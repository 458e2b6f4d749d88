"use client";

import { CheckCircle2, PackageCheck, Truck } from "lucide-react";
import { useState } from "react";
import { ProcessingNotes } from "@/components/stations/processing-notes";
import { newClientEventId, postJson } from "@/components/stations/post";
import { ScanField } from "@/components/stations/scan-field";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Refusal } from "@/components/washing/refusal";
import { cn } from "@/lib/cn";
import type { DispatchAnswer, DispatchBoard, DispatchRun, DispatchSet } from "@/lib/stations/dispatch-shared";

// The dispatch station: choose the van being loaded, then scan each released set onto it. The
// station refuses a set that is not released or goes on another van, and keeps the list of what
// the van still has to take in view.

const focusScan = () => setTimeout(() => document.getElementById("station-scan")?.focus(), 30);

export function DispatchStation({ initialBoard, initialRunId }: { initialBoard: DispatchBoard; initialRunId: number | null }) {
  const [board, setBoard] = useState(initialBoard);
  const [runId, setRunId] = useState<number | null>(initialRunId ?? (initialBoard.runs.length === 1 ? initialBoard.runs[0]!.runId : null));
  const [answer, setAnswer] = useState<DispatchAnswer | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const run = board.runs.find((r) => r.runId === runId) ?? null;

  const choose = (id: number) => {
    setRunId(id);
    setAnswer(null);
    setRefusal(null);
    const url = new URL(window.location.href);
    url.searchParams.set("run", String(id));
    window.history.replaceState(null, "", url);
    focusScan();
  };

  const onScan = async (code: string) => {
    if (!run) {
      setRefusal("Choose the van you are loading first (Tab to the vans, Enter to choose).");
      return;
    }
    setBusy(true);
    setRefusal(null);
    const res = await postJson<DispatchAnswer>("/api/stations/dispatch/scan", { runId: run.runId, code, clientEventId: newClientEventId() });
    setBusy(false);
    if (!res.ok) {
      setAnswer(null);
      setRefusal(res.message);
      return;
    }
    setAnswer(res.data);
    setBoard((b) => ({ ...b, runs: b.runs.map((r) => (r.runId === res.data.run.runId ? res.data.run : r)) }));
  };

  if (board.runs.length === 0) {
    return (
      <Card>
        <CardBody className="py-10 text-center text-lg text-muted">
          <Truck className="mx-auto mb-3 h-10 w-10 text-lagoon-600" aria-hidden="true" />
          No published plan for today yet. Once the dispatcher publishes it, its vans appear here to load.
        </CardBody>
      </Card>
    );
  }

  return (
    <div className="space-y-6">
      <div role="group" aria-label="Van being loaded" className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
        {board.runs.map((r) => (
          <button
            key={r.runId}
            type="button"
            onClick={() => choose(r.runId)}
            aria-pressed={r.runId === runId}
            data-testid="dispatch-run"
            className={cn(
              "flex min-h-20 items-center gap-4 rounded-card border-2 px-5 py-3 text-left focus:outline-none focus-visible:ring-4 focus-visible:ring-lagoon-200",
              r.runId === runId ? "border-lagoon-700 bg-lagoon-50" : "border-line bg-surface hover:border-lagoon-400",
            )}
          >
            <Truck className="h-8 w-8 shrink-0 text-lagoon-700" aria-hidden="true" />
            <span className="flex-1">
              <span className="block text-xl font-semibold text-ink">{r.vanName}</span>
              <span className="block text-sm text-muted">
                {r.driverName}
                {r.startTime ? ` · leaves ${r.startTime}` : ""}
              </span>
            </span>
            <span className="text-right text-sm">
              <span className="block text-2xl font-semibold tabular-nums text-ink">{r.toLoad.length}</span>
              to load
            </span>
          </button>
        ))}
      </div>

      <ScanField onScan={onScan} busy={busy} label={run ? `Load on ${run.vanName}` : "Load"} />

      <div className="grid gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          {refusal && <Refusal title="Not loaded" message={refusal} />}
          {answer && !refusal && <Loaded answer={answer} />}
          {!answer && !refusal && (
            <Card>
              <CardBody className="py-10 text-center text-lg text-muted">
                <PackageCheck className="mx-auto mb-3 h-10 w-10 text-lagoon-600" aria-hidden="true" />
                {run ? `Scan each released set as it goes on ${run.vanName}.` : "Choose the van you are loading, then scan its sets."}
              </CardBody>
            </Card>
          )}
        </div>
        {run && <RunLoading run={run} highlight={answer?.set.serial ?? null} />}
      </div>
      <p className="text-xs text-muted">
        Loading follows the release recorded by the quality lead and today&apos;s published plan. It is advisory: check each pack is intact, dry and within its
        expiry before it goes on the van; the unit&apos;s validated procedures, its qualified staff and local regulations decide what leaves the unit.
      </p>
    </div>
  );
}

function Loaded({ answer }: { answer: DispatchAnswer }) {
  return (
    <section data-testid="dispatch-answer" className="overflow-hidden rounded-card border border-line bg-surface shadow-card">
      <div className="flex flex-wrap items-center justify-between gap-3 bg-ok-50 px-6 py-4 text-ok-700">
        <h2 className="flex items-center gap-2 text-2xl font-semibold">
          <CheckCircle2 className="h-7 w-7" aria-hidden="true" /> Loaded: out for delivery
        </h2>
        {answer.duplicate && <span className="text-sm font-medium">Already recorded a moment ago — nothing was recorded twice.</span>}
      </div>
      <div className="space-y-4 px-6 py-5">
        <div>
          <p className="text-4xl font-semibold tracking-tight tabular-nums text-ink" data-testid="dispatch-serial">
            {answer.set.serial}
          </p>
          <p className="mt-1 text-xl text-ink-soft">{answer.set.typeName}</p>
          <p className="mt-1 text-base text-muted">
            {answer.set.customerName} · {answer.set.siteName}
          </p>
        </div>
        <div className="rounded-card border-2 border-lagoon-600 bg-lagoon-50 px-5 py-4">
          <p className="text-sm font-medium uppercase tracking-wide text-lagoon-800">Goes to</p>
          <p className="mt-1 text-2xl font-semibold text-lagoon-900">
            Stop {answer.stop.position}: {answer.stop.siteName}
          </p>
          {answer.expiresOn && <p className="mt-1 text-base text-lagoon-900">Sterile until {answer.expiresOn}</p>}
        </div>
        <ProcessingNotes typeName={answer.set.typeName} flags={answer.processing.flags} notes={answer.processing.notes} ifuFileId={answer.processing.ifuFileId} />
      </div>
    </section>
  );
}

function SetRows({ sets, highlight, extra }: { sets: DispatchSet[]; highlight: string | null; extra?: (s: DispatchSet) => string | null }) {
  return (
    <ul className="divide-y divide-line">
      {sets.map((s) => (
        <li key={s.cycleId} className={cn("flex items-center gap-3 px-5 py-2.5 text-sm", s.serial === highlight && "bg-ok-50")}>
          <span className="w-14 shrink-0 text-muted">Stop {s.stopPosition}</span>
          <span className="font-medium tabular-nums text-ink">{s.serial}</span>
          <span className="min-w-0 flex-1 truncate text-ink-soft" title={`${s.typeName} · ${s.siteName}`}>
            {s.typeName} · {s.siteName}
          </span>
          {extra?.(s) && <span className="shrink-0 text-xs text-warn-700">{extra(s)}</span>}
        </li>
      ))}
    </ul>
  );
}

function RunLoading({ run, highlight }: { run: DispatchRun; highlight: string | null }) {
  const states = new Map(run.notReady.map((s) => [s.cycleId, s.stateLabel]));
  return (
    <div className="space-y-6">
      <Card data-testid="dispatch-to-load">
        <CardHeader title={`Still to load on ${run.vanName} (${run.toLoad.length})`} description="Released sets of the van's delivery stops." />
        <CardBody className="p-0">
          {run.toLoad.length === 0 ? <p className="px-5 py-4 text-sm text-ok-700">✓ Everything released for this van is loaded.</p> : <SetRows sets={run.toLoad} highlight={null} />}
        </CardBody>
      </Card>
      {run.notReady.length > 0 && (
        <Card>
          <CardHeader title={`Not released yet (${run.notReady.length})`} description="Planned for this van but still in the unit's process." />
          <CardBody className="p-0">
            <SetRows sets={run.notReady} highlight={null} extra={(s) => states.get(s.cycleId) ?? null} />
          </CardBody>
        </Card>
      )}
      <Card>
        <CardHeader title={`Loaded (${run.loaded.length})`} />
        <CardBody className="p-0">
          {run.loaded.length === 0 ? <p className="px-5 py-4 text-sm text-muted">Nothing loaded yet.</p> : <SetRows sets={run.loaded} highlight={highlight} />}
        </CardBody>
      </Card>
    </div>
  );
}
