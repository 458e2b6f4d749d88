import { z } from "zod";
import { listQuerySchema } from "@/lib/http/paging";
import { MANUAL_WASH_STEPS } from "./checklist";
import { ENTERED_PHASES } from "./entered";

// Request bodies of the washing and manual-washing stations, and the batch list's query.

/** Made by the browser (crypto.randomUUID), so a retried request records nothing twice. */
export const clientEventIdSchema = z
  .string({ error: "Send a client event id with the request." })
  .trim()
  .min(8, "The client event id is too short.")
  .max(100, "The client event id is too long.")
  .regex(/^[A-Za-z0-9-]+$/, "The client event id holds letters, digits and dashes only.");

export const openBatchSchema = z.object({
  machineId: z.coerce.number({ error: "Choose the washer." }).int().positive("Choose the washer."),
  programId: z.coerce.number({ error: "Choose the program." }).int().positive("Choose the program."),
});

export const scanIntoBatchSchema = z.object({
  code: z.string({ error: "Scan a set." }).trim().min(1, "Scan a set.").max(200, "That scan is too long to be a set's label."),
});

export const removeFromBatchSchema = z.object({ cycleId: z.coerce.number().int().positive() });

/** The largest record accepted as text: the cycle record upload limit. */
export const MAX_RECORD_CHARS = 5 * 1024 * 1024;

export const batchRecordSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({
      kind: z.literal("csv"),
      fileName: z.string().trim().max(200).default("record.csv"),
      text: z.string().min(1, "The file is empty.").max(MAX_RECORD_CHARS, "The record is too large: at most 5 MB."),
    }),
    z.object({
      kind: z.literal("entered"),
      rows: z
        .array(
          z.object({
            t: z.string().max(30),
            tempC: z.string().max(30),
            phase: z.enum(ENTERED_PHASES).default(""),
          }),
        )
        .min(2, "Enter at least two samples: the record needs a start and an end.")
        .max(5000, "Enter at most 5000 samples; upload the machine's file instead."),
    }),
  ],
  { error: "Upload the machine's record or enter its values." },
);
export type BatchRecordInput = z.output<typeof batchRecordSchema>;

export const closeBatchSchema = z.object({ record: batchRecordSchema, clientEventId: clientEventIdSchema });

export const abortBatchSchema = z.object({
  reason: z
    .string({ error: "Say what went wrong." })
    .trim()
    .min(3, "Say what went wrong, e.g. the fault code the washer showed.")
    .max(500, "Use at most 500 characters."),
  clientEventId: clientEventIdSchema,
});

export const manualWashScanSchema = scanIntoBatchSchema;

export const manualWashConfirmSchema = z.object({
  cycleId: z.coerce.number().int().positive(),
  checks: z.partialRecord(z.enum(MANUAL_WASH_STEPS), z.boolean()).default({}),
  clientEventId: clientEventIdSchema,
});

export const BATCH_STATUSES = ["loading", "running", "passed", "failed", "aborted"] as const;

export const listBatchesQuerySchema = listQuerySchema(["created_at", "number", "machine", "program", "status"], {
  machineId: z.coerce.number().int().positive().optional(),
  status: z.enum(BATCH_STATUSES).optional(),
});
export type ListBatchesQuery = z.infer<typeof listBatchesQuerySchema>;
