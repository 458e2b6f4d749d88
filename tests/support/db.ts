import { randomBytes } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { type Kysely, sql } from "kysely";
import { Client } from "pg";
import { closeDb, getDb } from "@/db";
import type { Database } from "@/db/schema";
import { migrateToLatest } from "@/db/migrator";
import { resetServerEnvCache, serverEnv } from "@/lib/env";

// A freshly migrated database for one test file, installed as the process's database so that
// route handlers and actions under test use it: a SQLite file by default, or, with
// TEST_DATABASE=postgres, a new database on the PostgreSQL server at TEST_PG_URL (`npm run test:pg`).

export interface TestDatabase {
  db: Kysely<Database>;
  /** The test file's own data folder (uploads; the SQLite file). */
  dir: string;
  cleanup(): Promise<void>;
}

/** The server the PostgreSQL run creates its databases on; .ci/run starts one at this address. */
export const DEFAULT_TEST_PG_URL = "postgres://postgres@127.0.0.1:5433/postgres";

/** Which database the suite runs on, from TEST_DATABASE ("sqlite", the default, or "postgres"). */
export function testDatabaseKind(): "sqlite" | "postgres" {
  const kind = process.env.TEST_DATABASE ?? "sqlite";
  if (kind !== "sqlite" && kind !== "postgres") throw new Error(`TEST_DATABASE must be "sqlite" or "postgres", not "${kind}"`);
  return kind;
}

/** Runs one statement on the server's maintenance database (CREATE / DROP DATABASE). */
export async function onPostgresServer(statement: string): Promise<void> {
  const client = new Client({ connectionString: process.env.TEST_PG_URL ?? DEFAULT_TEST_PG_URL });
  try {
    await client.connect();
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    throw new Error(`TEST_DATABASE=postgres needs a PostgreSQL server at TEST_PG_URL (${client.host}:${client.port}): ${reason}`);
  }
  try {
    await client.query(statement);
  } finally {
    await client.end();
  }
}

/**
 * Creates an empty PostgreSQL database for a test and returns its address. Its text is ordered
 * by code point (locale C.UTF-8), the way SQLite compares text.
 */
async function createPostgresDatabase(template = "template0"): Promise<{ url: string; name: string }> {
  const name = `steamlane_t_${randomBytes(6).toString("hex")}`;
  await onPostgresServer(`create database ${name} template ${template} encoding 'UTF8' locale 'C.UTF-8'`);
  const url = new URL(process.env.TEST_PG_URL ?? DEFAULT_TEST_PG_URL);
  url.pathname = `/${name}`;
  return { url: url.toString(), name };
}

/** A freshly migrated, empty database of the suite's kind, installed as the process's database. */
export function useFreshDatabase(): Promise<TestDatabase> {
  return installTestDatabase({});
}

export interface DatabaseCopy {
  /** A SQLite file to start from (copied), instead of an empty one. */
  sqliteFrom?: string;
  /** A PostgreSQL database to copy (CREATE DATABASE … TEMPLATE), instead of an empty one. */
  postgresTemplate?: string;
  /** An uploads folder to copy into the test's own. */
  uploadsFrom?: string;
}

/** Installs a test database, empty or copied from a template (tests/support/demo-database.ts), and migrates it. */
export async function installTestDatabase(copy: DatabaseCopy): Promise<TestDatabase> {
  const kind = testDatabaseKind();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-test-"));
  process.env.STEAMLANE_DATA_DIR = dir;
  delete process.env.DATABASE_PATH;
  delete process.env.DATABASE_URL;
  process.env.NEXTAUTH_SECRET ??= "test-secret-of-sufficient-length-0123456789";
  const postgres = kind === "postgres" ? await createPostgresDatabase(copy.postgresTemplate) : null;
  if (postgres) process.env.DATABASE_URL = postgres.url;
  resetServerEnvCache();
  if (kind === "sqlite" && copy.sqliteFrom) fs.copyFileSync(copy.sqliteFrom, serverEnv().databasePath);
  if (copy.uploadsFrom && fs.existsSync(copy.uploadsFrom)) fs.cpSync(copy.uploadsFrom, serverEnv().uploadsDir, { recursive: true });
  await closeDb();
  const db = getDb();
  await migrateToLatest(db);
  return {
    db,
    dir,
    async cleanup() {
      await closeDb();
      if (postgres) {
        await onPostgresServer(`drop database if exists ${postgres.name} with (force)`);
        delete process.env.DATABASE_URL;
        resetServerEnvCache();
      }
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

/**
 * A count of the rows written so far, to prove that a refused request wrote nothing: SQLite's
 * total_changes() on the one connection; on PostgreSQL, a counter that a row trigger on every
 * table bumps (installed here; committed writes only, which is what a refusal must not leave).
 */
export async function writeCounter(db: Kysely<Database>): Promise<() => Promise<number>> {
  if (testDatabaseKind() === "sqlite") {
    return async () => Number((await sql<{ n: number }>`select total_changes() as n`.execute(db)).rows[0]!.n);
  }
  await sql`create table test_rows_written (n bigint not null)`.execute(db);
  await sql`insert into test_rows_written values (0)`.execute(db);
  await sql`
    create function test_count_write() returns trigger language plpgsql as $$
    begin update test_rows_written set n = n + 1; return null; end $$`.execute(db);
  const { rows } = await sql<{ name: string }>`
    select tablename as name from pg_tables
    where schemaname = 'public' and tablename not like 'kysely_%' and tablename <> 'test_rows_written'`.execute(db);
  for (const { name } of rows) {
    await sql`create trigger test_count_write after insert or update or delete on ${sql.table(name)} for each row execute function test_count_write()`.execute(db);
  }
  return async () => Number((await sql<{ n: number }>`select n from test_rows_written`.execute(db)).rows[0]!.n);
}
