import fs from "node:fs";
import path from "node:path";
import SQLite from "better-sqlite3";
import { Kysely, SqliteDialect } from "kysely";
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
