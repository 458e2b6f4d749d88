// What the batch-style stations (washing, sterilising) have in common: a machine with programs
// runs one open run at a time — a washer batch or a steriliser load — which is loaded by
// scanning sets, started, then closed with the machine's record or aborted. The shared screens
// take the run's noun ("batch", "load") and the machine's ("washer", "steriliser") and build
// their words from them; the station routes answer with the run under its noun ({ batch },
// { load }) and the machine list under the machines' plural ({ washers }, { sterilisers }).

import type { ProcessingFlag } from "@/lib/catalogue/vocabulary";

export type RunNoun = "batch" | "load";
export type MachineNoun = "washer" | "steriliser";

/** "batch" → "Batch". */
export function capitalise<T extends string>(word: T): Capitalize<T> {
  return (word.charAt(0).toUpperCase() + word.slice(1)) as Capitalize<T>;
}

/** A machine's open run as the machine list shows it. */
export interface OpenRunSummary<Status extends string = string> {
  id: number;
  number: string;
  status: Status;
  itemCount: number;
}

/** A machine the station can run, with its active programs. */
export interface StationMachine {
  id: number;
  code: string;
  name: string;
  capacityStu: number | null;
  programs: { id: number; name: string; requirementText: string }[];
}

/** A set in a run, as its item list shows it. */
export interface StationRunItem {
  cycleId: number;
  serial: string;
  setTypeName: string;
  organisationName: string;
  sizeStu: number;
}

/** An open or closed run on a machine. */
export interface StationRun<Status extends string = string, Item extends StationRunItem = StationRunItem> {
  id: number;
  number: string;
  status: Status;
  machine: { capacityStu: number | null };
  program: { name: string; requirementText: string };
  startedAt: string | null;
  startedBy: string | null;
  items: Item[];
  loadStu: number;
}

/** A run is closed once it is neither being loaded nor running. */
export function isClosed(run: StationRun): boolean {
  return run.status !== "loading" && run.status !== "running";
}

/** What a scan into a run answers about the set. */
export interface ScannedIntoRun {
  cycleId: number;
  serial: string;
  setTypeName: string;
  organisationName: string;
  homeSiteName: string;
  sizeStu: number;
  flags: ProcessingFlag[];
  processingNotes: string | null;
  ifuFileId: number | null;
}

/** The station routes' answers, the run under its noun. */
export type RunAnswer<N extends RunNoun, R> = Record<N, R>;
export type ScanAnswer<N extends RunNoun, R, S> = RunAnswer<N, R> & { scanned: S } & Record<`alreadyIn${Capitalize<N>}`, boolean>;
export type MachinesAnswer<P extends MachineNoun, M> = Record<`${P}s`, M[]>;

/** Moves the focus to the station's scan field once it is on screen. */
export const focusScan = () => setTimeout(() => document.getElementById("station-scan")?.focus(), 30);
