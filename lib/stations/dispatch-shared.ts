import { z } from "zod";
import type { ProcessingFlag } from "@/lib/catalogue/vocabulary";

// The dispatch station's shapes: today's runs with what each still has to load, and the answer
// to a scan. No I/O, so the station screen imports it.

export interface DispatchSet {
  cycleId: number;
  serial: string;
  typeName: string;
  stopPosition: number;
  siteName: string;
}

export interface DispatchRun {
  runId: number;
  vanName: string;
  vanRegistration: string;
  driverName: string;
  startTime: string | null;
  toLoad: DispatchSet[];
  loaded: DispatchSet[];
  /** Sets of the run's delivery stops that are not released yet (still in the unit's process). */
  notReady: (DispatchSet & { stateLabel: string })[];
}

export interface DispatchBoard {
  day: string;
  runs: DispatchRun[];
}

export const dispatchScanSchema = z.object({
  runId: z.number().int().positive("Choose the van you are loading."),
  code: z.string().trim().min(1, "Scan the set's label or type its serial.").max(200),
  clientEventId: z.uuid("The station sent a scan without a valid id. Reload the page and scan again."),
});
export type DispatchScanInput = z.infer<typeof dispatchScanSchema>;

export interface DispatchAnswer {
  duplicate: boolean;
  set: { serial: string; typeName: string; customerName: string; siteName: string };
  stop: { position: number; siteName: string };
  processing: { flags: ProcessingFlag[]; notes: string | null; ifuFileId: number | null };
  expiresOn: string | null;
  run: DispatchRun;
}
