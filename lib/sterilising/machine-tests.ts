import "server-only";
import { format, subDays } from "date-fns";
import { tz } from "@date-fns/tz";
import type { Kysely, Transaction } from "kysely";
import type { Database, MachineTestKind } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { getSterileSettings } from "./settings";

// A steriliser's daily tests: the air-removal (Bowie-Dick type) test, every day before the first
// load with an empty chamber (EN 285; AAMI ST79), and the vacuum leak test with its measured rate
// against the unit's limit. A load cannot start or be released without a passed air-removal test
// on its unit day (the calendar day in the unit's time zone).

type Db = Kysely<Database> | Transaction<Database>;

export const TEST_KIND_LABELS: Record<MachineTestKind, string> = {
  air_removal: "Air-removal (Bowie-Dick type) test",
  leak: "Vacuum leak test",
};

/** The unit's calendar day of an instant, YYYY-MM-DD. */
export function unitDayOf(at: Date, timeZone = serverEnv().UNIT_TIME_ZONE): string {
  return format(at, "yyyy-MM-dd", { in: tz(timeZone) });
}

export interface MachineTestView {
  id: number;
  machineId: number;
  kind: MachineTestKind;
  unitDay: string;
  result: "pass" | "fail";
  leakRateKpaMin: number | null;
  leakLimitKpaMin: number | null;
  notes: string | null;
  performedBy: string | null;
  performedAt: string;
}

/** The latest test of the kind recorded for the machine on a unit day (a repeat after a failure counts). */
export async function latestTest(db: Db, machineId: number, kind: MachineTestKind, unitDay: string): Promise<MachineTestView | null> {
  const row = await db
    .selectFrom("machine_tests as t")
    .leftJoin("users as u", "u.id", "t.performed_by")
    .select(["t.id", "t.machine_id", "t.kind", "t.unit_day", "t.result", "t.leak_rate_kpa_min", "t.leak_limit_kpa_min", "t.notes", "t.performed_at", "u.name as performer"])
    .where("t.machine_id", "=", machineId)
    .where("t.kind", "=", kind)
    .where("t.unit_day", "=", unitDay)
    .orderBy("t.performed_at", "desc")
    .orderBy("t.id", "desc")
    .executeTakeFirst();
  return row ? toView(row) : null;
}

function toView(row: {
  id: number;
  machine_id: number;
  kind: MachineTestKind;
  unit_day: string;
  result: "pass" | "fail";
  leak_rate_kpa_min: number | null;
  leak_limit_kpa_min: number | null;
  notes: string | null;
  performed_at: string;
  performer: string | null;
}): MachineTestView {
  return {
    id: row.id,
    machineId: row.machine_id,
    kind: row.kind,
    unitDay: row.unit_day,
    result: row.result,
    leakRateKpaMin: row.leak_rate_kpa_min,
    leakLimitKpaMin: row.leak_limit_kpa_min,
    notes: row.notes,
    performedBy: row.performer,
    performedAt: row.performed_at,
  };
}

/** The passed air-removal test of the machine's unit day, or throws a 409 saying what to do. */
export async function requirePassedAirRemoval(db: Db, machine: { id: number; code: string }, unitDay: string, doing: string): Promise<MachineTestView> {
  const test = await latestTest(db, machine.id, "air_removal", unitDay);
  if (!test) {
    throw new AppError(
      "conflict",
      `${machine.code} has no air-removal (Bowie-Dick type) test recorded on ${unitDay}: run and record the day's test before you ${doing}.`,
    );
  }
  if (test.result !== "pass") {
    throw new AppError("conflict", `${machine.code}'s air-removal test on ${unitDay} failed: the steriliser may not be used for loads that day until a repeat test passes; you cannot ${doing}.`);
  }
  return test;
}

export interface RecordTestInput {
  machineId: number;
  kind: MachineTestKind;
  result?: "pass" | "fail";
  leakRateKpaMin?: number | null;
  notes?: string | null;
}

/** Records a daily test for today's unit day. A leak test is judged against the unit's limit. */
export async function recordMachineTest(db: Kysely<Database>, user: SessionUser, input: RecordTestInput, now = new Date()): Promise<MachineTestView> {
  const id = await db.transaction().execute(async (trx) => {
    const machine = await trx.selectFrom("machines").select(["id", "code", "kind", "active"]).where("id", "=", input.machineId).executeTakeFirst();
    if (!machine || machine.kind !== "steriliser") throw notFound("That steriliser");
    let result = input.result;
    let limit: number | null = null;
    let rate: number | null = null;
    if (input.kind === "leak") {
      if (input.leakRateKpaMin === undefined || input.leakRateKpaMin === null || !Number.isFinite(input.leakRateKpaMin) || input.leakRateKpaMin < 0) {
        throw new AppError("validation", "Enter the measured leak rate in kPa per minute.", { leakRateKpaMin: ["Enter the measured leak rate (kPa/min), e.g. 0.08."] });
      }
      rate = input.leakRateKpaMin;
      limit = (await getSterileSettings(trx)).leakLimitKpaMin;
      result = rate <= limit + 1e-12 ? "pass" : "fail";
    }
    if (!result) throw new AppError("validation", "Choose whether the test passed or failed.", { result: ["Choose passed or failed."] });
    const iso = now.toISOString();
    const { id } = await trx
      .insertInto("machine_tests")
      .values({
        machine_id: machine.id,
        kind: input.kind,
        unit_day: unitDayOf(now),
        result,
        leak_rate_kpa_min: rate,
        leak_limit_kpa_min: limit,
        notes: input.notes?.trim() || null,
        performed_by: user.id,
        performed_at: iso,
        created_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(trx, { actorUserId: user.id, action: "machine_test.recorded", entity: "machine_test", entityId: id, details: { machine: machine.code, kind: input.kind, result, rate } }, now);
    return id;
  });
  const row = await db
    .selectFrom("machine_tests as t")
    .leftJoin("users as u", "u.id", "t.performed_by")
    .select(["t.id", "t.machine_id", "t.kind", "t.unit_day", "t.result", "t.leak_rate_kpa_min", "t.leak_limit_kpa_min", "t.notes", "t.performed_at", "u.name as performer"])
    .where("t.id", "=", id)
    .executeTakeFirstOrThrow();
  return toView(row);
}

export interface SteriliserTestsDay {
  unitDay: string;
  airRemoval: MachineTestView | null;
  leak: MachineTestView | null;
}

export interface SteriliserTestsView {
  id: number;
  code: string;
  name: string;
  days: SteriliserTestsDay[];
}

/** Every steriliser with the latest test of each kind on each of the last `days` unit days. */
export async function listSteriliserTests(db: Db, days = 14, now = new Date()): Promise<SteriliserTestsView[]> {
  const machines = await db.selectFrom("machines").select(["id", "code", "name"]).where("kind", "=", "steriliser").where("active", "=", 1).orderBy("code").execute();
  const dayList = Array.from({ length: days }, (_, i) => unitDayOf(subDays(now, i)));
  const rows = machines.length
    ? await db
        .selectFrom("machine_tests as t")
        .leftJoin("users as u", "u.id", "t.performed_by")
        .select(["t.id", "t.machine_id", "t.kind", "t.unit_day", "t.result", "t.leak_rate_kpa_min", "t.leak_limit_kpa_min", "t.notes", "t.performed_at", "u.name as performer"])
        .where("t.machine_id", "in", machines.map((m) => m.id))
        .where("t.unit_day", ">=", dayList[dayList.length - 1]!)
        .orderBy("t.performed_at")
        .orderBy("t.id")
        .execute()
    : [];
  return machines.map((m) => ({
    ...m,
    days: dayList.map((day) => {
      const of = (kind: MachineTestKind) => rows.filter((r) => r.machine_id === m.id && r.kind === kind && r.unit_day === day).map(toView).pop() ?? null;
      return { unitDay: day, airRemoval: of("air_removal"), leak: of("leak") };
    }),
  }));
}
