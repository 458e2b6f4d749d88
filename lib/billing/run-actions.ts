"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/http/action";
import { approveRun, createRun, discardRun } from "./run";
import { issueRun } from "./run-issue";
import { createRunSchema, runIdSchema } from "./run-schemas";

// Server actions of invoice runs (finance). Issuing runs in the action and answers per invoice.

export const createRunAction = defineAction("billing.manage", createRunSchema, async ({ db, user }, input) => {
  const created = await createRun(db, user, input);
  revalidatePath("/unit/billing");
  return created;
});

export const approveRunAction = defineAction("billing.manage", runIdSchema, async ({ db, user }, input) => {
  const result = await approveRun(db, user, input.runId);
  revalidatePath("/unit/billing");
  return result;
});

export const discardRunAction = defineAction("billing.manage", runIdSchema, async ({ db, user }, input) => {
  const result = await discardRun(db, user, input.runId);
  revalidatePath("/unit/billing");
  return result;
});

export const issueRunAction = defineAction("billing.manage", runIdSchema, async ({ db, user }, input) => {
  const result = await issueRun(db, user, input.runId);
  revalidatePath("/unit/billing");
  return result;
});
