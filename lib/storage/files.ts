import "server-only";
import { createHash, randomUUID } from "node:crypto";
import type { Kysely, Transaction } from "kysely";
import type { Database, FileRow } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import { CONTENT_TYPES, describeKinds, type FileKind, sniffFileKind } from "./content-type";
import { fileStore } from "./store";

// Uploads, kept by the configured store (./store.ts: the uploads folder, or an S3 bucket). The
// storage key is made here from a random id; no name or path a caller supplies ever reaches the
// store. Files are read back only through `readFileFor`, which applies the tenant scope.

export const DEFAULT_MAX_BYTES = 10 * 1024 * 1024;

/** What each kind of upload may be. */
export const UPLOAD_PURPOSES = {
  ifu: { kinds: ["pdf"], maxBytes: 20 * 1024 * 1024, label: "Instructions for use" },
  problem_photo: { kinds: ["png", "jpeg"], maxBytes: 10 * 1024 * 1024, label: "Photo" },
  signature: { kinds: ["png"], maxBytes: 1024 * 1024, label: "Signature" },
  cycle_record: { kinds: ["csv"], maxBytes: 5 * 1024 * 1024, label: "Cycle record" },
  catalogue_import: { kinds: ["csv"], maxBytes: 5 * 1024 * 1024, label: "Catalogue import" },
} as const satisfies Record<string, { kinds: readonly FileKind[]; maxBytes: number; label: string }>;

export type UploadPurpose = keyof typeof UPLOAD_PURPOSES;

export function isUploadPurpose(value: string): value is UploadPurpose {
  return Object.hasOwn(UPLOAD_PURPOSES, value);
}

/** A safe display name: no directory parts, no control characters, at most 200 characters. */
export function cleanFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  const cleaned = base.replace(/[\u0000-\u001f\u007f"<>|:*?]/g, "_").trim().slice(0, 200);
  return cleaned || "upload";
}

export interface SaveUploadInput {
  bytes: Uint8Array;
  originalName: string;
  purpose: UploadPurpose;
  organisationId: number | null;
  uploadedBy: number | null;
}

/**
 * Checks the bytes against the purpose (kind by content, size), writes them to the store and records
 * the file. Call it inside the transaction of the change that uses the file; if the transaction
 * fails, call `discardStoredFile` with the key (or let the orphan sweep remove it).
 */
export async function saveUpload(
  db: Kysely<Database> | Transaction<Database>,
  input: SaveUploadInput,
  now = new Date(),
): Promise<FileRow> {
  const rule = UPLOAD_PURPOSES[input.purpose];
  if (input.bytes.length === 0) throw new AppError("validation", "The file is empty.", { file: ["Choose a file that is not empty."] });
  if (input.bytes.length > rule.maxBytes) {
    const mb = (rule.maxBytes / 1024 / 1024).toFixed(0);
    throw new AppError("validation", `The file is too large: at most ${mb} MB.`, { file: [`At most ${mb} MB.`] });
  }
  const kind = sniffFileKind(input.bytes);
  if (!kind || !(rule.kinds as readonly FileKind[]).includes(kind)) {
    throw new AppError("validation", `${rule.label}: the file must be a ${describeKinds(rule.kinds)}; this one is not.`, {
      file: [`Expected ${describeKinds(rule.kinds)}.`],
    });
  }
  const key = `${now.toISOString().slice(0, 7)}/${randomUUID()}`;
  const store = fileStore();
  // Bytes first, row second: a row never names bytes that are not there (the backup relies on it).
  await store.put(key, input.bytes, CONTENT_TYPES[kind]);
  try {
    return await db
      .insertInto("files")
      .values({
        organisation_id: input.organisationId,
        purpose: input.purpose,
        original_name: cleanFileName(input.originalName),
        content_type: CONTENT_TYPES[kind],
        size_bytes: input.bytes.length,
        sha256: createHash("sha256").update(input.bytes).digest("hex"),
        storage_key: key,
        uploaded_by: input.uploadedBy,
        created_at: now.toISOString(),
      })
      .returningAll()
      .executeTakeFirstOrThrow();
  } catch (error) {
    await discardStoredFile(key);
    throw error;
  }
}

/**
 * Removes a stored file's bytes (after its transaction failed). Never throws, so the failure
 * that led here is the one reported; bytes it cannot remove are logged and stay, named by no row.
 */
export async function discardStoredFile(storageKey: string): Promise<void> {
  try {
    await fileStore().remove(storageKey);
  } catch (error) {
    console.error(`Could not remove the unrecorded upload ${storageKey}:`, error);
  }
}

/** A file's record and bytes, if the caller may see it; otherwise 404. */
export async function readFileFor(
  db: Kysely<Database>,
  user: SessionUser,
  id: number,
): Promise<{ file: FileRow; bytes: Buffer }> {
  const file = await db
    .selectFrom("files")
    .selectAll()
    .where("id", "=", id)
    .where((eb) =>
      // The unit's own files (no organisation) are for the unit's staff only.
      user.organisationKind === "unit"
        ? eb.lit(true)
        : eb.and([eb("organisation_id", "is not", null), tenantScope(user, { organisation: "files.organisation_id" })]),
    )
    .executeTakeFirst();
  if (!file) throw notFound("That file");
  const bytes = await fileStore().get(file.storage_key);
  if (!bytes) throw new AppError("not_found", "That file's content is missing from storage.");
  return { file, bytes };
}
