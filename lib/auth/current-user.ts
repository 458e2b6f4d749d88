import "server-only";
import { getServerSession } from "next-auth";
import { getToken } from "next-auth/jwt";
import { notFound, redirect } from "next/navigation";
import type { NextRequest } from "next/server";
import { cache } from "react";
import { getDb } from "@/db";
import { authOptions } from "./options";
import { type Action, can } from "./permissions";
import { loadSessionUser, type SessionUser } from "./session-user";

/** The signed-in user of this request (server components and actions), loaded once per request. */
export const getCurrentUser = cache(async (): Promise<SessionUser | null> => {
  const session = await getServerSession(authOptions);
  if (!session?.userId) return null;
  return loadSessionUser(getDb(), { userId: session.userId, sessionVersion: session.sessionVersion });
});

/** The signed-in user of a route handler's request, read from its session cookie. */
export async function getRequestUser(req: NextRequest): Promise<SessionUser | null> {
  const token = await getToken({ req, secret: process.env.NEXTAUTH_SECRET });
  if (!token?.sub) return null;
  return loadSessionUser(getDb(), { userId: Number(token.sub), sessionVersion: Number(token.sv ?? 0) });
}

/** For pages: the user, or a redirect to sign in. */
export async function requireUser(): Promise<SessionUser> {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in");
  return user;
}

/** For pages: the user if their role may do the action; otherwise "not found", as for any page they cannot see. */
export async function requirePermission(action: Action): Promise<SessionUser> {
  const user = await requireUser();
  if (!can(user.role, action)) notFound();
  return user;
}
