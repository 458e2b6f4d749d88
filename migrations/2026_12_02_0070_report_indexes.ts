import type { Kysely } from "kysely";

// Indexes for the reports (lib/reports): the on-time report reads the cycles released or
// delivered in a period, the volumes report those received in it, across every customer.
// Without them each report scans the whole cycles table; measured by tests/bench/reports.ts over
// one million cycles.
const INDEXES: { name: string; column: string }[] = [
  { name: "cycles_released_idx", column: "released_at" },
  { name: "cycles_delivered_idx", column: "delivered_at" },
  { name: "cycles_received_idx", column: "received_at" },
];

export async function up(db: Kysely<any>): Promise<void> {
  for (const index of INDEXES) await db.schema.createIndex(index.name).on("cycles").column(index.column).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const index of INDEXES) await db.schema.dropIndex(index.name).ifExists().execute();
}
