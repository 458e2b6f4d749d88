import "server-only";
import { format } from "date-fns";
import { tz } from "@date-fns/tz";
import type { Kysely, Transaction } from "kysely";
import type { Database, OrderNoticeKind } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { getSetType } from "@/lib/catalogue/set-types";
import { contractTermsFor } from "@/lib/contracts/service";
import { CYCLE_STATE_LABELS, type CycleState, transition } from "@/lib/cycles/lifecycle";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { enqueueMail } from "@/lib/mail/outbox";
import { missingSetMail, type ReceivingNoticeMailContext, unexpectedSetMail } from "@/lib/mail/receiving-templates";
import { recipientsFor } from "@/lib/orders/notifications";
import { getSet, type SetView } from "@/lib/sets/service";
import { markReturned } from "@/lib/sterilising/recalls";
import { promisedReturn } from "@/lib/turnaround";
import { identifyAtStation, type OpenCycleView, type SetAtStation } from "./identify";
import {
  type FinishReceivingInput,
  type FinishReceivingResult,
  type HeavySoilInput,
  type HeavySoilResult,
  type ReceivingAnswer,
  type ReceivingOrder,
  type ReceivingOutcome,
  type ReceivingScanInput,
  routeAfterReceiving,
} from "./receiving-shared";

// The receiving station: a scan receives a booked or collected set (or takes back a recalled
// one), opens and receives a cycle for a set that came without a booking and tells the clinic,
// and says where the set goes next. Finishing an order reports its sets that did not come.
// Every change runs in one transaction, with the scan's client-made id so a retry records nothing.

type Trx = Transaction<Database>;

/** Runs `fn` in the caller's transaction when there is one (the demo seed), else in a new one. */
function atomically<T>(db: Kysely<Database>, fn: (trx: Trx) => Promise<T>): Promise<T> {
  return db.isTransaction ? fn(db as Trx) : db.transaction().execute(fn);
}

const NOT_YET_RECEIVED: readonly CycleState[] = ["booked", "collected"];

/** "09:12" for a time today in the unit's zone, "30 Nov 2026, 16:40" for any other day. */
function shortTime(iso: string, now: Date, timeZone: string): string {
  const at = new Date(iso);
  const day = (d: Date) => format(d, "yyyy-MM-dd", { in: tz(timeZone) });
  return day(at) === day(now) ? format(at, "HH:mm", { in: tz(timeZone) }) : formatDateTime(at, timeZone);
}

/** Receives the set a scan names; see the module comment for what each case does. */
export async function receiveScan(db: Kysely<Database>, user: SessionUser, input: ReceivingScanInput, now = new Date()): Promise<ReceivingAnswer> {
  return atomically(db, async (trx) => {
    const earlier = await trx
      .selectFrom("scan_events")
      .select(["cycle_id", "event", "station", "details"])
      .where("client_event_id", "=", input.clientEventId)
      .executeTakeFirst();
    if (earlier) {
      if (earlier.station !== "receiving" || !["receive", "return_recalled"].includes(earlier.event)) {
        throw new AppError("conflict", "That scan id was already used for another step. Scan the set again.");
      }
      const unexpected = parseDetails(earlier.details).unexpected === true;
      return answerFor(trx, user, earlier.cycle_id, earlier.event === "return_recalled" ? "returned" : unexpected ? "unexpected" : "received", {
        duplicate: true,
        now,
      });
    }

    const found = await identifyAtStation(trx, user, input.code);
    const { set, type, cycle } = found;
    if (set.status === "retired") {
      throw new AppError(
        "conflict",
        `${set.serial} (${set.setTypeName}) is retired and should not be in use. Put it aside and tell the quality lead; nothing was recorded.`,
      );
    }
    if (!cycle) return receiveUnexpected(trx, user, found, input, now);

    const warnings: string[] = [];
    if (NOT_YET_RECEIVED.includes(cycle.state)) {
      await applyCycleEvent(trx, {
        cycleId: cycle.id,
        event: "receive",
        station: "receiving",
        userId: user.id,
        at: now,
        clientEventId: input.clientEventId,
      });
      const reported = await trx
        .selectFrom("order_notices")
        .select("created_at")
        .where("cycle_id", "=", cycle.id)
        .where("kind", "=", "missing_set")
        .executeTakeFirst();
      if (reported) {
        warnings.push(
          `This set was reported missing to the clinic on ${formatDateTime(reported.created_at, serverEnv().UNIT_TIME_ZONE)}; it has now arrived and is processed as normal.`,
        );
      }
      return answerFor(trx, user, cycle.id, "received", { duplicate: false, now, warnings, known: found });
    }
    if (cycle.state === "recalled") {
      const recalls = await trx
        .selectFrom("recall_items")
        .innerJoin("recalls", "recalls.id", "recall_items.recall_id")
        .select("recalls.number")
        .where("recall_items.cycle_id", "=", cycle.id)
        .where("recall_items.returned_at", "is", null)
        .orderBy("recalls.number")
        .execute();
      await applyCycleEvent(trx, {
        cycleId: cycle.id,
        event: "return_recalled",
        station: "receiving",
        userId: user.id,
        at: now,
        clientEventId: input.clientEventId,
      });
      // The recall's list of sets still out counts this one as back (and closes when none is left).
      await markReturned(trx, cycle.id, user.id, now);
      const warnings = recalls.map((r) => `Recall ${r.number}: this set is now recorded as back at the unit. Wash it again before it is packed.`);
      return answerFor(trx, user, cycle.id, "returned", { duplicate: false, now, warnings, known: found });
    }
    throw await alreadyReceived(trx, set, type.name, cycle, now);
  });
}

/** The refusal for a set that is already past receiving: when and by whom it was received, and why not again. */
async function alreadyReceived(trx: Trx, set: SetView, typeName: string, cycle: OpenCycleView, now: Date): Promise<AppError> {
  const receipt = await receiptOf(trx, cycle.id);
  const refused = transition(cycle.state, "receive");
  const reason = refused.ok ? "" : ` ${refused.reason}`;
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const what = `${set.serial} (${typeName})`;
  const said = receipt
    ? `${what} was already received at ${shortTime(receipt.at, now, timeZone)} by ${receipt.name ?? "an unknown user"}.`
    : `${what} is already past receiving: ${cycle.stateLabel.toLowerCase()}.`;
  return new AppError("conflict", `${said}${reason}`);
}

/** A set with no open cycle: open one at standard turnaround from now, receive it, tell the clinic. */
async function receiveUnexpected(trx: Trx, user: SessionUser, found: SetAtStation, input: ReceivingScanInput, now: Date): Promise<ReceivingAnswer> {
  const { set } = found;
  const env = serverEnv();
  const timeZone = env.UNIT_TIME_ZONE;
  const warnings: string[] = [];
  const contract = await contractTermsFor(trx, set.organisationId, now, timeZone);
  const promisedAt = contract
    ? promisedReturn({ calendar: contract.serviceCalendar, receivedAt: now, turnaroundHours: contract.turnaroundHours.standard })
    : null;
  if (!contract) {
    warnings.push(`${set.organisationName} has no contract in force today, so no return time could be promised. Tell the dispatcher.`);
  }

  // The order being received at the station, when the set is from that order's site: the van
  // brought it with that pickup.
  let order: { id: number; reference: string } | null = null;
  if (input.orderId) {
    const row = await trx
      .selectFrom("orders")
      .innerJoin("sites", "sites.id", "orders.site_id")
      .select(["orders.id", "orders.reference", "orders.organisation_id", "orders.site_id", "orders.kind", "orders.status", "sites.name as site_name"])
      .where("orders.id", "=", input.orderId)
      .where(tenantScope(user, { organisation: "orders.organisation_id", site: "orders.site_id" }))
      .executeTakeFirst();
    if (row && row.kind === "pickup" && row.status !== "cancelled" && row.organisation_id === set.organisationId && row.site_id === set.homeSiteId) {
      order = { id: row.id, reference: row.reference };
    } else if (row) {
      warnings.push(`It is not one of ${row.site_name}'s sets, so it is reported to ${set.homeSiteName} on its own, not with ${row.reference}.`);
    }
  }

  const cycleId = await openCycle(trx, {
    organisationId: set.organisationId,
    siteId: set.homeSiteId,
    setId: set.id,
    orderId: null,
    serviceLevel: "standard",
    heavySoil: false,
    outOfHours: false,
    loaner: set.setClass === "loaner_set",
    neededBackBy: null,
    promisedAt: promisedAt?.toISOString() ?? null,
    userId: user.id,
    at: now,
    station: "receiving",
  });
  await applyCycleEvent(trx, {
    cycleId,
    event: "receive",
    station: "receiving",
    userId: user.id,
    at: now,
    clientEventId: input.clientEventId,
    details: { unexpected: true, withOrderId: order?.id ?? null },
  });

  const at = formatDateTime(now, timeZone);
  const promised = promisedAt ? formatDateTime(promisedAt, timeZone) : null;
  const message =
    `${set.serial} (${set.setTypeName}) arrived at the unit on ${at} without a booking${order ? `, with pickup ${order.reference}` : ""}. ` +
    (promised ? `It is processed at standard turnaround and due back by ${promised}.` : "It is processed at standard turnaround.");
  const noticeId = await insertNotice(trx, {
    orderId: order?.id ?? null,
    organisationId: set.organisationId,
    siteId: set.homeSiteId,
    setId: set.id,
    cycleId,
    kind: "unexpected_set",
    message,
    userId: user.id,
    now,
  });
  if (noticeId) {
    await mailNotice(trx, noticeId, "unexpected_set", now, (ctx) => unexpectedSetMail(ctx, promised), {
      organisationId: set.organisationId,
      siteId: set.homeSiteId,
      siteName: set.homeSiteName,
      order,
      setId: set.id,
      serial: set.serial,
      setName: set.setTypeName,
    });
  }
  return answerFor(trx, user, cycleId, "unexpected", { duplicate: false, now, warnings, known: found });
}

async function insertNotice(
  trx: Trx,
  n: {
    orderId: number | null;
    organisationId: number;
    siteId: number;
    setId: number;
    cycleId: number;
    kind: OrderNoticeKind;
    message: string;
    userId: number;
    now: Date;
  },
): Promise<number | null> {
  const row = await trx
    .insertInto("order_notices")
    .values({
      order_id: n.orderId,
      organisation_id: n.organisationId,
      site_id: n.siteId,
      set_id: n.setId,
      cycle_id: n.cycleId,
      kind: n.kind,
      message: n.message,
      created_at: n.now.toISOString(),
      created_by: n.userId,
    })
    .onConflict((oc) => oc.columns(["cycle_id", "kind"]).doNothing())
    .returning("id")
    .executeTakeFirst();
  return row?.id ?? null;
}

/**
 * Queues one notice's e-mail to the users of its site who want to hear when their sets are
 * collected (the nearest existing choice), once per notice and person.
 */
async function mailNotice(
  trx: Trx,
  noticeId: number,
  kind: OrderNoticeKind,
  now: Date,
  render: (ctx: ReceivingNoticeMailContext) => ReturnType<typeof unexpectedSetMail>,
  about: {
    organisationId: number;
    siteId: number;
    siteName: string;
    order: { id: number; reference: string } | null;
    setId: number;
    serial: string;
    setName: string;
  },
): Promise<number> {
  const env = serverEnv();
  const recipients = await recipientsFor(trx, { organisation_id: about.organisationId, site_id: about.siteId }, "collected");
  for (const r of recipients) {
    const mail = render({
      recipientName: r.name,
      siteName: about.siteName,
      orderReference: about.order?.reference ?? null,
      serial: about.serial,
      setName: about.setName,
      at: formatDateTime(now, env.UNIT_TIME_ZONE),
      link: about.order ? `${env.APP_URL}/clinic/orders/${about.order.id}` : `${env.APP_URL}/clinic/sets/${about.setId}`,
      linkLabel: about.order ? "See the order" : "See the set",
    });
    await enqueueMail(
      trx,
      { template: `receiving.${kind}`, to: r.email, organisationId: about.organisationId, dedupeKey: `order_notice:${noticeId}:${r.id}`, ...mail },
      now,
    );
  }
  return recipients.length;
}

/** The last receipt of a cycle: when and by whom. */
async function receiptOf(trx: Kysely<Database>, cycleId: number): Promise<{ at: string; name: string | null } | null> {
  const row = await trx
    .selectFrom("scan_events")
    .leftJoin("users", "users.id", "scan_events.user_id")
    .select(["scan_events.at", "users.name"])
    .where("scan_events.cycle_id", "=", cycleId)
    .where("scan_events.event", "=", "receive")
    .orderBy("scan_events.id", "desc")
    .limit(1)
    .executeTakeFirst();
  return row ? { at: row.at, name: row.name } : null;
}

function parseDetails(text: string): Record<string, unknown> {
  try {
    const value: unknown = JSON.parse(text);
    return value && typeof value === "object" && !Array.isArray(value) ? (value as Record<string, unknown>) : {};
  } catch {
    return {};
  }
}

const HEADLINES: Record<ReceivingOutcome, string> = {
  received: "Received",
  unexpected: "Received without a booking",
  returned: "Recalled set back at the unit",
};

/** Everything the station shows about a cycle it has just received. */
async function answerFor(
  trx: Kysely<Database>,
  user: SessionUser,
  cycleId: number,
  outcome: ReceivingOutcome,
  options: { duplicate: boolean; now: Date; warnings?: string[]; known?: Pick<SetAtStation, "set" | "type"> },
): Promise<ReceivingAnswer> {
  const cycle = await trx
    .selectFrom("cycles")
    .selectAll()
    .where("id", "=", cycleId)
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .executeTakeFirst();
  if (!cycle) throw notFound("That set's cycle");
  // The set and its type as the scan identified them, or read again for a replayed scan.
  const set = options.known?.set ?? (await getSet(trx, user, cycle.set_id));
  const type = options.known?.type ?? (await getSetType(trx, user, set.setTypeId));
  const receipt = await receiptOf(trx, cycle.id);
  const notices = await trx
    .selectFrom("order_notices")
    .select(["id", "kind", "message", "created_at", "order_id"])
    .where("cycle_id", "=", cycle.id)
    .orderBy("id")
    .execute();
  const orderId = cycle.order_id ?? notices.find((n) => n.kind === "unexpected_set")?.order_id ?? null;
  const state = cycle.state as CycleState;
  return {
    outcome,
    duplicate: options.duplicate,
    headline: HEADLINES[outcome],
    set: {
      id: set.id,
      serial: set.serial,
      humanReadable: set.humanReadable,
      typeCode: set.setTypeCode,
      typeName: set.setTypeName,
      setClassLabel: set.setClassLabel,
      customerName: set.organisationName,
      homeSiteName: set.homeSiteName,
      instruments: set.contentsInstruments,
    },
    processing: { flags: type.flags, notes: type.processingNotes, ifuFileId: type.ifu?.id ?? null },
    cycle: {
      id: cycle.id,
      state,
      stateLabel: CYCLE_STATE_LABELS[state] ?? cycle.state,
      serviceLevel: cycle.service_level,
      heavySoil: cycle.heavy_soil === 1,
      loaner: cycle.loaner === 1,
      promisedAt: cycle.promised_at,
      receivedAt: cycle.received_at,
      receivedBy: receipt?.name ?? null,
    },
    route: routeAfterReceiving(type.flags),
    order: orderId ? await receivingOrder(trx, orderId) : null,
    notices: notices.map((n) => ({ id: n.id, kind: n.kind, message: n.message, createdAt: n.created_at })),
    warnings: options.warnings ?? [],
  };
}

/** An order as the receiving station follows it: its booked sets ticked off as they arrive. */
async function receivingOrder(trx: Kysely<Database>, orderId: number): Promise<ReceivingOrder> {
  const order = await trx
    .selectFrom("orders")
    .innerJoin("sites", "sites.id", "orders.site_id")
    .innerJoin("organisations", "organisations.id", "orders.organisation_id")
    .select([
      "orders.id",
      "orders.reference",
      "orders.kind",
      "orders.service_level",
      "orders.promised_return_at",
      "orders.needed_back_by",
      "sites.name as site_name",
      "organisations.name as organisation_name",
    ])
    .where("orders.id", "=", orderId)
    .executeTakeFirstOrThrow();
  const notices = await trx.selectFrom("order_notices").select(["cycle_id", "kind"]).where("order_id", "=", orderId).execute();
  const unexpectedIds = notices.filter((n) => n.kind === "unexpected_set").map((n) => n.cycle_id);
  const missingIds = new Set(notices.filter((n) => n.kind === "missing_set").map((n) => n.cycle_id));
  const column = order.kind === "pickup" ? "cycles.order_id" : "cycles.return_order_id";
  const rows = await trx
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["cycles.id", "cycles.set_id", "cycles.state", "cycles.received_at", "cycles.order_id", "sets.serial", "set_types.name as set_name"])
    .where((eb) => eb.or([eb(column, "=", orderId), ...(unexpectedIds.length ? [eb("cycles.id", "in", unexpectedIds)] : [])]))
    .where("cycles.state", "!=", "cancelled")
    .orderBy("sets.serial")
    .execute();
  const sets = rows.map((r) => {
    const state = r.state as CycleState;
    const received = r.received_at !== null;
    return {
      cycleId: r.id,
      setId: r.set_id,
      serial: r.serial,
      setName: r.set_name,
      state,
      stateLabel: CYCLE_STATE_LABELS[state] ?? r.state,
      received,
      receivedAt: r.received_at,
      missing: missingIds.has(r.id) && !received,
      unexpected: r.order_id !== orderId,
    };
  });
  // Booked sets first, in serial order; then those that came unbooked.
  sets.sort((a, b) => Number(a.unexpected) - Number(b.unexpected));
  const booked = sets.filter((s) => !s.unexpected);
  return {
    id: order.id,
    reference: order.reference,
    customerName: order.organisation_name,
    siteName: order.site_name,
    serviceLevel: order.service_level,
    promisedReturnAt: order.promised_return_at,
    neededBackBy: order.needed_back_by,
    sets,
    booked: booked.length,
    received: booked.filter((s) => s.received).length,
    stillExpected: booked.filter((s) => !s.received && !s.missing).length,
    missing: booked.filter((s) => s.missing).length,
  };
}

/** The order a station is receiving, in the caller's scope, or 404. */
export async function getReceivingOrder(db: Kysely<Database>, user: SessionUser, orderId: number): Promise<ReceivingOrder> {
  const row = await db
    .selectFrom("orders")
    .select("id")
    .where("id", "=", orderId)
    .where(tenantScope(user, { organisation: "orders.organisation_id", site: "orders.site_id" }))
    .executeTakeFirst();
  if (!row) throw notFound("That order");
  return receivingOrder(db, row.id);
}

/** Ends receiving of a pickup: its booked sets that did not arrive are reported missing to the clinic. */
export async function finishReceiving(
  db: Kysely<Database>,
  user: SessionUser,
  input: FinishReceivingInput,
  now = new Date(),
): Promise<FinishReceivingResult> {
  return atomically(db, async (trx) => {
    const order = await trx
      .selectFrom("orders")
      .innerJoin("sites", "sites.id", "orders.site_id")
      .select(["orders.id", "orders.reference", "orders.kind", "orders.status", "orders.organisation_id", "orders.site_id", "sites.name as site_name"])
      .where("orders.id", "=", input.orderId)
      .where(tenantScope(user, { organisation: "orders.organisation_id", site: "orders.site_id" }))
      .executeTakeFirst();
    if (!order) throw notFound("That order");
    if (order.kind !== "pickup") {
      throw new AppError("conflict", `${order.reference} is a delivery from the unit's store, not a pickup: there is nothing to receive.`);
    }
    if (order.status === "cancelled") throw new AppError("conflict", `${order.reference} was cancelled: there is nothing to receive.`);
    const cycles = await trx
      .selectFrom("cycles")
      .innerJoin("sets", "sets.id", "cycles.set_id")
      .innerJoin("set_types", "set_types.id", "sets.set_type_id")
      .select(["cycles.id", "cycles.set_id", "cycles.state", "cycles.received_at", "sets.serial", "set_types.name as set_name"])
      .where("cycles.order_id", "=", order.id)
      .where("cycles.state", "!=", "cancelled")
      .orderBy("sets.serial")
      .execute();
    const received = cycles.filter((c) => c.received_at !== null);
    if (received.length === 0) {
      throw new AppError(
        "conflict",
        `Nothing of ${order.reference} has been received yet. Scan its sets first; if the whole pickup did not arrive, tell the dispatcher.`,
      );
    }
    const missing = cycles.filter((c) => c.received_at === null && NOT_YET_RECEIVED.includes(c.state as CycleState));
    const at = formatDateTime(now, serverEnv().UNIT_TIME_ZONE);
    const reported: { serial: string; setName: string }[] = [];
    for (const c of missing) {
      const noticeId = await insertNotice(trx, {
        orderId: order.id,
        organisationId: order.organisation_id,
        siteId: order.site_id,
        setId: c.set_id,
        cycleId: c.id,
        kind: "missing_set",
        message: `${c.serial} (${c.set_name}) was booked on pickup ${order.reference} but was not among the sets the unit received; receiving was finished on ${at}.`,
        userId: user.id,
        now,
      });
      if (!noticeId) continue;
      reported.push({ serial: c.serial, setName: c.set_name });
      await mailNotice(trx, noticeId, "missing_set", now, (ctx) => missingSetMail({ ...ctx, orderReference: order.reference }), {
        organisationId: order.organisation_id,
        siteId: order.site_id,
        siteName: order.site_name,
        order: { id: order.id, reference: order.reference },
        setId: c.set_id,
        serial: c.serial,
        setName: c.set_name,
      });
    }
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: order.organisation_id,
        action: "order.receiving_finished",
        entity: "order",
        entityId: order.id,
        details: { received: received.length, missing: missing.map((c) => c.serial), reported: reported.map((r) => r.serial) },
      },
      now,
    );
    const summary = await receivingOrder(trx, order.id);
    const counted = `${received.length} of ${cycles.length} booked ${cycles.length === 1 ? "set" : "sets"} received`;
    const message =
      missing.length === 0
        ? `${order.reference}: every booked set is received.`
        : reported.length > 0
          ? `${order.reference}: ${counted}; ${reported.length} reported missing to the clinic (${reported.map((r) => r.serial).join(", ")}).`
          : `${order.reference}: ${counted}; the missing ${missing.length === 1 ? "set was" : "sets were"} already reported to the clinic.`;
    return { order: summary, reported, message };
  });
}

/** Marks a received set as heavily soiled or not pre-cleaned (a surcharge), or clears the mark; audited. */
export async function setHeavySoil(db: Kysely<Database>, user: SessionUser, input: HeavySoilInput, now = new Date()): Promise<HeavySoilResult> {
  return atomically(db, async (trx) => {
    const cycle = await trx
      .selectFrom("cycles")
      .innerJoin("sets", "sets.id", "cycles.set_id")
      .select(["cycles.id", "cycles.state", "cycles.heavy_soil", "cycles.organisation_id", "cycles.set_id", "sets.serial"])
      .where("cycles.id", "=", input.cycleId)
      .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
      .executeTakeFirst();
    if (!cycle) throw notFound("That set's cycle");
    const state = cycle.state as CycleState;
    if (state !== "received") {
      throw new AppError(
        "conflict",
        `Heavy soil is marked at receiving, before washing; ${cycle.serial} is ${(CYCLE_STATE_LABELS[state] ?? state).toLowerCase()}. Nothing was changed.`,
      );
    }
    if ((cycle.heavy_soil === 1) === input.heavySoil) return { cycleId: cycle.id, heavySoil: input.heavySoil, changed: false };
    await trx
      .updateTable("cycles")
      .set({ heavy_soil: input.heavySoil ? 1 : 0, updated_at: now.toISOString() })
      .where("id", "=", cycle.id)
      .where("state", "=", "received")
      .execute();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: cycle.organisation_id,
        action: input.heavySoil ? "cycle.heavy_soil_marked" : "cycle.heavy_soil_cleared",
        entity: "cycle",
        entityId: cycle.id,
        details: { serial: cycle.serial, setId: cycle.set_id, station: "receiving" },
      },
      now,
    );
    return { cycleId: cycle.id, heavySoil: input.heavySoil, changed: true };
  });
}

export interface OrderNoticeView {
  id: number;
  kind: OrderNoticeKind;
  message: string;
  serial: string;
  setName: string;
  createdAt: string;
}

/** The receiving notices of one order, for its page; none for an order outside the caller's scope. */
export async function listOrderNotices(db: Kysely<Database>, user: SessionUser, orderId: number): Promise<OrderNoticeView[]> {
  const rows = await db
    .selectFrom("order_notices")
    .innerJoin("orders", "orders.id", "order_notices.order_id")
    .innerJoin("sets", "sets.id", "order_notices.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select([
      "order_notices.id",
      "order_notices.kind",
      "order_notices.message",
      "order_notices.created_at",
      "sets.serial",
      "set_types.name as set_name",
    ])
    .where("order_notices.order_id", "=", orderId)
    .where(tenantScope(user, { organisation: "orders.organisation_id", site: "orders.site_id" }))
    .where(tenantScope(user, { organisation: "order_notices.organisation_id", site: "order_notices.site_id" }))
    .orderBy("order_notices.created_at")
    .orderBy("order_notices.id")
    .execute();
  return rows.map((r) => ({ id: r.id, kind: r.kind, message: r.message, serial: r.serial, setName: r.set_name, createdAt: r.created_at }));
}
