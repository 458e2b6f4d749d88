import { z } from "zod";
import { MACHINE_KINDS, type ProgramRequirement, REQUIREMENT_SCHEMAS } from "./requirements";

// Input shapes of the machine and program forms, shared by the dialogs (zodResolver) and the
// server actions, which parse them again.

const text = (label: string, max: number) =>
  z
    .string()
    .trim()
    .min(1, `Enter the ${label}.`)
    .max(max, `Use at most ${max} characters.`)
    .refine((v) => !/[\u0000-\u001f<>]/.test(v), "Remove control characters and angle brackets.");

/** Machine and program codes: capitals, digits and dashes, as printed on the machine and in batch numbers. */
const code = (label: string) =>
  z
    .string()
    .trim()
    .transform((v) => v.toUpperCase())
    .pipe(
      z
        .string()
        .min(1, `Enter the ${label}.`)
        .max(12, "Use at most 12 characters.")
        .regex(/^[A-Z0-9]+(?:-[A-Z0-9]+)*$/, "Use capital letters, digits and single dashes, e.g. W3 or A0-3000."),
    );

/** A number typed in a field; empty means "not given". */
const optionalNumber = (message: string) =>
  z.preprocess(
    (v) => (v === "" || v === null || v === undefined ? undefined : typeof v === "string" ? v.trim().replace(",", ".") : v),
    z.coerce.number({ error: message }).refine(Number.isFinite, message).optional(),
  );

/** One inner side of a chamber in whole millimetres; empty means not given. */
const chamberSide = (side: string) =>
  optionalNumber(`Enter the chamber ${side} in mm, e.g. 680.`)
    .refine((v) => v === undefined || (Number.isInteger(v) && v >= 100 && v <= 5000), `The chamber ${side} is whole mm from 100 to 5000.`)
    .transform((v) => v ?? null);

export const machineSchema = z.object({
  kind: z.enum(MACHINE_KINDS, { error: "Choose the kind of machine." }),
  code: code("machine's code"),
  name: text("machine's name", 80),
  serialNumber: z
    .string()
    .trim()
    .max(60, "Use at most 60 characters.")
    .refine((v) => !/[\u0000-\u001f<>]/.test(v), "Remove control characters and angle brackets.")
    .transform((v) => v || null),
  capacityStu: optionalNumber("Enter the capacity as a number of sterilisation units, e.g. 6.")
    .refine((v) => v === undefined || (v > 0 && v <= 100), "The capacity is more than 0 and at most 100 StU.")
    .transform((v) => v ?? null),
  active: z.boolean().default(true),
  // The inner chamber in mm: all three or none; the capacity is checked against what fits.
  chamberWidthMm: chamberSide("width"),
  chamberHeightMm: chamberSide("height"),
  chamberDepthMm: chamberSide("depth"),
});
export type MachineInput = z.input<typeof machineSchema>;
export type MachineFields = z.output<typeof machineSchema>;

export const updateMachineSchema = machineSchema.extend({ id: z.coerce.number().int().positive() });

/** The requirement fields of the program form; which ones count depends on `requirementKind`. */
const requirementFields = {
  requirementKind: z.enum(["a0", "time_temp", "steam", "set_point"], { error: "Choose what the program must achieve." }),
  minA0: optionalNumber("Enter the A0 value as a number, e.g. 3000."),
  a0MinTempC: optionalNumber("Enter the temperature in °C, e.g. 90."),
  minTempC: optionalNumber("Enter the temperature in °C, e.g. 90."),
  holdMinutes: optionalNumber("Enter the holding time in minutes, e.g. 1 or 3.5."),
  cycleName: z.string().trim().max(80, "Use at most 80 characters.").default(""),
  sterilisationTempC: optionalNumber("Enter the sterilisation temperature in °C, e.g. 134."),
  bandWidthK: optionalNumber("Enter the band width in K, e.g. 3."),
  saturationToleranceK: optionalNumber("Enter the tolerance in K, e.g. 2."),
  airRemoval: z.enum(["prevacuum", "gravity"]).default("prevacuum"),
  minF0: optionalNumber("Enter the F0 value in minutes, e.g. 15."),
  setTempC: optionalNumber("Enter the temperature in °C."),
  setMinutes: optionalNumber("Enter the time in minutes."),
};

type RequirementFieldValues = z.output<z.ZodObject<typeof requirementFields>>;

/** Where each part of a requirement is typed in the form, so its error lands under that field. */
const FIELD_OF: Record<string, Partial<Record<ProgramRequirement["kind"], keyof RequirementFieldValues>>> = {
  minA0: { a0: "minA0" },
  minTempC: { a0: "a0MinTempC", time_temp: "minTempC" },
  minHoldSeconds: { time_temp: "holdMinutes", steam: "holdMinutes" },
  name: { steam: "cycleName" },
  sterilisationTempC: { steam: "sterilisationTempC" },
  bandWidthK: { steam: "bandWidthK" },
  saturationToleranceK: { steam: "saturationToleranceK" },
  minF0: { steam: "minF0" },
  tempC: { set_point: "setTempC" },
  seconds: { set_point: "setMinutes" },
  airRemoval: { steam: "airRemoval" },
};

const seconds = (minutes: number | undefined) => (minutes === undefined ? undefined : Math.round(minutes * 60));

/** The requirement the form's fields describe (before its own checks). */
function draftRequirement(v: RequirementFieldValues): Record<string, unknown> {
  switch (v.requirementKind) {
    case "a0":
      return { kind: "a0", minA0: v.minA0, ...(v.a0MinTempC !== undefined ? { minTempC: v.a0MinTempC } : {}) };
    case "time_temp":
      return { kind: "time_temp", minTempC: v.minTempC, minHoldSeconds: seconds(v.holdMinutes) };
    case "steam":
      return {
        kind: "steam",
        name: v.cycleName,
        sterilisationTempC: v.sterilisationTempC,
        bandWidthK: v.bandWidthK,
        minHoldSeconds: seconds(v.holdMinutes),
        saturationToleranceK: v.saturationToleranceK,
        airRemoval: v.airRemoval,
        ...(v.minF0 !== undefined ? { minF0: v.minF0 } : {}),
      };
    case "set_point":
      return {
        kind: "set_point",
        ...(v.setTempC !== undefined ? { tempC: v.setTempC } : {}),
        ...(v.setMinutes !== undefined ? { seconds: seconds(v.setMinutes) } : {}),
      };
  }
}

const MISSING: Record<string, string> = {
  minA0: "Enter the A0 value the program must reach.",
  minTempC: "Enter the temperature the load must reach.",
  minHoldSeconds: "Enter how long the temperature must be held.",
  name: "Name the cycle type, e.g. 134 °C prevac.",
  sterilisationTempC: "Enter the sterilisation temperature.",
  bandWidthK: "Enter the width of the temperature band.",
  saturationToleranceK: "Enter the accepted difference from saturated steam.",
};

const programBase = z.object({
  code: code("program's code"),
  name: text("program's name", 80),
  active: z.boolean().default(true),
  ...requirementFields,
});

// Puts each problem of the described requirement under the field where it is typed.
function checkRequirement(v: RequirementFieldValues, ctx: z.RefinementCtx): void {
  const draft = draftRequirement(v);
  const parsed = REQUIREMENT_SCHEMAS[v.requirementKind].safeParse(draft);
  if (parsed.success) return;
  for (const issue of parsed.error.issues) {
    const key = issue.path[0];
    const field = typeof key === "string" ? FIELD_OF[key]?.[v.requirementKind] : v.requirementKind === "set_point" ? "setTempC" : undefined;
    const missing = typeof key === "string" && draft[key] === undefined ? MISSING[key] : undefined;
    ctx.addIssue({ code: "custom", path: [field ?? "requirementKind"], message: missing ?? issue.message });
  }
}

function requirementOf(v: RequirementFieldValues): ProgramRequirement {
  return REQUIREMENT_SCHEMAS[v.requirementKind].parse(draftRequirement(v)) as ProgramRequirement;
}

export const programSchema = programBase
  .extend({ machineId: z.coerce.number().int().positive() })
  .superRefine(checkRequirement)
  .transform((v) => ({ machineId: v.machineId, code: v.code, name: v.name, active: v.active, requirement: requirementOf(v) }));
export type ProgramInput = z.input<typeof programSchema>;
export type ProgramFields = z.output<typeof programSchema>;

export const updateProgramSchema = programBase
  .extend({ id: z.coerce.number().int().positive() })
  .superRefine(checkRequirement)
  .transform((v) => ({ id: v.id, code: v.code, name: v.name, active: v.active, requirement: requirementOf(v) }));
export type UpdateProgramFields = z.output<typeof updateProgramSchema>;

/** The form values that describe a stored program (for the edit dialog). */
export function programFormValues(p: { code: string; name: string; active: boolean; requirement: ProgramRequirement | null }): z.input<typeof programBase> {
  const r = p.requirement;
  const str = (n: number | undefined) => (n === undefined ? "" : String(n));
  const minutes = (s: number | undefined) => (s === undefined ? "" : String(Number((s / 60).toFixed(4))));
  const base = {
    code: p.code,
    name: p.name,
    active: p.active,
    minA0: "",
    a0MinTempC: "",
    minTempC: "",
    holdMinutes: "",
    cycleName: "",
    sterilisationTempC: "",
    bandWidthK: "",
    saturationToleranceK: "",
    airRemoval: "prevacuum" as const,
    minF0: "",
    setTempC: "",
    setMinutes: "",
  };
  if (!r) return { ...base, requirementKind: "a0" };
  switch (r.kind) {
    case "a0":
      return { ...base, requirementKind: "a0", minA0: str(r.minA0), a0MinTempC: str(r.minTempC) };
    case "time_temp":
      return { ...base, requirementKind: "time_temp", minTempC: str(r.minTempC), holdMinutes: minutes(r.minHoldSeconds) };
    case "steam":
      return {
        ...base,
        requirementKind: "steam",
        cycleName: r.name,
        sterilisationTempC: str(r.sterilisationTempC),
        bandWidthK: str(r.bandWidthK),
        saturationToleranceK: str(r.saturationToleranceK),
        holdMinutes: minutes(r.minHoldSeconds),
        airRemoval: r.airRemoval,
        minF0: str(r.minF0),
      };
    case "set_point":
      return { ...base, requirementKind: "set_point", setTempC: str(r.tempC), setMinutes: minutes(r.seconds) };
  }
}
