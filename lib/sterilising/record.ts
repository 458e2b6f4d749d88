import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { CycleRecordError } from "@/lib/cycles/errors";
import { parseSterilizerRecord } from "@/lib/cycles/parse";
import type { CycleSample } from "@/lib/cycles/record";
import { AppError } from "@/lib/errors";
import { readFileFor } from "@/lib/storage/files";

/** The samples of a load's stored record, read back as the station read it, or why they cannot be. */
export async function loadRecordSamples(db: Kysely<Database>, user: SessionUser, fileId: number): Promise<{ samples: CycleSample[] } | { problem: string }> {
  try {
    const { bytes } = await readFileFor(db, user, fileId);
    return { samples: parseSterilizerRecord(new TextDecoder().decode(bytes)).samples };
  } catch (error) {
    if (error instanceof AppError || error instanceof CycleRecordError) return { problem: `The stored record could not be read back: ${error.message}` };
    throw error;
  }
}
