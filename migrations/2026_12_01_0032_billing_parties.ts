import { type Kysely, sql } from "kysely";

// What an e-invoice (EN 16931) needs of the seller and the buyer beyond their names and sites —
// the VAT identifier (BT-31 / BT-48; the seller's is required on standard-rated invoices,
// BR-S-02) and the country of the postal address (BT-40 / BT-55, ISO 3166-1 alpha-2) — and how
// each credit note was settled: it reduced what was still due, was refunded to the card that
// paid, or was settled outside the payment service (bank transfer).
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("organisations").addColumn("vat_id", "text").execute();
  await db.schema
    .alterTable("organisations")
    .addColumn("country_code", "text", (c) => c.notNull().defaultTo("GB"))
    .execute();
  await db.schema
    .alterTable("credit_notes")
    .addColumn("settlement", "text", (c) => c.check(sql`settlement in ('amount_due', 'refund', 'out_of_band')`))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("credit_notes").dropColumn("settlement").execute();
  await db.schema.alterTable("organisations").dropColumn("country_code").execute();
  await db.schema.alterTable("organisations").dropColumn("vat_id").execute();
}
