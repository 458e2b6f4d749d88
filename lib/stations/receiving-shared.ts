import { z } from "zod";
import type { OrderNoticeKind } from "@/db/schema";
import type { ProcessingFlag } from "@/lib/catalogue/vocabulary";
import type { CycleState } from "@/lib/cycles/lifecycle";

// The receiving station's shapes, shared by the station screen and the route handlers (pure:
// no I/O): what a scan sends and gets back, and where a received set goes next.

const clientEventId = z.uuid({ error: "Each scan carries a fresh id made by the station (a UUID); reload the station page." });

export const receivingScanSchema = z.object({
  code: z.string({ error: "Scan or type a set's code." }).trim().min(1, "Scan or type a set's code.").max(200, "That code is too long to be a set's."),
  clientEventId,
  /** The order being received at the station, if any: an unbooked set from its site is reported with it. */
  orderId: z.number().int().positive().nullable().optional(),
});
export type ReceivingScanInput = z.infer<typeof receivingScanSchema>;

export const heavySoilSchema = z.object({
  cycleId: z.number({ error: "Say which set's cycle to mark." }).int().positive(),
  heavySoil: z.boolean({ error: "Say whether the set is heavily soiled (true or false)." }),
});
export type HeavySoilInput = z.infer<typeof heavySoilSchema>;

export const finishReceivingSchema = z.object({
  orderId: z.number({ error: "Say which order is finished." }).int().positive(),
});
export type FinishReceivingInput = z.infer<typeof finishReceivingSchema>;

// ---------------------------------------------------------------------------------------------
// Where a received set goes next

export type ReceivingDestination = "manual_washing" | "ultrasonic" | "dismantle" | "washer";

export interface ReceivingRoute {
  destination: ReceivingDestination;
  /** The headline at the station: "Manual washing", "Ultrasonic first", … */
  label: string;
  /** The steps before the set is washed, in the order they are done. */
  steps: string[];
}

/**
 * Where a set goes from receiving, from its type's processing flags: sets that must not go in a
 * washer-disinfector go to manual washing; otherwise an ultrasonic clean first, or dismantling
 * first, else straight to the washer-disinfector. Advisory: the instructions for use and the
 * unit's validated procedures decide.
 */
export function routeAfterReceiving(flags: readonly ProcessingFlag[]): ReceivingRoute {
  const has = (f: ProcessingFlag) => flags.includes(f);
  const flush = has("lumens_to_flush") ? ["Flush the lumens"] : [];
  if (has("manual_wash_only")) {
    return {
      destination: "manual_washing",
      label: "Manual washing",
      steps: [...(has("dismantle") ? ["Dismantle"] : []), ...flush, "Wash by hand at the manual washing station — not in a washer-disinfector"],
    };
  }
  const steps = [
    ...(has("dismantle") ? ["Dismantle"] : []),
    ...(has("ultrasonic") ? ["Ultrasonic clean"] : []),
    ...flush,
    "Washer-disinfector",
  ];
  if (has("ultrasonic")) return { destination: "ultrasonic", label: "Ultrasonic first", steps };
  if (has("dismantle")) return { destination: "dismantle", label: "Dismantle first", steps };
  return { destination: "washer", label: "Washer-disinfector", steps };
}

// ---------------------------------------------------------------------------------------------
// What the station gets back

/** received: a booked or collected set; unexpected: it came without a booking; returned: a recalled set is back. */
export type ReceivingOutcome = "received" | "unexpected" | "returned";

export interface ReceivingOrderSet {
  cycleId: number;
  setId: number;
  serial: string;
  setName: string;
  state: CycleState;
  stateLabel: string;
  /** Received at the unit (it has a receipt time). */
  received: boolean;
  receivedAt: string | null;
  /** Reported missing when the order was finished, and not received since. */
  missing: boolean;
  /** Came with the order without being booked on it. */
  unexpected: boolean;
}

export interface ReceivingOrder {
  id: number;
  reference: string;
  customerName: string;
  siteName: string;
  serviceLevel: "standard" | "express";
  promisedReturnAt: string | null;
  neededBackBy: string | null;
  /** The booked sets, then those that came with the order unbooked. */
  sets: ReceivingOrderSet[];
  booked: number;
  received: number;
  /** Booked sets not received yet (not counting those already reported missing). */
  stillExpected: number;
  missing: number;
}

export interface ReceivingNoticeView {
  id: number;
  kind: OrderNoticeKind;
  message: string;
  createdAt: string;
}

export interface ReceivingAnswer {
  outcome: ReceivingOutcome;
  /** True when this was a retried request: the first one's result, nothing recorded again. */
  duplicate: boolean;
  headline: string;
  set: {
    id: number;
    serial: string;
    humanReadable: string;
    typeCode: string;
    typeName: string;
    setClassLabel: string;
    customerName: string;
    homeSiteName: string;
    instruments: number;
  };
  processing: { flags: ProcessingFlag[]; notes: string | null; ifuFileId: number | null };
  cycle: {
    id: number;
    state: CycleState;
    stateLabel: string;
    serviceLevel: "standard" | "express";
    heavySoil: boolean;
    loaner: boolean;
    promisedAt: string | null;
    receivedAt: string | null;
    receivedBy: string | null;
  };
  route: ReceivingRoute;
  order: ReceivingOrder | null;
  notices: ReceivingNoticeView[];
  /** Things to tell the technician besides the headline (no contract in force, reported missing earlier…). */
  warnings: string[];
}

export interface FinishReceivingResult {
  order: ReceivingOrder;
  /** Sets reported missing by this request (none when they had been reported before). */
  reported: { serial: string; setName: string }[];
  message: string;
}

export interface HeavySoilResult {
  cycleId: number;
  heavySoil: boolean;
  changed: boolean;
}
