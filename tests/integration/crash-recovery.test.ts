import { type ChildProcessWithoutNullStreams, spawn } from "node:child_process";
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import SQLite from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db";
import type { SeedResult } from "@/db/seed/demo";
import type { RequestLogEntry } from "@/fakes/stripe/core";
import { startFakeStripe, type FakeStripe } from "@/fakes/stripe/server";
import { approveRun, createRun } from "@/lib/billing/run";
import { recordToCsv } from "@/lib/cycles/csv";
import { synthWasherRecord } from "@/lib/cycles/synth";
import { resetStripeClient } from "@/lib/stripe";
import { addToBatch, openBatch, startBatch } from "@/lib/washing/service";
import { testDatabaseKind } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { packedCycle } from "../support/loads";
import { sessionUser } from "../support/session";

// The server killed with SIGKILL in the middle of closing a washer batch and in the middle of
// issuing an invoice run. A child process runs the real operation on a copy of a seeded database
// file and is killed after a chosen number of SQL statements (tests/support/crash-worker.ts).
// After the restart the batch close is all or nothing, and the resumed invoice run finishes with
// every payment-service object created once.

// SQLite only: the worker runs on a copy of a SQLite file; on PostgreSQL the server keeps a killed client's open transaction out of the database.
const onSqlite = testDatabaseKind() === "sqlite";
const SEED_NOW = new Date("2026-12-01T08:00:00Z");
const NOW = "2026-12-01T10:00:00.000Z";
const WORKER = path.resolve(__dirname, "../support/crash-worker.ts");

let t: DemoDatabase;
let seed: SeedResult;
let template: string;
let fake: FakeStripe;
let stripeDir: string;
const runs: string[] = [];
let closeInput: Record<string, unknown>;
let issueInput: Record<string, unknown>;

interface WorkerOutcome {
  code: number | null;
  signal: NodeJS.Signals | null;
  paused: boolean;
  stdout: string;
  stderr: string;
}

/** Runs the worker on a data folder; with pauseAfter, kills it with SIGKILL once it has paused. */
function runWorker(dataDir: string, op: string, input: Record<string, unknown>, pauseAfter?: number): Promise<WorkerOutcome> {
  return new Promise((resolve, reject) => {
    const env: NodeJS.ProcessEnv = { ...process.env, STEAMLANE_DATA_DIR: dataDir, NODE_ENV: "production" };
    delete env.DATABASE_PATH;
    delete env.VITEST;
    if (pauseAfter !== undefined) env.CRASH_PAUSE_AFTER = String(pauseAfter);
    // Node itself with tsx's loader (not the tsx command, which runs the script in a second
    // process that a SIGKILL of the first would leave running), in a process group of its own.
    const child = spawn(process.execPath, ["--import", "tsx", "--conditions=react-server", WORKER, op, JSON.stringify(input)], {
      env,
      stdio: "pipe",
      detached: true,
    }) as unknown as ChildProcessWithoutNullStreams;
    let stdout = "";
    let stderr = "";
    let paused = false;
    child.stdout.on("data", (chunk: Buffer) => {
      stdout += chunk.toString();
      if (!paused && /paused \d+/.test(stdout)) {
        paused = true;
        process.kill(-child.pid!, "SIGKILL");
      }
    });
    child.stderr.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
    child.on("error", reject);
    child.on("close", (code: number | null, signal: NodeJS.Signals | null) => resolve({ code, signal, paused, stdout, stderr }));
  });
}

/** A fresh copy of the prepared database in its own data folder. */
function copyOfTemplate(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-crash-"));
  fs.copyFileSync(template, path.join(dir, "steamlane.db"));
  runs.push(dir);
  return dir;
}

type Snapshot = Map<string, Record<string, unknown>[]>;

/** Every row of every table, read after the crash as a restarted server would (WAL recovery). */
function snapshot(dir: string): Snapshot {
  const db = new SQLite(path.join(dir, "steamlane.db"));
  try {
    expect(db.pragma("integrity_check", { simple: true })).toBe("ok");
    const tables = db
      .prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like 'kysely_%' order by name")
      .all() as { name: string }[];
    return new Map(tables.map(({ name }) => [name, db.prepare(`select * from "${name}" order by rowid`).all() as Record<string, unknown>[]]));
  } finally {
    db.close();
  }
}

/** Columns that differ between two complete runs of the same operation (random file keys and the like). */
function volatileColumns(a: Snapshot, b: Snapshot): Set<string> {
  const out = new Set<string>();
  for (const [table, rows] of a) {
    rows.forEach((row, i) => {
      for (const [column, value] of Object.entries(row)) if (b.get(table)?.[i]?.[column] !== value) out.add(`${table}.${column}`);
    });
  }
  return out;
}

function sameState(a: Snapshot, b: Snapshot, volatile: Set<string>): boolean {
  if (a.size !== b.size) return false;
  for (const [table, rows] of a) {
    const other = b.get(table);
    if (!other || other.length !== rows.length) return false;
    for (let i = 0; i < rows.length; i++) {
      for (const [column, value] of Object.entries(rows[i]!)) {
        if (!volatile.has(`${table}.${column}`) && other[i]![column] !== value) return false;
      }
    }
  }
  return true;
}

beforeAll(async () => {
  stripeDir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-crash-stripe-"));
  fake = await startFakeStripe({ port: 0, dataFile: path.join(stripeDir, "fake-stripe.json"), log: () => {} });
  process.env.STRIPE_SECRET_KEY = "sk_test_crash_recovery";
  process.env.STRIPE_API_HOST = "127.0.0.1";
  process.env.STRIPE_API_PORT = String(fake.port);
  process.env.STRIPE_API_PROTOCOL = "http";
  process.env.STRIPE_WEBHOOK_SECRET = fake.webhookSecret;
  resetStripeClient();
  t = await useDemoDatabase(SEED_NOW);
  seed = t.seed;
  const tech = await sessionUser(t.db, seed.users["tech@larkmoor.example"]!);
  const finance = await sessionUser(t.db, seed.users["finance@larkmoor.example"]!);

  // A running washer batch with three received sets, on a washer with no open batch.
  const washers = await t.db.selectFrom("machines").select(["id", "code"]).where("kind", "=", "washer").orderBy("code").execute();
  const busy = await t.db.selectFrom("washer_batches").select("machine_id").where("status", "in", ["loading", "running"]).execute();
  const washer = washers.find((w) => !busy.some((b) => b.machine_id === w.id));
  if (!washer) throw new Error("every demo washer has an open batch");
  const batch = await openBatch(t.db, tech, { machineId: washer.id, programId: seed.programs![`${washer.code}/A0-3000`]! }, new Date("2026-12-01T09:00:00Z"));
  const free = await t.db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial", "sets.organisation_id", "sets.home_site_id", "set_types.processing_flags"])
    .where("sets.status", "=", "in_service")
    .where("set_types.size_stu", "<=", 1)
    .where("set_types.processing_flags", "not like", "%manual_wash_only%")
    .where((eb) => eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))))
    .orderBy("sets.serial")
    .limit(3)
    .execute();
  expect(free).toHaveLength(3);
  for (const set of free) {
    await packedCycle(t.db, set.id, tech.id, "received", new Date("2026-12-01T08:30:00Z"));
    await addToBatch(t.db, tech, batch.id, set.serial, new Date("2026-12-01T09:05:00Z"));
  }
  await startBatch(t.db, tech, batch.id, new Date("2026-12-01T09:10:00Z"));
  const text = recordToCsv(synthWasherRecord({ holdTempC: 90, holdSeconds: 300, rampSeconds: 60, dryingSeconds: 300, stepSeconds: 10 }), {
    startedAt: "2026-12-01T09:10:00.000Z",
    decimals: 3,
  });
  closeInput = { batchId: batch.id, userId: tech.id, record: { kind: "csv", fileName: "w-record.csv", text }, clientEventId: randomUUID(), now: NOW };

  // An approved invoice run for the first month of the demo's history, which the demo left unbilled.
  const run = await createRun(t.db, finance, { period: "2026-09" }, new Date(NOW));
  expect(run.invoices.length).toBeGreaterThan(1);
  await approveRun(t.db, finance, run.runId, new Date(NOW));
  issueInput = { runId: run.runId, userId: finance.id, now: NOW };

  await closeDb();
  template = path.join(t.dir, "steamlane.db");
}, 600_000);

afterAll(async () => {
  await fake?.close();
  for (const dir of runs) fs.rmSync(dir, { recursive: true, force: true });
  fs.rmSync(stripeDir, { recursive: true, force: true });
  await t?.cleanup();
  resetStripeClient();
});

describe.runIf(onSqlite)("SIGKILL in the middle of closing a washer batch", () => {
  it("leaves all of the close or none of it, wherever it is killed, and the retried close finishes it once", async () => {
    const before = snapshot(copyOfTemplate());
    const refA = copyOfTemplate();
    const refB = copyOfTemplate();
    const first = await runWorker(refA, "close-batch", closeInput);
    expect(first.code, first.stderr).toBe(0);
    const statements = Number(/done (\d+)/.exec(first.stdout)![1]);
    expect((await runWorker(refB, "close-batch", closeInput)).code).toBe(0);
    const after = snapshot(refA);
    const volatile = volatileColumns(after, snapshot(refB));
    // Only random file keys may differ between two complete closes with the same input and clock.
    expect([...volatile].every((c) => c === "files.storage_key"), [...volatile].join(", ")).toBe(true);
    expect(sameState(before, after, volatile)).toBe(false);

    const outcomes: string[] = [];
    // The first and last few statements, and evenly spread points between them.
    const step = Math.max(1, Math.ceil(statements / 8));
    const points = [...new Set([1, 2, 3, statements - 2, statements - 1, statements, ...Array.from({ length: statements }, (_, i) => i + 1).filter((n) => n % step === 0)])]
      .filter((n) => n >= 1 && n <= statements)
      .sort((a, b) => a - b);
    for (const n of points) {
      const dir = copyOfTemplate();
      const killed = await runWorker(dir, "close-batch", closeInput, n);
      expect(killed.paused, `statement ${n}: ${killed.stderr}`).toBe(true);
      expect(killed.signal).toBe("SIGKILL");
      const state = snapshot(dir);
      const whole = sameState(state, after, volatile);
      const none = sameState(state, before, volatile);
      expect(whole || none, `after SIGKILL at statement ${n} of ${statements} the database holds part of the close`).toBe(true);
      outcomes.push(whole ? "whole" : "none");
      // The station retries the same request after the restart: it completes, or answers the first result.
      const retry = await runWorker(dir, "close-batch", closeInput);
      expect(retry.code, retry.stderr).toBe(0);
      expect(sameState(snapshot(dir), after, volatile), `statement ${n}: the retried close differs from a clean one`).toBe(true);
    }
    // Both sides were seen: killed inside the transaction and after its commit.
    expect(outcomes).toContain("none");
    expect(outcomes).toContain("whole");
  }, 600_000);
});

describe.runIf(onSqlite)("SIGKILL in the middle of issuing an invoice run", () => {
  it("resumes after repeated kills at random points and creates every payment-service object once", async () => {
    const dir = copyOfTemplate();
    // A fixed sequence of pseudo-random kill points (a linear congruential generator, seed 7).
    let state = 7;
    const next = () => (state = (state * 48271) % 2147483647) % 40 + 1;
    let kills = 0;
    for (let attempt = 0; attempt < 8; attempt++) {
      const outcome = await runWorker(dir, "issue-run", issueInput, next());
      if (!outcome.paused) {
        expect(outcome.code, outcome.stderr).toBe(0);
        break;
      }
      kills++;
      snapshot(dir); // integrity_check after each kill
    }
    expect(kills).toBeGreaterThan(2);
    const last = await runWorker(dir, "issue-run", issueInput);
    expect(last.code, last.stderr).toBe(0);

    const db = new SQLite(path.join(dir, "steamlane.db"), { readonly: true });
    const run = db.prepare("select status from invoice_runs where id = ?").get(issueInput.runId) as { status: string };
    const invoices = db.prepare("select id, status, stripe_invoice_id from invoices where run_id = ?").all(issueInput.runId) as {
      id: number;
      status: string;
      stripe_invoice_id: string | null;
    }[];
    db.close();
    expect(run.status).toBe("issued");
    expect(invoices.length).toBeGreaterThan(1);
    expect(invoices.every((i) => i.status === "open" && i.stripe_invoice_id)).toBe(true);

    // In the fake's request log: each idempotency key ran once; repeats after a kill were replays.
    const log: RequestLogEntry[] = fake.requests();
    const ran = log.filter((r) => r.method === "POST" && !r.replayed && r.status === 200 && r.idempotency_key);
    const perKey = new Map<string, number>();
    for (const r of ran) perKey.set(r.idempotency_key!, (perKey.get(r.idempotency_key!) ?? 0) + 1);
    expect([...perKey].filter(([, n]) => n > 1)).toEqual([]);
    for (const invoice of invoices) {
      expect(perKey.get(`steamlane:invoice:${invoice.id}`)).toBe(1);
      expect(perKey.get(`steamlane:finalize:${invoice.id}`)).toBe(1);
    }
    const created = ran.filter((r) => r.path === "/v1/invoices");
    expect(created).toHaveLength(invoices.length);
  }, 600_000);
});
