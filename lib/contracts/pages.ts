import "server-only";
import { notFound } from "next/navigation";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { parseId } from "@/lib/http/route";
import { type ContractDetail, getContract } from "./service";

/** For pages: the version with this id in the caller's scope, or the not-found page. */
export async function contractForPage(db: Kysely<Database>, user: SessionUser, idText: string | undefined): Promise<ContractDetail> {
  try {
    return await getContract(db, user, parseId(idText, "That contract"));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}
