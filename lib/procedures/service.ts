import "server-only";
import type { Kysely } from "kysely";
import { uniqueViolation } from "@/db/dialect";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { CYCLE_STATE_LABELS, type CycleState } from "@/lib/cycles/lifecycle";
import { serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { expiryPhrase, expiryStatus, formatLocalDate, localDateOf } from "@/lib/expiry/dates";
import { formatDateTime } from "@/lib/format";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import { findSetByScan } from "@/lib/sets/service";
import type { ListUsesQuery, RecordUseFields } from "./schemas";

// Sets used for procedures at the clinic: what a scan found and whether it may be recorded, the
// record itself (one per delivered cycle), the clinic's latest uses, and — for a recall — which
// procedures used a set from a given cycle.

/** What the clinic's screen shows after a scan, before the use is confirmed. */
export interface ScannedSet {
  setId: number;
  serial: string;
  setName: string;
  siteName: string | null;
  cycleId: number | null;
  deliveredAt: string | null;
  /** The pack's expiry date as recorded by the unit ("YYYY-MM-DD"), or null when none is on record. */
  expiresOn: string | null;
  expiryText: string;
  /** Why the set cannot be recorded as used, or null when it can. */
  problem: string | null;
}

type Scanned = ScannedSet & { organisationId: number | null; siteId: number | null };

async function inspectScan(db: Kysely<Database>, user: SessionUser, code: string, now: Date): Promise<Scanned> {
  const set = await findSetByScan(db, user, code);
  // The set's latest trip that was not cancelled, in the caller's scope.
  const cycle = await db
    .selectFrom("cycles")
    .leftJoin("sites", "sites.id", "cycles.site_id")
    .leftJoin("orders", "orders.id", "cycles.order_id")
    .leftJoin("procedure_uses", "procedure_uses.cycle_id", "cycles.id")
    .select([
      "cycles.id",
      "cycles.state",
      "cycles.organisation_id",
      "cycles.site_id",
      "cycles.delivered_at",
      "cycles.expires_on",
      "sites.name as site_name",
      "orders.reference as order_reference",
      "procedure_uses.theatre as used_theatre",
      "procedure_uses.case_reference as used_case",
      "procedure_uses.used_at",
    ])
    .where("cycles.set_id", "=", set.id)
    .where("cycles.state", "!=", "cancelled")
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .orderBy("cycles.id", "desc")
    .limit(1)
    .executeTakeFirst();
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const today = localDateOf(now, timeZone);
  const expiresOn = cycle?.state === "delivered" ? cycle.expires_on : null;
  const result: Scanned = {
    setId: set.id,
    serial: set.serial,
    setName: set.setTypeName,
    siteName: cycle?.site_name ?? set.homeSiteName,
    cycleId: cycle?.state === "delivered" ? cycle.id : null,
    deliveredAt: cycle?.state === "delivered" ? cycle.delivered_at : null,
    expiresOn,
    expiryText: expiresOn
      ? `${formatLocalDate(expiresOn)} — ${expiryPhrase(expiryStatus(expiresOn, today, 0).daysLeft).toLowerCase()}`
      : "No expiry date on record: read it on the label.",
    problem: null,
    organisationId: cycle?.organisation_id ?? null,
    siteId: cycle?.site_id ?? null,
  };
  if (set.status !== "in_service") {
    result.problem = `${set.serial} is retired: do not use it. Ask the unit what to do with it.`;
  } else if (!cycle) {
    result.problem = `${set.serial} has no delivery from the unit on record, so its processing cannot be traced. Only a set delivered by the unit can be recorded.`;
  } else if (cycle.state === "booked") {
    result.problem = `${set.serial} is booked for pickup${cycle.order_reference ? ` on ${cycle.order_reference}` : ""}. Take it off that booking before using it.`;
  } else if (cycle.state !== "delivered") {
    const label = CYCLE_STATE_LABELS[cycle.state as CycleState] ?? cycle.state;
    result.problem = `${set.serial} has not been delivered to you yet: it is ${label.toLowerCase()}.`;
  } else if (cycle.used_at) {
    result.problem = `${set.serial} was already used on ${formatDateTime(cycle.used_at, timeZone)} (${cycle.used_theatre}, case ${cycle.used_case}). Send it back for reprocessing before it is used again.`;
  } else if (expiresOn && expiresOn < today) {
    result.problem = `${set.serial} expired on ${formatLocalDate(expiresOn)}. Do not use it: send it back for reprocessing.`;
  }
  return result;
}

/** The set a scan found, with whether it may be recorded as used (and why not). */
export async function checkScannedSet(db: Kysely<Database>, user: SessionUser, code: string, now = new Date()): Promise<ScannedSet> {
  const s = await inspectScan(db, user, code, now);
  return {
    setId: s.setId,
    serial: s.serial,
    setName: s.setName,
    siteName: s.siteName,
    cycleId: s.cycleId,
    deliveredAt: s.deliveredAt,
    expiresOn: s.expiresOn,
    expiryText: s.expiryText,
    problem: s.problem,
  };
}

export interface RecordedUse {
  id: number;
  serial: string;
  setName: string;
  usedAt: string;
}

function isUniqueViolation(error: unknown): boolean {
  return uniqueViolation(error) !== null;
}

/** Records that a delivered, unexpired, unused set was taken for a procedure; refuses anything else. */
export async function recordProcedureUse(
  db: Kysely<Database>,
  user: SessionUser,
  input: RecordUseFields,
  now = new Date(),
): Promise<RecordedUse> {
  return db.transaction().execute(async (trx) => {
    const scanned = await inspectScan(trx, user, input.code, now);
    if (scanned.problem || !scanned.cycleId || !scanned.organisationId || !scanned.siteId) {
      throw new AppError("conflict", scanned.problem ?? `${scanned.serial} cannot be recorded as used.`, { code: [scanned.problem ?? "Cannot be used."] });
    }
    const usedAt = now.toISOString();
    let id: number;
    try {
      ({ id } = await trx
        .insertInto("procedure_uses")
        .values({
          organisation_id: scanned.organisationId,
          site_id: scanned.siteId,
          cycle_id: scanned.cycleId,
          set_id: scanned.setId,
          theatre: input.theatre,
          case_reference: input.caseReference,
          pack_checked: 1,
          indicator_checked: 1,
          recorded_by: user.id,
          used_at: usedAt,
        })
        .returning("id")
        .executeTakeFirstOrThrow());
    } catch (error) {
      if (isUniqueViolation(error)) throw new AppError("conflict", `${scanned.serial} was recorded as used by someone else just now.`);
      throw error;
    }
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: scanned.organisationId,
        action: "procedure.set_used",
        entity: "set",
        entityId: scanned.setId,
        details: { cycleId: scanned.cycleId, theatre: input.theatre, caseReference: input.caseReference, expiresOn: scanned.expiresOn },
      },
      now,
    );
    return { id, serial: scanned.serial, setName: scanned.setName, usedAt };
  });
}

export interface ProcedureUseRow {
  id: number;
  setId: number;
  serial: string;
  setName: string;
  siteName: string;
  theatre: string;
  caseReference: string;
  usedAt: string;
  recordedBy: string | null;
}

const USE_SORTS = { used_at: "procedure_uses.used_at", serial: "sets.serial", theatre: "procedure_uses.theatre" } as const;

/** The caller's recorded uses, newest first by default, paged on the server. */
export async function listProcedureUses(db: Kysely<Database>, user: SessionUser, query: ListUsesQuery): Promise<Page<ProcedureUseRow>> {
  let base = db
    .selectFrom("procedure_uses")
    .innerJoin("sets", "sets.id", "procedure_uses.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("sites", "sites.id", "procedure_uses.site_id")
    .leftJoin("users", "users.id", "procedure_uses.recorded_by")
    .where(tenantScope(user, { organisation: "procedure_uses.organisation_id", site: "procedure_uses.site_id" }));
  if (query.q) base = base.where(searchTerm(["sets.serial", "set_types.name", "procedure_uses.theatre", "procedure_uses.case_reference"], query.q));
  const page = await fetchPage(
    base,
    (qb) =>
      qb.select([
        "procedure_uses.id",
        "procedure_uses.set_id",
        "sets.serial",
        "set_types.name as set_name",
        "sites.name as site_name",
        "procedure_uses.theatre",
        "procedure_uses.case_reference",
        "procedure_uses.used_at",
        "users.name as recorded_by",
      ]),
    query,
    USE_SORTS[query.sort],
    "procedure_uses.id",
  );
  return {
    total: page.total,
    rows: page.rows.map((r) => ({
      id: r.id,
      setId: r.set_id,
      serial: r.serial,
      setName: r.set_name,
      siteName: r.site_name,
      theatre: r.theatre,
      caseReference: r.case_reference,
      usedAt: r.used_at,
      recordedBy: r.recorded_by,
    })),
  };
}

export interface ProcedureForRecall {
  cycleId: number;
  setId: number;
  serial: string;
  setName: string;
  organisationId: number;
  organisationName: string;
  siteId: number;
  siteName: string;
  theatre: string;
  caseReference: string;
  usedAt: string;
  recordedBy: string | null;
}

/**
 * The procedures that used a set from any of these cycles — for a recall of a failed load, which
 * has to tell each customer which of its cases were affected. Unit-wide: the caller (the recall)
 * decides who sees what. Ordered by customer, site and time of use.
 */
export async function proceduresForCycles(db: Kysely<Database>, cycleIds: readonly number[]): Promise<ProcedureForRecall[]> {
  const ids = [...new Set(cycleIds)];
  const out: ProcedureForRecall[] = [];
  // In chunks, well inside SQLite's limit on bound parameters.
  for (let i = 0; i < ids.length; i += 500) {
    const rows = await db
      .selectFrom("procedure_uses")
      .innerJoin("sets", "sets.id", "procedure_uses.set_id")
      .innerJoin("set_types", "set_types.id", "sets.set_type_id")
      .innerJoin("sites", "sites.id", "procedure_uses.site_id")
      .innerJoin("organisations", "organisations.id", "procedure_uses.organisation_id")
      .leftJoin("users", "users.id", "procedure_uses.recorded_by")
      .select([
        "procedure_uses.cycle_id",
        "procedure_uses.set_id",
        "sets.serial",
        "set_types.name as set_name",
        "procedure_uses.organisation_id",
        "organisations.name as organisation_name",
        "procedure_uses.site_id",
        "sites.name as site_name",
        "procedure_uses.theatre",
        "procedure_uses.case_reference",
        "procedure_uses.used_at",
        "users.name as recorded_by",
      ])
      .where("procedure_uses.cycle_id", "in", ids.slice(i, i + 500))
      .execute();
    for (const r of rows) {
      out.push({
        cycleId: r.cycle_id,
        setId: r.set_id,
        serial: r.serial,
        setName: r.set_name,
        organisationId: r.organisation_id,
        organisationName: r.organisation_name,
        siteId: r.site_id,
        siteName: r.site_name,
        theatre: r.theatre,
        caseReference: r.case_reference,
        usedAt: r.used_at,
        recordedBy: r.recorded_by,
      });
    }
  }
  return out.sort(
    (a, b) => a.organisationName.localeCompare(b.organisationName) || a.siteName.localeCompare(b.siteName) || a.usedAt.localeCompare(b.usedAt) || a.cycleId - b.cycleId,
  );
}

