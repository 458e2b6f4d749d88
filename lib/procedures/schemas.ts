import { z } from "zod";
import { listQuerySchema } from "@/lib/http/paging";

// Recording that a sterile set was taken for a procedure, shared by the form and the server.
// The procedure is identified by the clinic's own reference — a theatre or room and a case
// number — never by a patient's name, so these fields refuse text that reads like one.

/** Letters, digits, "-" and "/", starting with a letter or digit (1–30 characters: see the schema). */
export const CASE_REFERENCE_PATTERN = /^[A-Za-z0-9][A-Za-z0-9/-]*$/;
const THEATRE_PATTERN = /^[\p{L}\p{N}][\p{L}\p{N} ./&()-]*$/u;
// A courtesy title at the start ("Mr Jones", "Dr. Patel") is a person, not a room.
const PERSON_TITLE = /^(mr|mrs|ms|miss|mx|dr|prof|sir|dame|master)\.?(\s|$)/i;
// A date such as 12/03/1980 or 1980-03-12 in a case number is likely a date of birth.
const DATE_LIKE = /^(\d{1,2}[/-]\d{1,2}[/-]\d{2,4}|\d{4}[/-]\d{1,2}[/-]\d{1,2})$/;

export const caseReferenceSchema = z
  .string()
  .trim()
  .min(1, "Enter the case number.")
  .max(30, "A case number has at most 30 characters.")
  .regex(CASE_REFERENCE_PATTERN, "Use only letters, digits, - and / (no spaces): the case number, never a patient's name.")
  // Checked only once the characters are right, so each mistake gets one message.
  .refine((v) => !CASE_REFERENCE_PATTERN.test(v) || /\d/.test(v), "A case number has at least one digit. Enter the case number, never a patient's name.")
  .refine((v) => !CASE_REFERENCE_PATTERN.test(v) || !DATE_LIKE.test(v), "That looks like a date (of birth?). Enter the case number instead.");

export const theatreSchema = z
  .string()
  .trim()
  .min(1, "Enter the theatre or room.")
  .max(40, "Use at most 40 characters.")
  .regex(THEATRE_PATTERN, "Use letters, digits, spaces and . / & ( ) - only.")
  .refine((v) => !PERSON_TITLE.test(v), "That looks like a person's name. Enter the theatre or room, e.g. Theatre 2.");

export const scanCodeSchema = z
  .string()
  .trim()
  .min(1, "Scan the set's label or type its serial.")
  .max(200, "That is too long for a set's label; scan it again.");

export const checkScanQuerySchema = z.object({ code: scanCodeSchema });

export const recordUseSchema = z.object({
  code: scanCodeSchema,
  theatre: theatreSchema,
  caseReference: caseReferenceSchema,
  packChecked: z.literal(true, { error: "Check that the pack is intact and dry, then tick this." }),
  indicatorChecked: z.literal(true, { error: "Check that the indicator has changed, then tick this." }),
});
export type RecordUseInput = z.input<typeof recordUseSchema>;
export type RecordUseFields = z.output<typeof recordUseSchema>;

export const listUsesQuerySchema = listQuerySchema(["used_at", "serial", "theatre"], {});
export type ListUsesQuery = z.infer<typeof listUsesQuerySchema>;
