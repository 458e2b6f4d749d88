import { z } from "zod";
import { listQuerySchema } from "@/lib/http/paging";

// Input shapes shared by the forms (zodResolver) and the server, which parses them again.

export const SET_STATUSES = ["in_service", "retired"] as const;
export type SetStatus = (typeof SET_STATUSES)[number];

/** At most this many sets are added in one go. */
export const MAX_SETS_PER_BATCH = 200;

const id = (message: string) => z.coerce.number({ error: message }).int(message).positive(message);

export const createSetsSchema = z.object({
  organisationId: id("Choose the customer."),
  setTypeId: id("Choose the set type."),
  homeSiteId: id("Choose the home site."),
  count: z.coerce
    .number({ error: "Enter how many sets to add." })
    .int("Enter a whole number of sets.")
    .min(1, "Add at least one set.")
    .max(MAX_SETS_PER_BATCH, `Add at most ${MAX_SETS_PER_BATCH} sets at a time.`),
});
export type CreateSetsInput = z.input<typeof createSetsSchema>;

export const changeSetStatusSchema = z.object({
  setId: id("That set was not found."),
  status: z.enum(SET_STATUSES, { error: "Choose in service or retired." }),
  reason: z
    .string()
    .trim()
    .min(3, "Say why, in a few words.")
    .max(500, "Use at most 500 characters.")
    .refine((r) => !/[\u0000-\u0008\u000b\u000c\u000e-\u001f]/.test(r), "The reason cannot contain control characters."),
});
export type ChangeSetStatusInput = z.input<typeof changeSetStatusSchema>;

export const SET_SORTS = ["serial", "set_type", "organisation", "home_site", "status", "created_at"] as const;

export const listSetsQuerySchema = listQuerySchema(SET_SORTS, {
  organisationId: z.coerce.number().int().positive().optional(),
  siteId: z.coerce.number().int().positive().optional(),
  setTypeId: z.coerce.number().int().positive().optional(),
  status: z.enum(SET_STATUSES).optional(),
});
export type ListSetsQuery = z.infer<typeof listSetsQuerySchema>;

export const lookupQuerySchema = z.object({
  code: z.string({ error: "Scan or type a set's code." }).min(1, "Scan or type a set's code.").max(200, "That code is too long to be a set's."),
});

export const labelQuerySchema = z.object({
  contents: z.enum(["0", "1"]).default("0"),
});

export const SET_STATUS_LABELS: Record<SetStatus, string> = {
  in_service: "In service",
  retired: "Retired",
};
