import { promises as fs } from "node:fs";
import path from "node:path";
import { type Kysely, type Migration, type MigrationProvider, Migrator } from "kysely";

export const MIGRATIONS_DIR = path.join(process.cwd(), "migrations");

/**
 * The migrations of a folder, one per `.ts`/`.js` file, named by the file. Files whose name starts
 * with "_" are shared helpers of the migrations (migrations/_portable.ts), never migrations.
 */
export class MigrationFolder implements MigrationProvider {
  constructor(private readonly folder: string) {}

  async getMigrations(): Promise<Record<string, Migration>> {
    const migrations: Record<string, Migration> = {};
    for (const file of (await fs.readdir(this.folder)).sort()) {
      if (file.startsWith("_") || file.endsWith(".d.ts") || !/\.(ts|js|mts|mjs)$/.test(file)) continue;
      const loaded = (await import(path.join(this.folder, file))) as Partial<Migration> & { default?: Migration };
      const migration = typeof loaded.up === "function" ? loaded : loaded.default;
      if (typeof migration?.up !== "function") throw new Error(`Migration ${file} has no up() function`);
      migrations[file.slice(0, file.lastIndexOf("."))] = migration as Migration;
    }
    return migrations;
  }
}

/** Applies pending migrations; returns their names, or throws naming the one that failed. */
export async function migrateToLatest(db: Kysely<any>, folder = MIGRATIONS_DIR): Promise<string[]> {
  const migrator = new Migrator({ db, provider: new MigrationFolder(folder) });
  const { error, results } = await migrator.migrateToLatest();
  const failed = results?.find((r) => r.status === "Error");
  if (error || failed) {
    const reason = error instanceof Error ? error.message : String(error ?? "unknown error");
    throw new Error(`Migration ${failed?.migrationName ?? "(before any ran)"} failed: ${reason}`);
  }
  return (results ?? []).filter((r) => r.status === "Success").map((r) => r.migrationName);
}
