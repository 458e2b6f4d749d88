import "server-only";
import { type Kysely, sql, type Transaction } from "kysely";
import type { Database, WasherBatchStatus } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { parseFlags } from "@/lib/catalogue/set-types";
import type { ProcessingFlag } from "@/lib/catalogue/vocabulary";
import { CycleRecordError } from "@/lib/cycles/errors";
import { CYCLE_STATE_LABELS, type CycleState, transition } from "@/lib/cycles/lifecycle";
import { parseWasherRecord } from "@/lib/cycles/parse";
import type { CycleRecord } from "@/lib/cycles/record";
import { applyCycleEvent } from "@/lib/cycles/store";
import { checkWasherBatch, type WasherRequirement } from "@/lib/cycles/washer";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import { describeRequirement, washerRequirementOf } from "@/lib/machines/requirements";
import { listStationMachines, openBatchesByMachine } from "@/lib/machines/station-machines";
import { requireUsableMachine } from "@/lib/machines/usable";
import { identifyAtStation } from "@/lib/stations/identify";
import { discardStoredFile, readFileFor, saveUpload } from "@/lib/storage/files";
import { enteredIssues, enteredSamplesToCsv } from "./entered";
import { chartPoints, type ChartPoint, readReasons, readStoredFigures, type StoredFigures, toStoredFigures } from "./figures";
import { batchNumberPrefix, nextBatchNumber } from "./numbering";
import type { BatchRecordInput, ListBatchesQuery } from "./schemas";
import { BATCH_STATUS_LABELS } from "./status";

// Washer-disinfector batches: opening one on a washer with a program, loading sets by scanning
// them, starting it, and closing it with its time/temperature record — checked against the
// program's requirement — or aborting it after a fault. Closing moves every set in one
// transaction: "wash_passed" to washed, or "wash_failed" back to washing. washer_batch_items is
// the authoritative link of a cycle to its batch. The checks are advisory (see lib/cycles).

type Db = Kysely<Database> | Transaction<Database>;

const OPEN: WasherBatchStatus[] = ["loading", "running"];
/** States a set can be washed from (the same for a batch and for washing by hand). */
const WASHABLE: CycleState[] = ["received", "reprocess"];
/** A record whose first timestamp is further than this from the batch's start is questioned in the notes. */
const RECORD_START_TOLERANCE_MS = 12 * 3600 * 1000;

export interface BatchItemView {
  cycleId: number;
  setId: number;
  serial: string;
  setTypeName: string;
  organisationName: string;
  sizeStu: number;
  flags: ProcessingFlag[];
  state: CycleState;
  stateLabel: string;
  addedAt: string;
}

export interface BatchView {
  id: number;
  number: string;
  status: WasherBatchStatus;
  statusLabel: string;
  machine: { id: number; code: string; name: string; capacityStu: number | null };
  program: { id: number; code: string; name: string; requirement: WasherRequirement | null; requirementText: string };
  createdAt: string;
  startedAt: string | null;
  startedBy: string | null;
  endedAt: string | null;
  closedAt: string | null;
  closedBy: string | null;
  items: BatchItemView[];
  loadStu: number;
  figures: StoredFigures | null;
  reasons: string[];
  record: { fileId: number; name: string } | null;
}

export interface WasherOption {
  id: number;
  code: string;
  name: string;
  capacityStu: number | null;
  programs: { id: number; code: string; name: string; requirementText: string }[];
  openBatch: { id: number; number: string; status: WasherBatchStatus; itemCount: number } | null;
}

/** What a scanned set is, for the station to show beside the batch. */
export interface ScannedSet {
  cycleId: number;
  serial: string;
  setTypeName: string;
  organisationName: string;
  homeSiteName: string;
  flags: ProcessingFlag[];
  processingNotes: string | null;
  ifuFileId: number | null;
  sizeStu: number;
}

// ---------------------------------------------------------------------------------------------
// Reading

/** The active washers with their active programs and open batch, for the washing station. */
export async function listWashersForStation(db: Db): Promise<WasherOption[]> {
  const washers = await listStationMachines(db, "washer", washerRequirementOf);
  const open = await openBatchesByMachine(db, washers.map((w) => w.id));
  return washers.map((w) => ({ ...w, openBatch: open.get(w.id) ?? null }));
}

/** One batch with its machine, program, sets and check, or 404. */
export async function getBatchView(db: Db, id: number): Promise<BatchView> {
  const row = await db
    .selectFrom("washer_batches as b")
    .innerJoin("machines as m", "m.id", "b.machine_id")
    .innerJoin("programs as p", "p.id", "b.program_id")
    .leftJoin("users as starter", "starter.id", "b.started_by")
    .leftJoin("users as closer", "closer.id", "b.closed_by")
    .leftJoin("files as f", "f.id", "b.record_file_id")
    .select([
      "b.id",
      "b.number",
      "b.status",
      "b.created_at",
      "b.started_at",
      "b.ended_at",
      "b.closed_at",
      "b.figures",
      "b.reasons",
      "b.record_file_id",
      "f.original_name as record_name",
      "m.id as machine_id",
      "m.code as machine_code",
      "m.name as machine_name",
      "m.capacity_stu",
      "p.id as program_id",
      "p.code as program_code",
      "p.name as program_name",
      "p.requirement",
      "starter.name as started_by_name",
      "closer.name as closed_by_name",
    ])
    .where("b.id", "=", id)
    .executeTakeFirst();
  if (!row) throw notFound("That washer batch");
  const items = await db
    .selectFrom("washer_batch_items as i")
    .innerJoin("cycles as c", "c.id", "i.cycle_id")
    .innerJoin("sets as s", "s.id", "c.set_id")
    .innerJoin("set_types as st", "st.id", "s.set_type_id")
    .innerJoin("organisations as o", "o.id", "c.organisation_id")
    .select([
      "c.id as cycle_id",
      "s.id as set_id",
      "s.serial",
      "st.name as set_type_name",
      "st.size_stu",
      "st.processing_flags",
      "o.name as organisation_name",
      "c.state",
      "i.added_at",
    ])
    .where("i.batch_id", "=", id)
    .orderBy("i.added_at")
    .orderBy("s.serial")
    .execute();
  const requirement = washerRequirementOf(row.requirement);
  const itemViews = items.map((i) => ({
    cycleId: i.cycle_id,
    setId: i.set_id,
    serial: i.serial,
    setTypeName: i.set_type_name,
    organisationName: i.organisation_name,
    sizeStu: i.size_stu,
    flags: parseFlags(i.processing_flags),
    state: i.state as CycleState,
    stateLabel: CYCLE_STATE_LABELS[i.state as CycleState] ?? i.state,
    addedAt: i.added_at,
  }));
  return {
    id: row.id,
    number: row.number,
    status: row.status,
    statusLabel: BATCH_STATUS_LABELS[row.status],
    machine: { id: row.machine_id, code: row.machine_code, name: row.machine_name, capacityStu: row.capacity_stu },
    program: { id: row.program_id, code: row.program_code, name: row.program_name, requirement, requirementText: describeRequirement(requirement) },
    createdAt: row.created_at,
    startedAt: row.started_at,
    startedBy: row.started_by_name,
    endedAt: row.ended_at,
    closedAt: row.closed_at,
    closedBy: row.closed_by_name,
    items: itemViews,
    loadStu: roundStu(itemViews.reduce((sum, i) => sum + i.sizeStu, 0)),
    figures: readStoredFigures(row.figures),
    reasons: readReasons(row.reasons),
    record: row.record_file_id ? { fileId: row.record_file_id, name: row.record_name ?? "record.csv" } : null,
  };
}

export interface BatchChart {
  points: ChartPoint[];
  thresholdC: number;
  /** The A0 lower limit (65 °C) when it differs from the hold threshold. */
  a0LowerLimitC: number;
  holdStartS: number | null;
  holdEndS: number | null;
  disinfectionEndS: number;
}

export interface BatchDetail extends BatchView {
  chart: BatchChart | null;
  /** Why there is no curve, when the stored record cannot be read back. */
  chartProblem: string | null;
}

/** A batch for its page: the view plus the temperature curve read back from its stored record. */
export async function getBatchDetail(db: Kysely<Database>, user: SessionUser, id: number): Promise<BatchDetail> {
  const view = await getBatchView(db, id);
  if (!view.record || !view.figures) return { ...view, chart: null, chartProblem: null };
  try {
    const { bytes } = await readFileFor(db, user, view.record.fileId);
    const record = parseWasherRecord(new TextDecoder().decode(bytes));
    return {
      ...view,
      chart: {
        points: chartPoints(record.samples),
        thresholdC: view.figures.holdThresholdC,
        a0LowerLimitC: 65,
        holdStartS: view.figures.holdStartS,
        holdEndS: view.figures.holdEndS,
        disinfectionEndS: view.figures.disinfectionEndS,
      },
      chartProblem: null,
    };
  } catch (error) {
    if (error instanceof AppError || error instanceof CycleRecordError) {
      return { ...view, chart: null, chartProblem: `The stored record could not be read back: ${error.message}` };
    }
    throw error;
  }
}

export interface BatchListRow {
  id: number;
  number: string;
  status: WasherBatchStatus;
  machineId: number;
  machineCode: string;
  machineName: string;
  programName: string;
  createdAt: string;
  startedAt: string | null;
  endedAt: string | null;
  itemCount: number;
  a0: number | null;
}

const SORT_COLUMNS = {
  created_at: "washer_batches.created_at",
  number: "washer_batches.number",
  machine: "machines.code",
  program: "programs.name",
  status: "washer_batches.status",
} as const;

/** Washer batches, newest first by default, filtered by washer and status, paged on the server. */
export async function listBatches(db: Kysely<Database>, query: ListBatchesQuery): Promise<Page<BatchListRow>> {
  let base = db
    .selectFrom("washer_batches")
    .innerJoin("machines", "machines.id", "washer_batches.machine_id")
    .innerJoin("programs", "programs.id", "washer_batches.program_id");
  if (query.q) base = base.where(searchTerm(["washer_batches.number", "programs.name", "machines.name"], query.q));
  if (query.machineId) base = base.where("washer_batches.machine_id", "=", query.machineId);
  if (query.status) base = base.where("washer_batches.status", "=", query.status);
  const page = await fetchPage(
    base,
    (qb) =>
      qb.select((eb) => [
        "washer_batches.id",
        "washer_batches.number",
        "washer_batches.status",
        "washer_batches.machine_id",
        "washer_batches.created_at",
        "washer_batches.started_at",
        "washer_batches.ended_at",
        "washer_batches.figures",
        "machines.code as machine_code",
        "machines.name as machine_name",
        "programs.name as program_name",
        eb
          .selectFrom("washer_batch_items")
          .whereRef("washer_batch_items.batch_id", "=", "washer_batches.id")
          .select(eb.fn.countAll<number>().as("n"))
          .as("item_count"),
      ]),
    query,
    SORT_COLUMNS[query.sort],
    "washer_batches.id",
  );
  return {
    total: page.total,
    rows: page.rows.map((r) => ({
      id: r.id,
      number: r.number,
      status: r.status,
      machineId: r.machine_id,
      machineCode: r.machine_code,
      machineName: r.machine_name,
      programName: r.program_name,
      createdAt: r.created_at,
      startedAt: r.started_at,
      endedAt: r.ended_at,
      itemCount: Number(r.item_count ?? 0),
      a0: readStoredFigures(r.figures)?.a0 ?? null,
    })),
  };
}

// ---------------------------------------------------------------------------------------------
// Changing

function roundStu(n: number): number {
  return Math.round(n * 1000) / 1000;
}

async function batchRow(db: Db, id: number) {
  const row = await db.selectFrom("washer_batches").selectAll().where("id", "=", id).executeTakeFirst();
  if (!row) throw notFound("That washer batch");
  return row;
}

function notLoading(number: string, status: WasherBatchStatus): AppError {
  return new AppError(
    "conflict",
    status === "running"
      ? `Batch ${number} is already running: sets can be added or taken out only while it is loading.`
      : `Batch ${number} is closed (${BATCH_STATUS_LABELS[status].toLowerCase()}); open a new batch for these sets.`,
  );
}

/** Opens a batch on a washer with one of its programs; a washer has at most one open batch. */
export async function openBatch(
  db: Kysely<Database>,
  user: SessionUser,
  input: { machineId: number; programId: number },
  now = new Date(),
): Promise<BatchView> {
  const id = await db.transaction().execute(async (trx) => {
    const machine = await requireUsableMachine(trx, input.machineId, "washer");
    const program = await trx
      .selectFrom("programs")
      .selectAll()
      .where("id", "=", input.programId)
      .where("machine_id", "=", machine.id)
      .executeTakeFirst();
    if (!program) {
      throw new AppError("validation", `Choose one of ${machine.code}'s own programs.`, { programId: ["Not a program of this washer."] });
    }
    if (program.active !== 1) throw new AppError("conflict", `Program ${program.name} is switched off; choose another.`);
    if (!washerRequirementOf(program.requirement)) {
      throw new AppError("conflict", `Program ${program.name} has no readable disinfection requirement; correct it on the machine's page first.`);
    }
    const open = await trx
      .selectFrom("washer_batches")
      .select(["number", "status"])
      .where("machine_id", "=", machine.id)
      .where("status", "in", OPEN)
      .executeTakeFirst();
    if (open) {
      throw new AppError("conflict", `${machine.code} already has batch ${open.number} ${open.status}: continue it, or close it first.`);
    }
    const prefix = batchNumberPrefix(machine.code, now, serverEnv().UNIT_TIME_ZONE);
    const existing = await trx
      .selectFrom("washer_batches")
      .select("number")
      .where("number", "like", `${prefix}-%`)
      .execute();
    const number = nextBatchNumber(prefix, existing.map((e) => e.number));
    const { id } = await trx
      .insertInto("washer_batches")
      .values({ number, machine_id: machine.id, program_id: program.id, status: "loading", created_at: now.toISOString() })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(
      trx,
      { actorUserId: user.id, action: "washer_batch.opened", entity: "washer_batch", entityId: id, details: { number, machine: machine.code, program: program.code } },
      now,
    );
    return id;
  });
  return getBatchView(db, id);
}

/**
 * Adds a scanned set to a loading batch. Refused, with the reason, when the set has no open cycle,
 * is not waiting to be washed, is for manual washing only, is in another open batch, or would
 * overfill the washer. Scanning a set already in this batch changes nothing.
 */
export async function addToBatch(
  db: Kysely<Database>,
  user: SessionUser,
  batchId: number,
  code: string,
  now = new Date(),
): Promise<{ batch: BatchView; scanned: ScannedSet; alreadyInBatch: boolean }> {
  const first = await batchRow(db, batchId);
  if (first.status !== "loading") throw notLoading(first.number, first.status);
  const found = await identifyAtStation(db, user, code);
  const { set, type } = found;
  const scanned: ScannedSet = {
    cycleId: found.cycle?.id ?? 0,
    serial: set.serial,
    setTypeName: type.name,
    organisationName: set.organisationName,
    homeSiteName: set.homeSiteName,
    flags: type.flags,
    processingNotes: type.processingNotes,
    ifuFileId: type.ifu?.id ?? null,
    sizeStu: type.sizeStu,
  };
  if (type.flags.includes("manual_wash_only")) {
    throw new AppError("conflict", `${set.serial} (${type.name}) is for manual washing only: take it to the manual-washing station.`);
  }
  if (!found.cycle) {
    throw new AppError("conflict", `${set.serial} is not on its way through the unit: it has no open cycle, so it cannot be washed. Receive it first.`);
  }
  const cycleId = found.cycle.id;
  const alreadyInBatch = await db.transaction().execute(async (trx) => {
    const batch = await batchRow(trx, batchId);
    if (batch.status !== "loading") throw notLoading(batch.number, batch.status);
    const here = await trx
      .selectFrom("washer_batch_items")
      .select("cycle_id")
      .where("batch_id", "=", batchId)
      .where("cycle_id", "=", cycleId)
      .executeTakeFirst();
    if (here) return true;
    const cycle = await trx.selectFrom("cycles").select(["state", "held_from"]).where("id", "=", cycleId).executeTakeFirstOrThrow();
    const state = cycle.state as CycleState;
    if (!WASHABLE.includes(state)) {
      const step = transition(state, "wash_passed", cycle.held_from as CycleState | null);
      throw new AppError("conflict", step.ok ? `${set.serial} cannot be washed now.` : step.reason);
    }
    const other = await trx
      .selectFrom("washer_batch_items as i")
      .innerJoin("washer_batches as b", "b.id", "i.batch_id")
      .innerJoin("machines as m", "m.id", "b.machine_id")
      .select(["b.number", "b.status", "m.code"])
      .where("i.cycle_id", "=", cycleId)
      .where("b.status", "in", OPEN)
      .executeTakeFirst();
    if (other) {
      throw new AppError(
        "conflict",
        `${set.serial} is already in batch ${other.number} on ${other.code} (${other.status}); a set goes in one batch at a time.`,
      );
    }
    const machine = await trx.selectFrom("machines").select(["code", "capacity_stu"]).where("id", "=", batch.machine_id).executeTakeFirstOrThrow();
    if (machine.capacity_stu !== null) {
      const load = await trx
        .selectFrom("washer_batch_items as i")
        .innerJoin("cycles as c", "c.id", "i.cycle_id")
        .innerJoin("sets as s", "s.id", "c.set_id")
        .innerJoin("set_types as st", "st.id", "s.set_type_id")
        .select(sql<number>`coalesce(sum(st.size_stu), 0)`.as("stu"))
        .where("i.batch_id", "=", batchId)
        .executeTakeFirstOrThrow();
      const after = roundStu(Number(load.stu) + type.sizeStu);
      if (after > machine.capacity_stu + 1e-9) {
        throw new AppError(
          "conflict",
          `${machine.code} holds ${machine.capacity_stu} StU and batch ${batch.number} already has ${roundStu(Number(load.stu))} StU; ${set.serial} needs ${type.sizeStu} StU more. Start this batch and put the set in the next one.`,
        );
      }
    }
    await trx.insertInto("washer_batch_items").values({ batch_id: batchId, cycle_id: cycleId, added_at: now.toISOString() }).execute();
    return false;
  });
  return { batch: await getBatchView(db, batchId), scanned: { ...scanned, cycleId }, alreadyInBatch };
}

/** Takes a set out of a batch that is still loading. */
export async function removeFromBatch(db: Kysely<Database>, _user: SessionUser, batchId: number, cycleId: number): Promise<BatchView> {
  await db.transaction().execute(async (trx) => {
    const batch = await batchRow(trx, batchId);
    if (batch.status !== "loading") throw notLoading(batch.number, batch.status);
    const removed = await trx.deleteFrom("washer_batch_items").where("batch_id", "=", batchId).where("cycle_id", "=", cycleId).executeTakeFirst();
    if (Number(removed.numDeletedRows) === 0) throw notFound("That set in this batch");
  });
  return getBatchView(db, batchId);
}

/** Starts a loaded batch on a washer that is still usable (no fault recorded since it was opened): its load list is fixed from now on. */
export async function startBatch(db: Kysely<Database>, user: SessionUser, batchId: number, now = new Date()): Promise<BatchView> {
  await db.transaction().execute(async (trx) => {
    const batch = await batchRow(trx, batchId);
    if (batch.status !== "loading") {
      throw new AppError("conflict", `Batch ${batch.number} is ${BATCH_STATUS_LABELS[batch.status].toLowerCase()}; only a loading batch can be started.`);
    }
    await requireUsableMachine(trx, batch.machine_id, "washer", batch);
    const count = await trx
      .selectFrom("washer_batch_items")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("batch_id", "=", batchId)
      .executeTakeFirstOrThrow();
    if (Number(count.n) === 0) throw new AppError("conflict", `Batch ${batch.number} is empty: scan the sets into it before starting it.`);
    await trx
      .updateTable("washer_batches")
      .set({ status: "running", started_by: user.id, started_at: now.toISOString() })
      .where("id", "=", batchId)
      .where("status", "=", "loading")
      .execute();
    await recordAudit(
      trx,
      { actorUserId: user.id, action: "washer_batch.started", entity: "washer_batch", entityId: batchId, details: { number: batch.number, sets: Number(count.n) } },
      now,
    );
  });
  return getBatchView(db, batchId);
}

/** Has this request (by its client event id) already closed or aborted the batch? */
async function sameRequestDone(db: Db, batchId: number, clientEventId: string): Promise<boolean> {
  const entries = await db
    .selectFrom("audit_log")
    .select("details")
    .where("entity", "=", "washer_batch")
    .where("entity_id", "=", String(batchId))
    .where("action", "in", ["washer_batch.closed", "washer_batch.aborted"])
    .execute();
  return entries.some((e) => {
    try {
      return (JSON.parse(e.details) as { requestId?: string }).requestId === clientEventId;
    } catch {
      return false;
    }
  });
}

/** The CSV text and file name of the record as sent: a machine's file, or values typed at the station. */
function recordText(record: BatchRecordInput): { text: string; fileName: string; entered: boolean } {
  if (record.kind === "csv") return { text: record.text, fileName: record.fileName || "record.csv", entered: false };
  return { text: enteredSamplesToCsv(record.rows), fileName: "entered-at-station.csv", entered: true };
}

function readRecord(text: string, entered: boolean): CycleRecord {
  try {
    return parseWasherRecord(text);
  } catch (error) {
    if (error instanceof CycleRecordError) {
      const messages = entered ? enteredIssues(error) : error.issues.map((i) => i.message);
      const count = messages.length;
      throw new AppError(
        "validation",
        `The record could not be read (${count} problem${count === 1 ? "" : "s"}); nothing was saved. Correct ${entered ? "the values" : "the file"} and close the batch again.`,
        { record: messages },
      );
    }
    throw error;
  }
}

export interface CloseResult {
  batch: BatchView;
  duplicate: boolean;
}

/**
 * Closes a running batch with its record: parses it, checks it against the program, stores the
 * record file and the figures, and moves every set — all in one transaction, so a record that
 * cannot be read or a set that cannot move leaves everything as it was. A repeat of the same
 * request answers the first result; any other close of a closed batch is a conflict.
 */
export async function closeBatch(
  db: Kysely<Database>,
  user: SessionUser,
  batchId: number,
  input: { record: BatchRecordInput; clientEventId: string },
  now = new Date(),
): Promise<CloseResult> {
  let storedKey: string | undefined;
  try {
    const duplicate = await db.transaction().execute(async (trx) => {
      const batch = await batchRow(trx, batchId);
      if (batch.status !== "running") {
        if (await sameRequestDone(trx, batchId, input.clientEventId)) return true;
        throw new AppError(
          "conflict",
          batch.status === "loading"
            ? `Batch ${batch.number} has not been started yet: start it before closing it with its record.`
            : `Batch ${batch.number} is already closed (${BATCH_STATUS_LABELS[batch.status].toLowerCase()}); its record cannot be replaced.`,
        );
      }
      const program = await trx.selectFrom("programs").select(["code", "requirement"]).where("id", "=", batch.program_id).executeTakeFirstOrThrow();
      const requirement = washerRequirementOf(program.requirement);
      if (!requirement) throw new AppError("conflict", "The batch's program has no readable disinfection requirement; correct the program first.");

      const { text, fileName, entered } = recordText(input.record);
      const record = readRecord(text, entered);
      const check = checkWasherBatch(record, requirement);
      const extraNotes: string[] = [];
      if (entered) extraNotes.push("The values were typed in at the station from the washer's display or printout.");
      if (record.startedAt && batch.started_at) {
        const recordStart = Date.parse(record.startedAt);
        const recordEnd = recordStart + (record.samples[record.samples.length - 1]?.t ?? 0) * 1000;
        if (Math.abs(recordStart - Date.parse(batch.started_at)) > RECORD_START_TOLERANCE_MS) {
          extraNotes.push("The record starts more than 12 hours away from when the batch was started: check that it is this batch's record.");
        } else if (recordEnd < Date.parse(batch.started_at)) {
          extraNotes.push("The record ends before the batch was started at the station: check the washer's clock and that it is this batch's record.");
        }
      }
      const items = await trx
        .selectFrom("washer_batch_items as i")
        .innerJoin("cycles as c", "c.id", "i.cycle_id")
        .innerJoin("sets as s", "s.id", "c.set_id")
        .select(["c.id", "c.state", "s.serial"])
        .where("i.batch_id", "=", batchId)
        .orderBy("s.serial")
        .execute();
      const event = check.passed ? "wash_passed" : "wash_failed";
      const movable = items.filter((i) => transition(i.state as CycleState, event).ok);
      for (const i of items) {
        if (!movable.includes(i)) {
          extraNotes.push(`${i.serial} was not moved: it is ${(CYCLE_STATE_LABELS[i.state as CycleState] ?? i.state).toLowerCase()}.`);
        }
      }
      const figures = toStoredFigures(record, requirement, check, extraNotes);

      const file = await saveUpload(
        trx,
        { bytes: new TextEncoder().encode(text), originalName: fileName, purpose: "cycle_record", organisationId: null, uploadedBy: user.id },
        now,
      );
      storedKey = file.storage_key;
      const endedAt = record.startedAt ? new Date(Date.parse(record.startedAt) + figures.durationSeconds * 1000).toISOString() : now.toISOString();
      await trx
        .updateTable("washer_batches")
        .set({
          status: check.passed ? "passed" : "failed",
          ended_at: endedAt,
          record_file_id: file.id,
          figures: JSON.stringify(figures),
          reasons: JSON.stringify(check.reasons),
          closed_by: user.id,
          closed_at: now.toISOString(),
        })
        .where("id", "=", batchId)
        .where("status", "=", "running")
        .execute();
      for (const item of movable) {
        await applyCycleEvent(trx, {
          cycleId: item.id,
          event,
          station: "washing",
          userId: user.id,
          at: now,
          batchId,
          clientEventId: `${input.clientEventId}-${item.id}`,
          details: check.passed
            ? { batch: batch.number, a0: Math.floor(figures.a0) }
            : { batch: batch.number, reasons: check.reasons },
        });
      }
      await recordAudit(
        trx,
        {
          actorUserId: user.id,
          action: "washer_batch.closed",
          entity: "washer_batch",
          entityId: batchId,
          details: { number: batch.number, passed: check.passed, reasons: check.reasons, sets: movable.length, requestId: input.clientEventId },
        },
        now,
      );
      return false;
    });
    return { batch: await getBatchView(db, batchId), duplicate };
  } catch (error) {
    if (storedKey) await discardStoredFile(storedKey);
    throw error;
  }
}

/** Aborts a running batch after a fault: every set goes back to washing, with the reason kept. */
export async function abortBatch(
  db: Kysely<Database>,
  user: SessionUser,
  batchId: number,
  input: { reason: string; clientEventId: string },
  now = new Date(),
): Promise<CloseResult> {
  const duplicate = await db.transaction().execute(async (trx) => {
    const batch = await batchRow(trx, batchId);
    if (batch.status !== "running") {
      if (await sameRequestDone(trx, batchId, input.clientEventId)) return true;
      throw new AppError(
        "conflict",
        batch.status === "loading"
          ? `Batch ${batch.number} has not been started: take the sets out instead of aborting it.`
          : `Batch ${batch.number} is already closed (${BATCH_STATUS_LABELS[batch.status].toLowerCase()}).`,
      );
    }
    const items = await trx
      .selectFrom("washer_batch_items as i")
      .innerJoin("cycles as c", "c.id", "i.cycle_id")
      .select(["c.id", "c.state"])
      .where("i.batch_id", "=", batchId)
      .execute();
    const reason = `Aborted: ${input.reason}`;
    await trx
      .updateTable("washer_batches")
      .set({ status: "aborted", ended_at: now.toISOString(), reasons: JSON.stringify([reason]), closed_by: user.id, closed_at: now.toISOString() })
      .where("id", "=", batchId)
      .where("status", "=", "running")
      .execute();
    let moved = 0;
    for (const item of items) {
      if (!transition(item.state as CycleState, "wash_failed").ok) continue;
      await applyCycleEvent(trx, {
        cycleId: item.id,
        event: "wash_failed",
        station: "washing",
        userId: user.id,
        at: now,
        batchId,
        clientEventId: `${input.clientEventId}-${item.id}`,
        details: { batch: batch.number, aborted: true, reason: input.reason },
      });
      moved += 1;
    }
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        action: "washer_batch.aborted",
        entity: "washer_batch",
        entityId: batchId,
        details: { number: batch.number, reason: input.reason, sets: moved, requestId: input.clientEventId },
      },
      now,
    );
    return false;
  });
  return { batch: await getBatchView(db, batchId), duplicate };
}
