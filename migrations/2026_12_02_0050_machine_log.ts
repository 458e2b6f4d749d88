import { type Kysely, sql } from "kysely";

// The monitoring and maintenance log of the unit's machines and rooms (cleaning, services, faults,
// seal tests, water treatment readings, sterile store climate), the quality lead's limits and
// check intervals, and the inner chamber size of each machine.
export async function up(db: Kysely<any>): Promise<void> {
  // Inner chamber size in millimetres; the StU capacity is worked out from it when given.
  await db.schema.alterTable("machines").addColumn("chamber_width_mm", "integer").execute();
  await db.schema.alterTable("machines").addColumn("chamber_height_mm", "integer").execute();
  await db.schema.alterTable("machines").addColumn("chamber_depth_mm", "integer").execute();

  await db.schema
    .createTable("machine_log")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("kind", "text", (c) =>
      c.notNull().check(sql`kind in ('washer_cleaning', 'service', 'fault', 'seal_test', 'water_reading', 'salt_refill', 'store_climate')`),
    )
    // Empty for readings of a room or of the water treatment rather than one machine.
    .addColumn("machine_id", "integer", (c) => c.references("machines.id"))
    // Where a room reading was taken (e.g. the sterile store), in the unit's own words.
    .addColumn("place", "text")
    // When the check was done (ISO-8601 UTC), and when and by whom it was written down.
    .addColumn("at", "text", (c) => c.notNull())
    .addColumn("recorded_by", "integer", (c) => c.notNull().references("users.id"))
    .addColumn("recorded_at", "text", (c) => c.notNull())
    // Seal test: pass or fail.
    .addColumn("outcome", "text", (c) => c.check(sql`outcome is null or outcome in ('pass', 'fail')`))
    // Readings, each in one fixed unit; an entry fills only those of its kind.
    .addColumn("temperature_c", "real")
    .addColumn("humidity_pct", "real")
    .addColumn("conductivity_us_cm", "real")
    .addColumn("hardness_mmol_l", "real")
    .addColumn("salt_kg", "real")
    // Service visits: who came (a company or engineer, as typed) and a reference.
    .addColumn("provider", "text")
    .addColumn("reference", "text")
    .addColumn("notes", "text")
    // Faults: the machine is out of use from `at` until the fault is cleared.
    .addColumn("cleared_at", "text")
    .addColumn("cleared_by", "integer", (c) => c.references("users.id"))
    .addColumn("clearance_note", "text")
    // The check against the limits in force when the entry was written: 1 when out of range,
    // with the sentences saying which limit was missed (JSON list).
    .addColumn("out_of_range", "integer", (c) => c.notNull().defaultTo(0).check(sql`out_of_range in (0, 1)`))
    .addColumn("findings", "text", (c) => c.notNull().defaultTo("[]"))
    .execute();
  await db.schema.createIndex("machine_log_at_idx").on("machine_log").columns(["at"]).execute();
  await db.schema.createIndex("machine_log_kind_idx").on("machine_log").columns(["kind", "machine_id", "at"]).execute();

  // The quality lead's limits and intervals where they differ from the built-in defaults
  // (lib/monitoring/limits.ts): one row per setting, its value as JSON.
  await db.schema
    .createTable("monitoring_settings")
    .addColumn("key", "text", (c) => c.primaryKey())
    .addColumn("value", "text", (c) => c.notNull())
    .addColumn("updated_by", "integer", (c) => c.references("users.id"))
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("monitoring_settings").execute();
  await db.schema.dropTable("machine_log").execute();
  for (const column of ["chamber_depth_mm", "chamber_height_mm", "chamber_width_mm"]) {
    await db.schema.alterTable("machines").dropColumn(column).execute();
  }
}
