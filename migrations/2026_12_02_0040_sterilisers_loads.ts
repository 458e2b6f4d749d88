import { type Kysely, sql } from "kysely";

// Steriliser daily tests, steriliser loads and their load lists, release decisions, shelf-life
// rules for expiry dates, recalls with the sets they affect, and the implant flag on set types.
export async function up(db: Kysely<any>): Promise<void> {
  // A set type whose sets hold implants: its loads wait for the biological indicator.
  await db.schema.alterTable("set_types").addColumn("contains_implant", "integer", (c) => c.notNull().defaultTo(0)).execute();
  // How a site stores sterile goods, for the shelf-life rule applied at release.
  await db.schema
    .alterTable("sites")
    .addColumn("sterile_storage", "text", (c) => c.notNull().defaultTo("protected").check(sql`sterile_storage in ('protected', 'unprotected')`))
    .execute();

  // Daily steriliser tests: the air-removal (Bowie-Dick type) test and the vacuum leak test.
  await db.schema
    .createTable("machine_tests")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("machine_id", "integer", (c) => c.notNull().references("machines.id"))
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('air_removal', 'leak')`))
    // The unit's calendar day (YYYY-MM-DD in the unit's time zone) the test covers.
    .addColumn("unit_day", "text", (c) => c.notNull())
    .addColumn("result", "text", (c) => c.notNull().check(sql`result in ('pass', 'fail')`))
    // Leak test only: the measured rate and the limit it was judged against, kPa per minute.
    .addColumn("leak_rate_kpa_min", "real")
    .addColumn("leak_limit_kpa_min", "real")
    .addColumn("notes", "text")
    .addColumn("performed_by", "integer", (c) => c.references("users.id"))
    .addColumn("performed_at", "text", (c) => c.notNull())
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("machine_tests_day_idx").on("machine_tests").columns(["machine_id", "kind", "unit_day"]).execute();

  await db.schema
    .createTable("steriliser_loads")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("number", "text", (c) => c.notNull().unique())
    .addColumn("machine_id", "integer", (c) => c.notNull().references("machines.id"))
    .addColumn("program_id", "integer", (c) => c.notNull().references("programs.id"))
    // loading: sets being added; running: started, list frozen; awaiting_release: record checked,
    // sets sterilised; released / failed: the quality lead's decision; aborted: a fault mid-run.
    .addColumn("status", "text", (c) =>
      c.notNull().check(sql`status in ('loading', 'running', 'awaiting_release', 'released', 'failed', 'aborted')`),
    )
    .addColumn("contains_implant", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("air_removal_test_id", "integer", (c) => c.references("machine_tests.id"))
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("started_by", "integer", (c) => c.references("users.id"))
    .addColumn("started_at", "text")
    .addColumn("ended_at", "text")
    .addColumn("finished_by", "integer", (c) => c.references("users.id"))
    .addColumn("record_file_id", "integer", (c) => c.references("files.id"))
    // JSON of the computed figures (hold, band, F0, saturation) and the reasons a check failed.
    .addColumn("figures", "text")
    .addColumn("reasons", "text")
    .addColumn("record_passed", "integer")
    // Chemical indicator (ISO 11140-1 type) and result; biological indicator result.
    .addColumn("ci_type", "integer")
    .addColumn("ci_result", "text", (c) => c.check(sql`ci_result in ('pass', 'fail')`))
    .addColumn("bi_result", "text", (c) => c.check(sql`bi_result in ('pending', 'pass', 'fail', 'not_used')`))
    .addColumn("bi_lot", "text")
    .addColumn("bi_read_at", "text")
    .addColumn("bi_read_by", "integer", (c) => c.references("users.id"))
    // A documented release of an implant load before its biological indicator is read.
    .addColumn("early_release_reason", "text")
    .addColumn("early_release_by", "integer", (c) => c.references("users.id"))
    .addColumn("decision_by", "integer", (c) => c.references("users.id"))
    .addColumn("decision_at", "text")
    .addColumn("decision_notes", "text")
    .addColumn("failed_after_release", "integer", (c) => c.notNull().defaultTo(0))
    .execute();
  await db.schema.createIndex("steriliser_loads_machine_idx").on("steriliser_loads").columns(["machine_id", "created_at"]).execute();
  await db.schema.createIndex("steriliser_loads_status_idx").on("steriliser_loads").columns(["status", "created_at"]).execute();

  await db.schema
    .createTable("load_items")
    .addColumn("load_id", "integer", (c) => c.notNull().references("steriliser_loads.id"))
    .addColumn("cycle_id", "integer", (c) => c.notNull().references("cycles.id"))
    .addColumn("shelf", "text", (c) => c.notNull().defaultTo("any").check(sql`shelf in ('lower', 'any')`))
    .addColumn("added_by", "integer", (c) => c.references("users.id"))
    .addColumn("added_at", "text", (c) => c.notNull())
    .addPrimaryKeyConstraint("load_items_pk", ["load_id", "cycle_id"])
    .execute();
  await db.schema.createIndex("load_items_cycle_idx").on("load_items").column("cycle_id").execute();

  // Shelf-life rules: how long a set stays usable by its packaging and the storage it goes to.
  await db.schema
    .createTable("shelf_life_rules")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("packaging", "text", (c) => c.notNull())
    .addColumn("storage", "text", (c) => c.notNull().check(sql`storage in ('protected', 'unprotected')`))
    .addColumn("amount", "integer", (c) => c.notNull().check(sql`amount > 0`))
    .addColumn("unit", "text", (c) => c.notNull().check(sql`unit in ('hours', 'days', 'months', 'years')`))
    .addColumn("updated_by", "integer", (c) => c.references("users.id"))
    .addColumn("updated_at", "text", (c) => c.notNull())
    .addUniqueConstraint("shelf_life_rules_unique", ["packaging", "storage"])
    .execute();

  // Settings of the sterilising area that the quality lead may change (leak-rate limit, the
  // weight above which a set goes on the lower shelf); values as text, parsed by the app.
  await db.schema
    .createTable("sterile_settings")
    .addColumn("key", "text", (c) => c.primaryKey())
    .addColumn("value", "text", (c) => c.notNull())
    .addColumn("updated_by", "integer", (c) => c.references("users.id"))
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("recalls")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("number", "text", (c) => c.notNull().unique())
    .addColumn("load_id", "integer", (c) => c.notNull().references("steriliser_loads.id"))
    .addColumn("reason", "text", (c) => c.notNull())
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('open', 'closed')`))
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("closed_at", "text")
    .execute();
  await db.schema.createIndex("recalls_load_idx").on("recalls").column("load_id").execute();

  await db.schema
    .createTable("recall_items")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("recall_id", "integer", (c) => c.notNull().references("recalls.id"))
    .addColumn("cycle_id", "integer", (c) => c.notNull().references("cycles.id"))
    .addColumn("set_id", "integer", (c) => c.notNull().references("sets.id"))
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("site_id", "integer", (c) => c.notNull().references("sites.id"))
    // The cycle's state when the recall was raised (released, dispatched or delivered).
    .addColumn("state_at_recall", "text", (c) => c.notNull())
    .addColumn("returned_at", "text")
    .addColumn("returned_by", "integer", (c) => c.references("users.id"))
    .addUniqueConstraint("recall_items_unique", ["recall_id", "cycle_id"])
    .execute();
  await db.schema.createIndex("recall_items_org_idx").on("recall_items").columns(["organisation_id", "recall_id"]).execute();
  await db.schema.createIndex("recall_items_cycle_idx").on("recall_items").column("cycle_id").execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["recall_items", "recalls", "sterile_settings", "shelf_life_rules", "load_items", "steriliser_loads", "machine_tests"]) {
    await db.schema.dropTable(table).execute();
  }
  await db.schema.alterTable("sites").dropColumn("sterile_storage").execute();
  await db.schema.alterTable("set_types").dropColumn("contains_implant").execute();
}
