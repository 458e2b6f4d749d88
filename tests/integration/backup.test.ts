import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import SQLite from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { verifyBackup } from "@/db/backup";
import type { SeedResult } from "@/db/seed/demo";
import { enqueueMail } from "@/lib/mail/outbox";
import { saveUpload } from "@/lib/storage/files";
import { testDatabaseKind } from "../support/db";
import { runBackupScript } from "../support/backup-script";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";

// `npm run backup` while the app is writing (uploads and rows), then `npm run restore` into a new
// data folder: every record and file that existed before the backup began is there, the restored
// database matches the backup's manifest, and every restored upload matches its recorded hash.

// SQLite only: `npm run backup` copies the SQLite file and the uploads; a PostgreSQL deployment backs up with the server's own tools (README).
const onSqlite = testDatabaseKind() === "sqlite";
let t: DemoDatabase;
let seed: SeedResult;
const dirs: string[] = [];

const PNG_HEAD = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const png = (n: number) => new Uint8Array([...PNG_HEAD, ...new TextEncoder().encode(`photo ${n} `.repeat(50 + n))]);
const sha = (bytes: Uint8Array | Buffer) => createHash("sha256").update(bytes).digest("hex");

function tempDir(name: string): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `steamlane-${name}-`));
  dirs.push(dir);
  return dir;
}

function readAll(file: string) {
  const db = new SQLite(file, { readonly: true });
  try {
    const tables = (db.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%'").all() as { name: string }[]).map((r) => r.name);
    const counts = Object.fromEntries(tables.map((n) => [n, (db.prepare(`select count(*) as n from "${n}"`).get() as { n: number }).n]));
    const files = db.prepare("select id, storage_key, sha256 from files order by id").all() as { id: number; storage_key: string; sha256: string }[];
    const outbox = (db.prepare("select id from outbox order by id").all() as { id: number }[]).map((r) => r.id);
    return { counts, files, outbox };
  } finally {
    db.close();
  }
}

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
  for (let i = 0; i < 12; i++) {
    await saveUpload(t.db, { bytes: png(i), originalName: `tray-${i}.png`, purpose: "problem_photo", organisationId: seed.organisations.QMH!, uploadedBy: null });
  }
}, 300_000);
afterAll(async () => {
  await t.cleanup();
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

describe.runIf(onSqlite)("backup and restore", () => {
  it("copies a consistent database and every upload while the app writes, and restores all of it", async () => {
    const before = readAll(path.join(t.dir, "steamlane.db"));
    expect(before.files.length).toBeGreaterThanOrEqual(12);
    const out = tempDir("backups");

    // The app goes on writing while the backup runs in its own process.
    let writing = true;
    let written = 0;
    const writer = (async () => {
      while (writing) {
        await saveUpload(t.db, { bytes: png(100 + written), originalName: "late.png", purpose: "problem_photo", organisationId: seed.organisations.ODS!, uploadedBy: null });
        await enqueueMail(t.db, { template: "test", to: `w${written}@clinic.example`, subject: `During backup ${written}`, text: "t", html: "<p>t</p>" });
        written++;
        await new Promise((r) => setTimeout(r, 5));
      }
    })();
    const backup = await runBackupScript(["backup", "--out", out], t.dir);
    writing = false;
    await writer;
    expect(backup.code, backup.stderr).toBe(0);
    expect(written).toBeGreaterThan(0);
    const folder = /to (\S+)$/m.exec(backup.stdout.trim())![1]!;
    expect(path.basename(folder)).toMatch(/^steamlane-\d{8}T\d{6}Z$/);
    const manifest = verifyBackup(folder);

    const target = tempDir("restored");
    const restore = await runBackupScript(["restore", folder], target);
    expect(restore.code, restore.stderr).toBe(0);
    const restored = readAll(path.join(target, "steamlane.db"));

    // The restored database is the backup's snapshot, which holds everything written before it began.
    expect(restored.counts).toEqual(manifest.database.tables);
    for (const [table, n] of Object.entries(before.counts)) expect(restored.counts[table], table).toBeGreaterThanOrEqual(n);
    expect(before.outbox.every((id) => restored.outbox.includes(id))).toBe(true);
    for (const f of before.files) expect(restored.files).toContainEqual(f);
    // Every file the restored database names is there, byte for byte.
    for (const f of restored.files) {
      const bytes = fs.readFileSync(path.join(target, "uploads", f.storage_key));
      expect(sha(bytes), f.storage_key).toBe(f.sha256);
    }
    expect(manifest.files.map((f) => f.storageKey).sort()).toEqual(restored.files.map((f) => f.storage_key).sort());
  }, 120_000);

  it("refuses to restore over an existing database unless forced, and a damaged backup at all, changing nothing", async () => {
    const out = tempDir("backups");
    const made = await runBackupScript(["backup", "--out", out], t.dir);
    expect(made.code, made.stderr).toBe(0);
    const folder = /to (\S+)$/m.exec(made.stdout.trim())![1]!;

    const target = tempDir("restored");
    expect((await runBackupScript(["restore", folder], target)).code).toBe(0);
    const dbFile = path.join(target, "steamlane.db");
    const first = sha(fs.readFileSync(dbFile));
    const again = await runBackupScript(["restore", folder], target);
    expect(again.code).toBe(1);
    expect(again.stderr).toMatch(/already exists.*--force/);
    expect(sha(fs.readFileSync(dbFile))).toBe(first);
    expect((await runBackupScript(["restore", folder, "--force"], target)).code).toBe(0);

    const manifest = verifyBackup(folder);
    const victim = path.join(folder, "uploads", manifest.files[0]!.storageKey);
    fs.appendFileSync(victim, "tampered");
    const damaged = await runBackupScript(["restore", folder, "--force"], target);
    expect(damaged.code).toBe(1);
    expect(damaged.stderr).toMatch(/missing or damaged/);
    expect(sha(fs.readFileSync(dbFile))).toBe(first);
  }, 120_000);
});
