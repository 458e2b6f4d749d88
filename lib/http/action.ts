import "server-only";
import type { z } from "zod";
import { getDb, type DB } from "@/db";
import { getCurrentUser } from "@/lib/auth/current-user";
import { type Action, assertCan } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, type ErrorCode, type FieldErrors, toAppError, zodFieldErrors } from "@/lib/errors";
import { declareEntryPoint } from "./entry-points";

// The one wrapper for server actions: the caller, the permission, the input parsed with the same
// zod schema the form uses, and every error returned as data the form can show.

export type ActionResult<T> =
  | { ok: true; data: T }
  | { ok: false; error: { code: ErrorCode | "internal"; message: string; fields?: FieldErrors } };

export interface ActionContext {
  user: SessionUser;
  db: DB;
}

export function defineAction<S extends z.ZodType, T>(
  action: Action,
  schema: S,
  run: (ctx: ActionContext, input: z.infer<S>) => Promise<T>,
) {
  const wrapped = async (input: z.input<S>): Promise<ActionResult<T>> => {
    try {
      const user = await getCurrentUser();
      if (!user) throw new AppError("unauthenticated", "Your session has ended. Sign in again.");
      assertCan(user, action);
      const parsed = schema.safeParse(input);
      if (!parsed.success) {
        return {
          ok: false,
          error: { code: "validation", message: "Some fields need attention.", fields: zodFieldErrors(parsed.error) },
        };
      }
      return { ok: true, data: await run({ user, db: getDb() }, parsed.data) };
    } catch (error) {
      return failure(error);
    }
  };
  return declareEntryPoint(wrapped, action, schema);
}

/** The error result for anything thrown in an action. */
export function failure(error: unknown): ActionResult<never> {
  const appError = toAppError(error);
  if (appError) return { ok: false, error: { code: appError.code, message: appError.message, fields: appError.fields } };
  console.error(error);
  return { ok: false, error: { code: "internal", message: "Something went wrong on our side. Nothing was saved." } };
}
