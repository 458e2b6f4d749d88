import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { recordToCsv } from "@/lib/cycles/csv";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { synthSterilizerRecord } from "@/lib/cycles/synth";

// Helpers for the steriliser load tests: a steriliser of the test's own (so no demo test of the
// day interferes), packed cycles of free demo sets, and steriliser records as a machine exports them.

/** A steriliser with a 134 °C 3 min program (EN 285), which no demo data touches. */
export async function makeSteriliser(db: Kysely<Database>, code: string, capacityStu: number): Promise<{ machineId: number; programId: number }> {
  const iso = new Date().toISOString();
  const { id: machineId } = await db
    .insertInto("machines")
    .values({ kind: "steriliser", code, name: `Test steriliser ${code}`, capacity_stu: capacityStu, created_at: iso, updated_at: iso })
    .returning("id")
    .executeTakeFirstOrThrow();
  const requirement = { kind: "steam", name: "134 °C, 3 min", sterilisationTempC: 134, bandWidthK: 3, minHoldSeconds: 180, saturationToleranceK: 2, airRemoval: "prevacuum" };
  const { id: programId } = await db
    .insertInto("programs")
    .values({ machine_id: machineId, code: "P134", name: "134 °C 3 min", requirement: JSON.stringify(requirement) })
    .returning("id")
    .executeTakeFirstOrThrow();
  return { machineId, programId };
}

export interface FreeSet {
  id: number;
  serial: string;
  sizeStu: number;
  weightG: number;
  organisationId: number;
  packaging: string;
  setTypeId: number;
}

/** Sets with no open cycle, sterilised with steam at 134 °C, in serial order. */
export async function freeSteamSets(db: Kysely<Database>): Promise<FreeSet[]> {
  const rows = await db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial", "set_types.size_stu", "set_types.weight_g", "sets.organisation_id", "set_types.packaging", "set_types.id as type_id"])
    .where("sets.status", "=", "in_service")
    .where("set_types.sterilisation_method", "=", "steam_134")
    .where((eb) =>
      eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))),
    )
    .orderBy("sets.serial")
    .execute();
  return rows.map((r) => ({ id: r.id, serial: r.serial, sizeStu: r.size_stu, weightG: r.weight_g, organisationId: r.organisation_id, packaging: r.packaging, setTypeId: r.type_id }));
}

/** Opens a cycle for the set and takes it through receiving, washing and packing. */
export async function packedCycle(
  db: Kysely<Database>,
  setId: number,
  userId: number,
  upTo: "packed" | "washed" | "received" = "packed",
  at = new Date(Date.now() - 3 * 3600_000),
): Promise<number> {
  const row = await db.selectFrom("sets").select(["organisation_id", "home_site_id"]).where("id", "=", setId).executeTakeFirstOrThrow();
  const cycleId = await openCycle(db, {
    organisationId: row.organisation_id,
    siteId: row.home_site_id,
    setId,
    orderId: null,
    serviceLevel: "standard",
    heavySoil: false,
    outOfHours: false,
    loaner: false,
    neededBackBy: null,
    promisedAt: null,
    userId: null,
    at,
  });
  await applyCycleEvent(db, { cycleId, event: "receive", station: "receiving", userId, at });
  if (upTo === "received") return cycleId;
  await applyCycleEvent(db, { cycleId, event: "wash_passed", station: "washing", userId, at });
  if (upTo === "packed") await applyCycleEvent(db, { cycleId, event: "pack", station: "packing", userId, at });
  return cycleId;
}

/** A steriliser record: 134 °C plateau for the given seconds, pressure on the saturation line. */
export function steamCsv(plateauSeconds = 240, opts: { pressureOffsetKpa?: number; startedAt?: string; pressure?: { unit: "kPa" | "bar"; reference: "absolute" | "gauge" } } = {}): string {
  const record = synthSterilizerRecord({ plateauTempC: 135, plateauSeconds, stepSeconds: 10, pressureOffsetKpa: opts.pressureOffsetKpa });
  return recordToCsv(record, { startedAt: opts.startedAt ?? new Date(Date.now() - 3600_000).toISOString(), decimals: 3, pressure: opts.pressure });
}
