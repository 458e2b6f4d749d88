import { type Kysely, sql } from "kysely";

// Uploaded files, the set catalogue (set types and their contents), the barcoded sets, and
// versioned contracts with their rate cards and surcharges.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("files")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    // The organisation whose users may see the file; null for the unit's own files.
    .addColumn("organisation_id", "integer", (c) => c.references("organisations.id"))
    .addColumn("purpose", "text", (c) => c.notNull())
    .addColumn("original_name", "text", (c) => c.notNull())
    .addColumn("content_type", "text", (c) => c.notNull())
    .addColumn("size_bytes", "integer", (c) => c.notNull())
    .addColumn("sha256", "text", (c) => c.notNull())
    // Where the bytes are, relative to the uploads folder; made by the storage module, never by a caller.
    .addColumn("storage_key", "text", (c) => c.notNull().unique())
    .addColumn("uploaded_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("files_organisation_idx").on("files").column("organisation_id").execute();

  await db.schema
    .createTable("set_types")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("code", "text", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("set_class", "text", (c) => c.notNull())
    .addColumn("packaging", "text", (c) =>
      c.notNull().check(sql`packaging in ('wrap', 'rigid_container', 'single_pouch', 'double_pouch')`),
    )
    .addColumn("sterilisation_method", "text", (c) =>
      c.notNull().check(sql`sterilisation_method in ('steam_134', 'steam_121', 'low_temperature')`),
    )
    // JSON array of flags: dismantle, ultrasonic, manual_wash_only, lumens_to_flush.
    .addColumn("processing_flags", "text", (c) => c.notNull().defaultTo("[]"))
    .addColumn("processing_notes", "text")
    .addColumn("weight_g", "integer", (c) => c.notNull().check(sql`weight_g > 0`))
    // Size in sterilisation units (1 StU = 300 × 300 × 600 mm), fractions for small items.
    .addColumn("size_stu", "real", (c) => c.notNull().check(sql`size_stu > 0`))
    .addColumn("ifu_file_id", "integer", (c) => c.references("files.id"))
    .addColumn("active", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .addUniqueConstraint("set_types_organisation_name_unique", ["organisation_id", "name"])
    .addUniqueConstraint("set_types_organisation_code_unique", ["organisation_id", "code"])
    .execute();

  await db.schema
    .createTable("set_type_items")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("set_type_id", "integer", (c) => c.notNull().references("set_types.id").onDelete("cascade"))
    .addColumn("position", "integer", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("quantity", "integer", (c) => c.notNull().check(sql`quantity > 0`))
    .addUniqueConstraint("set_type_items_name_unique", ["set_type_id", "name"])
    .execute();

  await db.schema
    .createTable("sets")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("set_type_id", "integer", (c) => c.notNull().references("set_types.id"))
    // The site the set belongs to and goes back to.
    .addColumn("home_site_id", "integer", (c) => c.notNull().references("sites.id"))
    .addColumn("serial", "text", (c) => c.notNull())
    // GS1 Global Individual Asset Identifier, AI (8004).
    .addColumn("giai", "text", (c) => c.notNull().unique())
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('in_service', 'retired')`))
    .addColumn("notes", "text")
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .addUniqueConstraint("sets_organisation_serial_unique", ["organisation_id", "serial"])
    .execute();
  await db.schema.createIndex("sets_organisation_type_idx").on("sets").columns(["organisation_id", "set_type_id"]).execute();
  await db.schema.createIndex("sets_home_site_idx").on("sets").column("home_site_id").execute();

  await db.schema
    .createTable("contracts")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("reference", "text", (c) => c.notNull().unique())
    // Local dates in the unit's time zone, inclusive; valid_until null = open-ended.
    .addColumn("valid_from", "text", (c) => c.notNull())
    .addColumn("valid_until", "text")
    .addColumn("currency", "text", (c) => c.notNull())
    .addColumn("vat_category", "text", (c) => c.notNull().defaultTo("S"))
    .addColumn("vat_rate_bp", "integer", (c) => c.notNull().check(sql`vat_rate_bp >= 0 and vat_rate_bp <= 10000`))
    .addColumn("payment_terms_days", "integer", (c) => c.notNull().check(sql`payment_terms_days between 0 and 365`))
    .addColumn("turnaround_standard_hours", "integer", (c) => c.notNull().check(sql`turnaround_standard_hours > 0`))
    .addColumn("turnaround_express_hours", "integer", (c) => c.notNull().check(sql`turnaround_express_hours > 0`))
    .addColumn("clock_stops_at", "text", (c) => c.notNull().check(sql`clock_stops_at in ('released', 'delivered')`))
    // JSON service calendar: { timeZone, hours: { mon: [{ start, end }], … }, holidays: [] }.
    .addColumn("service_calendar", "text", (c) => c.notNull())
    .addColumn("minimum_monthly_fee_minor", "integer", (c) => c.notNull().check(sql`minimum_monthly_fee_minor >= 0`))
    .addColumn("sla_credit_bp", "integer", (c) => c.notNull().check(sql`sla_credit_bp between 0 and 10000`))
    .addColumn("notes", "text")
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("contracts_organisation_idx").on("contracts").columns(["organisation_id", "valid_from"]).execute();

  await db.schema
    .createTable("contract_rates")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("contract_id", "integer", (c) => c.notNull().references("contracts.id").onDelete("cascade"))
    .addColumn("set_class", "text", (c) => c.notNull())
    .addColumn("band_index", "integer", (c) => c.notNull())
    // Cumulative monthly count of sets of the class up to which this band applies; null = no limit.
    .addColumn("up_to_quantity", "integer")
    .addColumn("unit_price_minor", "integer", (c) => c.notNull().check(sql`unit_price_minor >= 0`))
    .addUniqueConstraint("contract_rates_band_unique", ["contract_id", "set_class", "band_index"])
    .execute();

  await db.schema
    .createTable("contract_surcharges")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("contract_id", "integer", (c) => c.notNull().references("contracts.id").onDelete("cascade"))
    .addColumn("kind", "text", (c) => c.notNull())
    .addColumn("basis", "text", (c) => c.notNull().check(sql`basis in ('per_set', 'percent_of_fee')`))
    .addColumn("amount_minor", "integer")
    .addColumn("basis_points", "integer")
    .addUniqueConstraint("contract_surcharges_kind_unique", ["contract_id", "kind"])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["contract_surcharges", "contract_rates", "contracts", "sets", "set_type_items", "set_types", "files"]) {
    await db.schema.dropTable(table).execute();
  }
}
