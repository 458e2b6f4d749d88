import "server-only";
import { type NextRequest, NextResponse } from "next/server";
import type { z } from "zod";
import { getDb, type DB } from "@/db";
import { getRequestUser } from "@/lib/auth/current-user";
import { type Action, assertCan } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, type ErrorBody, toAppError } from "@/lib/errors";
import { declareEntryPoint } from "./entry-points";

// The one wrapper for route handlers: loads the caller, checks the permission, refuses
// cross-site state changes, and maps every error to its status and JSON body.

export interface RouteContext<P> {
  req: NextRequest;
  user: SessionUser;
  db: DB;
  params: P;
}

type Handler<P> = (ctx: RouteContext<P>) => Promise<unknown>;

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export function withAuth<P = Record<string, never>>(action: Action, handler: Handler<P>) {
  const wrapped = async (req: NextRequest, context: { params: Promise<P> }): Promise<Response> => {
    try {
      if (!SAFE_METHODS.has(req.method)) assertSameOrigin(req);
      const user = await getRequestUser(req);
      if (!user) throw new AppError("unauthenticated", "Sign in first.");
      assertCan(user, action);
      const params = context?.params ? await context.params : ({} as P);
      const result = await handler({ req, user, db: getDb(), params });
      return result instanceof Response ? result : NextResponse.json(result);
    } catch (error) {
      return errorResponse(error);
    }
  };
  return declareEntryPoint(wrapped, action);
}

/** The JSON error answer for anything thrown in a handler. */
export function errorResponse(error: unknown): Response {
  const appError = toAppError(error);
  if (appError) {
    const body: ErrorBody = { error: { code: appError.code, message: appError.message, fields: appError.fields } };
    return NextResponse.json(body, { status: appError.status });
  }
  console.error(error);
  const body: ErrorBody = { error: { code: "internal", message: "Something went wrong on our side. Nothing was changed." } };
  return NextResponse.json(body, { status: 500 });
}

/** Refuses a state-changing request whose Origin is not this site (CSRF). */
export function assertSameOrigin(req: NextRequest): void {
  const origin = req.headers.get("origin");
  const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host");
  if (!origin || !host || originHost(origin) !== host) {
    throw new AppError("forbidden", "This request did not come from a Steamlane page.");
  }
}

/** The host of an Origin header, or null when it is not a URL (a malformed header is refused, not a 500). */
function originHost(origin: string): string | null {
  try {
    return new URL(origin).host;
  } catch {
    return null;
  }
}

/** Parses the query string with a zod schema (422 with the field list on failure). */
export function parseQuery<S extends z.ZodType>(req: NextRequest, schema: S): z.infer<S> {
  return schema.parse(Object.fromEntries(req.nextUrl.searchParams));
}

/** Parses a numeric id from a path segment; anything else is a 404, never a 500. */
export function parseId(value: string | undefined, what = "That record"): number {
  if (!value || !/^[1-9][0-9]{0,15}$/.test(value)) throw new AppError("not_found", `${what} was not found.`);
  return Number(value);
}
