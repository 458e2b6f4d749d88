import { spawnSync } from "node:child_process";
import path from "node:path";
import { type Kysely, sql } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase } from "@/db/connection";
import { migrateToLatest } from "@/db/migrator";
import type { Database } from "@/db/schema";
import { seedDemo } from "@/db/seed/demo";
import { type TestDatabase, testDatabaseKind, useFreshDatabase } from "../support/db";

// A unit moving from the SQLite file to a PostgreSQL server (README, "Moving to PostgreSQL"):
// `npm run db:copy-to-postgres` copies the seeded demo into an empty PostgreSQL database, every
// row of every table as it was; new rows then get ids after the copied ones; a second copy into
// the now full database is refused and changes nothing. Runs in the PostgreSQL pass of the suite
// (`npm run test:pg`), which .ci/run starts.

const TSX = path.resolve(__dirname, "../../node_modules/.bin/tsx");
const SCRIPT = path.resolve(__dirname, "../../db/copy-to-postgres.ts");

let target: TestDatabase;
let source: Kysely<Database>;
let file: string;

const copy = () =>
  spawnSync(TSX, [SCRIPT, file], { env: { ...process.env, DATABASE_URL: process.env.DATABASE_URL }, encoding: "utf8", timeout: 300_000 });

async function tables(db: Kysely<Database>): Promise<string[]> {
  const { rows } = await sql<{ name: string }>`select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like 'kysely_%' order by name`.execute(db);
  return rows.map((r) => r.name);
}

/** Every row of a table as sorted JSON lines, so two databases compare whatever order they return. */
async function contents(db: Kysely<Database>, table: string): Promise<string[]> {
  const { rows } = await sql<Record<string, unknown>>`select * from ${sql.table(table)}`.execute(db);
  return rows.map((row) => JSON.stringify(Object.fromEntries(Object.entries(row).sort(([a], [b]) => (a < b ? -1 : 1))))).sort();
}

describe.runIf(testDatabaseKind() === "postgres")("copying a SQLite database into PostgreSQL", () => {
  beforeAll(async () => {
    target = await useFreshDatabase();
    file = path.join(target.dir, "unit.db");
    source = openDatabase(file);
    await migrateToLatest(source);
    await seedDemo(source, new Date("2026-12-01T08:00:00Z"));
  }, 300_000);
  afterAll(async () => {
    await source?.destroy();
    await target?.cleanup();
  });

  it("copies every row of every table unchanged", async () => {
    const result = copy();
    expect(result.stderr).toBe("");
    expect(result.status).toBe(0);
    expect(result.stdout).toMatch(/Copied \d+ rows from /);
    const names = await tables(source);
    expect(names.length).toBeGreaterThan(40);
    for (const table of names) {
      const [before, after] = [await contents(source, table), await contents(target.db, table)];
      expect(after.length, table).toBe(before.length);
      expect(after, table).toEqual(before);
    }
  }, 300_000);

  it("gives new rows ids after the copied ones", async () => {
    const highest = await target.db.selectFrom("audit_log").select((eb) => eb.fn.max("id").as("id")).executeTakeFirstOrThrow();
    const row = await target.db
      .insertInto("audit_log")
      .values({ at: new Date().toISOString(), actor_user_id: null, action: "test.copied", entity: "database", entity_id: null })
      .returning("id")
      .executeTakeFirstOrThrow();
    expect(row.id).toBeGreaterThan(Number(highest.id));
  });

  it("refuses to copy into a database that already holds rows, and changes nothing", async () => {
    const before = await contents(target.db, "orders");
    const result = copy();
    expect(result.status).toBe(1);
    expect(result.stderr).toMatch(/already holds rows in \w+: copy into an empty database/);
    expect(await contents(target.db, "orders")).toEqual(before);
  });
});
