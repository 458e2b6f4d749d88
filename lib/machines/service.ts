import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database, MachineKind } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { assertCan } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import {
  describeRequirement,
  MACHINE_KIND_LABELS,
  parseRequirement,
  type ProgramRequirement,
  requirementMismatch,
} from "./requirements";
import { describeChamber, stuThatFit } from "./chamber";
import type { MachineFields, ProgramFields, UpdateProgramFields } from "./schemas";

// The unit's machines and their programs: reading them for the pages and stations, and the
// administrator's and quality lead's changes, each in one transaction with its audit entry.
// Machines belong to the unit itself, so there is no customer scope: only unit roles hold
// machines.view.

type Db = Kysely<Database> | Transaction<Database>;

export interface ProgramView {
  id: number;
  machineId: number;
  code: string;
  name: string;
  active: boolean;
  requirement: ProgramRequirement | null;
  requirementText: string;
}

export interface MachineListRow {
  id: number;
  kind: MachineKind;
  kindLabel: string;
  code: string;
  name: string;
  serialNumber: string | null;
  capacityStu: number | null;
  /** The inner chamber in mm, when recorded. */
  chamber: { widthMm: number; heightMm: number; depthMm: number } | null;
  active: boolean;
  programCount: number;
  /** The washer batch or steriliser load that is loading or running on it, if any. */
  openRun: OpenMachineRun | null;
}

export interface OpenMachineRun {
  kind: "batch" | "load";
  id: number;
  number: string;
  status: "loading" | "running";
}

/** The loading or running washer batches and steriliser loads of these machines (all, when no ids are given), by machine id. */
async function openRunsOf(db: Db, machineIds?: number[]): Promise<Map<number, OpenMachineRun>> {
  let batches = db.selectFrom("washer_batches").select(["id", "number", "status", "machine_id"]).where("status", "in", ["loading", "running"]);
  let loads = db.selectFrom("steriliser_loads").select(["id", "number", "status", "machine_id"]).where("status", "in", ["loading", "running"]);
  if (machineIds) {
    if (machineIds.length === 0) return new Map();
    batches = batches.where("machine_id", "in", machineIds);
    loads = loads.where("machine_id", "in", machineIds);
  }
  const runs = new Map<number, OpenMachineRun>();
  for (const b of await batches.execute()) runs.set(b.machine_id, { kind: "batch", id: b.id, number: b.number, status: b.status as "loading" | "running" });
  for (const l of await loads.execute()) runs.set(l.machine_id, { kind: "load", id: l.id, number: l.number, status: l.status as "loading" | "running" });
  return runs;
}

export interface MachineDetail extends MachineListRow {
  programs: ProgramView[];
  createdAt: string;
  updatedAt: string;
}

function toProgramView(p: { id: number; machine_id: number; code: string; name: string; active: number; requirement: string }): ProgramView {
  const requirement = parseRequirement(p.requirement);
  return {
    id: p.id,
    machineId: p.machine_id,
    code: p.code,
    name: p.name,
    active: p.active === 1,
    requirement,
    requirementText: describeRequirement(requirement),
  };
}

function chamberOf(r: { chamber_width_mm: number | null; chamber_height_mm: number | null; chamber_depth_mm: number | null }): MachineListRow["chamber"] {
  return r.chamber_width_mm !== null && r.chamber_height_mm !== null && r.chamber_depth_mm !== null
    ? { widthMm: r.chamber_width_mm, heightMm: r.chamber_height_mm, depthMm: r.chamber_depth_mm }
    : null;
}

/**
 * The chamber and capacity to store: the three sides together or none; with a chamber, the
 * capacity is at most the StU modules that fit, and is worked out from it when left empty.
 */
function chamberAndCapacity(input: MachineFields): { chamber: MachineListRow["chamber"]; capacityStu: number | null } {
  const sides = [input.chamberWidthMm, input.chamberHeightMm, input.chamberDepthMm];
  const given = sides.filter((v) => v !== null && v !== undefined).length;
  if (given === 0) return { chamber: null, capacityStu: input.capacityStu };
  if (given < 3) {
    const missing = { chamberWidthMm: "width", chamberHeightMm: "height", chamberDepthMm: "depth" } as const;
    const fields = Object.fromEntries(
      (Object.keys(missing) as (keyof typeof missing)[]).filter((k) => input[k] === null || input[k] === undefined).map((k) => [k, [`Enter the ${missing[k]} too, or leave all three empty.`]]),
    );
    throw new AppError("validation", "Give the chamber's width, height and depth together, or none of them.", fields);
  }
  const chamber = { widthMm: input.chamberWidthMm!, heightMm: input.chamberHeightMm!, depthMm: input.chamberDepthMm! };
  const fits = stuThatFit(chamber);
  if (input.capacityStu !== null && input.capacityStu > fits) {
    throw new AppError("validation", `A chamber of ${describeChamber(chamber)} holds ${fits} whole StU of 300 × 300 × 600 mm, fewer than ${input.capacityStu}.`, {
      capacityStu: [`At most ${fits} StU fit this chamber.`],
    });
  }
  return { chamber, capacityStu: input.capacityStu ?? (fits > 0 ? fits : null) };
}

/** Every machine, by kind and code, with its program count and open batch or load. */
export async function listMachines(db: Db, filter: { kind?: MachineKind; activeOnly?: boolean } = {}): Promise<MachineListRow[]> {
  let query = db
    .selectFrom("machines")
    .select((eb) => [
      "machines.id",
      "machines.kind",
      "machines.code",
      "machines.name",
      "machines.serial_number",
      "machines.capacity_stu",
      "machines.chamber_width_mm",
      "machines.chamber_height_mm",
      "machines.chamber_depth_mm",
      "machines.active",
      eb.selectFrom("programs").whereRef("programs.machine_id", "=", "machines.id").select(eb.fn.countAll<number>().as("n")).as("program_count"),
    ])
    .orderBy("machines.kind")
    .orderBy("machines.code");
  if (filter.kind) query = query.where("machines.kind", "=", filter.kind);
  if (filter.activeOnly) query = query.where("machines.active", "=", 1);
  const rows = await query.execute();
  const open = await openRunsOf(db);
  return rows.map((r) => {
    return {
      id: r.id,
      kind: r.kind,
      kindLabel: MACHINE_KIND_LABELS[r.kind],
      code: r.code,
      name: r.name,
      serialNumber: r.serial_number,
      capacityStu: r.capacity_stu,
      chamber: chamberOf(r),
      active: r.active === 1,
      programCount: Number(r.program_count ?? 0),
      openRun: open.get(r.id) ?? null,
    };
  });
}

/** One machine with its programs, or 404. */
export async function getMachine(db: Db, id: number): Promise<MachineDetail> {
  const row = await db.selectFrom("machines").selectAll().where("id", "=", id).executeTakeFirst();
  if (!row) throw notFound("That machine");
  const programs = await db.selectFrom("programs").selectAll().where("machine_id", "=", id).orderBy("code").execute();
  const open = (await openRunsOf(db, [id])).get(id) ?? null;
  return {
    id: row.id,
    kind: row.kind,
    kindLabel: MACHINE_KIND_LABELS[row.kind],
    code: row.code,
    name: row.name,
    serialNumber: row.serial_number,
    capacityStu: row.capacity_stu,
    chamber: chamberOf(row),
    active: row.active === 1,
    programCount: programs.length,
    openRun: open,
    programs: programs.map(toProgramView),
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

/** One program with its machine's kind, or 404. */
export async function getProgram(db: Db, id: number): Promise<ProgramView & { machineKind: MachineKind }> {
  const row = await db
    .selectFrom("programs")
    .innerJoin("machines", "machines.id", "programs.machine_id")
    .selectAll("programs")
    .select("machines.kind as machine_kind")
    .where("programs.id", "=", id)
    .executeTakeFirst();
  if (!row) throw notFound("That program");
  return { ...toProgramView(row), machineKind: row.machine_kind };
}

async function assertCodeFree(db: Db, code: string, exceptId?: number): Promise<void> {
  let query = db.selectFrom("machines").select(["id", "name"]).where("code", "=", code);
  if (exceptId) query = query.where("id", "!=", exceptId);
  const clash = await query.executeTakeFirst();
  if (clash) {
    throw new AppError("conflict", `The code ${code} is already used by ${clash.name}; every machine needs its own code.`, {
      code: ["Already used by another machine."],
    });
  }
}

/** Adds a machine. */
export async function createMachine(db: Kysely<Database>, user: SessionUser, input: MachineFields, now = new Date()): Promise<{ id: number }> {
  assertCan(user, "machines.manage");
  return db.transaction().execute(async (trx) => {
    await assertCodeFree(trx, input.code);
    const { chamber, capacityStu } = chamberAndCapacity(input);
    const iso = now.toISOString();
    const { id } = await trx
      .insertInto("machines")
      .values({
        kind: input.kind,
        code: input.code,
        name: input.name,
        serial_number: input.serialNumber,
        capacity_stu: capacityStu,
        chamber_width_mm: chamber?.widthMm ?? null,
        chamber_height_mm: chamber?.heightMm ?? null,
        chamber_depth_mm: chamber?.depthMm ?? null,
        active: input.active ? 1 : 0,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(trx, { actorUserId: user.id, action: "machine.created", entity: "machine", entityId: id, details: { ...input } }, now);
    return { id };
  });
}

/** Changes a machine. Its kind is fixed once it has programs; a machine with an open batch or load stays active. */
export async function updateMachine(
  db: Kysely<Database>,
  user: SessionUser,
  input: MachineFields & { id: number },
  now = new Date(),
): Promise<void> {
  assertCan(user, "machines.manage");
  await db.transaction().execute(async (trx) => {
    const before = await getMachine(trx, input.id);
    await assertCodeFree(trx, input.code, input.id);
    const { chamber, capacityStu } = chamberAndCapacity(input);
    if (before.kind !== input.kind && before.programCount > 0) {
      throw new AppError("validation", `${before.code} has programs for a ${before.kindLabel.toLowerCase()}, so its kind cannot change.`, {
        kind: ["A machine with programs keeps its kind; add a new machine instead."],
      });
    }
    const run = before.openRun;
    if (run && (!input.active || input.code !== before.code)) {
      const [what, finish, machine] = run.kind === "batch" ? ["Batch", "close or abort it", "washer"] : ["Load", "finish or abort it", "steriliser"];
      throw new AppError("conflict", `${what} ${run.number} is ${run.status} on ${before.code}: ${finish} before switching the ${machine} off or changing its code.`);
    }
    await trx
      .updateTable("machines")
      .set({
        kind: input.kind,
        code: input.code,
        name: input.name,
        serial_number: input.serialNumber,
        capacity_stu: capacityStu,
        chamber_width_mm: chamber?.widthMm ?? null,
        chamber_height_mm: chamber?.heightMm ?? null,
        chamber_depth_mm: chamber?.depthMm ?? null,
        active: input.active ? 1 : 0,
        updated_at: now.toISOString(),
      })
      .where("id", "=", input.id)
      .execute();
    const { programs: _programs, openRun: _open, ...was } = before;
    await recordAudit(
      trx,
      { actorUserId: user.id, action: "machine.updated", entity: "machine", entityId: input.id, details: { before: was, after: input } },
      now,
    );
  });
}

async function assertProgramCodeFree(db: Db, machineId: number, code: string, exceptId?: number): Promise<void> {
  let query = db.selectFrom("programs").select("name").where("machine_id", "=", machineId).where("code", "=", code);
  if (exceptId) query = query.where("id", "!=", exceptId);
  const clash = await query.executeTakeFirst();
  if (clash) {
    throw new AppError("conflict", `This machine already has a program ${code} (${clash.name}).`, { code: ["Already used on this machine."] });
  }
}

function assertFits(kind: MachineKind, requirement: ProgramRequirement): void {
  const mismatch = requirementMismatch(kind, requirement);
  if (mismatch) throw new AppError("validation", mismatch, { requirementKind: [mismatch] });
}

/** Adds a program to a machine. */
export async function createProgram(db: Kysely<Database>, user: SessionUser, input: ProgramFields, now = new Date()): Promise<{ id: number }> {
  assertCan(user, "machines.manage");
  return db.transaction().execute(async (trx) => {
    const machine = await getMachine(trx, input.machineId);
    assertFits(machine.kind, input.requirement);
    await assertProgramCodeFree(trx, machine.id, input.code);
    const { id } = await trx
      .insertInto("programs")
      .values({
        machine_id: machine.id,
        code: input.code,
        name: input.name,
        requirement: JSON.stringify(input.requirement),
        active: input.active ? 1 : 0,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(
      trx,
      { actorUserId: user.id, action: "program.created", entity: "program", entityId: id, details: { machine: machine.code, ...input } },
      now,
    );
    return { id };
  });
}

/** Changes a program. Its requirement is fixed while a batch that runs it is open. */
export async function updateProgram(db: Kysely<Database>, user: SessionUser, input: UpdateProgramFields, now = new Date()): Promise<void> {
  assertCan(user, "machines.manage");
  await db.transaction().execute(async (trx) => {
    const before = await getProgram(trx, input.id);
    assertFits(before.machineKind, input.requirement);
    await assertProgramCodeFree(trx, before.machineId, input.code, input.id);
    const open = await trx
      .selectFrom("washer_batches")
      .select("number")
      .where("program_id", "=", input.id)
      .where("status", "in", ["loading", "running"])
      .executeTakeFirst();
    if (open && (JSON.stringify(before.requirement) !== JSON.stringify(input.requirement) || !input.active)) {
      throw new AppError(
        "conflict",
        `Batch ${open.number} runs this program: close or abort it before changing the requirement or switching the program off.`,
      );
    }
    await trx
      .updateTable("programs")
      .set({ code: input.code, name: input.name, requirement: JSON.stringify(input.requirement), active: input.active ? 1 : 0 })
      .where("id", "=", input.id)
      .execute();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        action: "program.updated",
        entity: "program",
        entityId: input.id,
        details: { before: { code: before.code, name: before.name, active: before.active, requirement: before.requirement }, after: input },
      },
      now,
    );
  });
}
