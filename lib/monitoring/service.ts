import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database, MachineKind, MachineLogKind } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { assertCan } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import { parseLocalDateTime } from "@/lib/local-time";
import { MACHINE_KIND_LABELS } from "@/lib/machines/requirements";
import { DAY_MS } from "@/lib/turnaround/local-time";
import { wallClockInstant } from "@/lib/turnaround/local-time";
import { dayNumberOf } from "@/lib/turnaround/calendar";
import { CHECK_INFO, CHECK_KEYS, type CheckKey, checkReadings, dhToMmolL, LIMIT_KEYS, type MonitoringSettings, mergeSettings, settingsProblems } from "./limits";
import { dueState, type DueState } from "./schedule";
import { ENTRY_KIND_LABELS, type EntryFields, type LogFilter, ROUTINE_KINDS } from "./schemas";

// The monitoring and maintenance log: recording entries (each reading checked against the limits
// in force), clearing faults, the quality lead's limits and intervals, the log list, the state of
// every recurring check, and the warnings for the unit's home. Machines and the log belong to the
// unit itself: there is no customer scope, only unit roles hold machine_log.view.

type Db = Kysely<Database> | Transaction<Database>;

/** How far back an entry may be dated. */
const MAX_BACKDATE_DAYS = 31;
/** A little clock drift between a phone and the server is not "in the future". */
const FUTURE_SLACK_MS = 5 * 60_000;
/** Out-of-range readings this recent show on the home page. */
export const RECENT_WARNING_DAYS = 7;

/** Which kind of machine an entry of each kind is about (null: none, it is a room or the water treatment). */
const MACHINE_FOR: Record<MachineLogKind, MachineKind[] | "any" | null> = {
  washer_cleaning: ["washer"],
  service: "any",
  fault: "any",
  seal_test: ["heat_sealer"],
  water_reading: null,
  salt_refill: null,
  store_climate: null,
};

export interface LogEntryView {
  id: number;
  kind: MachineLogKind;
  kindLabel: string;
  machine: { id: number; code: string; name: string } | null;
  place: string | null;
  at: string;
  recordedBy: string;
  /** The readings as people read them, e.g. "19.4 °C, 52 % RH". */
  summary: string;
  notes: string | null;
  outOfRange: boolean;
  findings: string[];
  fault: { open: boolean; clearedAt: string | null; clearedBy: string | null; note: string | null } | null;
}

// ---------------------------------------------------------------------------------------------
// Settings

/** The limits and intervals in force: the stored overrides over the defaults. */
export async function loadSettings(db: Db): Promise<MonitoringSettings> {
  const rows = await db.selectFrom("monitoring_settings").select(["key", "value"]).execute();
  return mergeSettings(rows);
}

/** Replaces the limits and intervals (quality lead), with an audit entry. */
export async function saveSettings(db: Kysely<Database>, user: SessionUser, settings: MonitoringSettings, now = new Date()): Promise<void> {
  assertCan(user, "machine_log.manage");
  const problems = settingsProblems(settings);
  if (Object.keys(problems).length > 0) {
    throw new AppError(
      "validation",
      "Some limits or intervals need attention.",
      Object.fromEntries(Object.entries(problems).map(([k, v]) => [k.startsWith("intervals.") ? k : `limits.${k}`, [v]])),
    );
  }
  await db.transaction().execute(async (trx) => {
    const before = await loadSettings(trx);
    const iso = now.toISOString();
    const rows = [
      ...LIMIT_KEYS.map((k) => ({ key: `limit:${k}`, value: JSON.stringify(settings.limits[k]) })),
      ...CHECK_KEYS.map((k) => ({ key: `interval:${k}`, value: JSON.stringify(settings.intervals[k]) })),
    ];
    for (const row of rows) {
      await trx
        .insertInto("monitoring_settings")
        .values({ ...row, updated_by: user.id, updated_at: iso })
        .onConflict((oc) => oc.column("key").doUpdateSet({ value: row.value, updated_by: user.id, updated_at: iso }))
        .execute();
    }
    await recordAudit(trx, { actorUserId: user.id, action: "monitoring.settings_changed", entity: "monitoring_settings", details: { before, after: settings } }, now);
  });
}

// ---------------------------------------------------------------------------------------------
// Recording

function entryInstant(text: string, now: Date, timeZone: string): Date {
  const at = parseLocalDateTime(text, timeZone);
  if (!at) throw new AppError("validation", "The date and time are not a real time.", { at: ["Enter the date and time the check was done."] });
  if (at.getTime() > now.getTime() + FUTURE_SLACK_MS) {
    throw new AppError("validation", "The check cannot be dated in the future.", { at: ["Enter the time the check was done, not later than now."] });
  }
  if (at.getTime() < now.getTime() - MAX_BACKDATE_DAYS * DAY_MS) {
    throw new AppError("validation", `Entries can be dated at most ${MAX_BACKDATE_DAYS} days back.`, {
      at: [`Enter a time within the last ${MAX_BACKDATE_DAYS} days; older records belong in the paper archive's note.`],
    });
  }
  return at;
}

/** The machine's open fault, if it is out of use. */
export async function openFaultOf(db: Db, machineId: number): Promise<{ id: number; at: string; notes: string | null } | null> {
  const row = await db
    .selectFrom("machine_log")
    .select(["id", "at", "notes"])
    .where("kind", "=", "fault")
    .where("machine_id", "=", machineId)
    .where("cleared_at", "is", null)
    .orderBy("at", "desc")
    .executeTakeFirst();
  return row ?? null;
}

/** Writes one log entry, checked against the limits in force; returns its id and what it missed. */
export async function recordEntry(
  db: Kysely<Database>,
  user: SessionUser,
  input: EntryFields,
  timeZone: string,
  now = new Date(),
): Promise<{ id: number; outOfRange: boolean; findings: string[] }> {
  assertCan(user, "machine_log.record");
  if (!ROUTINE_KINDS.includes(input.kind)) assertCan(user, "machine_log.manage");
  const at = entryInstant(input.at, now, timeZone);
  return db.transaction().execute(async (trx) => {
    const wanted = MACHINE_FOR[input.kind];
    let machine: { id: number; code: string; kind: MachineKind } | null = null;
    if (wanted !== null && "machineId" in input) {
      machine = (await trx.selectFrom("machines").select(["id", "code", "kind"]).where("id", "=", input.machineId).executeTakeFirst()) ?? null;
      if (!machine) throw new AppError("validation", "That machine was not found.", { machineId: ["Choose one of the unit's machines."] });
      if (wanted !== "any" && !wanted.includes(machine.kind)) {
        const needed = wanted.map((k) => MACHINE_KIND_LABELS[k].toLowerCase()).join(" or ");
        throw new AppError("validation", `${ENTRY_KIND_LABELS[input.kind]} is recorded for a ${needed}; ${machine.code} is a ${MACHINE_KIND_LABELS[machine.kind].toLowerCase()}.`, {
          machineId: [`Choose a ${needed}.`],
        });
      }
    }
    if (input.kind === "fault" && machine) {
      const open = await openFaultOf(trx, machine.id);
      if (open) {
        throw new AppError("conflict", `${machine.code} already has an open fault, recorded ${open.at.slice(0, 16).replace("T", " ")} UTC; clear it before recording another.`);
      }
    }
    const settings = await loadSettings(trx);
    const readings = {
      outcome: input.kind === "seal_test" ? input.outcome : null,
      temperatureC: input.kind === "store_climate" ? input.temperatureC! : null,
      humidityPct: input.kind === "store_climate" ? input.humidityPct! : null,
      conductivityUsCm: input.kind === "water_reading" ? (input.conductivityUsCm ?? null) : null,
      hardnessMmolL:
        input.kind === "water_reading" && input.hardness !== undefined ? (input.hardnessUnit === "dh" ? dhToMmolL(input.hardness) : input.hardness) : null,
    };
    const findings = checkReadings(readings, settings.limits, input.kind);
    const iso = now.toISOString();
    const { id } = await trx
      .insertInto("machine_log")
      .values({
        kind: input.kind,
        machine_id: machine?.id ?? null,
        place: input.kind === "store_climate" ? input.place : null,
        at: at.toISOString(),
        recorded_by: user.id,
        recorded_at: iso,
        outcome: readings.outcome,
        temperature_c: readings.temperatureC,
        humidity_pct: readings.humidityPct,
        conductivity_us_cm: readings.conductivityUsCm,
        hardness_mmol_l: readings.hardnessMmolL === null ? null : Number(readings.hardnessMmolL.toFixed(4)),
        salt_kg: input.kind === "salt_refill" ? input.saltKg! : null,
        provider: input.kind === "service" ? input.provider : null,
        reference: input.kind === "service" ? input.reference : null,
        notes: input.notes,
        out_of_range: findings.length > 0 ? 1 : 0,
        findings: JSON.stringify(findings),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(
      trx,
      { actorUserId: user.id, action: `machine_log.${input.kind}`, entity: "machine_log", entityId: id, details: { machine: machine?.code ?? null, findings } },
      now,
    );
    return { id, outOfRange: findings.length > 0, findings };
  });
}

/** Clears an open fault (quality lead): the machine is back in use. */
export async function clearFault(db: Kysely<Database>, user: SessionUser, input: { id: number; note: string }, now = new Date()): Promise<void> {
  assertCan(user, "machine_log.manage");
  await db.transaction().execute(async (trx) => {
    const row = await trx.selectFrom("machine_log").select(["id", "kind", "cleared_at", "machine_id", "at"]).where("id", "=", input.id).executeTakeFirst();
    if (!row || row.kind !== "fault") throw notFound("That fault");
    if (row.cleared_at) throw new AppError("conflict", "This fault has already been cleared.");
    if (new Date(row.at).getTime() > now.getTime()) throw new AppError("conflict", "A fault cannot be cleared before it was recorded.");
    await trx
      .updateTable("machine_log")
      .set({ cleared_at: now.toISOString(), cleared_by: user.id, clearance_note: input.note })
      .where("id", "=", row.id)
      .where("cleared_at", "is", null)
      .execute();
    await recordAudit(trx, { actorUserId: user.id, action: "machine_log.fault_cleared", entity: "machine_log", entityId: row.id, details: { note: input.note } }, now);
  });
}

// ---------------------------------------------------------------------------------------------
// Reading

const n = (v: number, digits = 1) => String(Number(v.toFixed(digits)));

function summaryOf(r: {
  kind: MachineLogKind;
  outcome: string | null;
  temperature_c: number | null;
  humidity_pct: number | null;
  conductivity_us_cm: number | null;
  hardness_mmol_l: number | null;
  salt_kg: number | null;
  provider: string | null;
  reference: string | null;
}): string {
  switch (r.kind) {
    case "seal_test":
      return r.outcome === "pass" ? "Passed" : "Failed";
    case "store_climate":
      return `${n(r.temperature_c ?? 0)} °C, ${n(r.humidity_pct ?? 0, 0)} % RH`;
    case "water_reading":
      return [
        r.conductivity_us_cm !== null ? `${n(r.conductivity_us_cm)} µS/cm` : null,
        r.hardness_mmol_l !== null ? `${n(r.hardness_mmol_l, 2)} mmol/l hardness` : null,
      ]
        .filter(Boolean)
        .join(", ");
    case "salt_refill":
      return `${n(r.salt_kg ?? 0)} kg salt`;
    case "service":
      return [r.provider, r.reference ? `ref. ${r.reference}` : null].filter(Boolean).join(", ");
    case "washer_cleaning":
      return "Cleaned";
    case "fault":
      return "Out of use until cleared";
  }
}

function readFindings(json: string): string[] {
  try {
    const v: unknown = JSON.parse(json);
    return Array.isArray(v) ? v.filter((s): s is string => typeof s === "string") : [];
  } catch {
    return [];
  }
}

function entriesQuery(db: Db) {
  return db
    .selectFrom("machine_log as l")
    .leftJoin("machines as m", "m.id", "l.machine_id")
    .innerJoin("users as u", "u.id", "l.recorded_by")
    .leftJoin("users as cu", "cu.id", "l.cleared_by")
    .select([
      "l.id",
      "l.kind",
      "l.place",
      "l.at",
      "l.outcome",
      "l.temperature_c",
      "l.humidity_pct",
      "l.conductivity_us_cm",
      "l.hardness_mmol_l",
      "l.salt_kg",
      "l.provider",
      "l.reference",
      "l.notes",
      "l.cleared_at",
      "l.clearance_note",
      "l.out_of_range",
      "l.findings",
      "m.id as machine_id",
      "m.code as machine_code",
      "m.name as machine_name",
      "u.name as recorded_by_name",
      "cu.name as cleared_by_name",
    ]);
}

type EntryRow = Awaited<ReturnType<ReturnType<typeof entriesQuery>["execute"]>>[number];

function toView(r: EntryRow): LogEntryView {
  return {
    id: r.id,
    kind: r.kind,
    kindLabel: ENTRY_KIND_LABELS[r.kind],
    machine: r.machine_id !== null && r.machine_code !== null ? { id: r.machine_id, code: r.machine_code, name: r.machine_name ?? r.machine_code } : null,
    place: r.place,
    at: r.at,
    recordedBy: r.recorded_by_name,
    summary: summaryOf(r),
    notes: r.notes,
    outOfRange: r.out_of_range === 1,
    findings: readFindings(r.findings),
    fault: r.kind === "fault" ? { open: r.cleared_at === null, clearedAt: r.cleared_at, clearedBy: r.cleared_by_name, note: r.clearance_note } : null,
  };
}

/** The log, newest first, filtered by machine, kind, local period and out-of-range only; at most `limit` rows. */
export async function listEntries(db: Db, filter: LogFilter, timeZone: string, limit = 300): Promise<LogEntryView[]> {
  let query = entriesQuery(db).orderBy("l.at", "desc").orderBy("l.id", "desc").limit(limit);
  if (filter.machine) query = query.where("l.machine_id", "=", filter.machine);
  if (filter.kind) query = query.where("l.kind", "=", filter.kind);
  if (filter.from) query = query.where("l.at", ">=", new Date(wallClockInstant(timeZone, dayNumberOf(filter.from), 0)).toISOString());
  if (filter.to) query = query.where("l.at", "<", new Date(wallClockInstant(timeZone, dayNumberOf(filter.to) + 1, 0)).toISOString());
  if (filter.flagged) query = query.where("l.out_of_range", "=", 1);
  return (await query.execute()).map(toView);
}

export interface CheckStatus {
  check: CheckKey;
  label: string;
  intervalDays: number;
  machine: { id: number; code: string; name: string } | null;
  lastAt: string | null;
  state: DueState;
}

/** Every recurring check with when it was last done (up to `now`) and whether it is due or overdue. Machines out of use (open fault) and switched off are left out. */
export async function checkStatuses(db: Db, now: Date, timeZone: string, settings?: MonitoringSettings): Promise<CheckStatus[]> {
  const s = settings ?? (await loadSettings(db));
  const machines = await db
    .selectFrom("machines")
    .select(["id", "code", "name", "kind", "created_at"])
    .where("active", "=", 1)
    .where("kind", "in", ["washer", "heat_sealer"])
    .where((eb) =>
      eb.not(
        eb.exists(
          eb.selectFrom("machine_log as f").select("f.id").whereRef("f.machine_id", "=", "machines.id").where("f.kind", "=", "fault").where("f.cleared_at", "is", null),
        ),
      ),
    )
    .orderBy("code")
    .execute();
  // The latest entry of each kind per machine; a seal test counts only when it passed.
  const latest = await db
    .selectFrom("machine_log")
    .select((eb) => ["kind", "machine_id", eb.fn.max("at").as("last_at")])
    .where((eb) => eb.or([eb("kind", "!=", "seal_test"), eb("outcome", "=", "pass")]))
    .where("kind", "in", ["seal_test", "washer_cleaning", "store_climate", "water_reading"])
    .where("at", "<=", now.toISOString())
    .groupBy(["kind", "machine_id"])
    .execute();
  const lastOf = (kind: string, machineId: number | null) => {
    const rows = latest.filter((r) => r.kind === kind && (machineId === null || r.machine_id === machineId));
    const times = rows.map((r) => String(r.last_at)).sort();
    return times.length ? times[times.length - 1]! : null;
  };
  const out: CheckStatus[] = [];
  for (const check of CHECK_KEYS) {
    const info = CHECK_INFO[check];
    const intervalDays = s.intervals[check];
    if (info.per === "unit") {
      const last = lastOf(check, null);
      out.push({ check, label: info.label, intervalDays, machine: null, lastAt: last, state: dueState(last ? new Date(last) : null, intervalDays, now, timeZone) });
      continue;
    }
    for (const m of machines.filter((m) => m.kind === info.per)) {
      const last = lastOf(check, m.id);
      out.push({
        check,
        label: info.label,
        intervalDays,
        machine: { id: m.id, code: m.code, name: m.name },
        lastAt: last,
        state: dueState(last ? new Date(last) : null, intervalDays, now, timeZone, new Date(m.created_at)),
      });
    }
  }
  return out;
}

export interface MonitoringWarnings {
  outOfRange: LogEntryView[];
  overdue: CheckStatus[];
  openFaults: LogEntryView[];
}

/** What the unit's home warns about: out-of-range readings of the last days, overdue checks, machines out of use. */
export async function monitoringWarnings(db: Db, now: Date, timeZone: string): Promise<MonitoringWarnings> {
  const since = new Date(now.getTime() - RECENT_WARNING_DAYS * DAY_MS).toISOString();
  const [flagged, faults, statuses] = await Promise.all([
    entriesQuery(db).where("l.out_of_range", "=", 1).where("l.at", ">=", since).orderBy("l.at", "desc").limit(20).execute(),
    entriesQuery(db).where("l.kind", "=", "fault").where("l.cleared_at", "is", null).orderBy("l.at", "desc").execute(),
    checkStatuses(db, now, timeZone),
  ]);
  return { outOfRange: flagged.map(toView), openFaults: faults.map(toView), overdue: statuses.filter((c) => c.state.status === "overdue") };
}

/** The machines for the log's forms and filter: id, code, name and kind, with whether each is out of use. */
export async function machineOptions(db: Db): Promise<{ id: number; code: string; name: string; kind: MachineKind; active: boolean; outOfUse: boolean }[]> {
  const rows = await db
    .selectFrom("machines")
    .select((eb) => [
      "id",
      "code",
      "name",
      "kind",
      "active",
      eb
        .exists(eb.selectFrom("machine_log as f").select("f.id").whereRef("f.machine_id", "=", "machines.id").where("f.kind", "=", "fault").where("f.cleared_at", "is", null))
        .as("out_of_use"),
    ])
    .orderBy("kind")
    .orderBy("code")
    .execute();
  return rows.map((r) => ({ id: r.id, code: r.code, name: r.name, kind: r.kind, active: r.active === 1, outOfUse: Boolean(r.out_of_use) }));
}
