import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import SQLite from "better-sqlite3";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as fileRoute } from "@/app/api/files/[id]/route";
import { POST as uploadRoute } from "@/app/api/files/route";
import { verifyBackup } from "@/db/backup";
import type { SeedResult } from "@/db/seed/demo";
import { resetServerEnvCache, serverEnv } from "@/lib/env";
import { readFileFor, saveUpload } from "@/lib/storage/files";
import { createFileStore, diskStore } from "@/lib/storage/store";
import { type FakeS3, startFakeS3 } from "@/fakes/s3/server";
import { countRows, testDatabaseKind } from "../support/db";
import { runBackupScript } from "../support/backup-script";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionCookie, sessionUser } from "../support/session";

// Uploads kept in an S3 bucket (STORAGE_DRIVER=s3), with the real AWS SDK talking to a local
// S3-compatible server (fakes/s3) on 127.0.0.1: the upload route writes to the bucket and not the
// disk, the file route serves it back, refused uploads and an unreachable bucket leave neither a
// row nor an object, and `npm run backup` / `npm run restore` carry every object the database names.

const CLINIC = "theatres@quillby.example";
const UNIT_ADMIN = "admin@larkmoor.example";

let t: DemoDatabase;
let seed: SeedResult;
let fake: FakeS3;
let s3: S3Client;
const savedEnv: Record<string, string | undefined> = {};
const dirs: string[] = [];

const PNG_HEAD = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const png = (n: number) => new Uint8Array([...PNG_HEAD, ...new TextEncoder().encode(`tray photo ${n} `.repeat(40 + n))]);
const sha = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");
const userId = (email: string) => seed.users[email]!;

/** The bytes of an object, read with the SDK directly; null when the bucket has none under the key. */
async function objectBytes(key: string): Promise<Uint8Array | null> {
  try {
    const out = await s3.send(new GetObjectCommand({ Bucket: fake.bucket, Key: key }));
    return await out.Body!.transformToByteArray();
  } catch (error) {
    if ((error as { name?: string }).name === "NoSuchKey") return null;
    throw error;
  }
}

async function objectKeys(): Promise<string[]> {
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const page = await s3.send(new ListObjectsV2Command({ Bucket: fake.bucket, ContinuationToken: token }));
    keys.push(...(page.Contents ?? []).map((o) => o.Key!));
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return keys.sort();
}

async function uploadAs(email: string, bytes: Uint8Array, name: string, purpose = "problem_photo"): Promise<Response> {
  const form = new FormData();
  form.set("file", new File([bytes as Uint8Array<ArrayBuffer>], name));
  form.set("purpose", purpose);
  const headers = new Headers({ host: "localhost:3000", origin: "http://localhost:3000", cookie: await sessionCookie(userId(email)) });
  return uploadRoute(new NextRequest(new URL("/api/files", "http://localhost:3000"), { method: "POST", headers, body: form }), params({}));
}

function tempDir(name: string): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `steamlane-${name}-`));
  dirs.push(dir);
  return dir;
}

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
  fake = await startFakeS3();
  for (const [name, value] of Object.entries(fake.env)) {
    savedEnv[name] = process.env[name];
    process.env[name] = value;
  }
  resetServerEnvCache();
  s3 = new S3Client({
    endpoint: fake.endpoint,
    region: fake.env.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: fake.env.S3_ACCESS_KEY_ID!, secretAccessKey: fake.env.S3_SECRET_ACCESS_KEY! },
  });
  // The demo's template keeps its files on disk: move them into the bucket, and take the folder
  // away, so that anything read or written below can only have gone through the bucket.
  const disk = diskStore(serverEnv().uploadsDir);
  const bucket = createFileStore(serverEnv().storage);
  for (const row of await t.db.selectFrom("files").select(["storage_key", "content_type"]).orderBy("id").execute()) {
    const bytes = await disk.get(row.storage_key);
    if (bytes) await bucket.put(row.storage_key, bytes, row.content_type);
  }
  fs.rmSync(serverEnv().uploadsDir, { recursive: true, force: true });
}, 120_000);

afterAll(async () => {
  s3?.destroy();
  await fake?.cleanup();
  for (const [name, value] of Object.entries(savedEnv)) {
    if (value === undefined) delete process.env[name];
    else process.env[name] = value;
  }
  resetServerEnvCache();
  await t?.cleanup();
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

describe("uploads in an S3 bucket", () => {
  it("stores an upload from the upload route in the bucket, not on disk, and serves it back", async () => {
    const bytes = png(1);
    const res = await uploadAs(CLINIC, bytes, "bent-forceps.png");
    expect(res.status).toBe(200);
    const body = (await res.json()) as { id: number; sha256: string; contentType: string };
    expect(body.sha256).toBe(sha(bytes));
    const row = await t.db.selectFrom("files").selectAll().where("id", "=", body.id).executeTakeFirstOrThrow();

    // In the bucket, byte for byte and with the sniffed content type, read with the SDK itself.
    const head = await s3.send(new HeadObjectCommand({ Bucket: fake.bucket, Key: row.storage_key }));
    expect(head.ContentType).toBe("image/png");
    expect(sha((await objectBytes(row.storage_key))!)).toBe(row.sha256);
    expect(fs.existsSync(path.join(serverEnv().uploadsDir, row.storage_key))).toBe(false);

    // Served back through the tenant-scoped reader and the file route.
    const read = await readFileFor(t.db, await sessionUser(t.db, userId(CLINIC)), body.id);
    expect(sha(read.bytes)).toBe(row.sha256);
    const served = await fileRoute(await requestAs(userId(CLINIC), `/api/files/${body.id}`), params({ id: String(body.id) }));
    expect(served.status).toBe(200);
    expect(served.headers.get("content-type")).toBe("image/png");
    expect(sha(new Uint8Array(await served.arrayBuffer()))).toBe(row.sha256);
    // Another customer's staff still get 404 for it.
    const other = Object.keys(seed.users).find((e) => e.endsWith("@otterwick.example"));
    expect(other, "a user of the second customer").toBeDefined();
    const refused = await fileRoute(await requestAs(userId(other!), `/api/files/${body.id}`), params({ id: String(body.id) }));
    expect(refused.status).toBe(404);
  });

  it("refuses an upload whose content is not what the purpose takes, writing neither a row nor an object", async () => {
    const rowsBefore = await countRows(t.db, ["files"]);
    const objectsBefore = await objectKeys();
    const res = await uploadAs(CLINIC, new TextEncoder().encode("not an image at all"), "photo.png");
    expect(res.status).toBe(422);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/must be a PNG image, JPEG image/);
    expect(await countRows(t.db, ["files"])).toEqual(rowsBefore);
    expect(await objectKeys()).toEqual(objectsBefore);
  });

  it("answers 404 for a file whose object has gone from the bucket", async () => {
    const saved = await saveUpload(t.db, { bytes: png(2), originalName: "gone.png", purpose: "problem_photo", organisationId: seed.organisations.QMH!, uploadedBy: null });
    await s3.send(new DeleteObjectCommand({ Bucket: fake.bucket, Key: saved.storage_key }));
    await expect(readFileFor(t.db, await sessionUser(t.db, userId(UNIT_ADMIN)), saved.id)).rejects.toMatchObject({
      code: "not_found",
      message: "That file's content is missing from storage.",
    });
    await t.db.deleteFrom("files").where("id", "=", saved.id).execute();
  });

  // SQLite only: `npm run backup` copies the SQLite file (a PostgreSQL deployment uses pg_dump).
  describe.runIf(testDatabaseKind() === "sqlite")("backup and restore", () => {
    it("backs up every object the database names from the bucket and restores them into it", async () => {
      for (let i = 10; i < 16; i++) {
        await saveUpload(t.db, { bytes: png(i), originalName: `tray-${i}.png`, purpose: "problem_photo", organisationId: seed.organisations.QMH!, uploadedBy: null });
      }
      const rows = await t.db.selectFrom("files").select(["storage_key", "sha256"]).orderBy("id").execute();
      expect(rows.length).toBeGreaterThan(6);

      const out = tempDir("s3-backups");
      const backup = await runBackupScript(["backup", "--out", out], t.dir);
      expect(backup.code, backup.stderr).toBe(0);
      const folder = /to (\S+)$/m.exec(backup.stdout.trim())![1]!;
      const manifest = verifyBackup(folder);
      expect(manifest.files.map((f) => f.storageKey).sort()).toEqual(rows.map((r) => r.storage_key).sort());
      for (const f of manifest.files) expect(f.sha256, f.storageKey).toBe(rows.find((r) => r.storage_key === f.storageKey)!.sha256);

      // The bucket loses everything; the restore puts back every object the database names.
      for (const key of await objectKeys()) await s3.send(new DeleteObjectCommand({ Bucket: fake.bucket, Key: key }));
      expect(await objectKeys()).toEqual([]);
      const target = tempDir("s3-restored");
      const restore = await runBackupScript(["restore", folder], target);
      expect(restore.code, restore.stderr).toBe(0);
      expect(restore.stdout).toMatch(`and the S3 bucket ${fake.bucket}`);
      expect(fs.existsSync(path.join(target, "uploads"))).toBe(false);

      const restoredDb = new SQLite(path.join(target, "steamlane.db"), { readonly: true });
      const restored = restoredDb.prepare("select storage_key, sha256, content_type from files order by id").all() as { storage_key: string; sha256: string; content_type: string }[];
      restoredDb.close();
      expect(restored.map((r) => r.storage_key).sort()).toEqual(rows.map((r) => r.storage_key).sort());
      expect(await objectKeys()).toEqual(restored.map((r) => r.storage_key).sort());
      for (const r of restored) {
        expect(sha((await objectBytes(r.storage_key))!), r.storage_key).toBe(r.sha256);
        expect((await s3.send(new HeadObjectCommand({ Bucket: fake.bucket, Key: r.storage_key }))).ContentType).toBe(r.content_type);
      }
    }, 120_000);

    it("refuses a backup when an object the database names is missing from the bucket", async () => {
      const saved = await saveUpload(t.db, { bytes: png(30), originalName: "lost.png", purpose: "problem_photo", organisationId: null, uploadedBy: null });
      await s3.send(new DeleteObjectCommand({ Bucket: fake.bucket, Key: saved.storage_key }));
      const out = tempDir("s3-backups");
      const backup = await runBackupScript(["backup", "--out", out], t.dir);
      expect(backup.code).toBe(1);
      expect(backup.stderr).toContain(`The upload ${saved.storage_key} named by the database is missing from the S3 bucket ${fake.bucket}`);
      expect(fs.readdirSync(out).filter((n) => !n.endsWith(".partial"))).toEqual([]);
      await t.db.deleteFrom("files").where("id", "=", saved.id).execute();
    }, 60_000);
  });

  // Through the backup script, which copies SQLite files only (on PostgreSQL it refuses first).
  it.runIf(testDatabaseKind() === "sqlite")("names the missing setting when STORAGE_DRIVER=s3 has no bucket", async () => {
    const out = tempDir("s3-backups");
    const child = await runBackupScript(["backup", "--out", out], t.dir, ["S3_BUCKET"]);
    expect(child.code).toBe(1);
    expect(child.stderr).toMatch(/S3_BUCKET: required when STORAGE_DRIVER=s3/);
  }, 60_000);

  // Last: the server stops here.
  it("fails an upload with a clear error and records no file when the bucket does not answer", async () => {
    await fake.stop();
    const rowsBefore = await countRows(t.db, ["files"]);
    const res = await uploadAs(CLINIC, png(40), "after-outage.png");
    expect(res.status).toBe(503);
    const body = (await res.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe("unavailable");
    expect(body.error.message).toMatch(/^File storage is not answering, so the file could not be saved\. Try again/);
    expect(await countRows(t.db, ["files"])).toEqual(rowsBefore);
    // Reading answers the same way rather than a misleading 404.
    const any = await t.db.selectFrom("files").select("id").orderBy("id").executeTakeFirstOrThrow();
    await expect(readFileFor(t.db, await sessionUser(t.db, userId(UNIT_ADMIN)), any.id)).rejects.toMatchObject({ code: "unavailable" });
  }, 60_000);
});
