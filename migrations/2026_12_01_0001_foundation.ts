import { type Kysely, sql } from "kysely";
import { isPostgres, makeAppendOnly } from "./_portable";

// Organisations (the unit and its customers), their sites, users, invitations,
// sign-in failures, the append-only audit log and the mail outbox.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("organisations")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('unit', 'customer')`))
    .addColumn("name", "text", (c) => c.notNull().unique())
    .addColumn("short_code", "text", (c) => c.notNull().unique())
    .addColumn("billing_email", "text")
    .addColumn("active", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("sites")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("address_line1", "text", (c) => c.notNull())
    .addColumn("address_line2", "text")
    .addColumn("town", "text", (c) => c.notNull())
    .addColumn("postcode", "text", (c) => c.notNull())
    .addColumn("latitude", "real", (c) => c.notNull())
    .addColumn("longitude", "real", (c) => c.notNull())
    // JSON: { mon: [{ start: "08:00", end: "18:00" }], …, sun: [] }
    .addColumn("opening_hours", "text", (c) => c.notNull())
    .addColumn("delivery_notes", "text")
    .addColumn("contact_name", "text")
    .addColumn("contact_phone", "text")
    .addColumn("contact_email", "text")
    .addColumn("is_depot", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("active", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .addUniqueConstraint("sites_organisation_name_unique", ["organisation_id", "name"])
    .execute();
  await db.schema.createIndex("sites_organisation_idx").on("sites").column("organisation_id").execute();

  await db.schema
    .createTable("users")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("organisation_id", "integer", (c) => c.notNull().references("organisations.id"))
    .addColumn("site_id", "integer", (c) => c.references("sites.id"))
    .addColumn("email", "text", (c) => c.notNull().unique())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("role", "text", (c) =>
      c
        .notNull()
        .check(
          sql`role in ('clinic_staff', 'clinic_manager', 'dispatcher', 'driver', 'technician', 'quality_lead', 'finance', 'admin')`,
        ),
    )
    .addColumn("password_hash", "text")
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('invited', 'active', 'disabled')`))
    // Bumped to revoke every session the user holds.
    .addColumn("session_version", "integer", (c) => c.notNull().defaultTo(0))
    // JSON: which notification e-mails the user receives.
    .addColumn("mail_preferences", "text", (c) => c.notNull().defaultTo("{}"))
    .addColumn("last_sign_in_at", "text")
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("users_organisation_idx").on("users").columns(["organisation_id", "name"]).execute();

  await db.schema
    .createTable("invitations")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("user_id", "integer", (c) => c.notNull().references("users.id"))
    // SHA-256 of the token; the token itself only travels in the e-mail.
    .addColumn("token_hash", "text", (c) => c.notNull().unique())
    .addColumn("expires_at", "text", (c) => c.notNull())
    .addColumn("used_at", "text")
    .addColumn("revoked_at", "text")
    .addColumn("created_by", "integer", (c) => c.references("users.id"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("invitations_user_idx").on("invitations").column("user_id").execute();

  await db.schema
    .createTable("sign_in_failures")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("sign_in_failures_email_at_idx").on("sign_in_failures").columns(["email", "at"]).execute();

  await db.schema
    .createTable("audit_log")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("at", "text", (c) => c.notNull())
    .addColumn("actor_user_id", "integer", (c) => c.references("users.id"))
    .addColumn("organisation_id", "integer", (c) => c.references("organisations.id"))
    .addColumn("action", "text", (c) => c.notNull())
    .addColumn("entity", "text", (c) => c.notNull())
    .addColumn("entity_id", "text")
    .addColumn("details", "text", (c) => c.notNull().defaultTo("{}"))
    .execute();
  await db.schema.createIndex("audit_log_entity_idx").on("audit_log").columns(["entity", "entity_id"]).execute();
  // Append-only: the database itself refuses to change or remove an entry.
  await makeAppendOnly(db, "audit_log");

  await db.schema
    .createTable("outbox")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("template", "text", (c) => c.notNull())
    .addColumn("organisation_id", "integer", (c) => c.references("organisations.id"))
    .addColumn("to_address", "text", (c) => c.notNull())
    .addColumn("subject", "text", (c) => c.notNull())
    .addColumn("text_body", "text", (c) => c.notNull())
    .addColumn("html_body", "text", (c) => c.notNull())
    // The Message-ID header, fixed when queued, so a resend after a crash is recognisable.
    .addColumn("message_id", "text", (c) => c.notNull().unique())
    // Optional key that makes queuing the same notification twice a no-op.
    .addColumn("dedupe_key", "text", (c) => c.unique())
    .addColumn("status", "text", (c) => c.notNull().check(sql`status in ('pending', 'sending', 'sent')`))
    .addColumn("attempts", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("next_attempt_at", "text", (c) => c.notNull())
    .addColumn("locked_until", "text")
    .addColumn("last_error", "text")
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("sent_at", "text")
    .execute();
  await db.schema.createIndex("outbox_due_idx").on("outbox").columns(["status", "next_attempt_at"]).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ["outbox", "audit_log", "sign_in_failures", "invitations", "users", "sites", "organisations"]) {
    await db.schema.dropTable(table).execute();
  }
  if (isPostgres(db)) await sql`drop function if exists refuse_append_only_change()`.execute(db);
}
