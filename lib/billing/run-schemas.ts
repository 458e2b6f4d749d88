import { z } from "zod";

// The inputs of invoice runs, shared by the pages, the route handlers and the server actions.

export const billingMonthSchema = z
  .string({ error: "Choose a month." })
  .trim()
  .regex(/^\d{4}-(0[1-9]|1[0-2])$/, "Write the month as YYYY-MM, for example 2026-11.");

export const previewQuerySchema = z.object({ period: billingMonthSchema });

export const createRunSchema = z.object({
  period: billingMonthSchema,
  /** The preview's token: the run is refused when what it would bill has changed since. */
  token: z.string().trim().min(8).max(64).optional(),
});
export type CreateRunInput = z.infer<typeof createRunSchema>;

export const runIdSchema = z.object({ runId: z.coerce.number().int().positive({ error: "Choose a run." }) });
