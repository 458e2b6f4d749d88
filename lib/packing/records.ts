import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { isPackaging, PACKAGING_LABELS } from "@/lib/catalogue/vocabulary";
import { type CountedLine, type Irregularity, parseCountedLines, parseIrregularities } from "./checklist";

// Packing records read back: the one that packed a cycle (for its label and the station), and
// any by id. Callers check the tenant scope of the cycle first.

type Executor = Kysely<Database> | Transaction<Database>;

export interface PackRecordView {
  id: number;
  cycleId: number;
  outcome: "packed" | "held";
  packedById: number | null;
  packedByName: string | null;
  at: string;
  packaging: string;
  packagingLabel: string;
  packagingReason: string | null;
  pouch: string | null;
  lines: CountedLine[];
  irregularities: Irregularity[];
  note: string | null;
  scanEventId: number | null;
}

function recordQuery(db: Executor) {
  return db
    .selectFrom("pack_records")
    .leftJoin("users", "users.id", "pack_records.packed_by")
    .select([
      "pack_records.id",
      "pack_records.cycle_id",
      "pack_records.outcome",
      "pack_records.packed_by",
      "users.name as packed_by_name",
      "pack_records.at",
      "pack_records.packaging",
      "pack_records.packaging_reason",
      "pack_records.pouch",
      "pack_records.counts",
      "pack_records.irregularities",
      "pack_records.notes",
      "pack_records.scan_event_id",
    ]);
}

type Row = Awaited<ReturnType<ReturnType<typeof recordQuery>["executeTakeFirstOrThrow"]>>;

function toView(r: Row): PackRecordView {
  return {
    id: r.id,
    cycleId: r.cycle_id,
    outcome: r.outcome,
    packedById: r.packed_by,
    packedByName: r.packed_by_name,
    at: r.at,
    packaging: r.packaging,
    packagingLabel: isPackaging(r.packaging) ? PACKAGING_LABELS[r.packaging] : r.packaging,
    packagingReason: r.packaging_reason,
    pouch: r.pouch,
    lines: parseCountedLines(r.counts),
    irregularities: parseIrregularities(r.irregularities),
    note: r.notes,
    scanEventId: r.scan_event_id,
  };
}

/**
 * The record that packed the cycle as it stands: the latest "packed" one, while the cycle is
 * packed (packed_at is cleared when it goes back to washing, and the old record no longer applies).
 */
export async function currentPackRecord(db: Executor, cycleId: number): Promise<PackRecordView | null> {
  const cycle = await db.selectFrom("cycles").select("packed_at").where("id", "=", cycleId).executeTakeFirst();
  if (!cycle?.packed_at) return null;
  const row = await recordQuery(db)
    .where("pack_records.cycle_id", "=", cycleId)
    .where("pack_records.outcome", "=", "packed")
    .orderBy("pack_records.at", "desc")
    .orderBy("pack_records.id", "desc")
    .executeTakeFirst();
  return row ? toView(row) : null;
}

/** The record written with a scan event (a pack or a hold), if any. */
export async function packRecordOfEvent(db: Executor, scanEventId: number): Promise<PackRecordView | null> {
  const row = await recordQuery(db).where("pack_records.scan_event_id", "=", scanEventId).executeTakeFirst();
  return row ? toView(row) : null;
}
