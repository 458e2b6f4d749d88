import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { sql } from "kysely";
import { closeDb } from "@/db";
import { type SeedResult, seedDemo } from "@/db/seed/demo";
import { serverEnv } from "@/lib/env";
import { installTestDatabase, onPostgresServer, type TestDatabase, testDatabaseKind } from "./db";

// The demo scenario for a test file, seeded once per machine and copied: seeding takes about ten
// seconds on SQLite and minutes through a PostgreSQL server, and most integration files start
// from it. The first file to ask for a (time, code) pair seeds a database and keeps a copy of it
// and its uploads in a template folder of the temporary directory; every other file gets a copy.
// A template is named by a hash of the seed's time, its settings and every source file the seed
// runs (db/, lib/, migrations/), so a change to any of them seeds afresh.
// The tests of the seed itself (history-seed, billing-seed, sets-seed) call `seedDemo` directly.

export interface DemoDatabase extends TestDatabase {
  /** The ids the seed recorded (organisations, users, sets, orders…), as `seedDemo` returns them. */
  seed: SeedResult;
}

const TEMPLATES = path.join(os.tmpdir(), "steamlane-demo-templates");
/** Templates older than this are removed when a new one is made. */
const KEEP_MS = 24 * 3600_000;
/** Files that ask for the current time share a template seeded at the start of its ten minutes. */
const SHARED_NOW_MS = 10 * 60_000;
const SOURCES = ["db", "lib", "migrations"];

let sourceHash: string | undefined;

/** A hash of every source file under db/, lib/ and migrations/ (computed once per process). */
function hashSources(): string {
  if (sourceHash) return sourceHash;
  const hash = createHash("sha256");
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/\.(ts|tsx|json|sql)$/.test(entry.name)) hash.update(full).update(fs.readFileSync(full));
    }
  };
  for (const dir of SOURCES) walk(path.resolve(dir));
  sourceHash = hash.digest("hex");
  return sourceHash;
}

function templateKey(seededAt: Date): string {
  const env = serverEnv();
  return createHash("sha256")
    .update([testDatabaseKind(), seededAt.toISOString(), env.APP_URL, env.UNIT_TIME_ZONE, hashSources()].join("\n"))
    .digest("hex")
    .slice(0, 16);
}

const postgresTemplateName = (key: string) => `steamlane_tpl_${key}`;

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

/** Takes the template's lock, or returns false if a live process holds it. A dead holder's lock is broken. */
function tryLock(lock: string): boolean {
  try {
    fs.writeFileSync(lock, String(process.pid), { flag: "wx" });
    return true;
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
    const holder = Number(fs.readFileSync(lock, "utf8") || "0");
    if (holder && !processAlive(holder)) fs.rmSync(lock, { force: true });
    return false;
  }
}

/** Removes templates older than a day (their folders and, on PostgreSQL, their databases). */
async function pruneTemplates(): Promise<void> {
  for (const name of fs.readdirSync(TEMPLATES)) {
    const dir = path.join(TEMPLATES, name);
    if (name.endsWith(".lock") || Date.now() - fs.statSync(dir).mtimeMs < KEEP_MS) continue;
    if (testDatabaseKind() === "postgres") await onPostgresServer(`drop database if exists ${postgresTemplateName(name)}`);
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Seeds a scratch database and keeps it as the template `key`. Runs under the template's lock. */
async function buildTemplate(key: string, seededAt: Date): Promise<void> {
  await pruneTemplates();
  const scratch = await installTestDatabase({});
  try {
    const seed = await seedDemo(scratch.db, seededAt);
    const staging = path.join(TEMPLATES, `${key}.staging`);
    fs.rmSync(staging, { recursive: true, force: true });
    fs.mkdirSync(staging);
    if (testDatabaseKind() === "postgres") {
      const source = new URL(process.env.DATABASE_URL!).pathname.slice(1);
      await closeDb();
      await onPostgresServer(`drop database if exists ${postgresTemplateName(key)}`);
      await onPostgresServer(`create database ${postgresTemplateName(key)} template ${source}`);
    } else {
      await sql`vacuum into ${path.join(staging, "steamlane.db")}`.execute(scratch.db);
    }
    const uploads = serverEnv().uploadsDir;
    if (fs.existsSync(uploads)) fs.cpSync(uploads, path.join(staging, "uploads"), { recursive: true });
    fs.writeFileSync(path.join(staging, "seed.json"), JSON.stringify(seed));
    fs.renameSync(staging, path.join(TEMPLATES, key));
  } finally {
    await scratch.cleanup();
  }
}

async function ensureTemplate(key: string, seededAt: Date): Promise<string> {
  fs.mkdirSync(TEMPLATES, { recursive: true });
  const dir = path.join(TEMPLATES, key);
  const lock = `${dir}.lock`;
  // Another file may be seeding this template: wait for it (seeding on PostgreSQL takes minutes).
  while (!fs.existsSync(path.join(dir, "seed.json"))) {
    if (!tryLock(lock)) {
      await new Promise((resolve) => setTimeout(resolve, 250));
      continue;
    }
    try {
      if (!fs.existsSync(path.join(dir, "seed.json"))) await buildTemplate(key, seededAt);
    } finally {
      fs.rmSync(lock, { force: true });
    }
  }
  return dir;
}

/**
 * A test file's own copy of the demo database, seeded at `now` (by default the start of the
 * current ten minutes, so that files run close together share one seeding), installed as the
 * process's database like `useFreshDatabase`.
 */
export async function useDemoDatabase(now?: Date): Promise<DemoDatabase> {
  const seededAt = now ?? new Date(Math.floor(Date.now() / SHARED_NOW_MS) * SHARED_NOW_MS);
  const key = templateKey(seededAt);
  const template = await ensureTemplate(key, seededAt);
  const seed = JSON.parse(fs.readFileSync(path.join(template, "seed.json"), "utf8")) as SeedResult;
  const database = await installTestDatabase({
    sqliteFrom: path.join(template, "steamlane.db"),
    postgresTemplate: postgresTemplateName(key),
    uploadsFrom: path.join(template, "uploads"),
  });
  return { ...database, seed };
}
