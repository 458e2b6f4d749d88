import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { DEMO_ORGANISATIONS } from "./organisations";
import { DEMO_PASSWORD, DEMO_PEOPLE } from "./people";
import { seedContracts } from "./contracts";
import { seedCatalogue } from "./catalogue";
import { seedSets } from "./sets";
import { type HistorySeed, seedHistory } from "./history";
import { seedProblems } from "./problems";
import { seedMachines } from "./machines";
import { seedBatches } from "./batches";
import { seedReceiving } from "./receiving";
import { seedProcedureUses } from "./procedures";
import { type InvoiceSeed, seedInvoices } from "./invoices";
import { seedPayments } from "./payments";
import { seedPackRecords } from "./packing";
import { seedLoads } from "./loads";
import { seedMonitoring } from "./monitoring";
import { seedVans } from "./vans";

// Writes the demo scenario into an empty, migrated database, in one transaction.

export interface SeedResult {
  organisations: Record<string, number>;
  sites: Record<string, number>;
  users: Record<string, number>;
  /** Contract versions by reference. */
  contracts?: Record<string, number>;
  /** Set type ids by organisation short code, then set type code. */
  setTypes?: Record<string, Record<string, number>>;
  /** Set ids by serial. */
  sets?: Record<string, number>;
  /** The 90 days of ordering history: order ids by reference, and the late orders. */
  history?: HistorySeed;
  /** Machine ids by code, and program ids by "<machine code>/<program code>". */
  machines?: Record<string, number>;
  programs?: Record<string, number>;
  /** The two months' invoices the demo has issued: ids by our number, run ids by month. */
  invoices?: InvoiceSeed;
  /** Van ids by code, and the day of the demo's route plan (YYYY-MM-DD). */
  vans?: Record<string, number>;
  planDay?: string;
}

export async function seedDemo(db: Kysely<Database>, now = new Date()): Promise<SeedResult> {
  const existing = await db.selectFrom("organisations").select("id").limit(1).executeTakeFirst();
  if (existing) {
    throw new Error("The database already holds data. Seed a fresh database (npm run demo starts from a fresh one).");
  }
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const iso = now.toISOString();
  return db.transaction().execute(async (trx) => {
    const result: SeedResult = { organisations: {}, sites: {}, users: {} };
    for (const org of DEMO_ORGANISATIONS) {
      const { id } = await trx
        .insertInto("organisations")
        .values({
          kind: org.kind,
          name: org.name,
          short_code: org.shortCode,
          billing_email: org.billingEmail ?? null,
          created_at: iso,
          updated_at: iso,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      result.organisations[org.shortCode] = id;
      for (const site of org.sites) {
        const row = await trx
          .insertInto("sites")
          .values({
            organisation_id: id,
            name: site.name,
            address_line1: site.addressLine1,
            town: site.town,
            postcode: site.postcode,
            latitude: site.latitude,
            longitude: site.longitude,
            opening_hours: JSON.stringify(site.openingHours),
            delivery_notes: site.deliveryNotes ?? null,
            contact_name: site.contactName ?? null,
            contact_phone: site.contactPhone ?? null,
            is_depot: site.isDepot ? 1 : 0,
            created_at: iso,
            updated_at: iso,
          })
          .returning("id")
          .executeTakeFirstOrThrow();
        result.sites[site.name] = row.id;
      }
    }
    for (const person of DEMO_PEOPLE) {
      const { id } = await trx
        .insertInto("users")
        .values({
          organisation_id: result.organisations[person.organisation]!,
          site_id: person.site ? result.sites[person.site]! : null,
          email: person.email,
          name: person.name,
          role: person.role,
          password_hash: passwordHash,
          status: "active",
          created_at: iso,
          updated_at: iso,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      result.users[person.email] = id;
    }
    await seedCatalogue(trx, result, now);
    result.sets = await seedSets(trx, result, now);
    await seedContracts(trx, result, now);
    result.history = await seedHistory(trx, result, now);
    await seedProblems(trx, result, now);
    Object.assign(result, await seedMachines(trx, result, now));
    await seedBatches(trx, result, now);
    await seedReceiving(trx, result, now);
    await seedProcedureUses(trx, result, now);
    result.invoices = await seedInvoices(trx, result, now);
    await seedPayments(trx, result, now);
    await seedPackRecords(trx, result, now);
    await seedLoads(trx, result, now);
    await seedMonitoring(trx, result, now);
    Object.assign(result, await seedVans(trx, result, now, passwordHash));
    return result;
  });
}
