import { z } from "zod";
import { A0_CLASSES, THERMAL_90C_1MIN, type WasherRequirement } from "@/lib/cycles/washer";
import { DEFAULT_BAND_WIDTH_K, DEFAULT_SATURATION_TOLERANCE_K } from "@/lib/cycles/sterilizer";
import type { MachineKind } from "@/db/schema";

// What a machine's program must achieve, as stored in programs.requirement (JSON), per kind of
// machine: a washer's disinfection requirement, a steriliser's cycle type, or the set point of a
// heat sealer, drying cabinet or ultrasonic bath. Pure: read and written by the machine pages,
// the washing station and the demo data.

export const MACHINE_KINDS = ["washer", "steriliser", "heat_sealer", "drying_cabinet", "ultrasonic"] as const satisfies readonly MachineKind[];

export const MACHINE_KIND_LABELS: Record<MachineKind, string> = {
  washer: "Washer-disinfector",
  steriliser: "Steam steriliser",
  heat_sealer: "Heat sealer",
  drying_cabinet: "Drying cabinet",
  ultrasonic: "Ultrasonic bath",
};

export const MACHINE_KIND_PLURALS: Record<MachineKind, string> = {
  washer: "Washer-disinfectors",
  steriliser: "Steam sterilisers",
  heat_sealer: "Heat sealers",
  drying_cabinet: "Drying cabinets",
  ultrasonic: "Ultrasonic baths",
};

export function isMachineKind(value: string): value is MachineKind {
  return (MACHINE_KINDS as readonly string[]).includes(value);
}

/** A steam steriliser's cycle type, as the later load checks read it (lib/cycles SterilizerCycleType plus the air removal). */
export interface SteamCycleRequirement {
  kind: "steam";
  name: string;
  sterilisationTempC: number;
  bandWidthK: number;
  minHoldSeconds: number;
  saturationToleranceK: number;
  airRemoval: "prevacuum" | "gravity";
  minF0?: number;
}

/** The set point of a heat sealer, drying cabinet or ultrasonic bath: a temperature and/or a time. */
export interface SetPointRequirement {
  kind: "set_point";
  tempC?: number;
  seconds?: number;
}

export type ProgramRequirement = WasherRequirement | SteamCycleRequirement | SetPointRequirement;

/** The requirement kinds a machine of each kind may have. */
export const REQUIREMENT_KINDS_FOR: Record<MachineKind, readonly ProgramRequirement["kind"][]> = {
  washer: ["a0", "time_temp"],
  steriliser: ["steam"],
  heat_sealer: ["set_point"],
  drying_cabinet: ["set_point"],
  ultrasonic: ["set_point"],
};

/** The A0 classes offered for washer programs, each with where it comes from. */
export const A0_CLASS_OPTIONS = [
  {
    minA0: A0_CLASSES.humanWasteContainers.minA0,
    label: "A0 60 — containers for human waste",
    source: "EN ISO 15883-3",
  },
  {
    minA0: A0_CLASSES.sterilisedAfterwards.minA0,
    label: "A0 600 — non-critical items and instruments sterilised afterwards",
    source: "EN ISO 15883-1",
  },
  {
    minA0: A0_CLASSES.notSterilisedAfterwards.minA0,
    label: "A0 3000 — heat-resistant viruses, or items not sterilised afterwards",
    source: "EN ISO 15883-1",
  },
] as const;

/** The time-and-temperature preset offered for washers: 90 °C held for 1 min (common practice; equals A0 600). */
export const TIME_TEMP_PRESET = {
  minTempC: THERMAL_90C_1MIN.minTempC,
  minHoldSeconds: THERMAL_90C_1MIN.minHoldSeconds,
  label: "90 °C held for 1 min (common practice; equals A0 600)",
} as const;

const finite = (what: string) => z.number({ error: `${what} must be a number.` }).refine(Number.isFinite, `${what} must be a number.`);

const washerA0 = z.strictObject({
  kind: z.literal("a0"),
  minA0: finite("The A0 value").min(1, "The A0 value is at least 1.").max(100_000, "The A0 value is at most 100 000."),
  minTempC: finite("The temperature").min(65, "At least 65 °C: below it nothing counts towards A0.").max(100, "At most 100 °C.").optional(),
});

const washerTimeTemp = z.strictObject({
  kind: z.literal("time_temp"),
  minTempC: finite("The temperature").min(65, "At least 65 °C for thermal disinfection.").max(100, "At most 100 °C."),
  minHoldSeconds: finite("The holding time").min(1, "Hold for at least 1 s.").max(24 * 3600, "At most 24 h."),
});

const steam = z.strictObject({
  kind: z.literal("steam"),
  name: z.string().trim().min(1, "Name the cycle type.").max(80),
  sterilisationTempC: finite("The sterilisation temperature").min(105, "At least 105 °C for a steam cycle.").max(150, "At most 150 °C."),
  bandWidthK: finite("The band width").min(0.5, "At least 0.5 K.").max(10, "At most 10 K."),
  minHoldSeconds: finite("The holding time").min(1, "Hold for at least 1 s.").max(24 * 3600, "At most 24 h."),
  saturationToleranceK: finite("The steam tolerance").min(0.1, "At least 0.1 K.").max(10, "At most 10 K."),
  airRemoval: z.enum(["prevacuum", "gravity"], { error: "Choose pre-vacuum or gravity air removal." }),
  minF0: finite("The F0 value").min(0.1, "At least 0.1 min.").max(10_000).optional(),
});

const setPoint = z
  .strictObject({
    kind: z.literal("set_point"),
    tempC: finite("The temperature").min(0, "At least 0 °C.").max(300, "At most 300 °C.").optional(),
    seconds: finite("The time").min(1, "At least 1 s.").max(7 * 24 * 3600, "At most 7 days.").optional(),
  })
  .refine((v) => v.tempC !== undefined || v.seconds !== undefined, "Give a temperature, a time, or both.");

/** The schema of each kind of requirement, to check one against its own fields. */
export const REQUIREMENT_SCHEMAS = { a0: washerA0, time_temp: washerTimeTemp, steam, set_point: setPoint } as const;

export const programRequirementSchema = z.union([washerA0, washerTimeTemp, steam, setPoint]);

/** Checks a requirement fits the machine; returns the reason when it does not. */
export function requirementMismatch(machineKind: MachineKind, requirement: ProgramRequirement): string | null {
  if (REQUIREMENT_KINDS_FOR[machineKind].includes(requirement.kind)) return null;
  const allowed = REQUIREMENT_KINDS_FOR[machineKind].map((k) => REQUIREMENT_KIND_LABELS[k]).join(" or ");
  return `A ${MACHINE_KIND_LABELS[machineKind].toLowerCase()} program needs ${allowed}.`;
}

export const REQUIREMENT_KIND_LABELS: Record<ProgramRequirement["kind"], string> = {
  a0: "an A0 value",
  time_temp: "a temperature held for a time",
  steam: "a steam cycle type",
  set_point: "a set point",
};

/** Reads a stored requirement; null when the JSON is not one (shown as "not readable"). */
export function parseRequirement(json: string): ProgramRequirement | null {
  let value: unknown;
  try {
    value = JSON.parse(json);
  } catch {
    return null;
  }
  const parsed = programRequirementSchema.safeParse(value);
  return parsed.success ? (parsed.data as ProgramRequirement) : null;
}

/** The washer requirement of a stored program, or null when the program is not a washer's. */
export function washerRequirementOf(json: string): WasherRequirement | null {
  const r = parseRequirement(json);
  return r && (r.kind === "a0" || r.kind === "time_temp") ? r : null;
}

/** "1 min 30 s", "15 min", "45 s". */
export function formatDuration(seconds: number): string {
  const s = Math.round(seconds);
  if (s < 60) return `${s} s`;
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const rest = s % 60;
  const parts: string[] = [];
  if (h) parts.push(`${h} h`);
  if (m) parts.push(`${m} min`);
  if (rest) parts.push(`${rest} s`);
  return parts.join(" ");
}

const number = (n: number) => (Number.isInteger(n) ? String(n) : String(Number(n.toFixed(2))));

/** The requirement in a few words, for lists and the station. */
export function describeRequirement(requirement: ProgramRequirement | null): string {
  if (!requirement) return "Requirement not readable";
  switch (requirement.kind) {
    case "a0": {
      const cls = A0_CLASS_OPTIONS.find((c) => c.minA0 === requirement.minA0);
      const base = `A0 ≥ ${number(requirement.minA0)}${cls ? ` (${cls.source})` : ""}`;
      return requirement.minTempC !== undefined ? `${base}, reaching ${number(requirement.minTempC)} °C` : base;
    }
    case "time_temp":
      return `${number(requirement.minTempC)} °C held for ${formatDuration(requirement.minHoldSeconds)}`;
    case "steam":
      return `${requirement.airRemoval === "prevacuum" ? "Pre-vacuum" : "Gravity"}, ${number(requirement.sterilisationTempC)}–${number(
        requirement.sterilisationTempC + requirement.bandWidthK,
      )} °C for ${formatDuration(requirement.minHoldSeconds)}${requirement.minF0 !== undefined ? `, F0 ≥ ${number(requirement.minF0)}` : ""}`;
    case "set_point": {
      const parts: string[] = [];
      if (requirement.tempC !== undefined) parts.push(`${number(requirement.tempC)} °C`);
      if (requirement.seconds !== undefined) parts.push(formatDuration(requirement.seconds));
      return parts.join(" for ");
    }
  }
}

/** Defaults for a new steam cycle type, from the reference values (EN 285 band width, from memory). */
export const STEAM_DEFAULTS = { bandWidthK: DEFAULT_BAND_WIDTH_K, saturationToleranceK: DEFAULT_SATURATION_TOLERANCE_K } as const;
