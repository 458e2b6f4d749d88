import { z } from "zod";
import { listQuerySchema } from "@/lib/http/paging";

// A pickup as the clinic books it, shared by the booking form and the server.

const localDateTime = (what: string) =>
  z.string().trim().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, `Choose the ${what} date and time.`);

export const ORDER_STATUSES = ["booked", "collected", "in_process", "ready", "out_for_delivery", "delivered", "cancelled"] as const;

export const ORDER_STATUS_LABELS: Record<(typeof ORDER_STATUSES)[number], string> = {
  booked: "Pickup booked",
  collected: "Collected",
  in_process: "At the unit",
  ready: "Ready to return",
  out_for_delivery: "Out for delivery",
  delivered: "Delivered",
  cancelled: "Cancelled",
};

export const extraItemSchema = z.object({
  description: z.string().trim().min(1, "Say what the item is.").max(120, "Use at most 120 characters."),
  quantity: z.coerce.number({ error: "Enter how many." }).int("Use a whole number.").min(1, "At least 1.").max(500, "At most 500."),
});

export const bookingSchema = z
  .object({
    siteId: z.coerce.number().int().positive("Choose the site."),
    setIds: z.array(z.coerce.number().int().positive()).max(200, "Book at most 200 sets at once."),
    extras: z.array(extraItemSchema).max(20, "List at most 20 other items."),
    collectionFrom: localDateTime("earliest collection"),
    collectionUntil: localDateTime("latest collection"),
    neededBackBy: localDateTime("needed-back-by"),
    serviceLevel: z.enum(["standard", "express"], { error: "Choose standard or express." }),
    heavySoil: z.boolean(),
    /** Keep the sets in the unit's store after processing, until the clinic asks for them. */
    keepInStore: z.boolean().default(false),
    notes: z
      .string()
      .trim()
      .max(1000, "Use at most 1000 characters.")
      .transform((v) => v || null),
  })
  .refine((v) => v.setIds.length + v.extras.length > 0, { path: ["setIds"], message: "Add at least one set or item to collect." })
  .refine((v) => new Set(v.setIds).size === v.setIds.length, { path: ["setIds"], message: "A set is listed twice." });
export type BookingInput = z.input<typeof bookingSchema>;
export type BookingFields = z.output<typeof bookingSchema>;

export const amendBookingSchema = bookingSchema.safeExtend({ orderId: z.coerce.number().int().positive() });

export const storeRequestSchema = z.object({
  siteId: z.coerce.number().int().positive("Choose the site."),
  cycleIds: z
    .array(z.coerce.number().int().positive())
    .min(1, "Choose at least one set from the store.")
    .max(200, "Ask for at most 200 sets at once.")
    .refine((ids) => new Set(ids).size === ids.length, "A set is listed twice."),
  neededBy: localDateTime("needed-by"),
  notes: z
    .string()
    .trim()
    .max(1000, "Use at most 1000 characters.")
    .transform((v) => v || null),
});
export type StoreRequestInput = z.input<typeof storeRequestSchema>;

export const cancelOrderSchema = z.object({
  orderId: z.coerce.number().int().positive(),
  reason: z.string().trim().max(500).optional(),
});

const localDate = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date like 2026-12-01.")
  .refine((d) => {
    const parsed = new Date(`${d}T00:00:00Z`);
    return !Number.isNaN(parsed.getTime()) && parsed.toISOString().slice(0, 10) === d;
  }, "That date does not exist.");

export const listOrdersQuerySchema = listQuerySchema(["created_at", "reference", "status", "site", "collection_from", "promised_return_at"], {
  status: z.enum(ORDER_STATUSES).optional(),
  siteId: z.coerce.number().int().positive().optional(),
  organisationId: z.coerce.number().int().positive().optional(),
  from: localDate.optional(),
  to: localDate.optional(),
});
export type ListOrdersQuery = z.infer<typeof listOrdersQuerySchema>;
