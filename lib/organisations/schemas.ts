import { z } from "zod";
import { listQuerySchema } from "@/lib/http/paging";

// Customer organisations as the administrator edits them.

const optionalEmail = z
  .string()
  .trim()
  .max(254)
  .transform((v) => v.toLowerCase())
  .pipe(z.union([z.literal(""), z.email("Enter a valid e-mail address.")]))
  .transform((v) => v || null);

export const organisationSchema = z.object({
  name: z
    .string()
    .trim()
    .min(2, "Enter the organisation's name.")
    .max(120, "Use at most 120 characters.")
    .refine((n) => !/[\u0000-\u001f<>]/.test(n), "Names cannot contain control characters or angle brackets."),
  shortCode: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z][A-Z0-9]{1,5}$/, "2 to 6 capital letters or digits, starting with a letter (it appears in set serials)."),
  billingEmail: optionalEmail,
});
export type OrganisationInput = z.input<typeof organisationSchema>;

export const updateOrganisationSchema = organisationSchema.extend({ id: z.coerce.number().int().positive() });

export const organisationStatusSchema = z.object({ id: z.coerce.number().int().positive(), active: z.boolean() });

export const listOrganisationsQuerySchema = listQuerySchema(["name", "short_code", "sites", "users"], {
  kind: z.enum(["unit", "customer"]).optional(),
  active: z.enum(["yes", "no"]).optional(),
});
export type ListOrganisationsQuery = z.infer<typeof listOrganisationsQuerySchema>;
