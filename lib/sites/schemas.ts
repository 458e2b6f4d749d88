import { z } from "zod";
import { listQuerySchema } from "@/lib/http/paging";
import { openingHoursSchema } from "./opening-hours";

// A site as the administrator edits it: address, map position, hours, delivery notes, contact.

const text = (label: string, max: number) =>
  z
    .string()
    .trim()
    .min(1, `Enter the ${label}.`)
    .max(max, `Use at most ${max} characters.`)
    .refine((v) => !/[\u0000-\u0008\u000b-\u001f]/.test(v), "Remove control characters.");

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters.`)
    .refine((v) => !/[\u0000-\u0008\u000b-\u001f]/.test(v), "Remove control characters.")
    .transform((v) => v || null);

export const siteSchema = z.object({
  organisationId: z.coerce.number().int().positive(),
  name: text("site's name", 120),
  addressLine1: text("street address", 160),
  addressLine2: optionalText(160),
  town: text("town", 80),
  postcode: text("postcode", 16),
  latitude: z.coerce.number({ error: "Enter the latitude in decimal degrees." }).min(-90, "Latitude is between −90 and 90.").max(90, "Latitude is between −90 and 90."),
  longitude: z.coerce.number({ error: "Enter the longitude in decimal degrees." }).min(-180, "Longitude is between −180 and 180.").max(180, "Longitude is between −180 and 180."),
  openingHours: openingHoursSchema,
  deliveryNotes: optionalText(1000),
  contactName: optionalText(120),
  contactPhone: optionalText(40).refine((v) => v === null || /^[0-9+()\s.-]{5,40}$/.test(v), "Use digits, spaces and + ( ) - only."),
  contactEmail: z
    .string()
    .trim()
    .max(254)
    .pipe(z.union([z.literal(""), z.email("Enter a valid e-mail address.")]))
    .transform((v) => v.toLowerCase() || null),
});
export type SiteInput = z.input<typeof siteSchema>;
export type SiteFields = z.output<typeof siteSchema>;

export const updateSiteSchema = siteSchema.extend({ id: z.coerce.number().int().positive() });

export const siteStatusSchema = z.object({ id: z.coerce.number().int().positive(), active: z.boolean() });

export const listSitesQuerySchema = listQuerySchema(["name", "organisation", "town", "postcode"], {
  organisationId: z.coerce.number().int().positive().optional(),
  active: z.enum(["yes", "no"]).optional(),
});
export type ListSitesQuery = z.infer<typeof listSitesQuerySchema>;
