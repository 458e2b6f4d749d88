import type { Kysely } from "kysely";

// Packing records: why the packaging differs from the set type's (when it does), the pouch sizes
// used, and the scan event the record belongs to (so a retried pack is recognised and recorded once).
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("pack_records").addColumn("packaging_reason", "text").execute();
  // e.g. "135 × 260 mm" or "135 × 260 mm inside 190 × 330 mm"; null when not pouched.
  await db.schema.alterTable("pack_records").addColumn("pouch", "text").execute();
  await db.schema
    .alterTable("pack_records")
    .addColumn("scan_event_id", "integer", (c) => c.references("scan_events.id"))
    .execute();
  await db.schema.createIndex("pack_records_scan_event_unique").on("pack_records").column("scan_event_id").unique().execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex("pack_records_scan_event_unique").execute();
  for (const column of ["scan_event_id", "pouch", "packaging_reason"]) {
    await db.schema.alterTable("pack_records").dropColumn(column).execute();
  }
}
