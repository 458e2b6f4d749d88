import { type Kysely, sql } from "kysely";

// The unit's machines and their programs, washer-disinfector batches with their records, manual
// washes, and packing records with the contents check.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("machines")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('washer', 'steriliser', 'heat_sealer', 'drying_cabinet', 'ultrasonic')`))
    .addColumn("code", "text", (c) => c.notNull().unique())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("serial_number", "text")
    // Usable chamber size in sterilisation units (StU), for sterilisers and washer racks.
    .addColumn("capacity_stu", "real")
    .addColumn("active", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("programs")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("machine_id", "integer", (c) => c.notNull().references("machines.id"))
    .addColumn("code", "text", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    // JSON: for washers { kind: "a0", minA0, minTempC? } | { kind: "time_temp", minTempC, minHoldSeconds };
    // for sterilisers the cycle type { sterilisationTempC, bandWidthK, minHoldSeconds, … }.
    .addColumn("requirement", "text", (c) => c.notNull())
    .addColumn("active", "integer", (c) => c.notNull().defaultTo(1))
    .addUniqueConstraint("programs_machine_code_unique", ["machine_id", "code"])
    .execute();

  await db.schema
    .createTable("washer_batches")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("number", "text", (c) => c.notNull().unique())
    .addColumn("machine_id", "integer", (c) => c.notNull().references("machines.id"))
    .addColumn("program_id", "integer", (c) => c.notNull().references("programs.id"))
    // loading: sets being added; running: started; passed / failed: record checked; aborted: a fault.
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('loading', 'running', 'passed', 'failed', 'aborted')`))
    .addColumn("started_by", "integer", (c) => c.references("users.id"))
    .addColumn("started_at", "text")
    .addColumn("ended_at", "text")
    .addColumn("record_file_id", "integer", (c) => c.references("files.id"))
    // JSON of the computed figures (A0, hold, min/max) and the reasons for a failure.
    .addColumn("figures", "text")
    .addColumn("reasons", "text")
    .addColumn("closed_by", "integer", (c) => c.references("users.id"))
    .addColumn("closed_at", "text")
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("washer_batches_machine_idx").on("washer_batches").columns(["machine_id", "created_at"]).execute();
  await db.schema.createIndex("washer_batches_status_idx").on("washer_batches").columns(["status", "created_at"]).execute();

  await db.schema
    .createTable("washer_batch_items")
    .addColumn("batch_id", "integer", (c) => c.notNull().references("washer_batches.id"))
    .addColumn("cycle_id", "integer", (c) => c.notNull().references("cycles.id"))
    .addColumn("added_at", "text", (c) => c.notNull())
    .addPrimaryKeyConstraint("washer_batch_items_pk", ["batch_id", "cycle_id"])
    .execute();
  await db.schema.createIndex("washer_batch_items_cycle_idx").on("washer_batch_items").column("cycle_id").execute();

  await db.schema
    .createTable("pack_records")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("cycle_id", "integer", (c) => c.notNull().references("cycles.id"))
    .addColumn("packed_by", "integer", (c) => c.references("users.id"))
    .addColumn("packaging", "text", (c) => c.notNull())
    // JSON: [{ name, expected, counted, damaged }] — the contents checklist as counted.
    .addColumn("counts", "text", (c) => c.notNull())
    // JSON: [{ name, kind: "missing" | "damaged", quantity }] — printed on the label when packed anyway.
    .addColumn("irregularities", "text", (c) => c.notNull().defaultTo("[]"))
    .addColumn("outcome", "text", (c) => c.notNull().check(sql`outcome in ('packed', 'held')`))
    .addColumn("notes", "text")
    .addColumn("at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("pack_records_cycle_idx").on("pack_records").columns(["cycle_id", "at"]).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["pack_records", "washer_batch_items", "washer_batches", "programs", "machines"]) {
    await db.schema.dropTable(table).execute();
  }
}
