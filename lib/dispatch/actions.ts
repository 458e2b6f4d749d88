"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/http/action";
import { lockStop, moveStop, planDay } from "./plan";
import { publishPlan } from "./publish";
import { deleteShiftSchema, lockStopSchema, moveStopSchema, planDaySchema, publishSchema, shiftSchema, updateVanSchema, vanSchema } from "./schemas";
import { createVan, deleteShift, saveShift, updateVan } from "./vans";

// Server actions for vans (administrator), shifts and the day's plan (dispatcher).

export const createVanAction = defineAction("vans.manage", vanSchema, async ({ db, user }, input) => {
  const result = await createVan(db, user, input);
  revalidatePath("/unit/vans");
  return result;
});

export const updateVanAction = defineAction("vans.manage", updateVanSchema, async ({ db, user }, input) => {
  await updateVan(db, user, input);
  revalidatePath("/unit/vans");
  return { id: input.id };
});

export const saveShiftAction = defineAction("routes.plan", shiftSchema, ({ db, user }, input) => saveShift(db, user, input));

export const deleteShiftAction = defineAction("routes.plan", deleteShiftSchema, async ({ db, user }, input) => {
  await deleteShift(db, user, input.id);
  return { id: input.id };
});

export const planDayAction = defineAction("routes.plan", planDaySchema, ({ db, user }, input) => planDay(db, user, input));

export const moveStopAction = defineAction("routes.plan", moveStopSchema, async ({ db, user }, input) => {
  const { violations } = await moveStop(db, user, input);
  return { violations: violations.map((v) => v.message) };
});

export const lockStopAction = defineAction("routes.plan", lockStopSchema, async ({ db, user }, input) => {
  await lockStop(db, user, input);
  return { stopId: input.stopId };
});

export const publishPlanAction = defineAction("routes.plan", publishSchema, ({ db, user }, input) => publishPlan(db, user, input.day));

