import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import type { SeedResult } from "./demo";

// The packing records behind the demo's history. The history records every packing as a "pack"
// scan event at the packing station; this seed writes the record each of those packings would
// have left — the packer, the set type's packaging, every line of its contents counted as listed
// — linked to its event, so the label of any historic cycle shows who packed it and when.
//
// Decisions:
// - Every historic pack was complete: no irregularities, so no missing-instrument charge is added
//   to cycles the invoices of the demo have already priced. (The history's holds after packing
//   are the quality lead's, at the quality station; they leave the packing record as it is.)
// - The pouch size is not recorded for the history (the helper came later); null.
// Deterministic: everything derives from the scan events already written.

const CHUNK = 200;

export async function seedPackRecords(trx: Transaction<Database>, _seed: SeedResult, _now: Date): Promise<number> {
  const events = await trx
    .selectFrom("scan_events")
    .innerJoin("cycles", "cycles.id", "scan_events.cycle_id")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .leftJoin("pack_records", "pack_records.scan_event_id", "scan_events.id")
    .select(["scan_events.id", "scan_events.cycle_id", "scan_events.user_id", "scan_events.at", "set_types.id as set_type_id", "set_types.packaging"])
    .where("scan_events.event", "=", "pack")
    .where("scan_events.station", "=", "packing")
    .where("pack_records.id", "is", null)
    .orderBy("scan_events.id")
    .execute();
  if (events.length === 0) return 0;

  const items = await trx
    .selectFrom("set_type_items")
    .select(["set_type_id", "position", "name", "quantity"])
    .where("set_type_id", "in", [...new Set(events.map((e) => e.set_type_id))])
    .orderBy("set_type_id")
    .orderBy("position")
    .execute();
  const countsByType = new Map<number, string>();
  for (const typeId of new Set(items.map((i) => i.set_type_id))) {
    const lines = items
      .filter((i) => i.set_type_id === typeId)
      .map((i) => ({ position: i.position, name: i.name, expected: i.quantity, counted: i.quantity, damaged: 0 }));
    countsByType.set(typeId, JSON.stringify(lines));
  }

  const rows = events.map((e) => ({
    cycle_id: e.cycle_id,
    packed_by: e.user_id,
    packaging: e.packaging,
    counts: countsByType.get(e.set_type_id) ?? "[]",
    irregularities: "[]",
    outcome: "packed" as const,
    notes: null,
    at: e.at,
    packaging_reason: null,
    pouch: null,
    scan_event_id: e.id,
  }));
  for (let i = 0; i < rows.length; i += CHUNK) await trx.insertInto("pack_records").values(rows.slice(i, i + CHUNK)).execute();
  return rows.length;
}
