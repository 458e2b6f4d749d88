import { type Kysely, sql } from "kysely";

// Vans, drivers' shifts and the day's route plans: runs per van, the ordered stops of each run,
// the orders each stop serves, and the sets scanned at a stop (once per client-made event id).
// Minutes (start_min, window_start_min, …) count from midnight of the plan's day in the unit's
// time zone; `day` is that local date as 'YYYY-MM-DD'.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("vans")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("code", "text", (c) => c.notNull().unique())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("registration", "text", (c) => c.notNull())
    .addColumn("soiled_capacity_carts", "integer", (c) => c.notNull().check(sql`soiled_capacity_carts >= 0`))
    .addColumn("clean_capacity_carts", "integer", (c) => c.notNull().check(sql`clean_capacity_carts >= 0`))
    .addColumn("active", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("driver_shifts")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("user_id", "integer", (c) => c.notNull().references("users.id"))
    .addColumn("day", "text", (c) => c.notNull())
    .addColumn("start_min", "integer", (c) => c.notNull().check(sql`start_min >= 0 and start_min < 1440`))
    .addColumn("end_min", "integer", (c) => c.notNull().check(sql`end_min > start_min and end_min <= 1440`))
    .addColumn("break_earliest_min", "integer")
    .addColumn("break_latest_min", "integer")
    .addColumn("break_duration_min", "integer", (c) => c.notNull().defaultTo(0).check(sql`break_duration_min >= 0`))
    .addColumn("van_id", "integer", (c) => c.references("vans.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .addUniqueConstraint("driver_shifts_user_day_unique", ["user_id", "day"])
    .execute();
  await db.schema.createIndex("driver_shifts_day_idx").on("driver_shifts").column("day").execute();

  await db.schema
    .createTable("route_plans")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("day", "text", (c) => c.notNull().unique())
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('draft', 'published')`))
    .addColumn("seed", "integer", (c) => c.notNull())
    .addColumn("road_factor", "real", (c) => c.notNull())
    .addColumn("speed_kmh", "real", (c) => c.notNull())
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("solved_at", "text")
    .addColumn("published_by", "integer", (c) => c.references("users.id"))
    .addColumn("published_at", "text")
    // JSON: totals and the planner's notes (unassigned stops with reasons, lateness).
    .addColumn("summary", "text", (c) => c.notNull().defaultTo("{}"))
    .execute();

  await db.schema
    .createTable("route_runs")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("plan_id", "integer", (c) => c.notNull().references("route_plans.id"))
    .addColumn("van_id", "integer", (c) => c.notNull().references("vans.id"))
    .addColumn("driver_user_id", "integer", (c) => c.notNull().references("users.id"))
    .addColumn("shift_id", "integer", (c) => c.notNull().references("driver_shifts.id"))
    .addColumn("distance_km", "real", (c) => c.notNull().defaultTo(0))
    .addColumn("drive_min", "real", (c) => c.notNull().defaultTo(0))
    .addColumn("start_min", "real")
    .addColumn("end_min", "real")
    .addUniqueConstraint("route_runs_plan_van_unique", ["plan_id", "van_id"])
    .execute();

  await db.schema
    .createTable("route_stops")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("plan_id", "integer", (c) => c.notNull().references("route_plans.id"))
    .addColumn("run_id", "integer", (c) => c.references("route_runs.id"))
    .addColumn("position", "integer")
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("site_id", "integer", (c) => c.notNull().references("sites.id"))
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('collection', 'delivery', 'both')`))
    .addColumn("window_start_min", "integer", (c) => c.notNull())
    .addColumn("window_end_min", "integer", (c) => c.notNull())
    .addColumn("hard", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("service_min", "integer", (c) => c.notNull().check(sql`service_min >= 0`))
    .addColumn("soiled_carts", "integer", (c) => c.notNull().defaultTo(0).check(sql`soiled_carts >= 0`))
    .addColumn("clean_carts", "integer", (c) => c.notNull().defaultTo(0).check(sql`clean_carts >= 0`))
    .addColumn("planned_arrival_min", "real")
    .addColumn("planned_start_min", "real")
    .addColumn("late_min", "real")
    .addColumn("locked", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("status", "text", (c) => c.notNull().defaultTo("planned").check(sql`status in ('planned', 'served', 'not_served')`))
    .addColumn("not_served_reason", "text")
    .addColumn("signature_file_id", "integer", (c) => c.references("files.id"))
    .addColumn("signed_by_name", "text")
    .addColumn("served_at", "text")
    .addColumn("served_by", "integer", (c) => c.references("users.id"))
    .addColumn("expected_time_notified_at", "text")
    // The planned start last sent to the site, so a re-publish mails only where it changed.
    .addColumn("notified_start_min", "real")
    // Why the planner could not place the stop, or why it is late, in words.
    .addColumn("note", "text")
    .execute();
  await db.schema.createIndex("route_stops_plan_idx").on("route_stops").columns(["plan_id", "run_id", "position"]).execute();
  await db.schema.createIndex("route_stops_org_idx").on("route_stops").columns(["organisation_id", "site_id"]).execute();

  await db.schema
    .createTable("route_stop_orders")
    .addColumn("stop_id", "integer", (c) => c.notNull().references("route_stops.id"))
    .addColumn("order_id", "integer", (c) => c.notNull().references("orders.id"))
    .addColumn("role", "text", (c) => c.notNull().check(sql`role in ('collect', 'deliver')`))
    .addPrimaryKeyConstraint("route_stop_orders_pk", ["stop_id", "order_id", "role"])
    .execute();
  await db.schema.createIndex("route_stop_orders_order_idx").on("route_stop_orders").column("order_id").execute();

  await db.schema
    .createTable("stop_scans")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("client_event_id", "text", (c) => c.notNull().unique())
    .addColumn("stop_id", "integer", (c) => c.notNull().references("route_stops.id"))
    .addColumn("cycle_id", "integer", (c) => c.notNull().references("cycles.id"))
    .addColumn("set_id", "integer", (c) => c.notNull().references("sets.id"))
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('collect', 'deliver')`))
    .addColumn("scanned_by", "integer", (c) => c.references("users.id"))
    .addColumn("scanned_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("stop_scans_stop_idx").on("stop_scans").column("stop_id").execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["stop_scans", "route_stop_orders", "route_stops", "route_runs", "route_plans", "driver_shifts", "vans"]) {
    await db.schema.dropTable(table).execute();
  }
}
