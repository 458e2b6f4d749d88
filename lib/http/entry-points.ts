import type { z } from "zod";
import type { Action } from "@/lib/auth/permissions";

// The permission (and, for server actions, the input schema) each wrapped entry point was
// declared with, so tests and reviews can ask an exported route handler or server action what it
// requires without keeping a list by hand.

interface Declared {
  action: Action;
  schema?: z.ZodType;
}

const declared = new WeakMap<object, Declared>();

/** Records the permission (and input schema) of a wrapped handler or action; answers the function unchanged. */
export function declareEntryPoint<F extends object>(fn: F, action: Action, schema?: z.ZodType): F {
  declared.set(fn, { action, schema });
  return fn;
}

/** The permission an exported handler or action was wrapped with, or null for an unwrapped one. */
export function declaredPermission(fn: unknown): Action | null {
  return typeof fn === "function" ? (declared.get(fn)?.action ?? null) : null;
}

/** The zod schema a server action parses its input with, or null. */
export function declaredSchema(fn: unknown): z.ZodType | null {
  return typeof fn === "function" ? (declared.get(fn)?.schema ?? null) : null;
}
