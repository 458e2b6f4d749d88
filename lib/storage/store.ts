import fs from "node:fs/promises";
import path from "node:path";
import type { S3Client } from "@aws-sdk/client-s3";
import { type StorageSettings, serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";

// Where the bytes of uploads live: the uploads folder on local disk, or a bucket of S3 or an
// S3-compatible service through the AWS SDK (STORAGE_DRIVER). The file rows, content checks and
// hashes are lib/storage/files.ts's; a store only keeps bytes under a key. No imports of
// `server-only` here: the backup script (plain tsx) uses the store too.

export interface PutOptions {
  /**
   * Replace an object already under the key. Off by default: an upload never overwrites another.
   * Only the seed, whose keys are derived from the content, writes the same key twice.
   */
  replace?: boolean;
}

export interface FileStore {
  /** Where the bytes go, for messages ("the uploads folder data/uploads", "the S3 bucket steamlane"). */
  readonly description: string;
  put(key: string, bytes: Uint8Array, contentType: string, options?: PutOptions): Promise<void>;
  /** The bytes under the key, or null when there are none. */
  get(key: string): Promise<Buffer | null>;
  /** Removes the bytes under the key; removing a key that holds nothing is not an error. */
  remove(key: string): Promise<void>;
}

/** A storage key as the app makes them ("2026-12/<uuid>", "demo/<sha256>"): never a path that leaves the store. */
export function checkStorageKey(key: string): string {
  if (!/^[A-Za-z0-9_-]+(\/[A-Za-z0-9_.-]+)*$/.test(key) || key.split("/").includes("..")) {
    throw new Error(`Refusing the storage key "${key}".`);
  }
  return key;
}

/** The uploads folder: the file's path is the folder joined with its key. */
export function diskStore(dir: string): FileStore {
  const root = path.resolve(dir);
  const target = (key: string) => path.join(root, checkStorageKey(key));
  return {
    description: `the uploads folder ${dir}`,
    async put(key, bytes, _contentType, options = {}) {
      const file = target(key);
      await fs.mkdir(path.dirname(file), { recursive: true });
      await fs.writeFile(file, bytes, { flag: options.replace ? "w" : "wx" });
    },
    async get(key) {
      try {
        return await fs.readFile(target(key));
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code === "ENOENT") return null;
        throw error;
      }
    },
    async remove(key) {
      await fs.rm(target(key), { force: true });
    },
  };
}

type S3Settings = Extract<StorageSettings, { driver: "s3" }>;

type S3Sdk = typeof import("@aws-sdk/client-s3");

/**
 * The error a person sees when the bucket fails: not answering (network, timeout) or refusing
 * (credentials, a missing bucket). The SDK's own error is its cause.
 */
function storageFailed(sdk: S3Sdk, doing: string, cause: unknown): AppError {
  const message =
    cause instanceof sdk.S3ServiceException
      ? `File storage refused the request (${cause.name}), so the file could not be ${doing}. Tell the unit's administrator: the storage settings need checking.`
      : `File storage is not answering, so the file could not be ${doing}. Try again in a few minutes; if it goes on, tell the unit's administrator.`;
  const error = new AppError("unavailable", message);
  error.cause = cause;
  return error;
}

/** A bucket of S3 or an S3-compatible service; keys are the object keys. */
export function s3Store(settings: S3Settings): FileStore {
  const Bucket = settings.bucket;
  const description = `the S3 bucket ${Bucket}${settings.endpoint ? ` at ${settings.endpoint}` : ""}`;
  // The SDK is loaded on first use, so a deployment on disk never loads it.
  let connected: Promise<{ sdk: S3Sdk; client: S3Client }> | undefined;
  const connect = () =>
    (connected ??= import("@aws-sdk/client-s3").then((sdk) => ({
      sdk,
      client: new sdk.S3Client({
        region: settings.region,
        endpoint: settings.endpoint,
        forcePathStyle: settings.forcePathStyle,
        credentials: settings.credentials,
        // Many S3-compatible services do not take the checksum headers the SDK now adds by default.
        ...(settings.endpoint ? { requestChecksumCalculation: "WHEN_REQUIRED", responseChecksumValidation: "WHEN_REQUIRED" } : {}),
        requestHandler: { connectionTimeout: 5_000, requestTimeout: 60_000 },
      }),
    })));
  return {
    description,
    async put(key, bytes, contentType, options = {}) {
      const Key = checkStorageKey(key);
      const { sdk, client } = await connect();
      try {
        await client.send(
          new sdk.PutObjectCommand({
            Bucket,
            Key,
            Body: bytes,
            ContentType: contentType,
            ContentLength: bytes.length,
            // The bucket refuses (412) to replace an existing object, as the disk's "wx" does.
            IfNoneMatch: options.replace ? undefined : "*",
          }),
        );
      } catch (error) {
        if (error instanceof sdk.S3ServiceException && error.$metadata.httpStatusCode === 412) {
          throw new Error(`The storage key ${key} already holds an object in ${description}; nothing was replaced.`, { cause: error });
        }
        throw storageFailed(sdk, "saved", error);
      }
    },
    async get(key) {
      const Key = checkStorageKey(key);
      const { sdk, client } = await connect();
      try {
        const out = await client.send(new sdk.GetObjectCommand({ Bucket, Key }));
        if (!out.Body) return null;
        return Buffer.from(await out.Body.transformToByteArray());
      } catch (error) {
        if (error instanceof sdk.NoSuchKey || (error instanceof sdk.S3ServiceException && error.$metadata.httpStatusCode === 404)) return null;
        throw storageFailed(sdk, "read", error);
      }
    },
    async remove(key) {
      const Key = checkStorageKey(key);
      const { sdk, client } = await connect();
      try {
        await client.send(new sdk.DeleteObjectCommand({ Bucket, Key }));
      } catch (error) {
        throw storageFailed(sdk, "removed", error);
      }
    },
  };
}

export function createFileStore(settings: StorageSettings): FileStore {
  return settings.driver === "s3" ? s3Store(settings) : diskStore(settings.dir);
}

let cached: { settings: StorageSettings; store: FileStore } | undefined;

/** The store the settings choose; made again when the settings change (resetServerEnvCache). */
export function fileStore(): FileStore {
  const { storage } = serverEnv();
  if (cached?.settings !== storage) cached = { settings: storage, store: createFileStore(storage) };
  return cached.store;
}
