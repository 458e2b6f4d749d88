"use server";

import { defineAction } from "@/lib/http/action";
import { answerProblemSchema, reportProblemSchema } from "./schemas";
import { answerProblem, reportProblem } from "./service";

// Server actions: a clinic reports a problem with a delivered set; the unit answers it.

export const reportProblemAction = defineAction("problems.report", reportProblemSchema, ({ db, user }, input) => reportProblem(db, user, input));

export const answerProblemAction = defineAction("problems.answer", answerProblemSchema, ({ db, user }, input) => answerProblem(db, user, input));
