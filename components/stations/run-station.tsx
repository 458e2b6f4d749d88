"use client";

import { ArrowLeft, type LucideIcon } from "lucide-react";
import { type ReactNode, useState } from "react";
import { Button } from "@/components/ui/button";
import { Refusal } from "@/components/washing/refusal";
import { fetchJson } from "@/lib/fetch-json";
import { MachinePicker } from "./machine-picker";
import { OpenRunCard } from "./open-run-card";
import { focusScan, type MachineNoun, type MachinesAnswer, type OpenRunSummary, type RunAnswer, type RunNoun, type ScannedIntoRun, type StationMachine, type StationRun } from "./run-kind";
import { RunPanel, type RunPanelProps } from "./run-panel";

type PanelProps<N extends RunNoun, R extends StationRun, S extends ScannedIntoRun> = Omit<RunPanelProps<N, R, S>, "run" | "noun" | "machineNoun" | "runUrl" | "recordHref" | "onChange" | "onNext">;

export interface RunStationProps<N extends RunNoun, P extends MachineNoun, M extends StationMachine, R extends StationRun, S extends ScannedIntoRun>
  extends PanelProps<N, R, S> {
  noun: N;
  machineNoun: P;
  initialMachines: M[];
  /** Answers the machines again ({ washers } or { sterilisers }) when the station comes back to the list. */
  machinesUrl: string;
  /** Opens a run (POST); `${runsUrl}/${id}` reads one and takes its steps. */
  runsUrl: string;
  recordHref: (runId: number) => string;
  openRunOf: (machine: M) => OpenRunSummary<R["status"]> | null;
  /** The machine list: its icon, columns, what it says when empty, and the machine's extras. */
  picker: {
    icon: LucideIcon;
    gridClassName: string;
    emptyText: string;
    nameSuffix?: (machine: M) => string;
    details?: (machine: M) => ReactNode;
    testIdOf?: (machine: M) => string;
  };
  /** After the chosen machine's code and name above its run, e.g. the day's test. */
  machineNote?: (machine: M) => ReactNode;
  openDescription: string;
  noProgramText: (machine: M) => string;
}

/**
 * A batch-style station (washing, sterilising): choose a machine and its program, or continue its
 * open run; then the run's panel. Going back to the list, or on to the next run, reads the
 * machines again so each shows its open run as it now stands.
 */
export function RunStation<N extends RunNoun, P extends MachineNoun, M extends StationMachine, R extends StationRun, S extends ScannedIntoRun>(
  props: RunStationProps<N, P, M, R, S>,
) {
  const { noun, machineNoun, machinesUrl, runsUrl, recordHref, openRunOf, picker, machineNote, openDescription, noProgramText, initialMachines, ...panel } = props;
  const [machines, setMachines] = useState(initialMachines);
  const [machineId, setMachineId] = useState<number | null>(null);
  const [run, setRun] = useState<R | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const machine = machines.find((m) => m.id === machineId) ?? null;

  const refresh = async () => {
    try {
      setMachines((await fetchJson<MachinesAnswer<P, M>>(machinesUrl))[`${machineNoun}s` as const]);
    } catch {
      // The list refreshes on the next visit; the run on screen is already current.
    }
  };

  const choose = async (m: M) => {
    setRefusal(null);
    setMachineId(m.id);
    setRun(null);
    const open = openRunOf(m);
    if (!open) return;
    setBusy(true);
    try {
      setRun((await fetchJson<RunAnswer<N, R>>(`${runsUrl}/${open.id}`))[noun]);
      focusScan();
    } catch (error) {
      setRefusal(error instanceof Error ? error.message : `The ${noun} could not be loaded.`);
    } finally {
      setBusy(false);
    }
  };

  const back = async () => {
    setMachineId(null);
    setRun(null);
    setRefusal(null);
    await refresh();
  };

  return (
    <div className="space-y-6">
      {!machine ? (
        <MachinePicker
          {...picker}
          machines={machines}
          noun={noun}
          machineNoun={machineNoun}
          busy={busy}
          onChoose={choose}
          openRunOf={openRunOf}
          statusBadge={panel.statusBadge}
        />
      ) : (
        <>
          <div className="flex flex-wrap items-center justify-between gap-3">
            <Button variant="secondary" size="lg" onClick={back}>
              <ArrowLeft className="h-5 w-5" aria-hidden="true" /> All {machineNoun}s
            </Button>
            <p className="text-lg font-semibold text-ink">
              {machine.code} · {machine.name}
              {machineNote && <> {machineNote(machine)}</>}
            </p>
          </div>
          {refusal && !run && <Refusal title="Not possible" message={refusal} />}
          {run ? (
            <RunPanel<N, R, S>
              key={run.id}
              {...panel}
              run={run}
              noun={noun}
              machineNoun={machineNoun}
              runUrl={`${runsUrl}/${run.id}`}
              recordHref={recordHref(run.id)}
              onChange={async (next) => {
                setRun(next);
                if (next.status !== "loading") await refresh();
              }}
              onNext={async () => {
                setRun(null);
                await refresh();
              }}
            />
          ) : (
            <OpenRunCard<N, R>
              machine={machine}
              noun={noun}
              runsUrl={runsUrl}
              description={openDescription}
              noProgramText={noProgramText(machine)}
              onOpened={async (opened) => {
                setRefusal(null);
                setRun(opened);
                await refresh();
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
