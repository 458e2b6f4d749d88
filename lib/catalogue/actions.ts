"use server";

import { defineAction } from "@/lib/http/action";
import { createSetTypeSchema, setTypeActiveSchema, updateSetTypeSchema } from "./schemas";
import { createSetType, setSetTypeActive, updateSetType } from "./set-types";

// Server actions of the set catalogue. Each checks catalogue.manage, parses the input with the
// form's schema and works inside the caller's tenant scope.

export const createSetTypeAction = defineAction("catalogue.manage", createSetTypeSchema, async ({ db, user }, input) => {
  return createSetType(db, user, input);
});

export const updateSetTypeAction = defineAction("catalogue.manage", updateSetTypeSchema, async ({ db, user }, input) => {
  return updateSetType(db, user, input);
});

export const setSetTypeActiveAction = defineAction("catalogue.manage", setTypeActiveSchema, async ({ db, user }, input) => {
  await setSetTypeActive(db, user, input);
  return { setTypeId: input.setTypeId, active: input.active };
});
