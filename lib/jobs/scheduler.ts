import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { invoiceRemindersJob } from "@/lib/billing/reminders";
import { serverEnv } from "@/lib/env";
import { expiryDigestJob } from "./expiry-digest";
import type { Period } from "./schedule";

// A small scheduler for periodic jobs, run every minute by the outbox worker process. Each job
// says which period is current (its latest scheduled slot at or before now); a job runs once per
// period. The period it last completed is stored in job_runs in the same transaction as the
// job's own writes (its e-mails in the outbox), so a crash mid-run leaves nothing half done and
// the next tick runs it again; a restart after the slot runs the missed period once, late; and a
// restart after a completed run does nothing until the next period.

export interface JobContext {
  now: Date;
  period: Period;
  timeZone: string;
}

export interface Job {
  name: string;
  /** The current period at `now`: the latest slot at or before it. */
  period(now: Date, timeZone: string): Period;
  /** Does the period's work inside the scheduler's transaction; returns a short summary. */
  run(trx: Transaction<Database>, ctx: JobContext): Promise<Record<string, unknown>>;
}

export const JOBS: readonly Job[] = [expiryDigestJob, invoiceRemindersJob];

export interface JobRunReport {
  name: string;
  period: string;
  ran: boolean;
  result?: Record<string, unknown>;
  error?: string;
}

/** Runs every job whose current period has not been completed yet; safe to call at any time. */
export async function runDueJobs(db: Kysely<Database>, now: Date, jobs: readonly Job[] = JOBS): Promise<JobRunReport[]> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const reports: JobRunReport[] = [];
  for (const job of jobs) {
    const period = job.period(now, timeZone);
    try {
      const report = await db.transaction().execute(async (trx) => {
        // Claim the period first: the write takes SQLite's write lock, so a second worker waits
        // here and then finds the period taken. Periods only move forward (keys sort by time).
        const claimed = await trx
          .insertInto("job_runs")
          .values({
            name: job.name,
            last_period: period.key,
            last_scheduled_at: period.scheduledAt.toISOString(),
            last_run_at: now.toISOString(),
            runs: 1,
          })
          .onConflict((oc) =>
            oc
              .column("name")
              .doUpdateSet((eb) => ({
                last_period: period.key,
                last_scheduled_at: period.scheduledAt.toISOString(),
                last_run_at: now.toISOString(),
                runs: eb("job_runs.runs", "+", 1),
              }))
              .where("job_runs.last_period", "<", period.key),
          )
          .returning("name")
          .executeTakeFirst();
        if (!claimed) return { name: job.name, period: period.key, ran: false } satisfies JobRunReport;
        const result = await job.run(trx, { now, period, timeZone });
        await trx.updateTable("job_runs").set({ last_result: JSON.stringify(result) }).where("name", "=", job.name).execute();
        return { name: job.name, period: period.key, ran: true, result } satisfies JobRunReport;
      });
      reports.push(report);
    } catch (error) {
      // Nothing of the failed run was kept; the next tick tries again.
      reports.push({ name: job.name, period: period.key, ran: false, error: error instanceof Error ? error.message : String(error) });
    }
  }
  return reports;
}

const globalForJobs = globalThis as unknown as { steamlaneJobTimer?: NodeJS.Timeout };

/** Runs due jobs now and then every `intervalMs`; returns a function that stops it. */
export function startJobScheduler(db: Kysely<Database>, intervalMs = 60_000, clock: () => Date = () => new Date()): () => void {
  if (globalForJobs.steamlaneJobTimer) return () => {};
  let running = false;
  const tick = async () => {
    if (running) return;
    running = true;
    try {
      for (const report of await runDueJobs(db, clock())) {
        if (report.error) console.error(`job ${report.name} (${report.period}) failed: ${report.error}`);
        else if (report.ran) console.log(`job ${report.name} ran for ${report.period}: ${JSON.stringify(report.result)}`);
      }
    } catch (error) {
      console.error("job scheduler:", error);
    } finally {
      running = false;
    }
  };
  void tick();
  const timer = setInterval(tick, intervalMs);
  globalForJobs.steamlaneJobTimer = timer;
  return () => {
    clearInterval(timer);
    globalForJobs.steamlaneJobTimer = undefined;
  };
}
