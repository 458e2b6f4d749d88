import { encode } from "next-auth/jwt";
import { NextRequest } from "next/server";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { loadSessionUser, type SessionUser } from "@/lib/auth/session-user";

// Real next-auth session cookies for calling route handlers as a given user.

export async function sessionCookie(userId: number, sessionVersion = 0): Promise<string> {
  const token = await encode({ token: { sub: String(userId), sv: sessionVersion }, secret: process.env.NEXTAUTH_SECRET! });
  return `next-auth.session-token=${token}`;
}

export async function requestAs(
  userId: number | null,
  url: string,
  init: { method?: string; body?: unknown; origin?: string; sessionVersion?: number } = {},
): Promise<NextRequest> {
  const headers = new Headers({ host: "localhost:3000" });
  if (userId !== null) headers.set("cookie", await sessionCookie(userId, init.sessionVersion));
  if (init.origin) headers.set("origin", init.origin);
  if (init.body !== undefined) headers.set("content-type", "application/json");
  return new NextRequest(new URL(url, "http://localhost:3000"), {
    method: init.method ?? "GET",
    headers,
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  });
}

export function params<P>(value: P): { params: Promise<P> } {
  return { params: Promise.resolve(value) };
}

export async function sessionUser(db: Kysely<Database>, userId: number): Promise<SessionUser> {
  const user = await loadSessionUser(db, { userId, sessionVersion: 0 });
  if (!user) throw new Error(`user ${userId} cannot sign in`);
  return user;
}
