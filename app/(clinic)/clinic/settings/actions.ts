"use server";

import { defineAction } from "@/lib/http/action";
import { mailPreferencesSchema } from "@/lib/orders/mail-preferences";
import { saveMailPreferences } from "./preferences";

// Saving the caller's own e-mail preferences. Every signed-in role may view its home; the
// service refuses unit staff, who receive none of these e-mails.
export const saveMailPreferencesAction = defineAction("mail.preferences", mailPreferencesSchema, ({ db, user }, input) =>
  saveMailPreferences(db, user, input),
);
