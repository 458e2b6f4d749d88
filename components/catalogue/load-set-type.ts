import "server-only";
import { notFound } from "next/navigation";
import { getDb } from "@/db";
import type { SessionUser } from "@/lib/auth/session-user";
import { getSetType, type SetTypeDetail } from "@/lib/catalogue/set-types";
import { AppError } from "@/lib/errors";

/** The set type of a page's [id], or the not-found page (a malformed id, or another tenant's set type). */
export async function loadSetTypeOr404(user: SessionUser, rawId: string): Promise<SetTypeDetail> {
  if (!/^[1-9][0-9]{0,15}$/.test(rawId)) notFound();
  try {
    return await getSetType(getDb(), user, Number(rawId));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}
