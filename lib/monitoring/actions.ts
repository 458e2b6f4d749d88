"use server";

import { defineAction } from "@/lib/http/action";
import { serverEnv } from "@/lib/env";
import { clearFaultSchema, entrySchema, settingsSchema } from "./schemas";
import { clearFault, recordEntry, saveSettings } from "./service";

// Server actions of the monitoring and maintenance log.

export const recordEntryAction = defineAction("machine_log.record", entrySchema, ({ db, user }, input) =>
  recordEntry(db, user, input, serverEnv().UNIT_TIME_ZONE),
);

export const clearFaultAction = defineAction("machine_log.manage", clearFaultSchema, async ({ db, user }, input) => {
  await clearFault(db, user, input);
  return { id: input.id };
});

export const saveSettingsAction = defineAction("machine_log.manage", settingsSchema, async ({ db, user }, input) => {
  await saveSettings(db, user, input);
  return { saved: true };
});
