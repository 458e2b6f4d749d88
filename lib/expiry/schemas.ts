import { z } from "zod";

// Inputs of the nearing-expiry list and its "send back" button, shared by the client and server.

export const DEFAULT_EXPIRY_DAYS = 14;
export const EXPIRY_DAY_CHOICES = [7, 14, 30, 60] as const;

export const expiringQuerySchema = z.object({
  days: z.coerce
    .number({ error: "Give the number of days ahead as a whole number." })
    .int("Give the number of days ahead as a whole number.")
    .min(0, "Look at least 0 days ahead.")
    .max(90, "Look at most 90 days ahead.")
    .default(DEFAULT_EXPIRY_DAYS),
});
export type ExpiringQuery = z.infer<typeof expiringQuerySchema>;

export const sendBackSchema = z.object({ cycleId: z.coerce.number().int().positive("Choose a set from the list.") });
export type SendBackInput = z.input<typeof sendBackSchema>;
