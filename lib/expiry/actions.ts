"use server";

import { defineAction } from "@/lib/http/action";
import { sendBackSchema } from "./schemas";
import { sendBackForReprocessing } from "./send-back";

// Server actions of the nearing-expiry list.

export const sendBackAction = defineAction("orders.book", sendBackSchema, ({ db, user }, input) =>
  sendBackForReprocessing(db, user, input.cycleId),
);
