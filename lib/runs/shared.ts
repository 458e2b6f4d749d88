import { format } from "date-fns";
import { tz } from "@date-fns/tz";
import { z } from "zod";

// What the driver's phone and the server say to each other about a run sheet: the shapes the
// screens get and the bodies the phone sends. No I/O here, so the client bundle can import it.

export type StopRole = "collect" | "deliver";

/** One set the stop is about: to pick up (soiled) or to hand over (sterile). */
export interface RunSheetSet {
  cycleId: number;
  setId: number;
  serial: string;
  giai: string;
  typeName: string;
  role: StopRole;
  state: string;
  stateLabel: string;
  /** Scanned at this stop (recorded on the server). */
  scanned: boolean;
  /** Collected or delivered already (the stop was served). */
  done: boolean;
  /** Why it cannot be scanned here now, when it cannot. */
  blocked: string | null;
}

export type StopStatus = "planned" | "served" | "not_served";

export interface RunSheetStop {
  id: number;
  position: number;
  status: StopStatus;
  kind: "collection" | "delivery" | "both";
  siteName: string;
  organisationName: string;
  address: string;
  deliveryNotes: string | null;
  contactName: string | null;
  contactPhone: string | null;
  window: string;
  plannedTime: string | null;
  serviceMin: number;
  collect: RunSheetSet[];
  deliver: RunSheetSet[];
  signedByName: string | null;
  servedAt: string | null;
  notServedReason: string | null;
  signatureFileId: number | null;
}

export interface RunSheet {
  runId: number;
  day: string;
  vanName: string;
  vanRegistration: string;
  driverName: string;
  startTime: string | null;
  endTime: string | null;
  stops: RunSheetStop[];
}

export const NOT_SERVED_REASONS = {
  closed: "Site closed",
  no_one_to_sign: "No one there to sign",
  access: "Could not get access",
  other: "Other",
} as const;
export type NotServedReason = keyof typeof NOT_SERVED_REASONS;

const clientEventId = z.uuid("The phone sent a scan without a valid id. Reload the page and scan again.");

export const stopScanSchema = z
  .object({
    clientEventId,
    code: z.string().trim().min(1, "Scan the set's label or type its serial.").max(200).optional(),
    cycleId: z.number().int().positive().optional(),
  })
  .refine((v) => v.code !== undefined || v.cycleId !== undefined, { message: "Scan the set's label or tap the set in the list.", path: ["code"] });
export type StopScanInput = z.infer<typeof stopScanSchema>;

export interface StopScanResult {
  duplicate: boolean;
  set: { cycleId: number; serial: string; typeName: string; role: StopRole };
  message: string;
}

/** A PNG signature as a data URL (or bare base64), at most about 1 MB once decoded. */
const signature = z.string().min(1, "Ask the receiver to sign in the box.").max(1_500_000, "The signature image is too large. Clear it and sign again.");

export const completeStopSchema = z.discriminatedUnion("outcome", [
  z.object({
    clientEventId,
    outcome: z.literal("served"),
    receiverName: z.string().trim().min(2, "Type the receiver's name.").max(120, "At most 120 characters."),
    signature,
  }),
  z
    .object({
      clientEventId,
      outcome: z.literal("not_served"),
      reason: z.enum(Object.keys(NOT_SERVED_REASONS) as [NotServedReason, ...NotServedReason[]], "Choose why the stop could not be served."),
      note: z.string().trim().max(500, "At most 500 characters.").optional(),
    })
    .refine((v) => v.reason !== "other" || (v.note?.length ?? 0) >= 3, { message: "Say in a few words why the stop could not be served.", path: ["note"] }),
]);
export type CompleteStopInput = z.infer<typeof completeStopSchema>;

export interface CompleteStopResult {
  duplicate: boolean;
  status: StopStatus;
  /** How many sets moved: collected and delivered. */
  collected: number;
  delivered: number;
  message: string;
}

/** The words stored and shown for a stop that could not be served. */
export function notServedText(reason: NotServedReason, note?: string | null): string {
  const label = NOT_SERVED_REASONS[reason];
  const text = note?.trim();
  return text ? `${label}: ${text}` : label;
}

/** Minutes from the plan day's midnight as "HH:MM". */
export function minutesText(min: number | null | undefined): string | null {
  if (min == null || !Number.isFinite(min)) return null;
  const m = Math.round(min);
  return `${String(Math.floor(m / 60)).padStart(2, "0")}:${String(m % 60).padStart(2, "0")}`;
}

/** True when a typed or scanned code names this set (serial, GIAI, or a GS1 string that carries the GIAI). */
export function codeMatchesSet(code: string, set: { serial: string; giai: string }): boolean {
  const c = code.trim().toUpperCase();
  if (!c) return false;
  const serial = set.serial.toUpperCase();
  const giai = set.giai.toUpperCase();
  return c === serial || c === serial.replace(/-/g, "") || c === giai || c.includes(`8004${giai}`) || c.includes(`(8004)${giai}`);
}

/** The local date of an instant in a time zone ("2026-12-02"), as route plans key their day. */
export function localDay(at: Date, timeZone: string): string {
  return format(at, "yyyy-MM-dd", { in: tz(timeZone) });
}
