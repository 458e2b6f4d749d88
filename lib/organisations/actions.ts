"use server";

import { defineAction } from "@/lib/http/action";
import { organisationSchema, organisationStatusSchema, updateOrganisationSchema } from "./schemas";
import { createCustomer, setOrganisationActive, updateOrganisation } from "./service";

// Server actions for the administrator's customer records.

export const createCustomerAction = defineAction("organisations.manage", organisationSchema, ({ db, user }, input) =>
  createCustomer(db, user, input),
);

export const updateOrganisationAction = defineAction("organisations.manage", updateOrganisationSchema, async ({ db, user }, input) => {
  await updateOrganisation(db, user, input);
  return { id: input.id };
});

export const setOrganisationActiveAction = defineAction("organisations.manage", organisationStatusSchema, async ({ db, user }, input) => {
  await setOrganisationActive(db, user, input);
  return { id: input.id };
});
