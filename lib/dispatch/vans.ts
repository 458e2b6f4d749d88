import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { assertCan } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import { clockToMinutes, type ShiftFields, type VanFields } from "./schemas";

// The unit's vans (administrator) and the drivers' shifts of a day (dispatcher). Vans and shifts
// belong to the unit itself: only unit roles hold the actions that reach them.

type Db = Kysely<Database> | Transaction<Database>;

export interface VanView {
  id: number;
  code: string;
  name: string;
  registration: string;
  soiledCapacityCarts: number;
  cleanCapacityCarts: number;
  active: boolean;
}

export async function listVans(db: Db, { activeOnly = false } = {}): Promise<VanView[]> {
  let q = db.selectFrom("vans").selectAll().orderBy("code");
  if (activeOnly) q = q.where("active", "=", 1);
  const rows = await q.execute();
  return rows.map((v) => ({
    id: v.id,
    code: v.code,
    name: v.name,
    registration: v.registration,
    soiledCapacityCarts: v.soiled_capacity_carts,
    cleanCapacityCarts: v.clean_capacity_carts,
    active: v.active === 1,
  }));
}

async function assertCodeFree(trx: Db, code: string, exceptId?: number) {
  let q = trx.selectFrom("vans").select("id").where("code", "=", code);
  if (exceptId) q = q.where("id", "!=", exceptId);
  if (await q.executeTakeFirst()) throw new AppError("validation", "Another van has that code.", { code: ["Another van has that code."] });
}

export async function createVan(db: Kysely<Database>, user: SessionUser, input: VanFields, now = new Date()): Promise<{ id: number }> {
  assertCan(user, "vans.manage");
  return db.transaction().execute(async (trx) => {
    await assertCodeFree(trx, input.code);
    const iso = now.toISOString();
    const { id } = await trx
      .insertInto("vans")
      .values({
        code: input.code,
        name: input.name,
        registration: input.registration,
        soiled_capacity_carts: input.soiledCapacityCarts,
        clean_capacity_carts: input.cleanCapacityCarts,
        active: input.active ? 1 : 0,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(trx, { actorUserId: user.id, action: "van.create", entity: "van", entityId: id, details: { code: input.code } }, now);
    return { id };
  });
}

export async function updateVan(db: Kysely<Database>, user: SessionUser, input: VanFields & { id: number }, now = new Date()): Promise<void> {
  assertCan(user, "vans.manage");
  await db.transaction().execute(async (trx) => {
    const existing = await trx.selectFrom("vans").select("id").where("id", "=", input.id).executeTakeFirst();
    if (!existing) throw notFound("That van");
    await assertCodeFree(trx, input.code, input.id);
    await trx
      .updateTable("vans")
      .set({
        code: input.code,
        name: input.name,
        registration: input.registration,
        soiled_capacity_carts: input.soiledCapacityCarts,
        clean_capacity_carts: input.cleanCapacityCarts,
        active: input.active ? 1 : 0,
        updated_at: now.toISOString(),
      })
      .where("id", "=", input.id)
      .execute();
    await recordAudit(trx, { actorUserId: user.id, action: "van.update", entity: "van", entityId: input.id, details: { code: input.code } }, now);
  });
}

export interface ShiftView {
  id: number;
  userId: number;
  driverName: string;
  day: string;
  startMin: number;
  endMin: number;
  breakEarliestMin: number | null;
  breakLatestMin: number | null;
  breakDurationMin: number;
  vanId: number | null;
  vanCode: string | null;
}

export async function listShifts(db: Db, day: string): Promise<ShiftView[]> {
  const rows = await db
    .selectFrom("driver_shifts")
    .innerJoin("users", "users.id", "driver_shifts.user_id")
    .leftJoin("vans", "vans.id", "driver_shifts.van_id")
    .select([
      "driver_shifts.id",
      "driver_shifts.user_id",
      "users.name",
      "driver_shifts.day",
      "driver_shifts.start_min",
      "driver_shifts.end_min",
      "driver_shifts.break_earliest_min",
      "driver_shifts.break_latest_min",
      "driver_shifts.break_duration_min",
      "driver_shifts.van_id",
      "vans.code as van_code",
    ])
    .where("driver_shifts.day", "=", day)
    .orderBy("driver_shifts.start_min")
    .orderBy("users.name")
    .execute();
  return rows.map((r) => ({
    id: r.id,
    userId: r.user_id,
    driverName: r.name,
    day: r.day,
    startMin: r.start_min,
    endMin: r.end_min,
    breakEarliestMin: r.break_earliest_min,
    breakLatestMin: r.break_latest_min,
    breakDurationMin: r.break_duration_min,
    vanId: r.van_id,
    vanCode: r.van_code,
  }));
}

/** The unit's active drivers, for the shift form. */
export async function listDrivers(db: Db): Promise<{ id: number; name: string }[]> {
  return db.selectFrom("users").select(["id", "name"]).where("role", "=", "driver").where("status", "=", "active").orderBy("name").execute();
}

/** Adds or replaces a driver's shift on a day (one per driver and day). */
export async function saveShift(db: Kysely<Database>, user: SessionUser, input: ShiftFields, now = new Date()): Promise<{ id: number }> {
  assertCan(user, "routes.plan");
  return db.transaction().execute(async (trx) => {
    const driver = await trx.selectFrom("users").select(["id", "role", "status"]).where("id", "=", input.userId).executeTakeFirst();
    if (!driver || driver.role !== "driver" || driver.status !== "active") {
      throw new AppError("validation", "Choose an active driver.", { userId: ["Choose an active driver."] });
    }
    const vanId = input.vanId === "" ? null : input.vanId;
    if (vanId !== null) {
      const van = await trx.selectFrom("vans").select(["id", "active", "code"]).where("id", "=", vanId).executeTakeFirst();
      if (!van || van.active !== 1) throw new AppError("validation", "Choose an active van.", { vanId: ["Choose an active van."] });
      const taken = await trx
        .selectFrom("driver_shifts")
        .innerJoin("users", "users.id", "driver_shifts.user_id")
        .select("users.name")
        .where("driver_shifts.day", "=", input.day)
        .where("driver_shifts.van_id", "=", vanId)
        .where("driver_shifts.user_id", "!=", input.userId)
        .executeTakeFirst();
      if (taken) throw new AppError("validation", `Van ${van.code} is already driven by ${taken.name} that day.`, { vanId: [`Van ${van.code} is already driven by ${taken.name} that day.`] });
    }
    const values = {
      start_min: clockToMinutes(input.start),
      end_min: clockToMinutes(input.end),
      break_earliest_min: input.breakMinutes > 0 ? clockToMinutes(input.breakEarliest) : null,
      break_latest_min: input.breakMinutes > 0 ? clockToMinutes(input.breakLatest) : null,
      break_duration_min: input.breakMinutes,
      van_id: vanId,
      updated_at: now.toISOString(),
    };
    const existing = await trx.selectFrom("driver_shifts").select("id").where("user_id", "=", input.userId).where("day", "=", input.day).executeTakeFirst();
    let id: number;
    if (existing) {
      await assertShiftNotOnRun(trx, existing.id, vanId);
      await trx.updateTable("driver_shifts").set(values).where("id", "=", existing.id).execute();
      id = existing.id;
    } else {
      ({ id } = await trx
        .insertInto("driver_shifts")
        .values({ ...values, user_id: input.userId, day: input.day, created_at: now.toISOString() })
        .returning("id")
        .executeTakeFirstOrThrow());
    }
    await recordAudit(trx, { actorUserId: user.id, action: "shift.save", entity: "driver_shift", entityId: id, details: { day: input.day, userId: input.userId } }, now);
    return { id };
  });
}

/** A shift whose van already has stops on the day's plan keeps its van until those stops move. */
async function assertShiftNotOnRun(trx: Db, shiftId: number, newVanId: number | null) {
  const run = await trx
    .selectFrom("route_runs")
    .innerJoin("vans", "vans.id", "route_runs.van_id")
    .select(["route_runs.id", "route_runs.van_id", "vans.code"])
    .where("route_runs.shift_id", "=", shiftId)
    .where((eb) => eb.exists(eb.selectFrom("route_stops").select("route_stops.id").whereRef("route_stops.run_id", "=", "route_runs.id")))
    .executeTakeFirst();
  if (run && run.van_id !== newVanId) {
    throw new AppError("conflict", `This shift drives van ${run.code}, which has stops on the day's plan. Move its stops or plan again first.`);
  }
}

export async function deleteShift(db: Kysely<Database>, user: SessionUser, id: number, now = new Date()): Promise<void> {
  assertCan(user, "routes.plan");
  await db.transaction().execute(async (trx) => {
    const shift = await trx.selectFrom("driver_shifts").select(["id", "day"]).where("id", "=", id).executeTakeFirst();
    if (!shift) throw notFound("That shift");
    await assertShiftNotOnRun(trx, id, null);
    await trx.deleteFrom("route_runs").where("shift_id", "=", id).execute();
    await trx.deleteFrom("driver_shifts").where("id", "=", id).execute();
    await recordAudit(trx, { actorUserId: user.id, action: "shift.delete", entity: "driver_shift", entityId: id, details: { day: shift.day } }, now);
  });
}
