// Online backup and restore of the SQLite database and the uploads (folder or S3 bucket).
//
//   npm run backup                      → backups/steamlane-<UTC time>/ (or BACKUP_DIR/…)
//   npm run backup -- --out /srv/backups
//   npm run restore -- <backup folder>  → into STEAMLANE_DATA_DIR (refuses to overwrite; --force)
//
// The database is copied with `VACUUM INTO`, which reads one consistent snapshot inside a single
// read transaction while the app goes on writing (WAL mode: readers never block writers). The
// uploads are copied after the snapshot, file by file, and only those the snapshot's `files` rows
// name; each copy's SHA-256 must equal the hash the row recorded at upload. An upload is written
// to disk before its row is committed and is never changed afterwards, so every file a snapshot
// names is already on disk. manifest.json lists the row count of every table and every file with
// its hash; restore checks them all before it puts anything in place.
//
// With STORAGE_DRIVER=s3 the uploads are read from the bucket instead, the same way (only the
// objects the snapshot names, each hash-checked), and restore puts them back into the bucket the
// settings name, reading each back to check its hash, before it puts the database in place.
// Objects in the bucket that the restored database does not name are left there.
//
// With DATABASE_URL (PostgreSQL) this script refuses: back that database up with pg_dump.
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import SQLite from "better-sqlite3";
import { parseServerEnv, type StorageSettings } from "@/lib/env";
// safeKey: a storage key as the app writes it ("2026-12/<uuid>"), never a path that leaves the folder.
import { checkStorageKey as safeKey, createFileStore, type FileStore } from "@/lib/storage/store";

export interface BackupManifest {
  format: "steamlane-backup-1";
  createdAt: string;
  database: { file: string; sha256: string; tables: Record<string, number> };
  files: { storageKey: string; sha256: string; sizeBytes: number; contentType?: string }[];
}

export interface DataLocation {
  databasePath: string;
  uploadsDir: string;
  /** Where the uploads live; the uploads folder when absent. */
  storage?: StorageSettings;
}

/** Where the app keeps its data, from the same variables the app reads. */
export function configuredLocation(env: NodeJS.ProcessEnv = process.env): DataLocation {
  if (env.DATABASE_URL) throw new Error("DATABASE_URL points at PostgreSQL: back that database up with pg_dump; this script copies the SQLite file.");
  const dataDir = env.STEAMLANE_DATA_DIR || "data";
  const location = { databasePath: env.DATABASE_PATH || path.join(dataDir, "steamlane.db"), uploadsDir: env.UPLOADS_DIR || path.join(dataDir, "uploads") };
  // The S3 settings are checked as the app checks them (a missing S3_BUCKET is named).
  return env.STORAGE_DRIVER === "s3" ? { ...location, storage: parseServerEnv(env).storage } : location;
}

/** The bucket's store when the uploads live in S3; null for the uploads folder, which is copied file by file. */
function bucketOf(location: DataLocation): FileStore | null {
  return location.storage?.driver === "s3" ? createFileStore(location.storage) : null;
}

function sha256File(file: string): string {
  return createHash("sha256").update(fs.readFileSync(file)).digest("hex");
}

function tableCounts(db: SQLite.Database): Record<string, number> {
  const tables = db.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name").all() as { name: string }[];
  return Object.fromEntries(tables.map(({ name }) => [name, (db.prepare(`select count(*) as n from "${name}"`).get() as { n: number }).n]));
}

/** Takes a consistent copy of the database and its uploads into a new timestamped folder; answers the folder. */
export async function backupData(location: DataLocation, outDir: string, now = new Date()): Promise<string> {
  if (!fs.existsSync(location.databasePath)) throw new Error(`There is no database at ${location.databasePath}.`);
  const stamp = now.toISOString().replace(/[-:]/g, "").replace(/\.\d+Z$/, "Z");
  const target = path.join(outDir, `steamlane-${stamp}`);
  if (fs.existsSync(target)) throw new Error(`${target} already exists.`);
  const partial = `${target}.partial`;
  fs.rmSync(partial, { recursive: true, force: true });
  fs.mkdirSync(path.join(partial, "uploads"), { recursive: true });
  const copy = path.join(partial, "steamlane.db");

  const source = new SQLite(location.databasePath, { fileMustExist: true });
  try {
    source.pragma("busy_timeout = 10000");
    source.prepare("vacuum into ?").run(copy);
  } finally {
    source.close();
  }

  const snapshot = new SQLite(copy, { readonly: true });
  let tables: Record<string, number>;
  let rows: { storage_key: string; sha256: string; size_bytes: number; content_type: string }[];
  try {
    tables = tableCounts(snapshot);
    rows = snapshot.prepare("select storage_key, sha256, size_bytes, content_type from files order by id").all() as typeof rows;
  } finally {
    snapshot.close();
  }
  const files: BackupManifest["files"] = [];
  const bucket = bucketOf(location);
  for (const row of rows) {
    const key = safeKey(row.storage_key);
    const to = path.join(partial, "uploads", key);
    fs.mkdirSync(path.dirname(to), { recursive: true });
    if (bucket) {
      const bytes = await bucket.get(key);
      if (!bytes) throw new Error(`The upload ${key} named by the database is missing from ${bucket.description}.`);
      fs.writeFileSync(to, bytes, { flag: "wx" });
    } else {
      const from = path.join(location.uploadsDir, key);
      if (!fs.existsSync(from)) throw new Error(`The upload ${key} named by the database is missing from ${location.uploadsDir}.`);
      fs.copyFileSync(from, to);
    }
    const hash = sha256File(to);
    if (hash !== row.sha256) throw new Error(`The upload ${key} does not match the hash recorded at upload (${row.sha256}); it was not backed up.`);
    files.push({ storageKey: key, sha256: hash, sizeBytes: fs.statSync(to).size, contentType: row.content_type });
  }
  const manifest: BackupManifest = {
    format: "steamlane-backup-1",
    createdAt: now.toISOString(),
    database: { file: "steamlane.db", sha256: sha256File(copy), tables },
    files,
  };
  fs.writeFileSync(path.join(partial, "manifest.json"), `${JSON.stringify(manifest, null, 2)}\n`);
  fs.renameSync(partial, target);
  return target;
}

/** Checks a backup folder against its manifest; answers the manifest. */
export function verifyBackup(folder: string): BackupManifest {
  const file = path.join(folder, "manifest.json");
  if (!fs.existsSync(file)) throw new Error(`${folder} has no manifest.json: it is not a Steamlane backup.`);
  const manifest = JSON.parse(fs.readFileSync(file, "utf8")) as BackupManifest;
  if (manifest.format !== "steamlane-backup-1") throw new Error(`${folder} is a backup of an unknown format (${String(manifest.format)}).`);
  const db = path.join(folder, manifest.database.file);
  if (!fs.existsSync(db) || sha256File(db) !== manifest.database.sha256) throw new Error(`The database copy in ${folder} is missing or damaged.`);
  const copy = new SQLite(db, { readonly: true });
  try {
    if (copy.pragma("integrity_check", { simple: true }) !== "ok") throw new Error(`The database copy in ${folder} fails SQLite's integrity check.`);
    const counts = tableCounts(copy);
    for (const [table, n] of Object.entries(manifest.database.tables)) {
      if (counts[table] !== n) throw new Error(`The database copy holds ${counts[table] ?? 0} rows of ${table}; the manifest says ${n}.`);
    }
  } finally {
    copy.close();
  }
  for (const f of manifest.files) {
    const p = path.join(folder, "uploads", safeKey(f.storageKey));
    if (!fs.existsSync(p) || sha256File(p) !== f.sha256) throw new Error(`The upload ${f.storageKey} in ${folder} is missing or damaged.`);
  }
  return manifest;
}

/**
 * Puts the backup's uploads into the bucket and reads each back to check its hash. Objects under
 * the same keys are replaced (a key names the same bytes for good); other objects stay.
 */
async function restoreToBucket(folder: string, manifest: BackupManifest, bucket: FileStore): Promise<void> {
  for (const f of manifest.files) {
    const key = safeKey(f.storageKey);
    await bucket.put(key, fs.readFileSync(path.join(folder, "uploads", key)), f.contentType ?? "application/octet-stream", { replace: true });
    const back = await bucket.get(key);
    if (!back || createHash("sha256").update(back).digest("hex") !== f.sha256) {
      throw new Error(`The upload ${key} did not read back from ${bucket.description} as it was put; the database was not restored.`);
    }
  }
}

/** Restores a verified backup into the data location; refuses to replace an existing database unless forced. */
export async function restoreData(folder: string, location: DataLocation, options: { force?: boolean } = {}): Promise<BackupManifest> {
  const manifest = verifyBackup(folder);
  const bucket = bucketOf(location);
  if (fs.existsSync(location.databasePath) && !options.force) {
    const uploads = bucket ? `the uploads are put back into ${bucket.description}` : "its uploads folder is replaced too";
    throw new Error(`${location.databasePath} already exists. Stop the app and pass --force to replace it (${uploads}).`);
  }
  // Into the bucket first: a database is put in place only once every file it names is there.
  if (bucket) await restoreToBucket(folder, manifest, bucket);
  fs.mkdirSync(path.dirname(path.resolve(location.databasePath)), { recursive: true });
  // Into place beside the target first, then renamed, so an interrupted restore leaves no half file.
  const incoming = `${location.databasePath}.restoring`;
  fs.copyFileSync(path.join(folder, manifest.database.file), incoming);
  for (const suffix of ["-wal", "-shm"]) fs.rmSync(`${location.databasePath}${suffix}`, { force: true });
  fs.renameSync(incoming, location.databasePath);
  if (bucket) return manifest;
  const uploadsIncoming = `${location.uploadsDir}.restoring`;
  fs.rmSync(uploadsIncoming, { recursive: true, force: true });
  fs.mkdirSync(uploadsIncoming, { recursive: true });
  for (const f of manifest.files) {
    const to = path.join(uploadsIncoming, f.storageKey);
    fs.mkdirSync(path.dirname(to), { recursive: true });
    fs.copyFileSync(path.join(folder, "uploads", f.storageKey), to);
  }
  fs.rmSync(location.uploadsDir, { recursive: true, force: true });
  fs.renameSync(uploadsIncoming, location.uploadsDir);
  return manifest;
}

async function main(argv: string[]) {
  const [command, ...rest] = argv;
  const flag = (name: string) => {
    const i = rest.indexOf(name);
    return i >= 0 ? rest[i + 1] : undefined;
  };
  const location = configuredLocation();
  if (command === "backup") {
    const out = flag("--out") ?? process.env.BACKUP_DIR ?? "backups";
    const folder = await backupData(location, out);
    const manifest = verifyBackup(folder);
    const rows = Object.values(manifest.database.tables).reduce((a, b) => a + b, 0);
    console.log(`Backed up ${rows} rows in ${Object.keys(manifest.database.tables).length} tables and ${manifest.files.length} uploads to ${folder}`);
  } else if (command === "restore") {
    const folder = rest.find((a) => !a.startsWith("--"));
    if (!folder) throw new Error("Name the backup folder: npm run restore -- backups/steamlane-20261201T020000Z");
    const manifest = await restoreData(folder, location, { force: rest.includes("--force") });
    const uploads = location.storage?.driver === "s3" ? ` and the S3 bucket ${location.storage.bucket}` : "";
    console.log(`Restored the backup of ${manifest.createdAt} (${manifest.files.length} uploads) into ${location.databasePath}${uploads}`);
  } else {
    throw new Error("Use: tsx db/backup.ts backup [--out DIR] | restore <folder> [--force]");
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(__filename)) {
  main(process.argv.slice(2)).catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
