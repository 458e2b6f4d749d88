import "server-only";
import { type Kysely, sql, type Transaction } from "kysely";
import type { Database, OrderKind, OrderStatus, ProblemKind } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { isCustomerRole } from "@/lib/auth/roles";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { type CycleState, CYCLE_STATE_LABELS } from "@/lib/cycles/lifecycle";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { type Page, searchTerm } from "@/lib/http/paging";
import { enqueueMail } from "@/lib/mail/outbox";
import { problemAnsweredMail } from "@/lib/mail/problem-templates";
import { recipientsFor } from "@/lib/orders/notifications";
import {
  type AnswerProblemFields,
  type ListProblemsQuery,
  needsDeliveredSet,
  PROBLEM_KIND_LABELS,
  PROBLEM_KIND_SHORT,
  type ProblemStatus,
  type ReportProblemFields,
} from "./schemas";

// Problems a clinic reports with a delivered set (or an order as a whole), and the unit's one
// written answer, which is e-mailed to the clinic. Every read and write carries the caller's
// tenant scope in its WHERE clause; every change is one transaction with its audit entry and
// e-mails.

type Executor = Kysely<Database> | Transaction<Database>;

// --- reporting ---------------------------------------------------------------------------------

/** Records a clinic's problem; another tenant's order, set or photo answers 404 and writes nothing. */
export async function reportProblem(
  db: Kysely<Database>,
  user: SessionUser,
  input: ReportProblemFields,
  now = new Date(),
): Promise<{ problemId: number }> {
  return db.transaction().execute(async (trx) => {
    const order = await trx
      .selectFrom("orders")
      .select(["id", "organisation_id", "site_id", "reference"])
      .where("id", "=", input.orderId)
      .where(tenantScope(user, { organisation: "orders.organisation_id", site: "orders.site_id" }))
      .executeTakeFirst();
    if (!order) throw notFound("That order");

    let cycle: { id: number; set_id: number; state: string; delivered_at: string | null } | undefined;
    if (input.cycleId !== null) {
      cycle = await trx
        .selectFrom("cycles")
        .select(["id", "set_id", "state", "delivered_at"])
        .where("id", "=", input.cycleId)
        .where((eb) => eb.or([eb("order_id", "=", order.id), eb("return_order_id", "=", order.id)]))
        .where(tenantScope(user, { organisation: "cycles.organisation_id" }))
        .executeTakeFirst();
      if (!cycle) {
        throw new AppError("not_found", `That set was not found on ${order.reference}.`, { cycleId: ["Choose one of this order's sets."] });
      }
      if (needsDeliveredSet(input.kind) && !cycle.delivered_at) {
        const label = CYCLE_STATE_LABELS[cycle.state as CycleState]?.toLowerCase() ?? cycle.state;
        throw new AppError(
          "validation",
          `"${PROBLEM_KIND_SHORT[input.kind]}" is for a set that was delivered to you; this one has not been delivered yet (${label}). Choose "Something else" to tell the unit about it.`,
          { cycleId: ["This set has not been delivered yet."] },
        );
      }
      if (needsDeliveredSet(input.kind)) {
        const same = await trx
          .selectFrom("problems")
          .select("id")
          .where("cycle_id", "=", cycle.id)
          .where("kind", "=", input.kind)
          .where("status", "=", "open")
          .executeTakeFirst();
        if (same) {
          throw new AppError(
            "conflict",
            `This was already reported for this set as problem ${same.id}, and the unit has not answered it yet. You will get an e-mail when it does.`,
          );
        }
      }
    }

    if (input.photoFileId !== null) {
      const photo = await trx
        .selectFrom("files")
        .select(["id", "purpose"])
        .where("id", "=", input.photoFileId)
        .where("organisation_id", "=", order.organisation_id)
        .where(tenantScope(user, { organisation: "files.organisation_id" }))
        .executeTakeFirst();
      if (!photo) throw new AppError("not_found", "That photo was not found. Upload it again.", { photoFileId: ["Upload the photo again."] });
      if (photo.purpose !== "problem_photo") {
        throw new AppError("validation", "That file was not uploaded as a photo of a problem. Upload the photo again.", {
          photoFileId: ["Upload the photo again."],
        });
      }
    }

    const { id } = await trx
      .insertInto("problems")
      .values({
        organisation_id: order.organisation_id,
        site_id: order.site_id,
        order_id: order.id,
        cycle_id: cycle?.id ?? null,
        set_id: cycle?.set_id ?? null,
        kind: input.kind,
        description: input.description,
        photo_file_id: input.photoFileId,
        status: "open",
        reported_by: user.id,
        created_at: now.toISOString(),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: order.organisation_id,
        action: "problem.reported",
        entity: "problem",
        entityId: id,
        details: { kind: input.kind, orderId: order.id, cycleId: cycle?.id ?? null, setId: cycle?.set_id ?? null, photoFileId: input.photoFileId },
      },
      now,
    );
    return { problemId: id };
  });
}

// --- answering ---------------------------------------------------------------------------------

/**
 * Records the unit's answer and e-mails it to the clinic's people who chose to hear of answers.
 * A problem has one answer: answering it again is a conflict.
 */
export async function answerProblem(
  db: Kysely<Database>,
  user: SessionUser,
  input: AnswerProblemFields,
  now = new Date(),
): Promise<{ problemId: number; notified: number }> {
  return db.transaction().execute(async (trx) => {
    const problem = await trx
      .selectFrom("problems")
      .leftJoin("users as answerer", "answerer.id", "problems.answered_by")
      .select([
        "problems.id",
        "problems.status",
        "problems.organisation_id",
        "problems.site_id",
        "problems.answered_at",
        "answerer.name as answered_by_name",
      ])
      .where("problems.id", "=", input.problemId)
      .where(tenantScope(user, { organisation: "problems.organisation_id", site: "problems.site_id" }))
      .executeTakeFirst();
    if (!problem) throw notFound("That problem");
    if (problem.status !== "open") throw alreadyAnswered(problem.answered_by_name, problem.answered_at);
    const iso = now.toISOString();
    const updated = await trx
      .updateTable("problems")
      .set({ status: "answered", answer: input.answer, answered_by: user.id, answered_at: iso })
      .where("id", "=", problem.id)
      .where("status", "=", "open")
      .executeTakeFirst();
    if (Number(updated.numUpdatedRows) !== 1) throw alreadyAnswered(null, null);
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: problem.organisation_id,
        action: "problem.answered",
        entity: "problem",
        entityId: problem.id,
        details: { length: input.answer.length },
      },
      now,
    );
    const notified = await notifyAnswer(trx, problem.id, now);
    return { problemId: problem.id, notified };
  });
}

function alreadyAnswered(byName: string | null, at: string | null): AppError {
  const who = byName ? ` by ${byName}` : "";
  const when = at ? ` on ${formatDateTime(at, serverEnv().UNIT_TIME_ZONE)}` : "";
  return new AppError(
    "conflict",
    `This problem has already been answered${who}${when}. A problem has one answer; if the clinic needs more, they report a new problem.`,
  );
}

/** Queues the answer e-mail, once per problem and person, to the clinic's people who chose it. */
async function notifyAnswer(db: Executor, problemId: number, now: Date): Promise<number> {
  const p = await db
    .selectFrom("problems")
    .innerJoin("sites", "sites.id", "problems.site_id")
    .leftJoin("orders", "orders.id", "problems.order_id")
    .leftJoin("sets", "sets.id", "problems.set_id")
    .leftJoin("set_types", "set_types.id", "sets.set_type_id")
    .leftJoin("users as answerer", "answerer.id", "problems.answered_by")
    .select([
      "problems.id",
      "problems.organisation_id",
      "problems.site_id",
      "problems.kind",
      "problems.description",
      "problems.answer",
      "problems.answered_at",
      "problems.created_at",
      "sites.name as site_name",
      "orders.reference as order_reference",
      "sets.serial",
      "set_types.name as set_name",
      "answerer.name as answered_by_name",
    ])
    .where("problems.id", "=", problemId)
    .executeTakeFirstOrThrow();
  const env = serverEnv();
  const tz = env.UNIT_TIME_ZONE;
  const recipients = await recipientsFor(db, { organisation_id: p.organisation_id, site_id: p.site_id }, "problem_answered");
  for (const r of recipients) {
    const mail = problemAnsweredMail({
      recipientName: r.name,
      problemNumber: p.id,
      kindLabel: PROBLEM_KIND_SHORT[p.kind],
      orderReference: p.order_reference,
      setLabel: p.serial ? `${p.serial} — ${p.set_name ?? ""}`.trim() : null,
      siteName: p.site_name,
      reportedAt: formatDateTime(p.created_at, tz),
      description: p.description,
      answer: p.answer ?? "",
      answeredByName: p.answered_by_name ?? "the unit",
      answeredAt: formatDateTime(p.answered_at, tz),
      link: `${env.APP_URL}/clinic/problems/${p.id}`,
    });
    await enqueueMail(
      db,
      { template: "problem.answered", to: r.email, organisationId: p.organisation_id, dedupeKey: `problem:${p.id}:answered:${r.id}`, ...mail },
      now,
    );
  }
  return recipients.length;
}

// --- lists -------------------------------------------------------------------------------------

export interface ProblemListRow {
  id: number;
  kind: ProblemKind;
  status: ProblemStatus;
  /** The first 200 characters of the description. */
  summary: string;
  organisationId: number;
  organisationName: string;
  siteId: number;
  siteName: string;
  orderId: number | null;
  orderReference: string | null;
  setId: number | null;
  setSerial: string | null;
  setName: string | null;
  reportedByName: string | null;
  hasPhoto: boolean;
  createdAt: string;
  answeredAt: string | null;
  /** Minutes from the report to the answer, or to now while it is open. */
  waitedMinutes: number;
}

function scopedProblems(db: Kysely<Database>, user: SessionUser) {
  return db
    .selectFrom("problems")
    .innerJoin("organisations", "organisations.id", "problems.organisation_id")
    .innerJoin("sites", "sites.id", "problems.site_id")
    .leftJoin("orders", "orders.id", "problems.order_id")
    .leftJoin("sets", "sets.id", "problems.set_id")
    .leftJoin("set_types", "set_types.id", "sets.set_type_id")
    .leftJoin("users as reporter", "reporter.id", "problems.reported_by")
    .where(tenantScope(user, { organisation: "problems.organisation_id", site: "problems.site_id" }));
}

type ScopedProblems = ReturnType<typeof scopedProblems>;

function selectListColumns(qb: ScopedProblems) {
  return qb.select([
    "problems.id",
    "problems.kind",
    "problems.status",
    sql<string>`substr(problems.description, 1, 200)`.as("summary"),
    "problems.organisation_id",
    "organisations.name as organisation_name",
    "problems.site_id",
    "sites.name as site_name",
    "problems.order_id",
    "orders.reference as order_reference",
    "problems.set_id",
    "sets.serial as set_serial",
    "set_types.name as set_name",
    "reporter.name as reported_by_name",
    "problems.photo_file_id",
    "problems.created_at",
    "problems.answered_at",
  ]);
}

type ListColumns = Awaited<ReturnType<ReturnType<typeof selectListColumns>["executeTakeFirstOrThrow"]>>;

function toListRow(r: ListColumns, now: Date): ProblemListRow {
  const until = r.answered_at ? new Date(r.answered_at) : now;
  return {
    id: r.id,
    kind: r.kind,
    status: r.status,
    summary: r.summary,
    organisationId: r.organisation_id,
    organisationName: r.organisation_name,
    siteId: r.site_id,
    siteName: r.site_name,
    orderId: r.order_id,
    orderReference: r.order_reference,
    setId: r.set_id,
    setSerial: r.set_serial,
    setName: r.set_name,
    reportedByName: r.reported_by_name,
    hasPhoto: r.photo_file_id !== null,
    createdAt: r.created_at,
    answeredAt: r.answered_at,
    waitedMinutes: Math.max(0, Math.floor((until.getTime() - new Date(r.created_at).getTime()) / 60_000)),
  };
}

/** The caller's problems, filtered and paged on the server; the default puts open ones first, oldest first. */
export async function listProblems(
  db: Kysely<Database>,
  user: SessionUser,
  query: ListProblemsQuery,
  now = new Date(),
): Promise<Page<ProblemListRow>> {
  let base = scopedProblems(db, user);
  if (query.status) base = base.where("problems.status", "=", query.status);
  if (query.kind) base = base.where("problems.kind", "=", query.kind);
  if (query.organisationId) base = base.where("problems.organisation_id", "=", query.organisationId);
  if (query.orderId) base = base.where("problems.order_id", "=", query.orderId);
  if (query.q) {
    base = base.where(searchTerm(["orders.reference", "sets.serial", "set_types.name", "problems.description", "organisations.name", "sites.name"], query.q));
  }
  const counted = await base.select((eb) => eb.fn.countAll<number>().as("total")).executeTakeFirst();
  const dir = query.dir;
  let rows = selectListColumns(base);
  // Each sort ends on the age and the id, so pages never overlap or skip a row.
  switch (query.sort) {
    case "queue":
      rows = rows.orderBy(sql`case when problems.status = 'open' then 0 else 1 end`, dir).orderBy("problems.created_at", dir).orderBy("problems.id", dir);
      break;
    case "created_at":
      rows = rows.orderBy("problems.created_at", dir).orderBy("problems.id", dir);
      break;
    case "status":
      rows = rows.orderBy("problems.status", dir === "asc" ? "desc" : "asc").orderBy("problems.created_at", "asc").orderBy("problems.id", "asc");
      break;
    case "customer":
      rows = rows.orderBy("organisations.name", dir).orderBy("problems.created_at", "asc").orderBy("problems.id", "asc");
      break;
    case "kind":
      rows = rows.orderBy("problems.kind", dir).orderBy("problems.created_at", "asc").orderBy("problems.id", "asc");
      break;
  }
  const page = await rows
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .execute();
  return { total: Number(counted?.total ?? 0), rows: page.map((r) => toListRow(r, now)) };
}

/** How many problems wait for an answer in the caller's scope. */
export async function countOpenProblems(db: Kysely<Database>, user: SessionUser): Promise<number> {
  const row = await scopedProblems(db, user)
    .where("problems.status", "=", "open")
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

export interface OrderProblem extends ProblemListRow {
  description: string;
  answer: string | null;
  answeredByName: string | null;
}

/** The problems reported on one order, oldest first, with their answers. */
export async function listOrderProblems(db: Kysely<Database>, user: SessionUser, orderId: number, now = new Date()): Promise<OrderProblem[]> {
  const rows = await selectListColumns(scopedProblems(db, user).where("problems.order_id", "=", orderId))
    .leftJoin("users as answerer", "answerer.id", "problems.answered_by")
    .select(["problems.description", "problems.answer", "answerer.name as answered_by_name"])
    .orderBy("problems.created_at")
    .orderBy("problems.id")
    .execute();
  return rows.map((r) => ({ ...toListRow(r, now), description: r.description, answer: r.answer, answeredByName: r.answered_by_name }));
}

// --- one problem -------------------------------------------------------------------------------

export interface ProblemHistoryEntry {
  id: number;
  at: string;
  event: string;
  fromState: string | null;
  toState: string;
  toLabel: string;
  station: string;
  userName: string | null;
  note: string | null;
}

export interface ProblemDetail {
  id: number;
  kind: ProblemKind;
  kindLabel: string;
  status: ProblemStatus;
  description: string;
  createdAt: string;
  organisationId: number;
  organisationName: string;
  siteId: number;
  siteName: string;
  reportedByName: string | null;
  order: { id: number; reference: string; kind: OrderKind; status: OrderStatus } | null;
  set: {
    id: number;
    serial: string;
    giai: string;
    typeId: number;
    typeCode: string;
    typeName: string;
    packaging: string;
    sterilisationMethod: string;
    contents: { position: number; name: string; quantity: number }[];
  } | null;
  cycle: { id: number; state: CycleState; stateLabel: string; releasedAt: string | null; deliveredAt: string | null; expiresOn: string | null } | null;
  photo: { id: number; name: string; contentType: string } | null;
  answer: { text: string; byName: string | null; at: string } | null;
  /** The cycle's scan events, for the unit's staff (empty for customers). */
  history: ProblemHistoryEntry[];
}

/** One problem in the caller's scope, with its set, order, photo, answer and (for the unit) the cycle's history. */
export async function getProblemDetail(db: Kysely<Database>, user: SessionUser, problemId: number): Promise<ProblemDetail> {
  const p = await scopedProblems(db, user)
    .leftJoin("users as answerer", "answerer.id", "problems.answered_by")
    .leftJoin("files", "files.id", "problems.photo_file_id")
    .leftJoin("cycles", "cycles.id", "problems.cycle_id")
    .select([
      "problems.id",
      "problems.kind",
      "problems.status",
      "problems.description",
      "problems.created_at",
      "problems.organisation_id",
      "organisations.name as organisation_name",
      "problems.site_id",
      "sites.name as site_name",
      "reporter.name as reported_by_name",
      "problems.order_id",
      "orders.reference as order_reference",
      "orders.kind as order_kind",
      "orders.status as order_status",
      "problems.set_id",
      "sets.serial",
      "sets.giai",
      "set_types.id as set_type_id",
      "set_types.code as set_type_code",
      "set_types.name as set_type_name",
      "set_types.packaging",
      "set_types.sterilisation_method",
      "problems.cycle_id",
      "cycles.state as cycle_state",
      "cycles.released_at",
      "cycles.delivered_at",
      "cycles.expires_on",
      "files.id as photo_id",
      "files.original_name as photo_name",
      "files.content_type as photo_type",
      "problems.answer",
      "problems.answered_at",
      "answerer.name as answered_by_name",
    ])
    .where("problems.id", "=", problemId)
    .executeTakeFirst();
  if (!p) throw notFound("That problem");

  const contents =
    p.set_type_id !== null
      ? await db
          .selectFrom("set_type_items")
          .select(["position", "name", "quantity"])
          .where("set_type_id", "=", p.set_type_id)
          .orderBy("position")
          .execute()
      : [];
  const history =
    p.cycle_id !== null && !isCustomerRole(user.role)
      ? await db
          .selectFrom("scan_events")
          .leftJoin("users", "users.id", "scan_events.user_id")
          .select([
            "scan_events.id",
            "scan_events.at",
            "scan_events.event",
            "scan_events.from_state",
            "scan_events.to_state",
            "scan_events.station",
            "scan_events.details",
            "users.name as user_name",
          ])
          .where("scan_events.cycle_id", "=", p.cycle_id)
          .orderBy("scan_events.id")
          .execute()
      : [];

  return {
    id: p.id,
    kind: p.kind,
    kindLabel: PROBLEM_KIND_LABELS[p.kind],
    status: p.status,
    description: p.description,
    createdAt: p.created_at,
    organisationId: p.organisation_id,
    organisationName: p.organisation_name,
    siteId: p.site_id,
    siteName: p.site_name,
    reportedByName: p.reported_by_name,
    order:
      p.order_id !== null && p.order_reference !== null && p.order_kind !== null && p.order_status !== null
        ? { id: p.order_id, reference: p.order_reference, kind: p.order_kind, status: p.order_status }
        : null,
    set:
      p.set_id !== null && p.serial !== null && p.set_type_id !== null
        ? {
            id: p.set_id,
            serial: p.serial,
            giai: p.giai ?? "",
            typeId: p.set_type_id,
            typeCode: p.set_type_code ?? "",
            typeName: p.set_type_name ?? "",
            packaging: p.packaging ?? "",
            sterilisationMethod: p.sterilisation_method ?? "",
            contents,
          }
        : null,
    cycle:
      p.cycle_id !== null && p.cycle_state !== null
        ? {
            id: p.cycle_id,
            state: p.cycle_state as CycleState,
            stateLabel: CYCLE_STATE_LABELS[p.cycle_state as CycleState] ?? p.cycle_state,
            releasedAt: p.released_at,
            deliveredAt: p.delivered_at,
            expiresOn: p.expires_on,
          }
        : null,
    photo: p.photo_id !== null ? { id: p.photo_id, name: p.photo_name ?? "photo", contentType: p.photo_type ?? "" } : null,
    answer: p.answer !== null && p.answered_at !== null ? { text: p.answer, byName: p.answered_by_name, at: p.answered_at } : null,
    history: history.map((h) => ({
      id: h.id,
      at: h.at,
      event: h.event,
      fromState: h.from_state,
      toState: h.to_state,
      toLabel: CYCLE_STATE_LABELS[h.to_state as CycleState] ?? h.to_state,
      station: h.station,
      userName: h.user_name,
      note: noteOf(h.details),
    })),
  };
}

/** The reason a scan event carries, if any (holds and cancellations record one). */
function noteOf(details: string): string | null {
  try {
    const parsed = JSON.parse(details) as Record<string, unknown>;
    return typeof parsed.reason === "string" && parsed.reason ? parsed.reason : null;
  } catch {
    return null;
  }
}
