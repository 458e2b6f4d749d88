import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import type { SurchargeRule, VolumeBand } from "@/lib/pricing/types";

// Invented customers, contracts, sets and delivered cycles for the invoice-run tests, written
// through the same functions the stations use (openCycle, applyCycleEvent).

/** Every day, all day: lateness is then plain hours between receipt and delivery. */
export const ALWAYS_OPEN = {
  timeZone: "Europe/London",
  hours: Object.fromEntries(["mon", "tue", "wed", "thu", "fri", "sat", "sun"].map((d) => [d, [{ start: "00:00", end: "24:00" }]])),
  holidays: [] as string[],
};

export interface VersionSpec {
  reference: string;
  validFrom: string;
  validUntil: string | null;
  paymentTermsDays?: number;
  standardHours?: number;
  expressHours?: number;
  minimumMonthlyFeeMinor?: number;
  slaCreditBasisPoints?: number;
  currency?: string;
  rates: Record<string, VolumeBand[]>;
  surcharges?: SurchargeRule[];
}

export interface TestCustomer {
  organisationId: number;
  siteId: number;
  contractIds: Record<string, number>;
  setTypes: Record<string, number>;
}

const iso = "2026-01-01T00:00:00.000Z";

/** A customer organisation with one site, its contract versions and one set type per class. */
export async function addCustomer(
  db: Kysely<Database>,
  spec: { code: string; name: string; email?: string; versions: VersionSpec[]; classes: string[] },
): Promise<TestCustomer> {
  const { id: organisationId } = await db
    .insertInto("organisations")
    .values({ kind: "customer", name: spec.name, short_code: spec.code, billing_email: spec.email ?? `accounts@${spec.code.toLowerCase()}.example`, created_at: iso, updated_at: iso })
    .returning("id")
    .executeTakeFirstOrThrow();
  const { id: siteId } = await db
    .insertInto("sites")
    .values({
      organisation_id: organisationId,
      name: `${spec.name} – main building`,
      address_line1: "1 Invented Row",
      town: "Larkmoor",
      postcode: "LK1 1AA",
      latitude: 53.7,
      longitude: -1.5,
      opening_hours: JSON.stringify({ mon: [{ start: "00:00", end: "24:00" }] }),
      created_at: iso,
      updated_at: iso,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  const contractIds: Record<string, number> = {};
  for (const v of spec.versions) {
    const { id } = await db
      .insertInto("contracts")
      .values({
        organisation_id: organisationId,
        reference: v.reference,
        valid_from: v.validFrom,
        valid_until: v.validUntil,
        currency: v.currency ?? "GBP",
        vat_category: "S",
        vat_rate_bp: 2000,
        payment_terms_days: v.paymentTermsDays ?? 30,
        turnaround_standard_hours: v.standardHours ?? 24,
        turnaround_express_hours: v.expressHours ?? 6,
        clock_stops_at: "delivered",
        service_calendar: JSON.stringify(ALWAYS_OPEN),
        minimum_monthly_fee_minor: v.minimumMonthlyFeeMinor ?? 0,
        sla_credit_bp: v.slaCreditBasisPoints ?? 1000,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    contractIds[v.reference] = id;
    const bands = Object.entries(v.rates).flatMap(([setClass, list]) =>
      list.map((band, index) => ({ contract_id: id, set_class: setClass, band_index: index, up_to_quantity: band.upToQuantity, unit_price_minor: band.unitPriceMinor })),
    );
    if (bands.length > 0) await db.insertInto("contract_rates").values(bands).execute();
    if (v.surcharges?.length) {
      await db
        .insertInto("contract_surcharges")
        .values(
          v.surcharges.map((rule) => ({
            contract_id: id,
            kind: rule.kind,
            basis: rule.basis,
            amount_minor: rule.basis === "per_set" ? rule.amountMinor : null,
            basis_points: rule.basis === "percent_of_fee" ? rule.basisPoints : null,
          })),
        )
        .execute();
    }
  }
  const setTypes: Record<string, number> = {};
  for (const setClass of spec.classes) {
    const { id } = await db
      .insertInto("set_types")
      .values({
        organisation_id: organisationId,
        code: `${spec.code}-${setClass}`,
        name: `${spec.code} ${setClass.replace("_", " ")}`,
        set_class: setClass,
        packaging: "wrap",
        sterilisation_method: "steam_134",
        weight_g: 2000,
        size_stu: 0.5,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    setTypes[setClass] = id;
  }
  return { organisationId, siteId, contractIds, setTypes };
}

let serial = 0;

export interface DeliverySpec {
  setClass: string;
  receivedAt: string;
  deliveredAt: string;
  serviceLevel?: "standard" | "express";
  heavySoil?: boolean;
  outOfHours?: boolean;
}

/** A new set of the class, taken through one whole cycle: received, processed, delivered. */
export async function deliver(db: Kysely<Database>, customer: TestCustomer, spec: DeliverySpec): Promise<{ cycleId: number; serial: string }> {
  serial += 1;
  const code = `T${String(serial).padStart(5, "0")}`;
  const { id: setId } = await db
    .insertInto("sets")
    .values({
      organisation_id: customer.organisationId,
      set_type_id: customer.setTypes[spec.setClass]!,
      home_site_id: customer.siteId,
      serial: code,
      giai: `952000000${code}`,
      status: "in_service",
      created_at: iso,
      updated_at: iso,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  const received = Date.parse(spec.receivedAt);
  const delivered = Date.parse(spec.deliveredAt);
  const step = (delivered - received) / 8;
  const cycleId = await openCycle(db, {
    organisationId: customer.organisationId,
    siteId: customer.siteId,
    setId,
    orderId: null,
    serviceLevel: spec.serviceLevel ?? "standard",
    heavySoil: spec.heavySoil ?? false,
    outOfHours: spec.outOfHours ?? false,
    loaner: false,
    neededBackBy: null,
    promisedAt: null,
    userId: null,
    at: new Date(received - 3 * 3_600_000),
  });
  const moves = [
    ["receive", "receiving"],
    ["wash_passed", "washing"],
    ["pack", "packing"],
    ["sterilise", "sterilising"],
    ["release", "release"],
    ["dispatch", "dispatch"],
  ] as const;
  for (const [index, [event, station]] of moves.entries()) {
    await applyCycleEvent(db, { cycleId, event, station, userId: null, at: new Date(received + index * step) });
  }
  await applyCycleEvent(db, { cycleId, event: "deliver", station: "clinic", userId: null, at: new Date(delivered) });
  return { cycleId, serial: code };
}
