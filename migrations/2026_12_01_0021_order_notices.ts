import { type Kysely, sql } from "kysely";

// What the receiving station tells a clinic about its sets: a set that arrived without a booking,
// or a booked set that did not arrive when its order was finished. Shown on the clinic's order
// page and e-mailed to the site's users.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("order_notices")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    // The order the set came with (or was booked on); null for a set that came on its own.
    .addColumn("order_id", "integer", (c) => c.references("orders.id"))
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("site_id", "integer", (c) => c.notNull().references("sites.id"))
    .addColumn("set_id", "integer", (c) => c.notNull().references("sets.id"))
    .addColumn("cycle_id", "integer", (c) => c.notNull().references("cycles.id"))
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('unexpected_set', 'missing_set')`))
    .addColumn("message", "text", (c) => c.notNull())
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    // One notice of a kind per cycle: finishing an order twice reports a missing set once.
    .addUniqueConstraint("order_notices_cycle_kind_unique", ["cycle_id", "kind"])
    .execute();
  await db.schema.createIndex("order_notices_order_idx").on("order_notices").columns(["order_id", "created_at"]).execute();
  await db.schema.createIndex("order_notices_org_idx").on("order_notices").columns(["organisation_id", "created_at"]).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("order_notices").execute();
}
