import type { Kysely } from "kysely";

// Indexes for the order list (GET /api/orders): each filter and sort the list offers, for the
// unit's staff (every customer), a clinic manager (one organisation) and clinic staff (one site),
// so that a page is read from an index in order instead of sorting the whole list. Measured by
// tests/bench/orders.ts on 200,000 orders.
//
// The list always breaks ties by orders.id ascending. Its default view is the newest first
// (created_at descending), so the creation-time indexes are declared descending: read forwards
// they give created_at descending with the row id ascending, the exact order of the default
// view, and a deep page skips rows without sorting them.
const INDEXES: { name: string; columns: string[] }[] = [
  // The unit's list: newest first, a date range, and a deep page.
  { name: "orders_created_idx", columns: ["created_at desc"] },
  // The unit's list filtered by status (and sorted by status).
  { name: "orders_status_created_idx", columns: ["status", "created_at desc"] },
  // The unit's list sorted by collection time or promised return.
  { name: "orders_collection_idx", columns: ["collection_from"] },
  { name: "orders_promised_idx", columns: ["promised_return_at"] },
  // A customer's list as its clinic manager sees it by default: newest first, deep pages too.
  { name: "orders_org_created_desc_idx", columns: ["organisation_id", "created_at desc"] },
  // A site's list as its clinic staff (organisation and site) or a manager filtering by site see
  // it: both equality terms and the default order in one index, which also answers the count from
  // the index alone (the unit's whole count as well).
  { name: "orders_org_site_created_idx", columns: ["organisation_id", "site_id", "created_at desc"] },
  // A site's list filtered by status ("at the unit", "ready to return"…): three equality terms,
  // then the default order; the count is read from the index alone.
  { name: "orders_org_site_status_created_idx", columns: ["organisation_id", "site_id", "status", "created_at desc"] },
  // A customer's list sorted by reference, collection time or promised return.
  { name: "orders_org_reference_idx", columns: ["organisation_id", "reference"] },
  { name: "orders_org_collection_idx", columns: ["organisation_id", "collection_from"] },
  { name: "orders_org_promised_idx", columns: ["organisation_id", "promised_return_at"] },
];

export async function up(db: Kysely<any>): Promise<void> {
  for (const index of INDEXES) await db.schema.createIndex(index.name).on("orders").columns(index.columns).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const index of INDEXES) await db.schema.dropIndex(index.name).ifExists().execute();
}
