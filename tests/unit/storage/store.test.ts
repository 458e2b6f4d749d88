import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { parseServerEnv } from "@/lib/env";
import { checkStorageKey, diskStore } from "@/lib/storage/store";

// The uploads folder store (no overwriting, missing keys, keys that would leave the folder) and
// the storage settings, whose mistakes name the variable to fix.

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-store-"));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe("diskStore", () => {
  const store = diskStore(dir);
  const bytes = new TextEncoder().encode("a,b\n1,2\n");

  it("writes under the folder by key, reads back, and removes", async () => {
    await store.put("2026-12/0d6c5e1a", bytes, "text/csv");
    expect(fs.readFileSync(path.join(dir, "2026-12", "0d6c5e1a"))).toEqual(Buffer.from(bytes));
    expect(await store.get("2026-12/0d6c5e1a")).toEqual(Buffer.from(bytes));
    await store.remove("2026-12/0d6c5e1a");
    expect(await store.get("2026-12/0d6c5e1a")).toBeNull();
    await store.remove("2026-12/0d6c5e1a");
  });

  it("never overwrites an upload unless asked to replace it", async () => {
    await store.put("2026-12/first", bytes, "text/csv");
    await expect(store.put("2026-12/first", new Uint8Array([1]), "text/csv")).rejects.toMatchObject({ code: "EEXIST" });
    expect(await store.get("2026-12/first")).toEqual(Buffer.from(bytes));
    await store.put("2026-12/first", new Uint8Array([1]), "text/csv", { replace: true });
    expect(await store.get("2026-12/first")).toEqual(Buffer.from([1]));
  });

  it("refuses keys that would leave the folder", async () => {
    for (const key of ["../outside", "2026-12/../../etc", "/abs", "a//b", "", "a/b\\c"]) {
      expect(() => checkStorageKey(key), key).toThrow(/Refusing the storage key/);
      await expect(store.put(key, bytes, "text/csv"), key).rejects.toThrow(/Refusing the storage key/);
    }
    expect(fs.existsSync(path.join(dir, "..", "outside"))).toBe(false);
    expect(checkStorageKey("demo/5f0c2a")).toBe("demo/5f0c2a");
  });
});

describe("storage settings", () => {
  it("keeps the uploads folder by default", () => {
    expect(parseServerEnv({ STEAMLANE_DATA_DIR: "/srv/steamlane" }).storage).toEqual({ driver: "disk", dir: path.join("/srv/steamlane", "uploads") });
  });

  it("reads the S3 settings", () => {
    const env = parseServerEnv({
      STORAGE_DRIVER: "s3",
      S3_BUCKET: "uploads",
      S3_REGION: "eu-west-2",
      S3_ENDPOINT: "http://127.0.0.1:9000",
      S3_FORCE_PATH_STYLE: "true",
      S3_ACCESS_KEY_ID: "key",
      S3_SECRET_ACCESS_KEY: "secret",
    });
    expect(env.storage).toEqual({
      driver: "s3",
      bucket: "uploads",
      region: "eu-west-2",
      endpoint: "http://127.0.0.1:9000",
      forcePathStyle: true,
      credentials: { accessKeyId: "key", secretAccessKey: "secret" },
    });
    expect(parseServerEnv({ STORAGE_DRIVER: "s3", S3_BUCKET: "b", S3_REGION: "r" }).storage).toMatchObject({ forcePathStyle: false, credentials: undefined, endpoint: undefined });
  });

  it("names each missing or bad variable", () => {
    expect(() => parseServerEnv({ STORAGE_DRIVER: "s3" })).toThrow(/S3_BUCKET: required when STORAGE_DRIVER=s3.*S3_REGION: required when STORAGE_DRIVER=s3/);
    expect(() => parseServerEnv({ STORAGE_DRIVER: "s3", S3_BUCKET: "b", S3_REGION: "r", S3_ACCESS_KEY_ID: "k" })).toThrow(/S3_SECRET_ACCESS_KEY: set S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY together/);
    expect(() => parseServerEnv({ STORAGE_DRIVER: "s3", S3_BUCKET: "b", S3_REGION: "r", S3_SECRET_ACCESS_KEY: "s" })).toThrow(/S3_ACCESS_KEY_ID: set/);
    expect(() => parseServerEnv({ STORAGE_DRIVER: "s3", S3_BUCKET: "b", S3_REGION: "r", S3_FORCE_PATH_STYLE: "yes" })).toThrow(/S3_FORCE_PATH_STYLE/);
    expect(() => parseServerEnv({ STORAGE_DRIVER: "s3", S3_BUCKET: "b", S3_REGION: "r", S3_ENDPOINT: "storage.local:9000" })).toThrow(/S3_ENDPOINT: must be an http:\/\/ or https:\/\/ address/);
    expect(() => parseServerEnv({ STORAGE_DRIVER: "ftp" })).toThrow(/STORAGE_DRIVER/);
  });
});
