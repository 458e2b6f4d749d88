"use server";

import { defineAction } from "@/lib/http/action";
import { recordUseSchema } from "./schemas";
import { recordProcedureUse } from "./service";

// Server actions for recording sets used for procedures.

export const recordUseAction = defineAction("procedures.record", recordUseSchema, ({ db, user }, input) =>
  recordProcedureUse(db, user, input),
);
