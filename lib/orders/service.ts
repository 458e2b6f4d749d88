import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database, OrderKind, OrderStatus } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { type CycleState, CYCLE_STATE_LABELS } from "@/lib/cycles/lifecycle";
import { applyCycleEvent, openCycle, refreshOrderStatus } from "@/lib/cycles/store";
import { AppError, type FieldErrors, notFound } from "@/lib/errors";
import { serverEnv } from "@/lib/env";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import { parseLocalDateTime } from "@/lib/local-time";
import { type BookingAssessment, assessBooking } from "./assess";
import { notifyOrder } from "./notifications";
import type { BookingFields, ListOrdersQuery } from "./schemas";

// Pickup orders: booking, amending and cancelling until collection, the clinic's list and the
// page of one order with every set's cycle.

function problemsToError(assessment: BookingAssessment): AppError {
  const fields: FieldErrors = {};
  for (const p of assessment.problems) (fields[p.field] ??= []).push(p.message);
  const first = assessment.problems[0]!.message;
  return new AppError("validation", assessment.problems.length === 1 ? first : `${first} (and ${assessment.problems.length - 1} more)`, fields);
}

async function nextReference(trx: Transaction<Database>, organisationId: number): Promise<string> {
  const org = await trx.selectFrom("organisations").select("short_code").where("id", "=", organisationId).executeTakeFirstOrThrow();
  const prefix = `${org.short_code}-P`;
  const last = await trx
    .selectFrom("orders")
    .select("reference")
    .where("organisation_id", "=", organisationId)
    .where("reference", "like", `${prefix}%`)
    .orderBy("reference", "desc")
    .limit(1)
    .executeTakeFirst();
  const n = last ? Number(last.reference.slice(prefix.length)) + 1 : 1;
  return `${prefix}${String(n).padStart(6, "0")}`;
}

/** Books a pickup: the order, one cycle per set, the other items, the confirmation e-mail. */
export async function bookPickup(
  db: Kysely<Database>,
  user: SessionUser,
  input: BookingFields,
  now = new Date(),
): Promise<{ orderId: number; reference: string }> {
  return db.transaction().execute(async (trx) => {
    const assessment = await assessBooking(trx, user, input, now);
    if (assessment.problems.length) throw problemsToError(assessment);
    const { site, window, plan, neededBackBy } = assessment;
    const iso = now.toISOString();
    const reference = await nextReference(trx, site!.organisationId);
    const { id: orderId } = await trx
      .insertInto("orders")
      .values({
        organisation_id: site!.organisationId,
        site_id: site!.id,
        reference,
        kind: "pickup",
        status: "booked",
        service_level: input.serviceLevel,
        collection_from: window!.from.toISOString(),
        collection_until: window!.until.toISOString(),
        needed_back_by: neededBackBy!.toISOString(),
        promised_return_at: plan!.promisedAt.toISOString(),
        heavy_soil: input.heavySoil ? 1 : 0,
        out_of_hours: assessment.outOfHours ? 1 : 0,
        notes: input.notes,
        created_by: user.id,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    for (const set of assessment.sets) {
      await openCycle(trx, {
        organisationId: site!.organisationId,
        siteId: site!.id,
        setId: set.id,
        orderId,
        serviceLevel: input.serviceLevel,
        heavySoil: input.heavySoil,
        outOfHours: assessment.outOfHours,
        loaner: set.loaner,
        keepInStore: input.keepInStore,
        neededBackBy: neededBackBy!.toISOString(),
        promisedAt: plan!.promisedAt.toISOString(),
        userId: user.id,
        at: now,
      });
    }
    if (input.extras.length) {
      await trx.insertInto("order_extras").values(input.extras.map((e) => ({ order_id: orderId, ...e }))).execute();
    }
    await notifyOrder(trx, orderId, "booking_confirmed", now);
    await recordAudit(trx, { actorUserId: user.id, organisationId: site!.organisationId, action: "order.booked", entity: "order", entityId: orderId, details: { reference, sets: assessment.sets.length, extras: input.extras.length } }, now);
    return { orderId, reference };
  });
}

async function bookedOrderFor(trx: Kysely<Database>, user: SessionUser, orderId: number) {
  const order = await trx
    .selectFrom("orders")
    .selectAll()
    .where("id", "=", orderId)
    .where(tenantScope(user, { organisation: "orders.organisation_id", site: "orders.site_id" }))
    .executeTakeFirst();
  if (!order) throw notFound("That order");
  if (order.status !== "booked") {
    throw new AppError("conflict", `This order can no longer be changed: it is ${order.status === "cancelled" ? "cancelled" : "already collected"}.`);
  }
  return order;
}

/** Changes a booking before collection: its window, sets, items, level, flags and notes. */
export async function amendPickup(
  db: Kysely<Database>,
  user: SessionUser,
  orderId: number,
  input: BookingFields,
  now = new Date(),
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const order = await bookedOrderFor(trx, user, orderId);
    if (input.siteId !== order.site_id) {
      throw new AppError("validation", "A booking cannot move to another site; cancel it and book from that site.", { siteId: ["Keep the order's site."] });
    }
    const assessment = await assessBooking(trx, user, input, now, { ignoreOrderId: orderId });
    if (assessment.problems.length) throw problemsToError(assessment);
    const iso = now.toISOString();
    const current = await trx.selectFrom("cycles").select(["id", "set_id"]).where("order_id", "=", orderId).where("state", "=", "booked").execute();
    const wanted = new Set(assessment.sets.map((s) => s.id));
    for (const cycle of current.filter((c) => !wanted.has(c.set_id))) {
      await applyCycleEvent(trx, { cycleId: cycle.id, event: "cancel", station: "clinic", userId: user.id, at: now, details: { reason: "removed from the booking" } });
    }
    const kept = new Set(current.map((c) => c.set_id));
    for (const set of assessment.sets.filter((s) => !kept.has(s.id))) {
      await openCycle(trx, {
        organisationId: order.organisation_id,
        siteId: order.site_id,
        setId: set.id,
        orderId,
        serviceLevel: input.serviceLevel,
        heavySoil: input.heavySoil,
        outOfHours: assessment.outOfHours,
        loaner: set.loaner,
        keepInStore: input.keepInStore,
        neededBackBy: assessment.neededBackBy!.toISOString(),
        promisedAt: assessment.plan!.promisedAt.toISOString(),
        userId: user.id,
        at: now,
      });
    }
    await trx
      .updateTable("cycles")
      .set({
        service_level: input.serviceLevel,
        heavy_soil: input.heavySoil ? 1 : 0,
        out_of_hours: assessment.outOfHours ? 1 : 0,
        keep_in_store: input.keepInStore ? 1 : 0,
        needed_back_by: assessment.neededBackBy!.toISOString(),
        promised_at: assessment.plan!.promisedAt.toISOString(),
        updated_at: iso,
      })
      .where("order_id", "=", orderId)
      .where("state", "=", "booked")
      .execute();
    await trx.deleteFrom("order_extras").where("order_id", "=", orderId).execute();
    if (input.extras.length) await trx.insertInto("order_extras").values(input.extras.map((e) => ({ order_id: orderId, ...e }))).execute();
    await trx
      .updateTable("orders")
      .set({
        service_level: input.serviceLevel,
        collection_from: assessment.window!.from.toISOString(),
        collection_until: assessment.window!.until.toISOString(),
        needed_back_by: assessment.neededBackBy!.toISOString(),
        promised_return_at: assessment.plan!.promisedAt.toISOString(),
        heavy_soil: input.heavySoil ? 1 : 0,
        out_of_hours: assessment.outOfHours ? 1 : 0,
        notes: input.notes,
        updated_at: iso,
      })
      .where("id", "=", orderId)
      .execute();
    await refreshOrderStatus(trx, orderId, now);
    await recordAudit(trx, { actorUserId: user.id, organisationId: order.organisation_id, action: "order.amended", entity: "order", entityId: orderId, details: { sets: assessment.sets.length } }, now);
  });
}

/** Cancels a booking before collection; its sets can be booked again at once. */
export async function cancelPickup(
  db: Kysely<Database>,
  user: SessionUser,
  input: { orderId: number; reason?: string },
  now = new Date(),
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const order = await bookedOrderFor(trx, user, input.orderId);
    const cycles = await trx.selectFrom("cycles").select("id").where("order_id", "=", order.id).where("state", "=", "booked").execute();
    for (const c of cycles) {
      await applyCycleEvent(trx, { cycleId: c.id, event: "cancel", station: "clinic", userId: user.id, at: now, details: { reason: input.reason ?? null } });
    }
    await trx.updateTable("orders").set({ status: "cancelled", cancelled_at: now.toISOString(), updated_at: now.toISOString() }).where("id", "=", order.id).execute();
    await refreshOrderStatus(trx, order.id, now);
    await recordAudit(trx, { actorUserId: user.id, organisationId: order.organisation_id, action: "order.cancelled", entity: "order", entityId: order.id, details: { reason: input.reason ?? null } }, now);
  });
}

export interface OrderListRow {
  id: number;
  reference: string;
  kind: OrderKind;
  status: OrderStatus;
  serviceLevel: "standard" | "express";
  siteId: number;
  siteName: string;
  organisationId: number;
  organisationName: string;
  collectionFrom: string | null;
  collectionUntil: string | null;
  neededBackBy: string | null;
  promisedReturnAt: string | null;
  createdAt: string;
  sets: number;
  /** Sets on hold, back to washing or recalled: something the clinic should know about. */
  exceptions: number;
}

const ORDER_SORTS = {
  created_at: "orders.created_at",
  reference: "orders.reference",
  status: "orders.status",
  site: "sites.name",
  collection_from: "orders.collection_from",
  promised_return_at: "orders.promised_return_at",
} as const;

/** The caller's orders, paged and filtered on the server (status, site, creation dates, search). */
export async function listOrders(db: Kysely<Database>, user: SessionUser, query: ListOrdersQuery): Promise<Page<OrderListRow>> {
  let base = db
    .selectFrom("orders")
    .innerJoin("sites", "sites.id", "orders.site_id")
    .innerJoin("organisations", "organisations.id", "orders.organisation_id")
    .where(tenantScope(user, { organisation: "orders.organisation_id", site: "orders.site_id" }));
  if (query.status) base = base.where("orders.status", "=", query.status);
  if (query.siteId) base = base.where("orders.site_id", "=", query.siteId);
  if (query.organisationId) base = base.where("orders.organisation_id", "=", query.organisationId);
  // Dates are the unit's local calendar days, both inclusive.
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  if (query.from) base = base.where("orders.created_at", ">=", parseLocalDateTime(`${query.from}T00:00`, timeZone)!.toISOString());
  if (query.to) {
    const next = new Date(`${query.to}T00:00:00Z`);
    next.setUTCDate(next.getUTCDate() + 1);
    base = base.where("orders.created_at", "<", parseLocalDateTime(`${next.toISOString().slice(0, 10)}T00:00`, timeZone)!.toISOString());
  }
  if (query.q) base = base.where(searchTerm(["orders.reference", "sites.name", "orders.notes"], query.q));
  const page = await fetchPage(
    base,
    (qb) =>
      qb.select((eb) => [
        "orders.id",
        "orders.reference",
        "orders.kind",
        "orders.status",
        "orders.service_level",
        "orders.site_id",
        "sites.name as site_name",
        "orders.organisation_id",
        "organisations.name as organisation_name",
        "orders.collection_from",
        "orders.collection_until",
        "orders.needed_back_by",
        "orders.promised_return_at",
        "orders.created_at",
        eb
          .selectFrom("cycles")
          .select(eb.fn.countAll<number>().as("n"))
          .whereRef("cycles.order_id", "=", "orders.id")
          .where("cycles.state", "!=", "cancelled")
          .as("sets"),
        eb
          .selectFrom("cycles")
          .select(eb.fn.countAll<number>().as("n"))
          .whereRef("cycles.order_id", "=", "orders.id")
          .where("cycles.state", "in", ["on_hold", "reprocess", "recalled"])
          .as("exceptions"),
      ]),
    query,
    ORDER_SORTS[query.sort],
    "orders.id",
  );
  return {
    total: page.total,
    rows: page.rows.map((r) => ({
      id: r.id,
      reference: r.reference,
      kind: r.kind,
      status: r.status,
      serviceLevel: r.service_level,
      siteId: r.site_id,
      siteName: r.site_name,
      organisationId: r.organisation_id,
      organisationName: r.organisation_name,
      collectionFrom: r.collection_from,
      collectionUntil: r.collection_until,
      neededBackBy: r.needed_back_by,
      promisedReturnAt: r.promised_return_at,
      createdAt: r.created_at,
      sets: Number(r.sets),
      exceptions: Number(r.exceptions),
    })),
  };
}

export interface OrderCycleView {
  cycleId: number;
  setId: number;
  serial: string;
  setName: string;
  state: CycleState;
  stateLabel: string;
  holdReason: string | null;
  times: { state: CycleState; at: string }[];
  expiresOn: string | null;
}

export interface OrderDetail extends OrderListRow {
  heavySoil: boolean;
  keepInStore: boolean;
  outOfHours: boolean;
  notes: string | null;
  collectedAt: string | null;
  cancelledAt: string | null;
  extras: { description: string; quantity: number }[];
  cycles: OrderCycleView[];
}

const TIME_STATES: { state: CycleState; column: "booked_at" | "collected_at" | "received_at" | "washed_at" | "packed_at" | "sterilised_at" | "released_at" | "dispatched_at" | "delivered_at" | "cancelled_at" }[] = [
  { state: "booked", column: "booked_at" },
  { state: "collected", column: "collected_at" },
  { state: "received", column: "received_at" },
  { state: "washed", column: "washed_at" },
  { state: "packed", column: "packed_at" },
  { state: "sterilised", column: "sterilised_at" },
  { state: "released", column: "released_at" },
  { state: "dispatched", column: "dispatched_at" },
  { state: "delivered", column: "delivered_at" },
  { state: "cancelled", column: "cancelled_at" },
];

/** One order with each set's cycle states and times; 404 for anyone else's. */
export async function getOrderDetail(db: Kysely<Database>, user: SessionUser, orderId: number): Promise<OrderDetail> {
  const order = await db
    .selectFrom("orders")
    .innerJoin("sites", "sites.id", "orders.site_id")
    .innerJoin("organisations", "organisations.id", "orders.organisation_id")
    .selectAll("orders")
    .select(["sites.name as site_name", "organisations.name as organisation_name"])
    .where("orders.id", "=", orderId)
    .where(tenantScope(user, { organisation: "orders.organisation_id", site: "orders.site_id" }))
    .executeTakeFirst();
  if (!order) throw notFound("That order");
  const column = order.kind === "pickup" ? "cycles.order_id" : "cycles.return_order_id";
  const cycles = await db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .selectAll("cycles")
    .select(["sets.serial", "set_types.name as set_name"])
    .where(column, "=", orderId)
    .orderBy("sets.serial")
    .execute();
  const extras = await db.selectFrom("order_extras").select(["description", "quantity"]).where("order_id", "=", orderId).execute();
  const live = cycles.filter((c) => c.state !== "cancelled");
  return {
    id: order.id,
    reference: order.reference,
    kind: order.kind,
    status: order.status,
    serviceLevel: order.service_level,
    siteId: order.site_id,
    siteName: order.site_name,
    organisationId: order.organisation_id,
    organisationName: order.organisation_name,
    collectionFrom: order.collection_from,
    collectionUntil: order.collection_until,
    neededBackBy: order.needed_back_by,
    promisedReturnAt: order.promised_return_at,
    createdAt: order.created_at,
    sets: live.length,
    exceptions: live.filter((c) => ["on_hold", "reprocess", "recalled"].includes(c.state)).length,
    heavySoil: order.heavy_soil === 1,
    keepInStore: live.length > 0 && live.every((c) => c.keep_in_store === 1),
    outOfHours: order.out_of_hours === 1,
    notes: order.notes,
    collectedAt: order.collected_at,
    cancelledAt: order.cancelled_at,
    extras,
    cycles: cycles.map((c) => ({
      cycleId: c.id,
      setId: c.set_id,
      serial: c.serial,
      setName: c.set_name,
      state: c.state as CycleState,
      stateLabel: CYCLE_STATE_LABELS[c.state as CycleState] ?? c.state,
      holdReason: c.hold_reason,
      times: TIME_STATES.filter((t) => c[t.column]).map((t) => ({ state: t.state, at: c[t.column]! })),
      expiresOn: c.expires_on,
    })),
  };
}
