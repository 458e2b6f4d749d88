"use server";

import { defineAction } from "@/lib/http/action";
import { contractVersionSchema, endContractSchema, updateContractSchema } from "./schemas";
import { createContract, endContract, updateContract } from "./service";

// Server actions for contract versions: each checks contracts.manage, parses the form's input
// with the schema the form uses, and writes in one transaction with its audit entry.

export const createContractAction = defineAction("contracts.manage", contractVersionSchema, async ({ db, user }, input) => {
  return createContract(db, user, input);
});

export const updateContractAction = defineAction("contracts.manage", updateContractSchema, async ({ db, user }, input) => {
  return updateContract(db, user, input.id, input.values);
});

export const endContractAction = defineAction("contracts.manage", endContractSchema, async ({ db, user }, input) => {
  return endContract(db, user, input);
});
