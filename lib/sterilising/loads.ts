import "server-only";
import { type Kysely, sql, type Transaction } from "kysely";
import type { BiResult, Database, LoadStatus } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import type { ProcessingFlag } from "@/lib/catalogue/vocabulary";
import { CycleRecordError } from "@/lib/cycles/errors";
import { CYCLE_STATE_LABELS, type CycleState, transition } from "@/lib/cycles/lifecycle";
import { parseSterilizerRecord } from "@/lib/cycles/parse";
import type { CycleRecord } from "@/lib/cycles/record";
import { applyCycleEvent } from "@/lib/cycles/store";
import { checkSterilizerLoad } from "@/lib/cycles/sterilizer";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { describeRequirement, parseRequirement, type SteamCycleRequirement } from "@/lib/machines/requirements";
import { listStationMachines, openLoadsByMachine } from "@/lib/machines/station-machines";
import { requireUsableMachine } from "@/lib/machines/usable";
import { identifyAtStation } from "@/lib/stations/identify";
import { discardStoredFile, saveUpload } from "@/lib/storage/files";
import { batchNumberPrefix, nextBatchNumber } from "@/lib/washing/numbering";
import { assessRelease, type LoadFigures, type ReleaseAssessment } from "./checks";
import { latestTest, requirePassedAirRemoval, unitDayOf } from "./machine-tests";
import { capacityProblem, placementHint, roundStu, shelfFor } from "./placement";
import { getShelfLifeRules, getSterileSettings } from "./settings";
import { expiryFor, type StorageKind } from "./shelf-life";
import { LOAD_STATUS_LABELS } from "./status";

// Steriliser loads: opening one on a steriliser with a program (its cycle type), scanning packed
// sets into it (capacity in StU, heavy sets on the lower shelf, the set's method matching the
// program), starting it (its load list frozen; refused without the day's passed air-removal
// test), finishing it with the steriliser's record and the indicator results (every set moves
// with "sterilise"), and the quality lead's decision: release (every set "release", with its
// expiry date from the shelf-life rules) or fail (sets back to washing; a released load is
// recalled — see ./recalls.ts). load_items is the link of a cycle to its load. Advisory checks.

type Db = Kysely<Database> | Transaction<Database>;

const OPEN: LoadStatus[] = ["loading", "running"];

export interface LoadItemView {
  cycleId: number;
  setId: number;
  serial: string;
  setTypeName: string;
  organisationName: string;
  siteName: string;
  sizeStu: number;
  weightG: number;
  shelf: "lower" | "any";
  placement: string;
  containsImplant: boolean;
  state: CycleState;
  stateLabel: string;
  expiresOn: string | null;
  addedAt: string;
}

export interface LoadView {
  id: number;
  number: string;
  status: LoadStatus;
  statusLabel: string;
  machine: { id: number; code: string; name: string; capacityStu: number | null };
  program: { id: number; code: string; name: string; requirement: SteamCycleRequirement | null; requirementText: string };
  containsImplant: boolean;
  createdAt: string;
  startedAt: string | null;
  startedBy: string | null;
  endedAt: string | null;
  unitDay: string;
  items: LoadItemView[];
  loadStu: number;
  figures: LoadFigures | null;
  reasons: string[];
  recordPassed: boolean | null;
  record: { fileId: number; name: string } | null;
  ci: { type: number | null; result: "pass" | "fail" | null };
  bi: { result: BiResult | null; lot: string | null; readAt: string | null };
  earlyRelease: { reason: string; by: string | null } | null;
  decision: { by: string | null; at: string | null; notes: string | null };
  failedAfterRelease: boolean;
  recallId: number | null;
}

export interface LoadDetail extends LoadView {
  assessment: ReleaseAssessment;
}

export interface SteriliserOption {
  id: number;
  code: string;
  name: string;
  capacityStu: number | null;
  programs: { id: number; code: string; name: string; requirementText: string }[];
  openLoad: { id: number; number: string; status: LoadStatus; itemCount: number } | null;
  airRemovalToday: "pass" | "fail" | null;
}

export interface ScannedIntoLoad {
  cycleId: number;
  serial: string;
  setTypeName: string;
  organisationName: string;
  homeSiteName: string;
  flags: ProcessingFlag[];
  processingNotes: string | null;
  ifuFileId: number | null;
  sizeStu: number;
  weightG: number;
  placement: string;
  shelf: "lower" | "any";
  containsImplant: boolean;
}

export function steamRequirementOf(json: string): SteamCycleRequirement | null {
  const r = parseRequirement(json);
  return r && r.kind === "steam" ? r : null;
}

function readJson<T>(text: string | null, fallback: T): T {
  if (!text) return fallback;
  try {
    return JSON.parse(text) as T;
  } catch {
    return fallback;
  }
}

// ---------------------------------------------------------------------------------------------
// Reading

/** The active sterilisers with their steam programs, open load and today's air-removal test. */
export async function listSterilisersForStation(db: Db, now = new Date()): Promise<SteriliserOption[]> {
  const machines = await listStationMachines(db, "steriliser", steamRequirementOf);
  const open = await openLoadsByMachine(db, machines.map((m) => m.id));
  const today = unitDayOf(now);
  const out: SteriliserOption[] = [];
  for (const m of machines) {
    const test = await latestTest(db, m.id, "air_removal", today);
    out.push({ ...m, openLoad: open.get(m.id) ?? null, airRemovalToday: test?.result ?? null });
  }
  return out;
}

/** One load with its machine, program, sets and results, or 404. */
export async function getLoadView(db: Db, id: number): Promise<LoadView> {
  const row = await db
    .selectFrom("steriliser_loads as l")
    .innerJoin("machines as m", "m.id", "l.machine_id")
    .innerJoin("programs as p", "p.id", "l.program_id")
    .leftJoin("users as starter", "starter.id", "l.started_by")
    .leftJoin("users as decider", "decider.id", "l.decision_by")
    .leftJoin("users as early", "early.id", "l.early_release_by")
    .leftJoin("files as f", "f.id", "l.record_file_id")
    .selectAll("l")
    .select([
      "f.original_name as record_name",
      "m.code as machine_code",
      "m.name as machine_name",
      "m.capacity_stu",
      "p.code as program_code",
      "p.name as program_name",
      "p.requirement",
      "starter.name as started_by_name",
      "decider.name as decision_by_name",
      "early.name as early_by_name",
    ])
    .where("l.id", "=", id)
    .executeTakeFirst();
  if (!row) throw notFound("That steriliser load");
  const settings = await getSterileSettings(db);
  const items = await db
    .selectFrom("load_items as i")
    .innerJoin("cycles as c", "c.id", "i.cycle_id")
    .innerJoin("sets as s", "s.id", "c.set_id")
    .innerJoin("set_types as st", "st.id", "s.set_type_id")
    .innerJoin("organisations as o", "o.id", "c.organisation_id")
    .innerJoin("sites as si", "si.id", "c.site_id")
    .select([
      "c.id as cycle_id",
      "s.id as set_id",
      "s.serial",
      "st.name as set_type_name",
      "st.size_stu",
      "st.weight_g",
      "st.contains_implant",
      "o.name as organisation_name",
      "si.name as site_name",
      "c.state",
      "c.expires_on",
      "i.shelf",
      "i.added_at",
    ])
    .where("i.load_id", "=", id)
    .orderBy("i.added_at")
    .orderBy("s.serial")
    .execute();
  const recall = await db.selectFrom("recalls").select("id").where("load_id", "=", id).executeTakeFirst();
  const requirement = steamRequirementOf(row.requirement);
  const itemViews: LoadItemView[] = items.map((i) => ({
    cycleId: i.cycle_id,
    setId: i.set_id,
    serial: i.serial,
    setTypeName: i.set_type_name,
    organisationName: i.organisation_name,
    siteName: i.site_name,
    sizeStu: i.size_stu,
    weightG: i.weight_g,
    shelf: i.shelf,
    placement: placementHint(i.weight_g, settings.heavySetThresholdG),
    containsImplant: i.contains_implant === 1,
    state: i.state as CycleState,
    stateLabel: CYCLE_STATE_LABELS[i.state as CycleState] ?? i.state,
    expiresOn: i.expires_on,
    addedAt: i.added_at,
  }));
  const containsImplant = row.status === "loading" ? itemViews.some((i) => i.containsImplant) : row.contains_implant === 1;
  return {
    id: row.id,
    number: row.number,
    status: row.status,
    statusLabel: LOAD_STATUS_LABELS[row.status],
    machine: { id: row.machine_id, code: row.machine_code, name: row.machine_name, capacityStu: row.capacity_stu },
    program: { id: row.program_id, code: row.program_code, name: row.program_name, requirement, requirementText: describeRequirement(requirement) },
    containsImplant,
    createdAt: row.created_at,
    startedAt: row.started_at,
    startedBy: row.started_by_name,
    endedAt: row.ended_at,
    unitDay: unitDayOf(new Date(row.started_at ?? row.created_at)),
    items: itemViews,
    loadStu: roundStu(itemViews.reduce((sum, i) => sum + i.sizeStu, 0)),
    figures: readJson<LoadFigures | null>(row.figures, null),
    reasons: readJson<string[]>(row.reasons, []),
    recordPassed: row.record_passed === null ? null : row.record_passed === 1,
    record: row.record_file_id ? { fileId: row.record_file_id, name: row.record_name ?? "record.csv" } : null,
    ci: { type: row.ci_type, result: row.ci_result },
    bi: { result: row.bi_result, lot: row.bi_lot, readAt: row.bi_read_at },
    earlyRelease: row.early_release_reason ? { reason: row.early_release_reason, by: row.early_by_name } : null,
    decision: { by: row.decision_by_name, at: row.decision_at, notes: row.decision_notes },
    failedAfterRelease: row.failed_after_release === 1,
    recallId: recall?.id ?? null,
  };
}

/** The load with its release checks side by side with the limits. */
export async function getLoadDetail(db: Db, id: number, earlyReleaseReason?: string): Promise<LoadDetail> {
  const view = await getLoadView(db, id);
  return { ...view, assessment: await assessLoad(db, view, earlyReleaseReason) };
}

async function assessLoad(db: Db, view: LoadView, earlyReleaseReason?: string): Promise<ReleaseAssessment> {
  const air = await latestTest(db, view.machine.id, "air_removal", view.unitDay);
  const early = view.earlyRelease ?? (earlyReleaseReason ? { reason: earlyReleaseReason } : null);
  return assessRelease({
    requirement: view.program.requirement,
    figures: view.figures,
    recordPassed: view.recordPassed,
    recordReasons: view.reasons,
    airRemoval: air ? { result: air.result, day: air.unitDay } : null,
    unitDay: view.unitDay,
    ci: view.ci,
    bi: { result: view.bi.result, required: view.containsImplant },
    containsImplant: view.containsImplant,
    earlyRelease: early,
  });
}

export interface LoadListRow {
  id: number;
  number: string;
  status: LoadStatus;
  machineCode: string;
  programName: string;
  createdAt: string;
  startedAt: string | null;
  endedAt: string | null;
  itemCount: number;
  containsImplant: boolean;
  f0: number | null;
}

/** Loads, newest first, optionally of one status and machine; at most `limit`. */
export async function listLoads(db: Db, query: { status?: LoadStatus; machineId?: number; limit?: number; offset?: number } = {}): Promise<{ rows: LoadListRow[]; total: number }> {
  let base = db.selectFrom("steriliser_loads as l").innerJoin("machines as m", "m.id", "l.machine_id").innerJoin("programs as p", "p.id", "l.program_id");
  if (query.status) base = base.where("l.status", "=", query.status);
  if (query.machineId) base = base.where("l.machine_id", "=", query.machineId);
  const total = await base.select((eb) => eb.fn.countAll<number>().as("n")).executeTakeFirstOrThrow();
  const rows = await base
    .select((eb) => [
      "l.id",
      "l.number",
      "l.status",
      "l.created_at",
      "l.started_at",
      "l.ended_at",
      "l.contains_implant",
      "l.figures",
      "m.code as machine_code",
      "p.name as program_name",
      eb.selectFrom("load_items").whereRef("load_items.load_id", "=", "l.id").select(eb.fn.countAll<number>().as("n")).as("item_count"),
    ])
    .orderBy("l.created_at", "desc")
    .orderBy("l.id", "desc")
    .limit(query.limit ?? 50)
    .offset(query.offset ?? 0)
    .execute();
  return {
    total: Number(total.n),
    rows: rows.map((r) => ({
      id: r.id,
      number: r.number,
      status: r.status,
      machineCode: r.machine_code,
      programName: r.program_name,
      createdAt: r.created_at,
      startedAt: r.started_at,
      endedAt: r.ended_at,
      itemCount: Number(r.item_count ?? 0),
      containsImplant: r.contains_implant === 1,
      f0: readJson<LoadFigures | null>(r.figures, null)?.f0 ?? null,
    })),
  };
}

/** The loads waiting for the quality lead, each with its checks. */
export async function listAwaitingRelease(db: Db): Promise<LoadDetail[]> {
  const ids = await db.selectFrom("steriliser_loads").select("id").where("status", "=", "awaiting_release").orderBy("ended_at").orderBy("id").execute();
  const out: LoadDetail[] = [];
  for (const { id } of ids) out.push(await getLoadDetail(db, id));
  return out;
}

/** The printed number of a load, for the set's label. */
export async function loadNumberOf(db: Db, loadId: number): Promise<string | null> {
  const row = await db.selectFrom("steriliser_loads").select("number").where("id", "=", loadId).executeTakeFirst();
  return row?.number ?? null;
}

// ---------------------------------------------------------------------------------------------
// Changing

async function loadRow(db: Db, id: number) {
  const row = await db.selectFrom("steriliser_loads").selectAll().where("id", "=", id).executeTakeFirst();
  if (!row) throw notFound("That steriliser load");
  return row;
}

function notLoading(number: string, status: LoadStatus): AppError {
  return new AppError(
    "conflict",
    status === "running"
      ? `Load ${number} is running: its load list was frozen when it started.`
      : `Load ${number} is ${LOAD_STATUS_LABELS[status].toLowerCase()}; open a new load for these sets.`,
  );
}

/** Opens a load on a usable steriliser (switched on, no open fault) with one of its steam programs; a steriliser has at most one open load. */
export async function openLoad(db: Kysely<Database>, user: SessionUser, input: { machineId: number; programId: number }, now = new Date()): Promise<LoadView> {
  const id = await db.transaction().execute(async (trx) => {
    const machine = await requireUsableMachine(trx, input.machineId, "steriliser");
    const program = await trx.selectFrom("programs").selectAll().where("id", "=", input.programId).where("machine_id", "=", machine.id).executeTakeFirst();
    if (!program) throw new AppError("validation", `Choose one of ${machine.code}'s own programs.`, { programId: ["Not a program of this steriliser."] });
    if (program.active !== 1) throw new AppError("conflict", `Program ${program.name} is switched off; choose another.`);
    if (!steamRequirementOf(program.requirement)) throw new AppError("conflict", `Program ${program.name} has no readable steam cycle type; correct it on the machine's page first.`);
    const open = await trx.selectFrom("steriliser_loads").select(["number", "status"]).where("machine_id", "=", machine.id).where("status", "in", OPEN).executeTakeFirst();
    if (open) throw new AppError("conflict", `${machine.code} already has load ${open.number} ${LOAD_STATUS_LABELS[open.status].toLowerCase()}: continue it, or finish it first.`);
    const prefix = batchNumberPrefix(machine.code, now, serverEnv().UNIT_TIME_ZONE);
    const existing = await trx.selectFrom("steriliser_loads").select("number").where("number", "like", `${prefix}-%`).execute();
    const number = nextBatchNumber(prefix, existing.map((e) => e.number));
    const { id } = await trx
      .insertInto("steriliser_loads")
      .values({ number, machine_id: machine.id, program_id: program.id, status: "loading", created_by: user.id, created_at: now.toISOString() })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(trx, { actorUserId: user.id, action: "load.opened", entity: "steriliser_load", entityId: id, details: { number, machine: machine.code, program: program.code } }, now);
    return id;
  });
  return getLoadView(db, id);
}

/** Does the set's sterilisation method suit the program's temperature? (common practice: 121 °C sets are heat-sensitive). */
function methodProblem(method: string, requirement: SteamCycleRequirement, serial: string, typeName: string): string | null {
  if (method === "low_temperature") return `${serial} (${typeName}) is for low-temperature sterilisation: it must not go into a steam load.`;
  if (method === "steam_121" && requirement.sterilisationTempC > 125) {
    return `${serial} (${typeName}) is to be sterilised at 121 °C; this load runs ${requirement.name}. Put it in a 121 °C load.`;
  }
  if (method === "steam_134" && requirement.sterilisationTempC <= 125) {
    return `${serial} (${typeName}) is to be sterilised at 134 °C; this load runs ${requirement.name}. Put it in a 134 °C load.`;
  }
  return null;
}

/**
 * Adds a scanned set to a loading load. Refused, with the reason, when the set has no open cycle,
 * is not packed, is in another open load, does not suit the program, or would overfill the
 * chamber. Scanning a set already in this load changes nothing.
 */
export async function addToLoad(
  db: Kysely<Database>,
  user: SessionUser,
  loadId: number,
  code: string,
  now = new Date(),
): Promise<{ load: LoadView; scanned: ScannedIntoLoad; alreadyInLoad: boolean }> {
  const first = await loadRow(db, loadId);
  if (first.status !== "loading") throw notLoading(first.number, first.status);
  const found = await identifyAtStation(db, user, code);
  const { set, type } = found;
  const typeRow = await db.selectFrom("set_types").select(["contains_implant", "weight_g", "sterilisation_method"]).where("id", "=", type.id).executeTakeFirstOrThrow();
  const settings = await getSterileSettings(db);
  const scanned: ScannedIntoLoad = {
    cycleId: found.cycle?.id ?? 0,
    serial: set.serial,
    setTypeName: type.name,
    organisationName: set.organisationName,
    homeSiteName: set.homeSiteName,
    flags: type.flags,
    processingNotes: type.processingNotes,
    ifuFileId: type.ifu?.id ?? null,
    sizeStu: type.sizeStu,
    weightG: typeRow.weight_g,
    placement: placementHint(typeRow.weight_g, settings.heavySetThresholdG),
    shelf: shelfFor(typeRow.weight_g, settings.heavySetThresholdG),
    containsImplant: typeRow.contains_implant === 1,
  };
  if (!found.cycle) throw new AppError("conflict", `${set.serial} is not on its way through the unit: it has no open cycle, so it cannot be sterilised.`);
  const cycleId = found.cycle.id;
  const alreadyInLoad = await db.transaction().execute(async (trx) => {
    const load = await loadRow(trx, loadId);
    if (load.status !== "loading") throw notLoading(load.number, load.status);
    const here = await trx.selectFrom("load_items").select("cycle_id").where("load_id", "=", loadId).where("cycle_id", "=", cycleId).executeTakeFirst();
    if (here) return true;
    const cycle = await trx.selectFrom("cycles").select(["state", "held_from"]).where("id", "=", cycleId).executeTakeFirstOrThrow();
    const state = cycle.state as CycleState;
    if (state !== "packed") {
      const step = transition(state, "sterilise", cycle.held_from as CycleState | null);
      throw new AppError("conflict", step.ok ? `${set.serial} cannot be sterilised now.` : step.reason);
    }
    const program = await trx.selectFrom("programs").select("requirement").where("id", "=", load.program_id).executeTakeFirstOrThrow();
    const requirement = steamRequirementOf(program.requirement);
    if (!requirement) throw new AppError("conflict", "The load's program has no readable steam cycle type; correct the program first.");
    const mismatch = methodProblem(typeRow.sterilisation_method, requirement, set.serial, type.name);
    if (mismatch) throw new AppError("conflict", mismatch);
    const other = await trx
      .selectFrom("load_items as i")
      .innerJoin("steriliser_loads as l", "l.id", "i.load_id")
      .innerJoin("machines as m", "m.id", "l.machine_id")
      .select(["l.number", "l.status", "m.code"])
      .where("i.cycle_id", "=", cycleId)
      .where("l.status", "in", OPEN)
      .executeTakeFirst();
    if (other) throw new AppError("conflict", `${set.serial} is already in load ${other.number} on ${other.code} (${LOAD_STATUS_LABELS[other.status].toLowerCase()}); a set goes in one load at a time.`);
    const machine = await trx.selectFrom("machines").select(["code", "capacity_stu"]).where("id", "=", load.machine_id).executeTakeFirstOrThrow();
    const current = await trx
      .selectFrom("load_items as i")
      .innerJoin("cycles as c", "c.id", "i.cycle_id")
      .innerJoin("sets as s", "s.id", "c.set_id")
      .innerJoin("set_types as st", "st.id", "s.set_type_id")
      .select(sql<number>`coalesce(sum(st.size_stu), 0)`.as("stu"))
      .where("i.load_id", "=", loadId)
      .executeTakeFirstOrThrow();
    const problem = capacityProblem({ machineCode: machine.code, capacityStu: machine.capacity_stu, loadStu: Number(current.stu), addStu: type.sizeStu, serial: set.serial, loadNumber: load.number });
    if (problem) throw new AppError("conflict", problem);
    await trx.insertInto("load_items").values({ load_id: loadId, cycle_id: cycleId, shelf: scanned.shelf, added_by: user.id, added_at: now.toISOString() }).execute();
    return false;
  });
  return { load: await getLoadView(db, loadId), scanned: { ...scanned, cycleId }, alreadyInLoad };
}

/** Takes a set out of a load that is still loading. */
export async function removeFromLoad(db: Kysely<Database>, _user: SessionUser, loadId: number, cycleId: number): Promise<LoadView> {
  await db.transaction().execute(async (trx) => {
    const load = await loadRow(trx, loadId);
    if (load.status !== "loading") throw notLoading(load.number, load.status);
    const removed = await trx.deleteFrom("load_items").where("load_id", "=", loadId).where("cycle_id", "=", cycleId).executeTakeFirst();
    if (Number(removed.numDeletedRows) === 0) throw notFound("That set in this load");
  });
  return getLoadView(db, loadId);
}

/** Starts a loaded load: refused on a steriliser out of use (a fault recorded since it was opened) and without the day's passed air-removal test; the load list is frozen. */
export async function startLoad(db: Kysely<Database>, user: SessionUser, loadId: number, now = new Date()): Promise<LoadView> {
  await db.transaction().execute(async (trx) => {
    const load = await loadRow(trx, loadId);
    if (load.status !== "loading") throw new AppError("conflict", `Load ${load.number} is ${LOAD_STATUS_LABELS[load.status].toLowerCase()}; only a loading load can be started.`);
    const machine = await requireUsableMachine(trx, load.machine_id, "steriliser", load);
    const test = await requirePassedAirRemoval(trx, machine, unitDayOf(now), `start load ${load.number}`);
    const items = await trx
      .selectFrom("load_items as i")
      .innerJoin("cycles as c", "c.id", "i.cycle_id")
      .innerJoin("sets as s", "s.id", "c.set_id")
      .innerJoin("set_types as st", "st.id", "s.set_type_id")
      .select(["st.contains_implant"])
      .where("i.load_id", "=", loadId)
      .execute();
    if (items.length === 0) throw new AppError("conflict", `Load ${load.number} is empty: scan the sets into it before starting it.`);
    const implant = items.some((i) => i.contains_implant === 1) ? 1 : 0;
    await trx
      .updateTable("steriliser_loads")
      .set({ status: "running", started_by: user.id, started_at: now.toISOString(), air_removal_test_id: test.id, contains_implant: implant })
      .where("id", "=", loadId)
      .where("status", "=", "loading")
      .execute();
    await recordAudit(trx, { actorUserId: user.id, action: "load.started", entity: "steriliser_load", entityId: loadId, details: { number: load.number, sets: items.length, implant: implant === 1 } }, now);
  });
  return getLoadView(db, loadId);
}

async function sameRequestDone(db: Db, loadId: number, requestId: string): Promise<boolean> {
  const entries = await db
    .selectFrom("audit_log")
    .select("details")
    .where("entity", "=", "steriliser_load")
    .where("entity_id", "=", String(loadId))
    .where("action", "in", ["load.finished", "load.aborted"])
    .execute();
  return entries.some((e) => readJson<{ requestId?: string }>(e.details, {}).requestId === requestId);
}

function readRecord(text: string): CycleRecord {
  try {
    return parseSterilizerRecord(text);
  } catch (error) {
    if (error instanceof CycleRecordError) {
      const messages = error.issues.map((i) => i.message);
      throw new AppError(
        "validation",
        `The record could not be read (${messages.length} problem${messages.length === 1 ? "" : "s"}); nothing was saved. Correct the file and finish the load again.`,
        { record: messages },
      );
    }
    throw error;
  }
}

export interface FinishLoadInput {
  record: { fileName: string; text: string };
  ciType: number | null;
  ciResult: "pass" | "fail";
  biResult: "pending" | "pass" | "not_used";
  biLot?: string;
  clientEventId: string;
}

/**
 * Finishes a running load with its record and indicator results: parses and checks the record,
 * stores the file and the figures, and moves every set with "sterilise" — in one transaction, so
 * a record that cannot be read leaves everything as it was. The load then awaits release.
 */
export async function finishLoad(db: Kysely<Database>, user: SessionUser, loadId: number, input: FinishLoadInput, now = new Date()): Promise<{ load: LoadView; duplicate: boolean }> {
  let storedKey: string | undefined;
  try {
    const duplicate = await db.transaction().execute(async (trx) => {
      const load = await loadRow(trx, loadId);
      if (load.status !== "running") {
        if (await sameRequestDone(trx, loadId, input.clientEventId)) return true;
        throw new AppError(
          "conflict",
          load.status === "loading"
            ? `Load ${load.number} has not been started yet: start it before finishing it with its record.`
            : `Load ${load.number} is already finished (${LOAD_STATUS_LABELS[load.status].toLowerCase()}); its record cannot be replaced.`,
        );
      }
      if (load.contains_implant === 1 && input.biResult === "not_used") {
        throw new AppError("validation", `Load ${load.number} holds implants: it needs a biological indicator (ISO 11138-3; CDC 2008). Nothing was saved.`, {
          biResult: ["A load with implants needs a biological indicator."],
        });
      }
      const program = await trx.selectFrom("programs").select("requirement").where("id", "=", load.program_id).executeTakeFirstOrThrow();
      const requirement = steamRequirementOf(program.requirement);
      if (!requirement) throw new AppError("conflict", "The load's program has no readable steam cycle type; correct the program first.");
      const record = readRecord(input.record.text);
      const check = checkSterilizerLoad(record, requirement);
      const file = await saveUpload(
        trx,
        { bytes: new TextEncoder().encode(input.record.text), originalName: input.record.fileName || "record.csv", purpose: "cycle_record", organisationId: null, uploadedBy: user.id },
        now,
      );
      storedKey = file.storage_key;
      const f = check.figures;
      const figures: LoadFigures = {
        f0: f.f0,
        band: f.band,
        holdSeconds: f.holdSeconds,
        plateauStartS: f.plateauStartS,
        plateauEndS: f.plateauEndS,
        plateauMinTempC: f.plateauMinTempC,
        plateauMaxTempC: f.plateauMaxTempC,
        saturation: f.saturation,
        peakTempC: f.peakTempC,
        durationSeconds: f.durationSeconds,
      };
      const endedAt = record.startedAt ? new Date(Date.parse(record.startedAt) + f.durationSeconds * 1000).toISOString() : now.toISOString();
      await trx
        .updateTable("steriliser_loads")
        .set({
          status: "awaiting_release",
          ended_at: endedAt,
          finished_by: user.id,
          record_file_id: file.id,
          figures: JSON.stringify(figures),
          reasons: JSON.stringify(check.reasons),
          record_passed: check.passed ? 1 : 0,
          ci_type: input.ciType,
          ci_result: input.ciResult,
          bi_result: input.biResult,
          bi_lot: input.biLot?.trim() || null,
        })
        .where("id", "=", loadId)
        .where("status", "=", "running")
        .execute();
      const items = await trx
        .selectFrom("load_items as i")
        .innerJoin("cycles as c", "c.id", "i.cycle_id")
        .innerJoin("sets as s", "s.id", "c.set_id")
        .select(["c.id", "c.state", "s.serial"])
        .where("i.load_id", "=", loadId)
        .orderBy("s.serial")
        .execute();
      for (const item of items) {
        const step = transition(item.state as CycleState, "sterilise");
        if (!step.ok) throw new AppError("conflict", `${item.serial} cannot be recorded as sterilised: ${step.reason}. Nothing was saved.`);
        await applyCycleEvent(trx, {
          cycleId: item.id,
          event: "sterilise",
          station: "sterilising",
          userId: user.id,
          at: now,
          loadId,
          clientEventId: `${input.clientEventId}-${item.id}`,
          details: { load: load.number, f0: Math.floor(f.f0 * 10) / 10, recordPassed: check.passed },
        });
      }
      await recordAudit(
        trx,
        { actorUserId: user.id, action: "load.finished", entity: "steriliser_load", entityId: loadId, details: { number: load.number, passed: check.passed, reasons: check.reasons, sets: items.length, requestId: input.clientEventId } },
        now,
      );
      return false;
    });
    return { load: await getLoadView(db, loadId), duplicate };
  } catch (error) {
    if (storedKey) await discardStoredFile(storedKey);
    throw error;
  }
}

/** Aborts a running load after a fault: its sets go back to washing, with the reason kept. */
export async function abortLoad(db: Kysely<Database>, user: SessionUser, loadId: number, input: { reason: string; clientEventId: string }, now = new Date()): Promise<LoadView> {
  await db.transaction().execute(async (trx) => {
    const load = await loadRow(trx, loadId);
    if (load.status !== "running") {
      if (await sameRequestDone(trx, loadId, input.clientEventId)) return;
      throw new AppError("conflict", load.status === "loading" ? `Load ${load.number} has not been started: take the sets out instead.` : `Load ${load.number} is already finished.`);
    }
    await trx
      .updateTable("steriliser_loads")
      .set({ status: "aborted", ended_at: now.toISOString(), reasons: JSON.stringify([`Aborted: ${input.reason}`]), finished_by: user.id })
      .where("id", "=", loadId)
      .execute();
    const items = await trx.selectFrom("load_items as i").innerJoin("cycles as c", "c.id", "i.cycle_id").select(["c.id", "c.state"]).where("i.load_id", "=", loadId).execute();
    for (const item of items) {
      if (!transition(item.state as CycleState, "send_to_rewash").ok) continue;
      await applyCycleEvent(trx, { cycleId: item.id, event: "send_to_rewash", station: "sterilising", userId: user.id, at: now, loadId, clientEventId: `${input.clientEventId}-${item.id}`, details: { load: load.number, aborted: true, reason: input.reason } });
    }
    await recordAudit(trx, { actorUserId: user.id, action: "load.aborted", entity: "steriliser_load", entityId: loadId, details: { number: load.number, reason: input.reason, requestId: input.clientEventId } }, now);
  });
  return getLoadView(db, loadId);
}

/** Records the biological indicator's reading once incubated. */
export async function recordBiResult(db: Kysely<Database>, user: SessionUser, loadId: number, result: "pass" | "fail", now = new Date()): Promise<LoadView> {
  await db.transaction().execute(async (trx) => {
    const load = await loadRow(trx, loadId);
    if (load.bi_result !== "pending") {
      throw new AppError("conflict", load.bi_result ? `Load ${load.number}'s biological indicator is already recorded (${load.bi_result}).` : `Load ${load.number} has no biological indicator waiting to be read.`);
    }
    await trx.updateTable("steriliser_loads").set({ bi_result: result, bi_read_at: now.toISOString(), bi_read_by: user.id }).where("id", "=", loadId).execute();
    await recordAudit(trx, { actorUserId: user.id, action: "load.bi_read", entity: "steriliser_load", entityId: loadId, details: { number: load.number, result } }, now);
  });
  return getLoadView(db, loadId);
}

/** The packaging a cycle was packed in (its latest pack record), else the set type's. */
async function packagingOf(db: Db, cycleId: number): Promise<string> {
  const pack = await db.selectFrom("pack_records").select("packaging").where("cycle_id", "=", cycleId).where("outcome", "=", "packed").orderBy("at", "desc").orderBy("id", "desc").executeTakeFirst();
  if (pack) return pack.packaging;
  const type = await db
    .selectFrom("cycles as c")
    .innerJoin("sets as s", "s.id", "c.set_id")
    .innerJoin("set_types as st", "st.id", "s.set_type_id")
    .select("st.packaging")
    .where("c.id", "=", cycleId)
    .executeTakeFirstOrThrow();
  return type.packaging;
}

/**
 * Releases a load awaiting release: refused while any release check blocks it (the day's
 * air-removal test, the record, the chemical indicator, an implant load's biological indicator
 * unless an early release is documented). Every set moves with "release" and gets its expiry date.
 */
export async function releaseLoad(
  db: Kysely<Database>,
  user: SessionUser,
  loadId: number,
  input: { earlyReleaseReason?: string; notes?: string },
  now = new Date(),
): Promise<LoadView> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  await db.transaction().execute(async (trx) => {
    const view = await getLoadView(trx, loadId);
    if (view.status !== "awaiting_release") throw new AppError("conflict", `Load ${view.number} is ${view.statusLabel.toLowerCase()}; only a load awaiting release can be released.`);
    const early = input.earlyReleaseReason?.trim() || undefined;
    if (early !== undefined && early.length < 10) {
      throw new AppError("validation", "Document the early release: why the sets are needed before the biological indicator is read (at least a few words).", { earlyReleaseReason: ["Say why, in at least a few words."] });
    }
    const assessment = await assessLoad(trx, view, view.containsImplant && view.bi.result === "pending" ? early : undefined);
    if (assessment.blockers.length > 0) throw new AppError("conflict", `Load ${view.number} cannot be released: ${assessment.blockers.join(" ")}`);
    const rules = await getShelfLifeRules(trx);
    const iso = now.toISOString();
    const usedEarly = view.containsImplant && view.bi.result === "pending" && early !== undefined;
    await trx
      .updateTable("steriliser_loads")
      .set({
        status: "released",
        decision_by: user.id,
        decision_at: iso,
        decision_notes: input.notes?.trim() || null,
        early_release_reason: usedEarly ? early : null,
        early_release_by: usedEarly ? user.id : null,
      })
      .where("id", "=", loadId)
      .where("status", "=", "awaiting_release")
      .execute();
    for (const item of view.items) {
      const cycle = await trx
        .selectFrom("cycles as c")
        .innerJoin("sites as si", "si.id", "c.site_id")
        .select(["c.sterilised_at", "si.sterile_storage"])
        .where("c.id", "=", item.cycleId)
        .executeTakeFirstOrThrow();
      const packaging = await packagingOf(trx, item.cycleId);
      const expiry = expiryFor(rules, { packaging, storage: cycle.sterile_storage as StorageKind, sterilisedAt: new Date(cycle.sterilised_at ?? view.endedAt ?? iso), timeZone });
      if (!expiry.ok) throw new AppError("conflict", `${item.serial}: ${expiry.reason}`);
      await applyCycleEvent(trx, {
        cycleId: item.cycleId,
        event: "release",
        station: "release",
        userId: user.id,
        at: now,
        loadId,
        details: { load: view.number, expiresOn: expiry.date, ...(usedEarly ? { earlyRelease: early } : {}) },
      });
      await trx.updateTable("cycles").set({ expires_on: expiry.date }).where("id", "=", item.cycleId).execute();
    }
    await recordAudit(trx, { actorUserId: user.id, action: "load.released", entity: "steriliser_load", entityId: loadId, details: { number: view.number, sets: view.items.length, earlyRelease: usedEarly ? early : null } }, now);
  });
  return getLoadView(db, loadId);
}
