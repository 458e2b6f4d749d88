import { promises as fs } from "node:fs";
import path from "node:path";
import { FileMigrationProvider, type Kysely, Migrator } from "kysely";

export const MIGRATIONS_DIR = path.join(process.cwd(), "migrations");

/** Applies pending migrations; returns their names, or throws naming the one that failed. */
export async function migrateToLatest(db: Kysely<any>, folder = MIGRATIONS_DIR): Promise<string[]> {
  const migrator = new Migrator({ db, provider: new FileMigrationProvider({ fs, path, migrationFolder: folder }) });
  const { error, results } = await migrator.migrateToLatest();
  const failed = results?.find((r) => r.status === "Error");
  if (error || failed) {
    const reason = error instanceof Error ? error.message : String(error ?? "unknown error");
    throw new Error(`Migration ${failed?.migrationName ?? "(before any ran)"} failed: ${reason}`);
  }
  return (results ?? []).filter((r) => r.status === "Success").map((r) => r.migrationName);
}
