"use server";

import { revalidatePath } from "next/cache";
import { updateSellerDetails } from "@/lib/billing/exports-document";
import { setReminderSchedule } from "@/lib/billing/reminders";
import { defineAction } from "@/lib/http/action";
import { reminderScheduleSchema, sellerDetailsSchema } from "./schemas";

// Saving finance's billing settings.

export const saveReminderScheduleAction = defineAction("billing.manage", reminderScheduleSchema, async ({ db, user }, input) => {
  const days = await setReminderSchedule(db, user, input.days.map((d) => d.value));
  revalidatePath("/unit/billing/settings");
  return { days };
});

export const saveSellerDetailsAction = defineAction("billing.manage", sellerDetailsSchema, async ({ db, user }, input) => {
  const details = await updateSellerDetails(db, user, { vatId: input.vatId || null, billingEmail: input.billingEmail || null });
  revalidatePath("/unit/billing/settings");
  return { vatId: details.vatId, billingEmail: details.billingEmail };
});
