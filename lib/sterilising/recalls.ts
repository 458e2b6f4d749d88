import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { toCsv } from "@/lib/csv";
import { CYCLE_STATE_LABELS, type CycleState, transition } from "@/lib/cycles/lifecycle";
import { applyCycleEvent } from "@/lib/cycles/store";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { enqueueMail } from "@/lib/mail/outbox";
import { recallMail } from "@/lib/mail/templates";
import { getLoadView } from "./loads";

// Failing a load, and the recall a failed released load raises: every cycle of the load that had
// left the unit's hands (released, dispatched, delivered) moves with "recall"; the recall lists
// the affected customers, sites and sets, where each is now, and the procedures a clinic recorded
// with them; each affected customer's managers get one e-mail through the outbox; each set is
// tracked until it is back ("return_recalled"). Advisory: see RECALL_ADVISORY_TEXT.

type Db = Kysely<Database> | Transaction<Database>;

const RECALLABLE: CycleState[] = ["released", "dispatched", "delivered"];

/**
 * Fails a load. Awaiting release: its sets go back to washing. Released: every set is recalled,
 * a recall is raised with its items and each affected customer is e-mailed — all in one transaction.
 */
export async function failLoad(db: Kysely<Database>, user: SessionUser, loadId: number, input: { reason: string }, now = new Date()): Promise<{ recallId: number | null }> {
  const reason = input.reason.trim();
  if (reason.length < 5) throw new AppError("validation", "Say why the load fails.", { reason: ["Say why the load fails (at least a few words)."] });
  return db.transaction().execute(async (trx) => {
    const load = await getLoadView(trx, loadId);
    const iso = now.toISOString();
    if (load.status === "awaiting_release") {
      await trx.updateTable("steriliser_loads").set({ status: "failed", decision_by: user.id, decision_at: iso, decision_notes: reason }).where("id", "=", loadId).execute();
      for (const item of load.items) {
        if (!transition(item.state, "send_to_rewash").ok) continue;
        await applyCycleEvent(trx, { cycleId: item.cycleId, event: "send_to_rewash", station: "release", userId: user.id, at: now, loadId, details: { load: load.number, reason } });
      }
      await recordAudit(trx, { actorUserId: user.id, action: "load.failed", entity: "steriliser_load", entityId: loadId, details: { number: load.number, reason } }, now);
      return { recallId: null };
    }
    if (load.status !== "released") {
      throw new AppError("conflict", `Load ${load.number} is ${load.statusLabel.toLowerCase()}; only a load awaiting release or a released load can be failed.`);
    }
    await trx
      .updateTable("steriliser_loads")
      .set({ status: "failed", failed_after_release: 1, decision_notes: reason, decision_at: iso, decision_by: user.id })
      .where("id", "=", loadId)
      .execute();
    const recallId = await raiseRecall(trx, user, load.id, load.number, reason, now);
    return { recallId };
  });
}

async function raiseRecall(trx: Transaction<Database>, user: SessionUser, loadId: number, loadNumber: string, reason: string, now: Date): Promise<number> {
  const iso = now.toISOString();
  const number = `R-${loadNumber}`;
  const { id: recallId } = await trx
    .insertInto("recalls")
    .values({ number, load_id: loadId, reason, status: "open", created_by: user.id, created_at: iso })
    .returning("id")
    .executeTakeFirstOrThrow();
  const cycles = await trx
    .selectFrom("load_items as i")
    .innerJoin("cycles as c", "c.id", "i.cycle_id")
    .select(["c.id", "c.state", "c.set_id", "c.organisation_id", "c.site_id"])
    .where("i.load_id", "=", loadId)
    .execute();
  for (const c of cycles) {
    const state = c.state as CycleState;
    const newer = await trx
      .selectFrom("cycles")
      .select("id")
      .where("set_id", "=", c.set_id)
      .where("id", "!=", c.id)
      .where("state", "not in", ["delivered", "cancelled"])
      .executeTakeFirst();
    // A delivered set already booked for its next trip keeps that cycle: it is on its way back.
    const canRecall = RECALLABLE.includes(state) && !(state === "delivered" && newer);
    await trx
      .insertInto("recall_items")
      .values({
        recall_id: recallId,
        cycle_id: c.id,
        set_id: c.set_id,
        organisation_id: c.organisation_id,
        site_id: c.site_id,
        state_at_recall: state,
        returned_at: canRecall ? null : iso,
      })
      .execute();
    if (canRecall) {
      await applyCycleEvent(trx, { cycleId: c.id, event: "recall", station: "quality", userId: user.id, at: now, loadId, details: { recall: number, reason } });
    }
  }
  const customers = [...new Set(cycles.map((c) => c.organisation_id))];
  for (const organisationId of customers) {
    const org = await trx.selectFrom("organisations").select(["name", "billing_email"]).where("id", "=", organisationId).executeTakeFirstOrThrow();
    const managers = await trx.selectFrom("users").select("email").where("organisation_id", "=", organisationId).where("role", "=", "clinic_manager").where("status", "=", "active").orderBy("email").execute();
    const to = managers.map((m) => m.email);
    if (to.length === 0 && org.billing_email) to.push(org.billing_email);
    if (to.length === 0) continue;
    const sets = await trx
      .selectFrom("recall_items as ri")
      .innerJoin("sets as s", "s.id", "ri.set_id")
      .innerJoin("set_types as st", "st.id", "s.set_type_id")
      .innerJoin("sites as si", "si.id", "ri.site_id")
      .select(["s.serial", "st.name as type_name", "si.name as site_name"])
      .where("ri.recall_id", "=", recallId)
      .where("ri.organisation_id", "=", organisationId)
      .orderBy("s.serial")
      .execute();
    const mail = recallMail({
      organisationName: org.name,
      recallNumber: number,
      loadNumber,
      reason,
      sets: sets.map((s) => ({ serial: s.serial, typeName: s.type_name, siteName: s.site_name })),
      link: `${serverEnv().APP_URL}/clinic/recalls/${recallId}`,
    });
    await enqueueMail(trx, { template: "recall", to: to.join(", "), organisationId, dedupeKey: `recall:${recallId}:org:${organisationId}`, ...mail }, now);
  }
  await recordAudit(trx, { actorUserId: user.id, action: "recall.raised", entity: "recall", entityId: recallId, details: { number, load: loadNumber, sets: cycles.length, customers: customers.length, reason } }, now);
  return recallId;
}

export interface RecallItemView {
  cycleId: number;
  setId: number;
  serial: string;
  setTypeName: string;
  organisationId: number;
  organisationName: string;
  siteName: string;
  stateAtRecall: string;
  state: CycleState;
  stateLabel: string;
  returnedAt: string | null;
  procedures: { theatre: string; caseReference: string; usedAt: string }[];
}

export interface RecallView {
  id: number;
  number: string;
  status: "open" | "closed";
  reason: string;
  createdAt: string;
  createdBy: string | null;
  load: { id: number; number: string; machineCode: string; endedAt: string | null; releasedAt: string | null };
  items: RecallItemView[];
  customers: { organisationId: number; name: string; sets: number; outstanding: number }[];
  mails: { to: string; status: string; sentAt: string | null }[];
}

/** A recall in the caller's scope (a clinic user sees only its own organisation's sets), or 404. */
export async function getRecall(db: Db, user: SessionUser, id: number): Promise<RecallView> {
  const row = await db
    .selectFrom("recalls as r")
    .innerJoin("steriliser_loads as l", "l.id", "r.load_id")
    .innerJoin("machines as m", "m.id", "l.machine_id")
    .leftJoin("users as u", "u.id", "r.created_by")
    .select(["r.id", "r.number", "r.status", "r.reason", "r.created_at", "u.name as created_by_name", "l.id as load_id", "l.number as load_number", "l.ended_at", "m.code as machine_code"])
    .where("r.id", "=", id)
    .where((eb) => eb.exists(eb.selectFrom("recall_items as ri").select("ri.id").whereRef("ri.recall_id", "=", "r.id").where(tenantScope(user, { organisation: "ri.organisation_id", site: "ri.site_id" }))))
    .executeTakeFirst();
  if (!row) throw notFound("That recall");
  const items = await db
    .selectFrom("recall_items as ri")
    .innerJoin("cycles as c", "c.id", "ri.cycle_id")
    .innerJoin("sets as s", "s.id", "ri.set_id")
    .innerJoin("set_types as st", "st.id", "s.set_type_id")
    .innerJoin("organisations as o", "o.id", "ri.organisation_id")
    .innerJoin("sites as si", "si.id", "ri.site_id")
    .select(["ri.cycle_id", "ri.set_id", "s.serial", "st.name as type_name", "ri.organisation_id", "o.name as org_name", "si.name as site_name", "ri.state_at_recall", "c.state", "ri.returned_at", "c.released_at"])
    .where("ri.recall_id", "=", id)
    .where(tenantScope(user, { organisation: "ri.organisation_id", site: "ri.site_id" }))
    .orderBy("o.name")
    .orderBy("s.serial")
    .execute();
  const cycleIds = items.map((i) => i.cycle_id);
  const uses = cycleIds.length
    ? await db.selectFrom("procedure_uses").select(["cycle_id", "theatre", "case_reference", "used_at"]).where("cycle_id", "in", cycleIds).orderBy("used_at").execute()
    : [];
  const views: RecallItemView[] = items.map((i) => ({
    cycleId: i.cycle_id,
    setId: i.set_id,
    serial: i.serial,
    setTypeName: i.type_name,
    organisationId: i.organisation_id,
    organisationName: i.org_name,
    siteName: i.site_name,
    stateAtRecall: i.state_at_recall,
    state: i.state as CycleState,
    stateLabel: CYCLE_STATE_LABELS[i.state as CycleState] ?? i.state,
    returnedAt: i.returned_at,
    procedures: uses.filter((u) => u.cycle_id === i.cycle_id).map((u) => ({ theatre: u.theatre, caseReference: u.case_reference, usedAt: u.used_at })),
  }));
  const customers = [...new Map(views.map((v) => [v.organisationId, v.organisationName])).entries()].map(([organisationId, name]) => ({
    organisationId,
    name,
    sets: views.filter((v) => v.organisationId === organisationId).length,
    outstanding: views.filter((v) => v.organisationId === organisationId && !v.returnedAt).length,
  }));
  const mails = await db
    .selectFrom("outbox")
    .select(["to_address", "status", "sent_at"])
    .where("dedupe_key", "like", `recall:${id}:org:%`)
    .where(tenantScope(user, { organisation: "outbox.organisation_id" }))
    .execute();
  return {
    id: row.id,
    number: row.number,
    status: row.status,
    reason: row.reason,
    createdAt: row.created_at,
    createdBy: row.created_by_name,
    load: { id: row.load_id, number: row.load_number, machineCode: row.machine_code, endedAt: row.ended_at, releasedAt: items[0]?.released_at ?? null },
    items: views,
    customers,
    mails: mails.map((m) => ({ to: m.to_address, status: m.status, sentAt: m.sent_at })),
  };
}

export interface RecallListRow {
  id: number;
  number: string;
  status: "open" | "closed";
  reason: string;
  createdAt: string;
  loadNumber: string;
  sets: number;
  outstanding: number;
}

/** Recalls in the caller's scope, newest first; counts only the caller's own sets. */
export async function listRecalls(db: Db, user: SessionUser, query: { openOnly?: boolean } = {}): Promise<RecallListRow[]> {
  let q = db
    .selectFrom("recalls as r")
    .innerJoin("steriliser_loads as l", "l.id", "r.load_id")
    .innerJoin("recall_items as ri", "ri.recall_id", "r.id")
    .select((eb) => [
      "r.id",
      "r.number",
      "r.status",
      "r.reason",
      "r.created_at",
      "l.number as load_number",
      eb.fn.countAll<number>().as("sets"),
      eb.fn.sum<number>(eb.case().when("ri.returned_at", "is", null).then(1).else(0).end()).as("outstanding"),
    ])
    .where(tenantScope(user, { organisation: "ri.organisation_id", site: "ri.site_id" }))
    .groupBy(["r.id", "r.number", "r.status", "r.reason", "r.created_at", "l.number"])
    .orderBy("r.created_at", "desc");
  if (query.openOnly) q = q.where("r.status", "=", "open");
  const rows = await q.execute();
  return rows.map((r) => ({ id: r.id, number: r.number, status: r.status, reason: r.reason, createdAt: r.created_at, loadNumber: r.load_number, sets: Number(r.sets), outstanding: Number(r.outstanding ?? 0) }));
}

/** Marks a recalled set as back at the unit ("return_recalled": back to washing); closes the recall when none is outstanding. */
export async function returnRecalledSet(db: Kysely<Database>, user: SessionUser, recallId: number, cycleId: number, now = new Date()): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const item = await trx.selectFrom("recall_items").selectAll().where("recall_id", "=", recallId).where("cycle_id", "=", cycleId).executeTakeFirst();
    if (!item) throw notFound("That set in this recall");
    if (item.returned_at) throw new AppError("conflict", "This set is already recorded as back at the unit.");
    const cycle = await trx.selectFrom("cycles").select("state").where("id", "=", cycleId).executeTakeFirstOrThrow();
    if (cycle.state === "recalled") {
      await applyCycleEvent(trx, { cycleId, event: "return_recalled", station: "receiving", userId: user.id, at: now, details: { recallId } });
    }
    await markReturned(trx, cycleId, user.id, now);
  });
}

/** Marks every open recall item of the cycle returned and closes recalls left with none outstanding (also called by receiving). */
export async function markReturned(trx: Db, cycleId: number, userId: number | null, now: Date): Promise<void> {
  const items = await trx.selectFrom("recall_items").select(["id", "recall_id"]).where("cycle_id", "=", cycleId).where("returned_at", "is", null).execute();
  for (const item of items) {
    await trx.updateTable("recall_items").set({ returned_at: now.toISOString(), returned_by: userId }).where("id", "=", item.id).execute();
    const left = await trx.selectFrom("recall_items").select("id").where("recall_id", "=", item.recall_id).where("returned_at", "is", null).executeTakeFirst();
    if (!left) await trx.updateTable("recalls").set({ status: "closed", closed_at: now.toISOString() }).where("id", "=", item.recall_id).execute();
  }
}

/** The recall report as CSV: one row per set (and per procedure that used it), spreadsheet-safe cells. */
export function recallCsv(recall: RecallView): string {
  const header = ["recall", "load", "customer", "site", "serial", "set_type", "state_at_recall", "state_now", "returned_at", "procedure_theatre", "procedure_case", "procedure_at"];
  const rows: (string | number | null)[][] = [];
  for (const i of recall.items) {
    const base = [recall.number, recall.load.number, i.organisationName, i.siteName, i.serial, i.setTypeName, i.stateAtRecall, i.stateLabel, i.returnedAt];
    if (i.procedures.length === 0) rows.push([...base, null, null, null]);
    for (const p of i.procedures) rows.push([...base, p.theatre, p.caseReference, p.usedAt]);
  }
  return toCsv(header, rows);
}
