import "server-only";
import type { Kysely, Transaction, Updateable } from "kysely";
import type { CycleRow, CyclesTable, Database, OrderStatus } from "@/db/schema";
import { AppError, notFound } from "@/lib/errors";
import { notifyOrder } from "@/lib/orders/notifications";
import { type CycleEvent, type CycleState, isOpenState, transition } from "./lifecycle";

// Cycles in the database: opening one when a set is booked, and moving it by an event. Every move
// writes one append-only scan event and keeps the cycle's current state and times for fast lists,
// and the order's status follows its cycles. Call these inside the caller's transaction.

type Executor = Kysely<Database> | Transaction<Database>;

/** Where an event was recorded. */
export type Station =
  | "clinic"
  | "van"
  | "receiving"
  | "washing"
  | "manual_washing"
  | "packing"
  | "sterilising"
  | "release"
  | "dispatch"
  | "quality";

const TIME_COLUMN: Partial<Record<CycleState, keyof CycleRow & `${string}_at`>> = {
  collected: "collected_at",
  received: "received_at",
  washed: "washed_at",
  packed: "packed_at",
  sterilised: "sterilised_at",
  released: "released_at",
  dispatched: "dispatched_at",
  delivered: "delivered_at",
  cancelled: "cancelled_at",
};

export interface OpenCycleInput {
  organisationId: number;
  siteId: number;
  setId: number;
  orderId: number | null;
  serviceLevel: "standard" | "express";
  heavySoil: boolean;
  outOfHours: boolean;
  loaner: boolean;
  keepInStore?: boolean;
  neededBackBy: string | null;
  promisedAt: string | null;
  userId: number | null;
  at: Date;
  /** Where the booking is recorded: "clinic" (an order), or "receiving" for a set that came without one. */
  station?: Station;
}

/** Opens a cycle in "booked" for a set that has none open; the unique index is the backstop. */
export async function openCycle(db: Executor, input: OpenCycleInput): Promise<number> {
  const open = await db
    .selectFrom("cycles")
    .select(["id", "state"])
    .where("set_id", "=", input.setId)
    .where("state", "not in", ["delivered", "cancelled"])
    .executeTakeFirst();
  if (open) throw new AppError("conflict", "This set is already on its way through the unit; it cannot be booked again until it is back.");
  const iso = input.at.toISOString();
  const { id } = await db
    .insertInto("cycles")
    .values({
      organisation_id: input.organisationId,
      site_id: input.siteId,
      set_id: input.setId,
      order_id: input.orderId,
      state: "booked",
      service_level: input.serviceLevel,
      heavy_soil: input.heavySoil ? 1 : 0,
      out_of_hours: input.outOfHours ? 1 : 0,
      loaner: input.loaner ? 1 : 0,
      keep_in_store: input.keepInStore ? 1 : 0,
      needed_back_by: input.neededBackBy,
      promised_at: input.promisedAt,
      booked_at: iso,
      created_at: iso,
      updated_at: iso,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  await db
    .insertInto("scan_events")
    .values({
      cycle_id: id,
      set_id: input.setId,
      organisation_id: input.organisationId,
      event: "book",
      from_state: null,
      to_state: "booked",
      station: input.station ?? "clinic",
      user_id: input.userId,
      at: iso,
    })
    .execute();
  return id;
}

export interface CycleEventInput {
  cycleId: number;
  event: CycleEvent;
  station: Station;
  userId: number | null;
  at: Date;
  /** A client-made id: the same id again returns the first result and records nothing. */
  clientEventId?: string;
  batchId?: number | null;
  loadId?: number | null;
  details?: Record<string, unknown>;
}

export interface CycleEventResult {
  cycleId: number;
  from: CycleState;
  to: CycleState;
  eventId: number;
  duplicate: boolean;
}

/** Moves a cycle by an event, or throws a 409 with the reason the move is not allowed. */
export async function applyCycleEvent(db: Executor, input: CycleEventInput): Promise<CycleEventResult> {
  if (input.clientEventId) {
    const earlier = await db
      .selectFrom("scan_events")
      .select(["id", "cycle_id", "from_state", "to_state"])
      .where("client_event_id", "=", input.clientEventId)
      .executeTakeFirst();
    if (earlier) {
      return {
        cycleId: earlier.cycle_id,
        from: earlier.from_state as CycleState,
        to: earlier.to_state as CycleState,
        eventId: earlier.id,
        duplicate: true,
      };
    }
  }
  const cycle = await db.selectFrom("cycles").selectAll().where("id", "=", input.cycleId).executeTakeFirst();
  if (!cycle) throw notFound("That cycle");
  const from = cycle.state as CycleState;
  const result = transition(from, input.event, cycle.held_from as CycleState | null);
  if (!result.ok) throw new AppError("conflict", result.reason);
  const iso = input.at.toISOString();

  const changes: Updateable<CyclesTable> = { state: result.to, updated_at: iso };
  const timeColumn = TIME_COLUMN[result.to];
  if (timeColumn) Object.assign(changes, { [timeColumn]: iso });
  if (result.to === "on_hold") {
    changes.held_from = from;
    changes.hold_reason = typeof input.details?.reason === "string" ? input.details.reason : null;
  }
  if (from === "on_hold") {
    changes.held_from = null;
    changes.hold_reason = null;
  }
  if (result.to === "reprocess") {
    // The cycle restarts from washing: what came after washing has to be done again.
    changes.washed_at = null;
    changes.packed_at = null;
    changes.sterilised_at = null;
  }
  await db.updateTable("cycles").set(changes).where("id", "=", cycle.id).execute();
  const { id: eventId } = await db
    .insertInto("scan_events")
    .values({
      cycle_id: cycle.id,
      set_id: cycle.set_id,
      organisation_id: cycle.organisation_id,
      event: input.event,
      from_state: from,
      to_state: result.to,
      station: input.station,
      batch_id: input.batchId ?? null,
      load_id: input.loadId ?? null,
      user_id: input.userId,
      at: iso,
      client_event_id: input.clientEventId ?? null,
      details: JSON.stringify(input.details ?? {}),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  if (cycle.order_id) await refreshOrderStatus(db, cycle.order_id, input.at);
  if (cycle.return_order_id) await refreshOrderStatus(db, cycle.return_order_id, input.at);
  return { cycleId: cycle.id, from, to: result.to, eventId, duplicate: false };
}

const PROCESSING: readonly CycleState[] = ["received", "washed", "packed", "sterilised", "on_hold", "reprocess", "recalled"];

/** An order's status from its cycles' states. */
export function orderStatusFrom(states: CycleState[], cancelled: boolean): OrderStatus {
  if (cancelled) return "cancelled";
  const live = states.filter((s) => s !== "cancelled");
  // An order with no live sets (only other items, or while being amended) is still booked until
  // the order itself is cancelled.
  if (live.length === 0) return "booked";
  if (live.every((s) => s === "delivered")) return "delivered";
  if (live.some((s) => PROCESSING.includes(s))) return "in_process";
  const afterRelease = live.every((s) => s === "released" || s === "dispatched" || s === "delivered");
  if (afterRelease) return live.some((s) => s === "dispatched") ? "out_for_delivery" : "ready";
  if (live.some((s) => s === "collected")) return "collected";
  return "booked";
}

/** The order statuses the clinic is told about by e-mail when the order reaches them. */
const NOTIFIED = ["collected", "ready", "out_for_delivery", "delivered"] as const satisfies readonly OrderStatus[];

/** Recomputes and stores an order's status from its cycles, and tells the clinic of a change. */
export async function refreshOrderStatus(db: Executor, orderId: number, at: Date): Promise<OrderStatus> {
  const order = await db.selectFrom("orders").select(["id", "kind", "status", "cancelled_at", "collected_at"]).where("id", "=", orderId).executeTakeFirstOrThrow();
  const column = order.kind === "pickup" ? "order_id" : "return_order_id";
  const rows = await db.selectFrom("cycles").select("state").where(column, "=", orderId).execute();
  const states = rows.map((r) => r.state as CycleState);
  const status = orderStatusFrom(states, !!order.cancelled_at);
  const collected =
    order.collected_at ?? (order.kind === "pickup" && status !== "booked" && status !== "cancelled" ? at.toISOString() : null);
  if (status !== order.status || collected !== order.collected_at) {
    await db.updateTable("orders").set({ status, collected_at: collected, updated_at: at.toISOString() }).where("id", "=", orderId).execute();
  }
  const notified = NOTIFIED.find((s) => s === status);
  if (status !== order.status && notified) await notifyOrder(db, orderId, notified, at);
  return status;
}

export { isOpenState };
