import { z } from "zod";
import { clientEventIdSchema, MAX_RECORD_CHARS } from "@/lib/washing/schemas";
import { SHELF_LIFE_UNITS, STORAGE_KINDS } from "./shelf-life";

// Request bodies of the sterilising station, daily steriliser tests, release, recall and the
// sterilising settings.

export const openLoadSchema = z.object({
  machineId: z.coerce.number({ error: "Choose the steriliser." }).int().positive("Choose the steriliser."),
  programId: z.coerce.number({ error: "Choose the program." }).int().positive("Choose the program."),
});

export const scanIntoLoadSchema = z.object({
  code: z.string({ error: "Scan a set." }).trim().min(1, "Scan a set.").max(200, "That scan is too long to be a set's label."),
});

export const removeFromLoadSchema = z.object({ cycleId: z.coerce.number().int().positive() });

export const finishLoadSchema = z.object({
  record: z.object({
    fileName: z.string().trim().max(200).default("record.csv"),
    text: z.string({ error: "Upload the steriliser's record." }).min(1, "The file is empty.").max(MAX_RECORD_CHARS, "The record is too large: at most 5 MB."),
  }),
  ciType: z.coerce.number().int().min(1, "ISO 11140-1 types run from 1 to 6.").max(6, "ISO 11140-1 types run from 1 to 6.").nullable().default(null),
  ciResult: z.enum(["pass", "fail"], { error: "Record the chemical indicator: changed as expected, or not." }),
  biResult: z.enum(["pending", "pass", "not_used"], { error: "Say whether a biological indicator went in the load." }),
  biLot: z.string().trim().max(60).optional(),
  clientEventId: clientEventIdSchema,
});

export const abortLoadSchema = z.object({
  reason: z.string({ error: "Say what went wrong." }).trim().min(3, "Say what went wrong, e.g. the fault the steriliser showed.").max(500),
  clientEventId: clientEventIdSchema,
});

export const machineTestSchema = z.object({
  machineId: z.coerce.number({ error: "Choose the steriliser." }).int().positive("Choose the steriliser."),
  kind: z.enum(["air_removal", "leak"], { error: "Choose the test." }),
  result: z.enum(["pass", "fail"]).optional(),
  leakRateKpaMin: z.coerce.number().min(0, "A leak rate is not negative.").max(100, "That leak rate is implausible.").nullable().optional(),
  notes: z.string().trim().max(500).nullable().optional(),
});

export const releaseLoadSchema = z.object({
  earlyReleaseReason: z.string().trim().max(500).optional(),
  notes: z.string().trim().max(500).optional(),
});

export const failLoadSchema = z.object({
  reason: z.string({ error: "Say why the load fails." }).trim().min(5, "Say why the load fails (at least a few words).").max(1000),
});

export const biResultSchema = z.object({ result: z.enum(["pass", "fail"], { error: "Choose no growth or growth." }) });

export const returnRecalledSchema = z.object({ cycleId: z.coerce.number().int().positive() });

export const sterileSettingsSchema = z.object({
  leakLimitKpaMin: z.coerce.number().positive("The leak limit is a positive number of kPa/min.").max(10),
  heavySetThresholdG: z.coerce.number().int().min(500, "At least 500 g.").max(50_000, "At most 50 kg."),
  rules: z
    .array(
      z.object({
        packaging: z.string().trim().min(1).max(40),
        storage: z.enum(STORAGE_KINDS),
        amount: z.coerce.number().int("Whole numbers only.").positive("At least 1."),
        unit: z.enum(SHELF_LIFE_UNITS),
      }),
    )
    .max(40),
});
