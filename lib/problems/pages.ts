import "server-only";
import type { Kysely } from "kysely";
import { notFound } from "next/navigation";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { getProblemDetail, type ProblemDetail } from "./service";

/** The problem a page shows, or the not-found page (also for another tenant's problem). */
export async function problemForPage(db: Kysely<Database>, user: SessionUser, idText: string): Promise<ProblemDetail> {
  if (!/^[1-9]\d{0,15}$/.test(idText)) notFound();
  return getProblemDetail(db, user, Number(idText)).catch((error: unknown) => {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  });
}
