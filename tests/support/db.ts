import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Kysely } from "kysely";
import { closeDb, getDb } from "@/db";
import type { Database } from "@/db/schema";
import { migrateToLatest } from "@/db/migrator";
import { resetServerEnvCache } from "@/lib/env";

// A freshly migrated SQLite database for one test file, installed as the process's database so
// that route handlers and actions under test use it.

export interface TestDatabase {
  db: Kysely<Database>;
  dir: string;
  cleanup(): Promise<void>;
}

export async function useFreshDatabase(): Promise<TestDatabase> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-test-"));
  process.env.STEAMLANE_DATA_DIR = dir;
  delete process.env.DATABASE_PATH;
  process.env.NEXTAUTH_SECRET ??= "test-secret-of-sufficient-length-0123456789";
  resetServerEnvCache();
  await closeDb();
  const db = getDb();
  await migrateToLatest(db);
  return {
    db,
    dir,
    async cleanup() {
      await closeDb();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Row counts of the given tables, to prove a failed request wrote nothing. */
export async function countRows(db: Kysely<Database>, tables: (keyof Database)[]): Promise<Record<string, number>> {
  const counts: Record<string, number> = {};
  for (const table of tables) {
    const row = await db.selectFrom(table).select((eb) => eb.fn.countAll<number>().as("n")).executeTakeFirstOrThrow();
    counts[table] = Number(row.n);
  }
  return counts;
}
