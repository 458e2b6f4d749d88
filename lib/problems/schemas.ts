import { z } from "zod";
import type { ProblemKind } from "@/db/schema";
import { listQuerySchema } from "@/lib/http/paging";

// A problem a clinic reports after a delivery, and the unit's written answer: the shapes shared
// by the forms (zodResolver) and the server, which parses them again.

export const PROBLEM_KINDS = ["missing_instrument", "damaged_instrument", "wet_or_torn_pack", "wrong_set", "other"] as const satisfies readonly ProblemKind[];

export const PROBLEM_KIND_LABELS: Record<ProblemKind, string> = {
  missing_instrument: "An instrument is missing",
  damaged_instrument: "An instrument is damaged",
  wet_or_torn_pack: "The pack is wet, torn or open",
  wrong_set: "We received the wrong set",
  other: "Something else",
};

/** Short words for tables and badges. */
export const PROBLEM_KIND_SHORT: Record<ProblemKind, string> = {
  missing_instrument: "Missing instrument",
  damaged_instrument: "Damaged instrument",
  wet_or_torn_pack: "Wet or torn pack",
  wrong_set: "Wrong set",
  other: "Other",
};

/**
 * Kinds that are about one set as it arrived: they need a set of the order that was delivered.
 * "Other" may be about any set of the order, in any state, or about the order as a whole.
 */
export const DELIVERED_SET_KINDS: readonly ProblemKind[] = ["missing_instrument", "damaged_instrument", "wet_or_torn_pack", "wrong_set"];

export function needsDeliveredSet(kind: ProblemKind): boolean {
  return DELIVERED_SET_KINDS.includes(kind);
}

export const PROBLEM_STATUSES = ["open", "answered"] as const;
export type ProblemStatus = (typeof PROBLEM_STATUSES)[number];
export const PROBLEM_STATUS_LABELS: Record<ProblemStatus, string> = {
  open: "Open",
  answered: "Answered",
};

export const DESCRIPTION_MIN = 10;
export const DESCRIPTION_MAX = 2000;
export const ANSWER_MIN = 5;
export const ANSWER_MAX = 4000;

/** An optional id from a form: "" and null mean none. */
const optionalId = (message: string) =>
  z.preprocess((v) => (v === "" || v === undefined ? null : v), z.coerce.number().int().positive(message).nullable());

export const reportProblemSchema = z
  .object({
    orderId: z.coerce.number().int().positive("Choose the order."),
    cycleId: optionalId("Choose one of the order's sets."),
    kind: z.enum(PROBLEM_KINDS, { error: "Choose what is wrong." }),
    description: z
      .string()
      .trim()
      .min(DESCRIPTION_MIN, `Describe the problem in at least ${DESCRIPTION_MIN} characters: what, where in the set, how many.`)
      .max(DESCRIPTION_MAX, `Use at most ${DESCRIPTION_MAX} characters.`),
    photoFileId: optionalId("Upload the photo again."),
  })
  .refine((v) => !needsDeliveredSet(v.kind) || v.cycleId !== null, {
    path: ["cycleId"],
    message: "Choose the set this is about.",
  });
export type ReportProblemInput = z.input<typeof reportProblemSchema>;
export type ReportProblemFields = z.output<typeof reportProblemSchema>;

export const answerProblemSchema = z.object({
  problemId: z.coerce.number().int().positive(),
  answer: z
    .string()
    .trim()
    .min(ANSWER_MIN, `Write an answer of at least ${ANSWER_MIN} characters.`)
    .max(ANSWER_MAX, `Use at most ${ANSWER_MAX} characters.`),
});
export type AnswerProblemInput = z.input<typeof answerProblemSchema>;
export type AnswerProblemFields = z.output<typeof answerProblemSchema>;

/** Sorts of the problem lists; "queue" is open ones first, then the oldest first. */
export const PROBLEM_SORTS = ["queue", "created_at", "status", "customer", "kind"] as const;

export const listProblemsQuerySchema = listQuerySchema(PROBLEM_SORTS, {
  status: z.enum(PROBLEM_STATUSES).optional(),
  kind: z.enum(PROBLEM_KINDS).optional(),
  organisationId: z.coerce.number().int().positive().optional(),
  orderId: z.coerce.number().int().positive().optional(),
});
export type ListProblemsQuery = z.infer<typeof listProblemsQuerySchema>;

/** A waiting time in words: "12 min", "5 h", "3 days". */
export function formatWait(minutes: number): string {
  if (minutes < 60) return `${minutes} min`;
  const hours = Math.floor(minutes / 60);
  if (hours < 48) return `${hours} h`;
  return `${Math.floor(hours / 24)} days`;
}
