import { z } from "zod";
import { CHECK_KEYS, type CheckKey, LIMIT_KEYS, type LimitKey } from "./limits";

// Input shapes of the monitoring log's forms, one per kind of entry, shared by the forms
// (zodResolver) and the server actions, which parse them again. Numbers arrive as the text typed.

export const ENTRY_KINDS = ["washer_cleaning", "service", "fault", "seal_test", "water_reading", "salt_refill", "store_climate"] as const;
export type EntryKind = (typeof ENTRY_KINDS)[number];

export const ENTRY_KIND_LABELS: Record<EntryKind, string> = {
  washer_cleaning: "Wash arms and sieves cleaned",
  service: "Service visit",
  fault: "Fault",
  seal_test: "Seal test",
  water_reading: "Water treatment reading",
  salt_refill: "Softener salt refill",
  store_climate: "Sterile store climate",
};

/** Kinds a technician may record; the rest (service visits) are the quality lead's. */
export const ROUTINE_KINDS: readonly EntryKind[] = ["washer_cleaning", "fault", "seal_test", "water_reading", "salt_refill", "store_climate"];

const plainText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters.`)
    .refine((v) => !/[\u0000-\u0008\u000b-\u001f<>]/.test(v), "Remove control characters and angle brackets.");

const optionalText = (max: number) => plainText(max).transform((v) => v || null);
const requiredText = (max: number, message: string) => plainText(max).pipe(z.string().min(1, message));

/** A number typed in a field, with "," accepted as the decimal mark; empty means not given. */
const optionalNumber = (message: string) =>
  z.preprocess(
    (v) => (v === "" || v === null || v === undefined ? undefined : typeof v === "string" ? v.trim().replace(",", ".") : v),
    z.coerce.number({ error: message }).refine(Number.isFinite, message).optional(),
  );

const requiredNumber = (message: string) => optionalNumber(message).refine((v) => v !== undefined, message);

const machineId = z.coerce.number({ error: "Choose the machine." }).int("Choose the machine.").positive("Choose the machine.");

/** When the check was done, as a datetime-local field gives it ("2026-12-02T09:30", the unit's time). */
const at = z.string().trim().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, "Enter the date and time the check was done.");

const common = { at, notes: optionalText(1000) };

export const washerCleaningSchema = z.object({ kind: z.literal("washer_cleaning"), machineId, ...common });

export const serviceSchema = z.object({
  kind: z.literal("service"),
  machineId,
  ...common,
  provider: requiredText(120, "Enter who did the service (company or engineer)."),
  reference: optionalText(60),
  notes: requiredText(1000, "Say what was done, e.g. annual service and revalidation."),
});

export const faultSchema = z.object({
  kind: z.literal("fault"),
  machineId,
  ...common,
  notes: requiredText(1000, "Describe the fault, e.g. the error shown and what happened."),
});

export const sealTestSchema = z.object({
  kind: z.literal("seal_test"),
  machineId,
  ...common,
  outcome: z.enum(["pass", "fail"], { error: "Choose whether the seal test passed or failed." }),
});

export const waterReadingSchema = z
  .object({
    kind: z.literal("water_reading"),
    ...common,
    conductivityUsCm: optionalNumber("Enter the conductivity in µS/cm, e.g. 12.5.").refine(
      (v) => v === undefined || (v >= 0 && v <= 5000),
      "The conductivity is from 0 to 5000 µS/cm.",
    ),
    hardness: optionalNumber("Enter the hardness as a number, e.g. 0.2.").refine((v) => v === undefined || (v >= 0 && v <= 60), "The hardness is from 0 to 60."),
    hardnessUnit: z.enum(["mmol_l", "dh"], { error: "Choose mmol/l or °dH." }).default("mmol_l"),
  })
  .superRefine((v, ctx) => {
    if (v.conductivityUsCm === undefined && v.hardness === undefined) {
      ctx.addIssue({ code: "custom", path: ["conductivityUsCm"], message: "Enter the conductivity, the hardness, or both." });
    }
  });

export const saltRefillSchema = z.object({
  kind: z.literal("salt_refill"),
  ...common,
  saltKg: requiredNumber("Enter the salt added in kg, e.g. 25.").refine((v) => v === undefined || (v > 0 && v <= 1000), "Enter more than 0 and at most 1000 kg."),
});

export const storeClimateSchema = z.object({
  kind: z.literal("store_climate"),
  ...common,
  place: requiredText(80, "Name the store, e.g. Sterile store."),
  temperatureC: requiredNumber("Enter the temperature in °C, e.g. 19.2.").refine(
    (v) => v === undefined || (v >= -10 && v <= 50),
    "The temperature is from −10 to 50 °C: check the reading.",
  ),
  humidityPct: requiredNumber("Enter the relative humidity in %, e.g. 48.").refine(
    (v) => v === undefined || (v >= 0 && v <= 100),
    "The relative humidity is from 0 to 100 %.",
  ),
});

export const ENTRY_SCHEMAS = {
  washer_cleaning: washerCleaningSchema,
  service: serviceSchema,
  fault: faultSchema,
  seal_test: sealTestSchema,
  water_reading: waterReadingSchema,
  salt_refill: saltRefillSchema,
  store_climate: storeClimateSchema,
} as const;

export const entrySchema = z.discriminatedUnion("kind", [
  washerCleaningSchema,
  serviceSchema,
  faultSchema,
  sealTestSchema,
  waterReadingSchema,
  saltRefillSchema,
  storeClimateSchema,
]);
export type EntryInput = z.input<typeof entrySchema>;
export type EntryFields = z.output<typeof entrySchema>;

export const clearFaultSchema = z.object({
  id: z.coerce.number().int().positive(),
  note: requiredText(1000, "Say how the fault was cleared, e.g. the engineer's repair and the test run that passed."),
});
export type ClearFaultInput = z.input<typeof clearFaultSchema>;

const intervalDays = () =>
  z.coerce
    .number({ error: "Enter whole days from 1 to 366." })
    .int("Enter whole days from 1 to 366.")
    .min(1, "Enter whole days from 1 to 366.")
    .max(366, "Enter whole days from 1 to 366.");

const limitEnd = optionalNumber("Enter a number, or leave empty for no limit.").transform((v) => v ?? null);

export const settingsSchema = z.object({
  limits: z.object(Object.fromEntries(LIMIT_KEYS.map((k) => [k, z.object({ low: limitEnd, high: limitEnd })])) as Record<
    LimitKey,
    z.ZodObject<{ low: typeof limitEnd; high: typeof limitEnd }>
  >),
  intervals: z.object(Object.fromEntries(CHECK_KEYS.map((k) => [k, intervalDays()])) as Record<CheckKey, ReturnType<typeof intervalDays>>),
});
export type SettingsInput = z.input<typeof settingsSchema>;

/** The log list's filters, from the query string. */
export const logFilterSchema = z.object({
  machine: z.coerce.number().int().positive().optional().catch(undefined),
  kind: z.enum(ENTRY_KINDS).optional().catch(undefined),
  from: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/)
    .optional()
    .catch(undefined),
  to: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/)
    .optional()
    .catch(undefined),
  flagged: z.enum(["1"]).optional().catch(undefined),
});
export type LogFilter = z.output<typeof logFilterSchema>;
