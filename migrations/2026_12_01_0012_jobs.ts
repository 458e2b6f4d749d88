import type { Kysely } from "kysely";

// Scheduled jobs (the weekly expiry digest and those to come): the last period each job ran for,
// so a restarted worker neither repeats a period nor skips the one it missed while down.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("job_runs")
    .addColumn("name", "text", (c) => c.primaryKey())
    // The key of the last period the job completed, e.g. "2026-W49" for a weekly job.
    .addColumn("last_period", "text", (c) => c.notNull())
    // The scheduled instant of that period (ISO-8601 UTC) and when the run actually happened.
    .addColumn("last_scheduled_at", "text", (c) => c.notNull())
    .addColumn("last_run_at", "text", (c) => c.notNull())
    // A short JSON summary of what the run did (e.g. how many e-mails it queued).
    .addColumn("last_result", "text", (c) => c.notNull().defaultTo("{}"))
    .addColumn("runs", "integer", (c) => c.notNull().defaultTo(0))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("job_runs").execute();
}
