import fs from "node:fs";
import path from "node:path";
import SQLite from "better-sqlite3";
import { Kysely, PostgresDialect, SqliteDialect } from "kysely";
import { Pool, types as pgTypes } from "pg";
import type { ServerEnv } from "@/lib/env";
import { PostgresSchemaPlugin } from "./dialect";
import type { Database } from "./schema";

/** Opens a Kysely handle on a SQLite file with the settings every process uses. */
export function openDatabase(file: string): Kysely<Database> {
  if (file !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  const sqlite = new SQLite(file);
  sqlite.pragma("journal_mode = WAL");
  sqlite.pragma("foreign_keys = ON");
  sqlite.pragma("busy_timeout = 5000");
  sqlite.pragma("synchronous = NORMAL");
  return new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
}

// PostgreSQL type ids whose text form pg would hand over as strings or booleans.
const INT8 = 20;
const NUMERIC = 1700;
const BOOL = 16;

function parseInt8(text: string): number {
  const value = Number(text);
  if (!Number.isSafeInteger(value)) throw new Error(`The database returned ${text}, too large for a JavaScript number`);
  return value;
}

/**
 * The values PostgreSQL returns, shaped as SQLite returns them, so one query reads the same on
 * both: count(*) and sum() of integers (bigint, numeric) come back as numbers, not strings, and
 * a comparison or exists() in a select list as 1 or 0, like the integer booleans of the schema.
 */
const sqliteShapedTypes = {
  getTypeParser(oid: number, format?: "text" | "binary") {
    if (format === undefined || format === "text") {
      if (oid === INT8) return parseInt8;
      if (oid === NUMERIC) return Number;
      if (oid === BOOL) return (text: string) => (text === "t" ? 1 : 0);
    }
    return pgTypes.getTypeParser(oid, format as "text");
  },
} as typeof pgTypes;

export interface PostgresOptions {
  /** Connections in the pool (default 10). */
  max?: number;
}

/** Opens a Kysely handle on a PostgreSQL database given by a postgres:// address. */
export function openPostgres(url: string, options: PostgresOptions = {}): Kysely<Database> {
  const pool = new Pool({ connectionString: url, max: options.max ?? 10, types: sqliteShapedTypes });
  // An idle connection that the server drops must not crash the process; the pool replaces it.
  pool.on("error", (error) => console.error(`PostgreSQL connection error: ${error.message}`));
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool }), plugins: [new PostgresSchemaPlugin()] });
}

/** Where the database is: DATABASE_URL (PostgreSQL) when set, else the SQLite file (see lib/env.ts). */
export type DatabaseConfig = Pick<ServerEnv, "DATABASE_URL" | "databasePath">;

/** The database a process is configured for: PostgreSQL when a postgres:// address is given, else the SQLite file. */
export function openConfigured(config: DatabaseConfig): Kysely<Database> {
  return config.DATABASE_URL ? openPostgres(config.DATABASE_URL) : openDatabase(config.databasePath);
}

/** Names the configured database for log lines, without the password of an address. */
export function describeConfigured(config: DatabaseConfig): string {
  if (!config.DATABASE_URL) return config.databasePath;
  const url = new URL(config.DATABASE_URL);
  if (url.password) url.password = "***";
  return url.toString();
}
