import "server-only";
import { notFound } from "next/navigation";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { getOrderDetail, type OrderDetail } from "./service";

/** The order a page shows, or the not-found page (also for another tenant's order). */
export async function orderForPage(db: Kysely<Database>, user: SessionUser, idText: string): Promise<OrderDetail> {
  if (!/^[1-9]\d{0,15}$/.test(idText)) notFound();
  return getOrderDetail(db, user, Number(idText)).catch((error: unknown) => {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  });
}
