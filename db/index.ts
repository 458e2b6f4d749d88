import "server-only";
import type { Kysely } from "kysely";
import { serverEnv } from "@/lib/env";
import { openConfigured } from "./connection";
import type { Database } from "./schema";

export type { Database } from "./schema";
export type DB = Kysely<Database>;

const globalForDb = globalThis as unknown as { steamlaneDb?: Kysely<Database> };

/** The one Kysely instance of this process, opened on first use: PostgreSQL when DATABASE_URL is set, else SQLite. */
export function getDb(): Kysely<Database> {
  if (!globalForDb.steamlaneDb) globalForDb.steamlaneDb = openConfigured(serverEnv());
  return globalForDb.steamlaneDb;
}

/** Closes the process's instance (tests and scripts). */
export async function closeDb(): Promise<void> {
  const db = globalForDb.steamlaneDb;
  globalForDb.steamlaneDb = undefined;
  await db?.destroy();
}
