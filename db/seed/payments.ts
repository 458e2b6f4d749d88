import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import type { SeedResult } from "./demo";

// The demo's billing settings: the unit's own details for e-invoices (its accounts address and a
// VAT number — an obvious placeholder, since the unit is invented) and finance's reminder
// schedule of 7, 21 and 45 days after an invoice's due date.

export const DEMO_UNIT_VAT_ID = "GB000000000";
export const DEMO_UNIT_BILLING_EMAIL = "accounts@larkmoor.example";
export const DEMO_REMINDER_DAYS = [7, 21, 45] as const;

export async function seedPayments(trx: Transaction<Database>, seed: SeedResult, now: Date): Promise<void> {
  const unitId = seed.organisations.LSS;
  if (unitId !== undefined) {
    await trx
      .updateTable("organisations")
      .set({ vat_id: DEMO_UNIT_VAT_ID, billing_email: DEMO_UNIT_BILLING_EMAIL, updated_at: now.toISOString() })
      .where("id", "=", unitId)
      .execute();
  }
  for (const days of DEMO_REMINDER_DAYS) {
    await trx.insertInto("reminder_rules").values({ days_after_due: days, created_at: now.toISOString() }).execute();
  }
}
