import { z } from "zod";
import { PACKAGINGS } from "@/lib/catalogue/vocabulary";

// What the packing station sends: a scan, and the packing of one cycle with its counts. Parsed
// the same way by the screen and the route handlers.

export const packingScanSchema = z.object({
  code: z.string().trim().min(1, "Scan a set or type its serial.").max(200, "That is too long for a set's code."),
});
export type PackingScanInput = z.infer<typeof packingScanSchema>;

/** What the packer decided: pack (everything there), pack with the irregularity recorded, or hold. */
export const PACK_DECISIONS = ["pack", "pack_with_irregularity", "hold"] as const;
export type PackDecision = (typeof PACK_DECISIONS)[number];

const millimetres = z.number().positive().max(2000);
const pouchSizeSchema = z.object({ widthMm: millimetres, lengthMm: millimetres });

export const lineCountSchema = z.object({
  position: z.number().int().positive(),
  counted: z.number().int("Count whole instruments.").min(0, "A count cannot be below 0.").max(999).nullable(),
  damaged: z.number().int("Count whole instruments.").min(0, "A count cannot be below 0.").max(999).default(0),
});

export const packSchema = z.object({
  cycleId: z.number().int().positive(),
  /** Made by the browser (crypto.randomUUID()) once per pack, so a retried request records once. */
  clientEventId: z.uuid("The request needs an id made by the station (a UUID)."),
  decision: z.enum(PACK_DECISIONS),
  counts: z.array(lineCountSchema).max(500),
  packaging: z.enum(PACKAGINGS, "Choose the packaging."),
  packagingReason: z.string().trim().max(300, "Keep the reason under 300 characters.").default(""),
  /** The pouch used, for single and double pouches; the outer one for double pouches. */
  pouch: z.object({ inner: pouchSizeSchema, outer: pouchSizeSchema.nullable() }).nullable().default(null),
  note: z.string().trim().max(500, "Keep the note under 500 characters.").default(""),
});
export type PackInput = z.infer<typeof packSchema>;
export type PackRequest = z.input<typeof packSchema>;
