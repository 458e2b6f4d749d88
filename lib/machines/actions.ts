"use server";

import { defineAction } from "@/lib/http/action";
import { machineSchema, programSchema, updateMachineSchema, updateProgramSchema } from "./schemas";
import { createMachine, createProgram, updateMachine, updateProgram } from "./service";

// Server actions for the unit's machines and their programs (administrator and quality lead).

export const createMachineAction = defineAction("machines.manage", machineSchema, ({ db, user }, input) => createMachine(db, user, input));

export const updateMachineAction = defineAction("machines.manage", updateMachineSchema, async ({ db, user }, input) => {
  await updateMachine(db, user, input);
  return { id: input.id };
});

export const createProgramAction = defineAction("machines.manage", programSchema, ({ db, user }, input) => createProgram(db, user, input));

export const updateProgramAction = defineAction("machines.manage", updateProgramSchema, async ({ db, user }, input) => {
  await updateProgram(db, user, input);
  return { id: input.id };
});
