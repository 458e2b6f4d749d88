import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database, LoadStatus, WasherBatchStatus } from "@/db/schema";
import { describeRequirement, type ProgramRequirement } from "./requirements";

// What the washing and sterilising stations list: the active machines of one kind with the
// active programs they can run, and each machine's open run (a washer batch or a steriliser
// load) with its number of sets. The stations add their own parts (a steriliser's air-removal
// test of the day) on top.

type Db = Kysely<Database> | Transaction<Database>;

/** The kinds of machine that run batches or loads at a station. */
export type RunMachineKind = "washer" | "steriliser";

export interface StationProgram {
  id: number;
  code: string;
  name: string;
  requirementText: string;
}

export interface StationMachineRow {
  id: number;
  code: string;
  name: string;
  capacityStu: number | null;
  programs: StationProgram[];
}

/** A machine's loading or running batch or load, as the station's machine list shows it. */
export interface OpenRun<Status extends string> {
  id: number;
  number: string;
  status: Status;
  itemCount: number;
}

/**
 * The active machines of a kind, by code, each with its active programs (by code) whose stored
 * requirement `requirementOf` reads as one this kind of machine runs; a program it cannot read is
 * left out.
 */
export async function listStationMachines(
  db: Db,
  kind: RunMachineKind,
  requirementOf: (json: string) => ProgramRequirement | null,
): Promise<StationMachineRow[]> {
  const machines = await db
    .selectFrom("machines")
    .select(["id", "code", "name", "capacity_stu"])
    .where("kind", "=", kind)
    .where("active", "=", 1)
    .orderBy("code")
    .execute();
  if (machines.length === 0) return [];
  const programs = await db
    .selectFrom("programs")
    .select(["id", "machine_id", "code", "name", "requirement"])
    .where("machine_id", "in", machines.map((m) => m.id))
    .where("active", "=", 1)
    .orderBy("code")
    .execute();
  return machines.map((m) => ({
    id: m.id,
    code: m.code,
    name: m.name,
    capacityStu: m.capacity_stu,
    programs: programs.flatMap((p) => {
      if (p.machine_id !== m.id) return [];
      const requirement = requirementOf(p.requirement);
      return requirement ? [{ id: p.id, code: p.code, name: p.name, requirementText: describeRequirement(requirement) }] : [];
    }),
  }));
}

/** The loading or running washer batch of each of these washers, by machine id. */
export async function openBatchesByMachine(db: Db, machineIds: number[]): Promise<Map<number, OpenRun<WasherBatchStatus>>> {
  if (machineIds.length === 0) return new Map();
  const rows = await db
    .selectFrom("washer_batches as b")
    .select((eb) => [
      "b.id",
      "b.number",
      "b.status",
      "b.machine_id",
      eb.selectFrom("washer_batch_items as i").whereRef("i.batch_id", "=", "b.id").select(eb.fn.countAll<number>().as("n")).as("item_count"),
    ])
    .where("b.machine_id", "in", machineIds)
    .where("b.status", "in", ["loading", "running"])
    .orderBy("b.id")
    .execute();
  return byMachine(rows);
}

/** The loading or running steriliser load of each of these sterilisers, by machine id. */
export async function openLoadsByMachine(db: Db, machineIds: number[]): Promise<Map<number, OpenRun<LoadStatus>>> {
  if (machineIds.length === 0) return new Map();
  const rows = await db
    .selectFrom("steriliser_loads as l")
    .select((eb) => [
      "l.id",
      "l.number",
      "l.status",
      "l.machine_id",
      eb.selectFrom("load_items as i").whereRef("i.load_id", "=", "l.id").select(eb.fn.countAll<number>().as("n")).as("item_count"),
    ])
    .where("l.machine_id", "in", machineIds)
    .where("l.status", "in", ["loading", "running"])
    .orderBy("l.id")
    .execute();
  return byMachine(rows);
}

/** The first open run of each machine (a machine has at most one). */
function byMachine<Status extends string>(
  rows: { id: number; number: string; status: Status; machine_id: number; item_count: number | null }[],
): Map<number, OpenRun<Status>> {
  const out = new Map<number, OpenRun<Status>>();
  for (const r of rows) {
    if (!out.has(r.machine_id)) out.set(r.machine_id, { id: r.id, number: r.number, status: r.status, itemCount: Number(r.item_count ?? 0) });
  }
  return out;
}
