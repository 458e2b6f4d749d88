"use server";

import { defineAction } from "@/lib/http/action";
import { changeSetStatusSchema, createSetsSchema } from "./schemas";
import { changeSetStatus, createSets } from "./service";

// Server actions for sets. Each checks the caller's permission; the service applies the tenant scope.

export const createSetsAction = defineAction("sets.manage", createSetsSchema, async ({ db, user }, input) => {
  const { sets } = await createSets(db, user, input);
  return { ids: sets.map((s) => s.id), firstSerial: sets[0]?.serial ?? null, lastSerial: sets.at(-1)?.serial ?? null };
});

export const changeSetStatusAction = defineAction("sets.manage", changeSetStatusSchema, async ({ db, user }, input) => {
  const set = await changeSetStatus(db, user, input);
  return { id: set.id, status: set.status };
});
