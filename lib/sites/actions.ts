"use server";

import { defineAction } from "@/lib/http/action";
import { siteSchema, siteStatusSchema, updateSiteSchema } from "./schemas";
import { createSite, setSiteActive, updateSite } from "./service";

// Server actions for the administrator's site records.

export const createSiteAction = defineAction("sites.manage", siteSchema, ({ db, user }, input) => createSite(db, user, input));

export const updateSiteAction = defineAction("sites.manage", updateSiteSchema, async ({ db, user }, input) => {
  await updateSite(db, user, input);
  return { id: input.id };
});

export const setSiteActiveAction = defineAction("sites.manage", siteStatusSchema, async ({ db, user }, input) => {
  await setSiteActive(db, user, input);
  return { id: input.id };
});
