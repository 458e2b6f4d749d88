import { z } from "zod";

// Finance's billing settings: the reminder schedule and the unit's details on its e-invoices.

export const reminderScheduleSchema = z.object({
  days: z
    .array(
      z.object({
        value: z.coerce
          .number({ error: "A whole number of days." })
          .int({ error: "A whole number of days." })
          .min(1, { error: "At least 1 day after the due date." })
          .max(365, { error: "At most 365 days." }),
      }),
    )
    .max(10, { error: "At most 10 reminders." })
    .refine((days) => new Set(days.map((d) => d.value)).size === days.length, { error: "Each day may appear once." }),
});
export type ReminderScheduleInput = z.input<typeof reminderScheduleSchema>;
export type ReminderSchedule = z.output<typeof reminderScheduleSchema>;

export const sellerDetailsSchema = z.object({
  vatId: z
    .string()
    .transform((v) => v.replace(/[\s.-]/g, "").toUpperCase())
    .refine((v) => v === "" || /^[A-Z]{2}[A-Z0-9]{2,13}$/.test(v), { error: "A VAT number with its country prefix, such as GB123456789." }),
  billingEmail: z.union([z.literal(""), z.email({ error: "An e-mail address, such as accounts@example.org." })]),
});
export type SellerDetailsInput = z.input<typeof sellerDetailsSchema>;
export type SellerDetailsForm = z.output<typeof sellerDetailsSchema>;
