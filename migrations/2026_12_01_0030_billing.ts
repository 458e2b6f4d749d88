import { type Kysely, sql } from "kysely";

// Billing: invoice runs per period, invoices with their lines and the cycles each priced (once,
// by a unique key), the payment service's customers, payments, webhook events processed once,
// credit notes, and finance's reminder schedule.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("payment_customers")
    .addColumn("organisation_id", "integer", (c) => c.primaryKey().references("organisations.id"))
    .addColumn("stripe_customer_id", "text", (c) => c.notNull().unique())
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("invoice_runs")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    // The billing month as a local month "2026-11", and its instants [start, end).
    .addColumn("period", "text", (c) => c.notNull())
    .addColumn("period_start", "text", (c) => c.notNull())
    .addColumn("period_end", "text", (c) => c.notNull())
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('draft', 'approved', 'issuing', 'issued')`))
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    .addColumn("approved_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("approved_at", "text")
    .addColumn("issued_at", "text")
    .execute();
  await db.schema.createIndex("invoice_runs_period_idx").on("invoice_runs").column("period").execute();

  await db.schema
    .createTable("invoices")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("run_id", "integer", (c) => c.references("invoice_runs.id"))
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("contract_id", "integer", (c) => c.references("contracts.id"))
    // Our own number, e.g. "LSS-2026-11-QMH"; the payment service numbers its copy itself.
    .addColumn("number", "text", (c) => c.notNull().unique())
    .addColumn("currency", "text", (c) => c.notNull())
    .addColumn("period_start", "text", (c) => c.notNull())
    .addColumn("period_end", "text", (c) => c.notNull())
    .addColumn("issue_date", "text")
    .addColumn("due_date", "text")
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('draft', 'open', 'paid', 'void', 'uncollectible')`))
    .addColumn("line_total_minor", "integer", (c) => c.notNull())
    .addColumn("tax_exclusive_minor", "integer", (c) => c.notNull())
    .addColumn("vat_minor", "integer", (c) => c.notNull())
    .addColumn("total_minor", "integer", (c) => c.notNull())
    .addColumn("amount_paid_minor", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("amount_credited_minor", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("amount_due_minor", "integer", (c) => c.notNull())
    // JSON: the VAT breakdown per category and rate.
    .addColumn("vat_breakdown", "text", (c) => c.notNull())
    .addColumn("stripe_invoice_id", "text", (c) => c.unique())
    .addColumn("stripe_number", "text")
    .addColumn("hosted_invoice_url", "text")
    .addColumn("last_payment_error", "text")
    .addColumn("paid_at", "text")
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .addUniqueConstraint("invoices_run_organisation_unique", ["run_id", "organisation_id"])
    .execute();
  await db.schema.createIndex("invoices_org_status_idx").on("invoices").columns(["organisation_id", "status", "due_date"]).execute();
  await db.schema.createIndex("invoices_status_due_idx").on("invoices").columns(["status", "due_date"]).execute();

  await db.schema
    .createTable("invoice_lines")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("invoice_id", "integer", (c) => c.notNull().references("invoices.id").onDelete("cascade"))
    .addColumn("position", "integer", (c) => c.notNull())
    .addColumn("kind", "text", (c) => c.notNull())
    .addColumn("item_code", "text", (c) => c.notNull())
    .addColumn("description", "text", (c) => c.notNull())
    .addColumn("note", "text")
    .addColumn("quantity", "integer", (c) => c.notNull())
    .addColumn("unit_price_minor", "integer", (c) => c.notNull())
    .addColumn("net_minor", "integer", (c) => c.notNull())
    .addColumn("vat_category", "text", (c) => c.notNull())
    .addColumn("vat_rate_bp", "integer", (c) => c.notNull())
    // JSON array of the cycle ids this line was priced from (its evidence).
    .addColumn("cycle_ids", "text", (c) => c.notNull().defaultTo("[]"))
    .addColumn("stripe_invoice_item_id", "text", (c) => c.unique())
    .addUniqueConstraint("invoice_lines_position_unique", ["invoice_id", "position"])
    .execute();

  // A cycle is priced at most once, whatever the code does: the primary key says so.
  await db.schema
    .createTable("priced_cycles")
    .addColumn("cycle_id", "integer", (c) => c.primaryKey().references("cycles.id"))
    .addColumn("invoice_id", "integer", (c) => c.notNull().references("invoices.id"))
    .addColumn("fee_minor", "integer", (c) => c.notNull())
    .addColumn("late", "integer", (c) => c.notNull())
    .addColumn("priced_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("priced_cycles_invoice_idx").on("priced_cycles").column("invoice_id").execute();

  await db.schema
    .createTable("payments")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("invoice_id", "integer", (c) => c.notNull().references("invoices.id"))
    .addColumn("stripe_payment_id", "text", (c) => c.notNull().unique())
    .addColumn("amount_minor", "integer", (c) => c.notNull())
    .addColumn("currency", "text", (c) => c.notNull())
    .addColumn("status", "text", (c) => c.notNull())
    .addColumn("paid_at", "text")
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("webhook_events")
    .addColumn("id", "text", (c) => c.primaryKey())
    .addColumn("type", "text", (c) => c.notNull())
    .addColumn("received_at", "text", (c) => c.notNull())
    .addColumn("processed_at", "text")
    .execute();

  await db.schema
    .createTable("credit_notes")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("invoice_id", "integer", (c) => c.notNull().references("invoices.id"))
    .addColumn("number", "text", (c) => c.notNull().unique())
    .addColumn("reason", "text", (c) => c.notNull())
    .addColumn("net_minor", "integer", (c) => c.notNull())
    .addColumn("vat_minor", "integer", (c) => c.notNull())
    .addColumn("total_minor", "integer", (c) => c.notNull())
    // JSON: the credited lines (EN 16931 shape) for the export.
    .addColumn("lines", "text", (c) => c.notNull())
    .addColumn("stripe_credit_note_id", "text", (c) => c.unique())
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("reminder_rules")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    // Days after the due date on which an unpaid invoice's reminder is sent.
    .addColumn("days_after_due", "integer", (c) => c.notNull().unique().check(sql`days_after_due between 1 and 365`))
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["reminder_rules", "credit_notes", "webhook_events", "payments", "priced_cycles", "invoice_lines", "invoices", "invoice_runs", "payment_customers"]) {
    await db.schema.dropTable(table).execute();
  }
}
