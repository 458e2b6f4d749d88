import { type Kysely, sql } from "kysely";
import { makeAppendOnly } from "./_portable";

// Pickup orders and store requests, the sets in them, each set's cycles through the unit with
// their append-only scan events, problems reported by clinics, and sets used for procedures.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("orders")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("site_id", "integer", (c) => c.notNull().references("sites.id"))
    .addColumn("reference", "text", (c) => c.notNull().unique())
    // pickup: collect used sets, return them processed; store_request: deliver sets held at the unit.
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('pickup', 'store_request')`))
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .check(sql`status in ('booked', 'collected', 'in_process', 'ready', 'out_for_delivery', 'delivered', 'cancelled')`),
    )
    .addColumn("service_level", "text", (c) => c.notNull().check(sql`service_level in ('standard', 'express')`))
    .addColumn("collection_from", "text")
    .addColumn("collection_until", "text")
    .addColumn("needed_back_by", "text")
    .addColumn("promised_return_at", "text")
    .addColumn("heavy_soil", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("out_of_hours", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("notes", "text")
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .addColumn("collected_at", "text")
    .addColumn("cancelled_at", "text")
    .execute();
  await db.schema.createIndex("orders_org_created_idx").on("orders").columns(["organisation_id", "created_at"]).execute();
  await db.schema.createIndex("orders_org_status_idx").on("orders").columns(["organisation_id", "status", "created_at"]).execute();
  await db.schema.createIndex("orders_site_created_idx").on("orders").columns(["site_id", "created_at"]).execute();
  await db.schema.createIndex("orders_status_collection_idx").on("orders").columns(["status", "collection_from"]).execute();

  // Items a clinic counts without a barcoded set (e.g. loose instruments), priced by the unit.
  await db.schema
    .createTable("order_extras")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("order_id", "integer", (c) => c.notNull().references("orders.id").onDelete("cascade"))
    .addColumn("description", "text", (c) => c.notNull())
    .addColumn("quantity", "integer", (c) => c.notNull().check(sql`quantity > 0`))
    .execute();

  await db.schema
    .createTable("cycles")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    // The site the set returns to.
    .addColumn("site_id", "integer", (c) => c.notNull().references("sites.id"))
    .addColumn("set_id", "integer", (c) => c.notNull().references("sets.id"))
    .addColumn("order_id", "integer", (c) => c.references("orders.id"))
    // Released sets the clinic asked the unit to keep, until a store request sends them.
    .addColumn("keep_in_store", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("return_order_id", "integer", (c) => c.references("orders.id"))
    .addColumn("state", "text", (c) => c.notNull())
    // The state before a hold, so clearing the hold returns the set there.
    .addColumn("held_from", "text")
    .addColumn("hold_reason", "text")
    .addColumn("service_level", "text", (c) => c.notNull().check(sql`service_level in ('standard', 'express')`))
    .addColumn("heavy_soil", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("out_of_hours", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("loaner", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("missing_instrument", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("needed_back_by", "text")
    .addColumn("promised_at", "text")
    .addColumn("booked_at", "text", (c) => c.notNull())
    .addColumn("collected_at", "text")
    .addColumn("received_at", "text")
    .addColumn("washed_at", "text")
    .addColumn("packed_at", "text")
    .addColumn("sterilised_at", "text")
    .addColumn("released_at", "text")
    .addColumn("dispatched_at", "text")
    .addColumn("delivered_at", "text")
    .addColumn("cancelled_at", "text")
    // Printed on the label at release: the sterile pack's expiry (local date).
    .addColumn("expires_on", "text")
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();
  // A set has at most one open cycle.
  await sql`create unique index cycles_one_open_per_set on cycles (set_id) where state not in ('delivered', 'cancelled')`.execute(db);
  await db.schema.createIndex("cycles_order_idx").on("cycles").column("order_id").execute();
  await db.schema.createIndex("cycles_org_state_idx").on("cycles").columns(["organisation_id", "state"]).execute();
  await db.schema.createIndex("cycles_state_promised_idx").on("cycles").columns(["state", "promised_at"]).execute();
  await db.schema.createIndex("cycles_org_delivered_idx").on("cycles").columns(["organisation_id", "delivered_at"]).execute();
  await db.schema.createIndex("cycles_set_idx").on("cycles").columns(["set_id", "booked_at"]).execute();

  await db.schema
    .createTable("scan_events")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("cycle_id", "integer", (c) => c.notNull().references("cycles.id"))
    .addColumn("set_id", "integer", (c) => c.notNull().references("sets.id"))
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("event", "text", (c) => c.notNull())
    .addColumn("from_state", "text")
    .addColumn("to_state", "text", (c) => c.notNull())
    // Where it happened: a station of the unit, a van stop, the clinic.
    .addColumn("station", "text", (c) => c.notNull())
    .addColumn("batch_id", "integer")
    .addColumn("load_id", "integer")
    .addColumn("user_id", "integer", (c) => c.references("users.id"))
    .addColumn("at", "text", (c) => c.notNull())
    // Made by the client, so a retried scan is recognised and not recorded twice.
    .addColumn("client_event_id", "text", (c) => c.unique())
    .addColumn("details", "text", (c) => c.notNull().defaultTo("{}"))
    .execute();
  await db.schema.createIndex("scan_events_cycle_idx").on("scan_events").columns(["cycle_id", "id"]).execute();
  await db.schema.createIndex("scan_events_at_idx").on("scan_events").columns(["at"]).execute();
  await makeAppendOnly(db, "scan_events");

  await db.schema
    .createTable("problems")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("site_id", "integer", (c) => c.notNull().references("sites.id"))
    .addColumn("order_id", "integer", (c) => c.references("orders.id"))
    .addColumn("cycle_id", "integer", (c) => c.references("cycles.id"))
    .addColumn("set_id", "integer", (c) => c.references("sets.id"))
    .addColumn("kind", "text", (c) =>
      c.notNull().check(sql`kind in ('missing_instrument', 'damaged_instrument', 'wet_or_torn_pack', 'wrong_set', 'other')`),
    )
    .addColumn("description", "text", (c) => c.notNull())
    .addColumn("photo_file_id", "integer", (c) => c.references("files.id"))
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('open', 'answered')`))
    .addColumn("answer", "text")
    .addColumn("answered_by", "integer", (c) => c.references("users.id"))
    .addColumn("answered_at", "text")
    .addColumn("reported_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("problems_org_status_idx").on("problems").columns(["organisation_id", "status", "created_at"]).execute();
  await db.schema.createIndex("problems_status_idx").on("problems").columns(["status", "created_at"]).execute();

  await db.schema
    .createTable("procedure_uses")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("site_id", "integer", (c) => c.notNull().references("sites.id"))
    .addColumn("cycle_id", "integer", (c) => c.notNull().references("cycles.id"))
    .addColumn("set_id", "integer", (c) => c.notNull().references("sets.id"))
    // The clinic's own reference: a theatre and a case number, never a patient's name.
    .addColumn("theatre", "text", (c) => c.notNull())
    .addColumn("case_reference", "text", (c) => c.notNull())
    .addColumn("pack_checked", "integer", (c) => c.notNull().check(sql`pack_checked = 1`))
    .addColumn("indicator_checked", "integer", (c) => c.notNull().check(sql`indicator_checked = 1`))
    .addColumn("recorded_by", "integer", (c) => c.references("users.id"))
    .addColumn("used_at", "text", (c) => c.notNull())
    .addUniqueConstraint("procedure_uses_cycle_unique", ["cycle_id"])
    .execute();
  await db.schema.createIndex("procedure_uses_org_idx").on("procedure_uses").columns(["organisation_id", "used_at"]).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["procedure_uses", "problems", "scan_events", "cycles", "order_extras", "orders"]) {
    await db.schema.dropTable(table).execute();
  }
}
