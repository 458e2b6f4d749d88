import "server-only";
import { createHash } from "node:crypto";
import type { Kysely } from "kysely";
import { z } from "zod";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { discardStoredFile, saveUpload } from "@/lib/storage/files";
import { describeChanges, type SetTypeValues } from "./compare";
import { formatIssue, type ImportedSetType, type ImportIssue, MAX_IMPORT_BYTES, readCatalogueFile } from "./import";
import { catalogueOrganisation, parseFlags, setTypeColumns, writeItems } from "./set-types";
import { expectsIfu, type SetClass } from "./vocabulary";

// The catalogue import against the database: the dry run says what a file would create and change
// and writes nothing; the commit checks the same file again and writes all of it in one
// transaction, or nothing. Set types are matched by code; set types missing from the file stay
// as they are (an import never removes anything), and an import never touches IFU files.

type Db = Kysely<Database>;

/** The most problems one answer lists; the count says how many there are in all. */
export const MAX_LISTED_ISSUES = 500;

export interface ImportPlanEntry {
  code: string;
  name: string;
  line: number;
  itemCount: number;
  /** For changed set types: what changes, in words. */
  changes?: string[];
}

export interface ImportPlan {
  organisationId: number;
  organisationName: string;
  fileName: string;
  sha256: string;
  sizeBytes: number;
  rowCount: number;
  issueCount: number;
  issues: ImportIssue[];
  warnings: ImportIssue[];
  create: ImportPlanEntry[];
  update: ImportPlanEntry[];
  unchanged: ImportPlanEntry[];
  /** Set types of the catalogue that the file does not mention; they are left as they are. */
  notInFile: number;
}

export interface ImportUpload {
  organisationId: number;
  fileName: string;
  bytes: Uint8Array;
  /** The digest the dry run reported; the commit refuses a different file. */
  expectedSha256?: string | null;
}

interface ExistingSetType extends SetTypeValues {
  id: number;
  active: boolean;
  hasIfu: boolean;
}

async function loadCatalogue(db: Db, organisationId: number): Promise<Map<string, ExistingSetType>> {
  const rows = await db.selectFrom("set_types").selectAll().where("organisation_id", "=", organisationId).execute();
  const items = await db
    .selectFrom("set_type_items")
    .innerJoin("set_types", "set_types.id", "set_type_items.set_type_id")
    .select(["set_type_items.set_type_id", "set_type_items.name", "set_type_items.quantity"])
    .where("set_types.organisation_id", "=", organisationId)
    .orderBy("set_type_items.set_type_id")
    .orderBy("set_type_items.position")
    .execute();
  const byId = new Map<number, { name: string; quantity: number }[]>();
  for (const item of items) {
    const list = byId.get(item.set_type_id) ?? [];
    list.push({ name: item.name, quantity: item.quantity });
    byId.set(item.set_type_id, list);
  }
  return new Map(
    rows.map((r) => [
      r.code,
      {
        id: r.id,
        code: r.code,
        name: r.name,
        setClass: r.set_class as SetClass,
        packaging: r.packaging,
        sterilisationMethod: r.sterilisation_method,
        flags: parseFlags(r.processing_flags),
        processingNotes: r.processing_notes,
        weightG: r.weight_g,
        sizeStu: r.size_stu,
        items: byId.get(r.id) ?? [],
        active: r.active === 1,
        hasIfu: r.ifu_file_id !== null,
      },
    ]),
  );
}

const entry = (s: ImportedSetType, changes?: string[]): ImportPlanEntry => ({
  code: s.code,
  name: s.name,
  line: s.line,
  itemCount: s.items.length,
  ...(changes ? { changes } : {}),
});

/** Reads the file and compares it with the customer's catalogue. Writes nothing. */
async function planImport(db: Db, user: SessionUser, upload: ImportUpload) {
  const org = await catalogueOrganisation(db, user, upload.organisationId);
  const file = readCatalogueFile(upload.bytes);
  const existing = await loadCatalogue(db, org.id);
  const issues = [...file.issues];
  const warnings: ImportIssue[] = [];
  const existingNames = new Map([...existing.values()].map((s) => [s.name.toLowerCase(), s]));
  const create: ImportedSetType[] = [];
  const update: { setType: ImportedSetType; id: number; changes: string[] }[] = [];
  const unchanged: ImportedSetType[] = [];

  for (const setType of file.setTypes) {
    const current = existing.get(setType.code);
    const holder = existingNames.get(setType.name.toLowerCase());
    if (holder && holder.code !== setType.code) {
      issues.push({
        line: setType.line,
        column: "name",
        message: `"${setType.name}" is already the name of set type ${holder.code} in this catalogue; choose another name or use code ${holder.code}`,
      });
      continue;
    }
    if (expectsIfu(setType.setClass) && !current?.hasIfu) {
      warnings.push({
        line: setType.line,
        column: null,
        message: `${setType.code} is a loaner set without instructions for use; upload the PDF on its page before it is booked`,
      });
    }
    if (!current) {
      create.push(setType);
      continue;
    }
    if (!current.active) {
      warnings.push({ line: setType.line, column: null, message: `${setType.code} is inactive; the import updates it but leaves it inactive` });
    }
    const changes = describeChanges(current, setType);
    if (changes.length) update.push({ setType, id: current.id, changes });
    else unchanged.push(setType);
  }
  issues.sort((a, b) => (a.line ?? 0) - (b.line ?? 0));

  const inFile = new Set(file.setTypes.map((s) => s.code));
  const plan: ImportPlan = {
    organisationId: org.id,
    organisationName: org.name,
    fileName: upload.fileName,
    sha256: createHash("sha256").update(upload.bytes).digest("hex"),
    sizeBytes: upload.bytes.length,
    rowCount: file.rowCount,
    issueCount: issues.length,
    issues: issues.slice(0, MAX_LISTED_ISSUES),
    warnings: warnings.slice(0, MAX_LISTED_ISSUES),
    create: create.map((s) => entry(s)),
    update: update.map((u) => entry(u.setType, u.changes)),
    unchanged: unchanged.map((s) => entry(s)),
    notInFile: [...existing.keys()].filter((code) => !inFile.has(code)).length,
  };
  return { plan, create, update, allIssues: issues };
}

/** The dry run: problems with line and column, and what the file would create and change. */
export async function checkImport(db: Db, user: SessionUser, upload: ImportUpload): Promise<ImportPlan> {
  return (await planImport(db, user, upload)).plan;
}

export interface ImportOutcome {
  created: number;
  updated: number;
  unchanged: number;
  fileId: number | null;
}

/**
 * Checks the file again and, when it has no problems, writes every new and changed set type in one
 * transaction, keeps the file as a record, and audits each set type and the import.
 */
export async function commitImport(db: Db, user: SessionUser, upload: ImportUpload, now = new Date()): Promise<ImportOutcome> {
  let storedKey: string | null = null;
  try {
    return await db.transaction().execute(async (trx) => {
      const { plan, create, update, allIssues } = await planImport(trx, user, upload);
      if (upload.expectedSha256 && upload.expectedSha256 !== plan.sha256) {
        throw new AppError("conflict", "This is not the file that was checked. Check it again before importing.");
      }
      if (allIssues.length > 0) {
        const first = formatIssue(allIssues[0]!);
        throw new AppError(
          "validation",
          `The file has ${allIssues.length === 1 ? "a problem" : `${allIssues.length} problems`}, so nothing was imported. The first: ${first}. Fix the file and check it again.`,
        );
      }
      if (create.length === 0 && update.length === 0) {
        return { created: 0, updated: 0, unchanged: plan.unchanged.length, fileId: null };
      }
      const saved = await saveUpload(
        trx,
        { bytes: upload.bytes, originalName: upload.fileName, purpose: "catalogue_import", organisationId: plan.organisationId, uploadedBy: user.id },
        now,
      );
      storedKey = saved.storage_key;
      const iso = now.toISOString();
      for (const setType of create) {
        const { id } = await trx
          .insertInto("set_types")
          .values({ organisation_id: plan.organisationId, ...setTypeColumns(setType), ifu_file_id: null, created_at: iso, updated_at: iso })
          .returning("id")
          .executeTakeFirstOrThrow();
        await writeItems(trx, id, setType.items);
        await recordAudit(
          trx,
          {
            actorUserId: user.id,
            organisationId: plan.organisationId,
            action: "set_type.created",
            entity: "set_type",
            entityId: id,
            details: { code: setType.code, name: setType.name, items: setType.items.length, importFileId: saved.id, line: setType.line },
          },
          now,
        );
      }
      for (const { setType, id, changes } of update) {
        await trx
          .updateTable("set_types")
          .set({ ...setTypeColumns(setType), updated_at: iso })
          .where("id", "=", id)
          .where("organisation_id", "=", plan.organisationId)
          .execute();
        await writeItems(trx, id, setType.items);
        await recordAudit(
          trx,
          {
            actorUserId: user.id,
            organisationId: plan.organisationId,
            action: "set_type.updated",
            entity: "set_type",
            entityId: id,
            details: { code: setType.code, changes, importFileId: saved.id, line: setType.line },
          },
          now,
        );
      }
      await recordAudit(
        trx,
        {
          actorUserId: user.id,
          organisationId: plan.organisationId,
          action: "catalogue.imported",
          entity: "file",
          entityId: saved.id,
          details: { fileName: plan.fileName, sha256: plan.sha256, created: create.length, updated: update.length, unchanged: plan.unchanged.length },
        },
        now,
      );
      return { created: create.length, updated: update.length, unchanged: plan.unchanged.length, fileId: saved.id };
    });
  } catch (error) {
    if (storedKey) await discardStoredFile(storedKey);
    throw error;
  }
}

const importFormSchema = z.object({
  organisationId: z.coerce.number({ error: "Choose a customer." }).int().positive("Choose a customer."),
  expectedSha256: z
    .string()
    .regex(/^[0-9a-f]{64}$/)
    .nullish(),
});

/** The multipart form of an import request: the file, the customer, and (to commit) the checked digest. */
export async function readImportUpload(req: Request): Promise<ImportUpload> {
  const form = await req.formData().catch(() => {
    throw new AppError("invalid", "Send the file as multipart form data with a file field.");
  });
  const file = form.get("file");
  if (!(file instanceof File)) throw new AppError("validation", "Choose a CSV file to import.", { file: ["Choose a file."] });
  if (file.size > MAX_IMPORT_BYTES) {
    throw new AppError("validation", `The file is ${(file.size / 1024 / 1024).toFixed(1)} MB; import at most 5 MB at a time (split the file).`, {
      file: ["At most 5 MB."],
    });
  }
  const fields = importFormSchema.parse({
    organisationId: form.get("organisationId"),
    expectedSha256: form.get("expectedSha256") || null,
  });
  return { ...fields, fileName: file.name || "catalogue.csv", bytes: new Uint8Array(await file.arrayBuffer()) };
}
