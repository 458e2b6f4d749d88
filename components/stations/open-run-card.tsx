"use client";

import { Layers } from "lucide-react";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Refusal } from "@/components/washing/refusal";
import { cn } from "@/lib/cn";
import { postJson } from "./post";
import type { RunAnswer, RunNoun, StationMachine } from "./run-kind";

/**
 * Opening a run on a free machine: the machine's active programs as big radio buttons, then
 * "Open a batch/load on <code>". A machine without an active program says so instead.
 */
export function OpenRunCard<N extends RunNoun, R>({
  machine,
  noun,
  runsUrl,
  description,
  noProgramText,
  onOpened,
  onRefused,
}: {
  machine: StationMachine;
  noun: N;
  /** Where a POST of { machineId, programId } opens a run. */
  runsUrl: string;
  description: string;
  noProgramText: string;
  onOpened: (run: R) => void;
  onRefused: (message: string) => void;
}) {
  const [programId, setProgramId] = useState<number | null>(machine.programs[0]?.id ?? null);
  const [busy, setBusy] = useState(false);
  const open = async () => {
    if (!programId) return;
    setBusy(true);
    const res = await postJson<RunAnswer<N, R>>(runsUrl, { machineId: machine.id, programId });
    setBusy(false);
    if (res.ok) onOpened(res.data[noun]);
    else onRefused(res.message);
  };
  if (machine.programs.length === 0) {
    return <Refusal title="No program" message={noProgramText} />;
  }
  return (
    <Card>
      <CardHeader title={`Open a ${noun}`} description={description} />
      <CardBody className="space-y-4">
        <div role="radiogroup" aria-label="Program" className="grid gap-3 sm:grid-cols-2">
          {machine.programs.map((p) => (
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
          <Layers className="h-5 w-5" aria-hidden="true" /> {busy ? "Opening…" : `Open a ${noun} on ${machine.code}`}
        </Button>
      </CardBody>
    </Card>
  );
}
