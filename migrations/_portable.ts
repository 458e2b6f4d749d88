import { type Kysely, PostgresAdapter, sql } from "kysely";

// Helpers shared by the migrations where SQLite and PostgreSQL need different statements. Not a
// migration itself: the migrator skips files whose name starts with "_". Frozen like the
// migrations: change what a helper writes only by adding a new helper.
//
// Generated ids (`primaryKey().autoIncrement()`) and `real` columns need nothing here: the
// PostgreSQL connection rewrites them (db/dialect.ts, PostgresSchemaPlugin).

/** True when the migration runs on PostgreSQL. */
export function isPostgres(db: Kysely<any>): boolean {
  return db.getExecutor().adapter instanceof PostgresAdapter;
}

function checkedName(table: string): string {
  if (!/^[a-z][a-z0-9_]*$/.test(table)) throw new Error(`Not a plain table name: ${table}`);
  return table;
}

/**
 * Makes a table append-only: the database itself refuses to change or remove a row, with the
 * error "<table> is append-only". On SQLite, two triggers raising ABORT (the statements the first
 * migrations wrote inline, unchanged); on PostgreSQL, row triggers (and one for TRUNCATE) calling
 * a shared function that raises an exception.
 */
export async function makeAppendOnly(db: Kysely<any>, table: string): Promise<void> {
  const name = checkedName(table);
  if (!isPostgres(db)) {
    for (const operation of ["update", "delete"]) {
      await sql
        .raw(`create trigger ${name}_no_${operation} before ${operation} on ${name}\n    begin select raise(abort, '${name} is append-only'); end`)
        .execute(db);
    }
    return;
  }
  await sql`create or replace function refuse_append_only_change() returns trigger language plpgsql as $$
    begin
      raise exception '% is append-only', tg_table_name using errcode = 'restrict_violation';
    end
  $$`.execute(db);
  for (const operation of ["update", "delete"]) {
    await sql
      .raw(`create trigger ${name}_no_${operation} before ${operation} on ${name} for each row execute function refuse_append_only_change()`)
      .execute(db);
  }
  await sql
    .raw(`create trigger ${name}_no_truncate before truncate on ${name} for each statement execute function refuse_append_only_change()`)
    .execute(db);
}
