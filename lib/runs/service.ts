import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { CYCLE_STATE_LABELS, type CycleState, transition } from "@/lib/cycles/lifecycle";
import { applyCycleEvent } from "@/lib/cycles/store";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { findSetByScan } from "@/lib/sets/service";
import { discardStoredFile, saveUpload } from "@/lib/storage/files";
import {
  type CompleteStopInput,
  type CompleteStopResult,
  localDay,
  minutesText,
  notServedText,
  type RunSheet,
  type RunSheetSet,
  type RunSheetStop,
  type StopRole,
  type StopScanInput,
  type StopScanResult,
  type StopStatus,
} from "./shared";

// The driver's run sheet: today's published run of the signed-in driver, its stops in order and
// the sets each stop collects or delivers, and what happens at a stop. A scan at a stop checks the
// set belongs there and can move now, and records it once (stop_scans.client_event_id). The sets
// move when the stop is completed: a served stop, signed by the receiver, applies `collect` and
// `deliver` to every set scanned there (each with its scan's client id, so a retry records once);
// a stop that could not be served keeps its reason and leaves every set as it was.

type Executor = Kysely<Database> | Transaction<Database>;

/** The local date of an instant in the unit's time zone, as route plans key their day. */
export function unitDay(at: Date): string {
  return localDay(at, serverEnv().UNIT_TIME_ZONE);
}

export interface RunSummary {
  runId: number;
  vanName: string;
  vanRegistration: string;
  stops: number;
  startTime: string | null;
}

/** The signed-in driver's runs of today's published plan, earliest first. */
export async function todaysRunsFor(db: Executor, user: SessionUser, now = new Date()): Promise<RunSummary[]> {
  const rows = await db
    .selectFrom("route_runs")
    .innerJoin("route_plans", "route_plans.id", "route_runs.plan_id")
    .innerJoin("vans", "vans.id", "route_runs.van_id")
    .select((eb) => [
      "route_runs.id",
      "route_runs.start_min",
      "vans.name",
      "vans.registration",
      eb.selectFrom("route_stops").select((s) => s.fn.countAll<number>().as("n")).whereRef("route_stops.run_id", "=", "route_runs.id").as("stops"),
    ])
    .where("route_plans.day", "=", unitDay(now))
    .where("route_plans.status", "=", "published")
    .where("route_runs.driver_user_id", "=", user.id)
    .orderBy("route_runs.start_min")
    .orderBy("route_runs.id")
    .execute();
  return rows.map((r) => ({
    runId: r.id,
    vanName: r.name,
    vanRegistration: r.registration,
    stops: Number(r.stops ?? 0),
    startTime: minutesText(r.start_min),
  }));
}

/** A published run of the caller's, or 404 (another driver's run, a draft, an unknown id alike). */
async function ownRun(db: Executor, user: SessionUser, runId: number) {
  const run = await db
    .selectFrom("route_runs")
    .innerJoin("route_plans", "route_plans.id", "route_runs.plan_id")
    .innerJoin("vans", "vans.id", "route_runs.van_id")
    .innerJoin("users", "users.id", "route_runs.driver_user_id")
    .select([
      "route_runs.id",
      "route_runs.start_min",
      "route_runs.end_min",
      "route_plans.day",
      "vans.name as van_name",
      "vans.registration",
      "users.name as driver_name",
    ])
    .where("route_runs.id", "=", runId)
    .where("route_runs.driver_user_id", "=", user.id)
    .where("route_plans.status", "=", "published")
    .executeTakeFirst();
  if (!run) throw notFound("That run");
  return run;
}

interface StopSetRow {
  stopId: number;
  role: StopRole;
  cycleId: number;
  setId: number;
  serial: string;
  giai: string;
  typeName: string;
  state: CycleState;
  expiresOn: string | null;
}

/** The sets of each stop: a collection's booked pickups, a delivery's sets going back. */
export async function setsOfStops(db: Executor, stopIds: number[]): Promise<StopSetRow[]> {
  if (stopIds.length === 0) return [];
  const links = await db.selectFrom("route_stop_orders").select(["stop_id", "order_id", "role"]).where("stop_id", "in", stopIds).execute();
  if (links.length === 0) return [];
  const orderIds = [...new Set(links.map((l) => l.order_id))];
  const cycles = await db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select([
      "cycles.id",
      "cycles.order_id",
      "cycles.return_order_id",
      "cycles.keep_in_store",
      "cycles.state",
      "cycles.expires_on",
      "sets.id as set_id",
      "sets.serial",
      "sets.giai",
      "set_types.name as type_name",
    ])
    .where((eb) => eb.or([eb("cycles.order_id", "in", orderIds), eb("cycles.return_order_id", "in", orderIds)]))
    .where("cycles.state", "!=", "cancelled")
    .orderBy("sets.serial")
    .execute();
  const out: StopSetRow[] = [];
  const seen = new Set<string>();
  for (const link of links) {
    for (const c of cycles) {
      const belongs =
        link.role === "collect"
          ? c.order_id === link.order_id
          : c.return_order_id === link.order_id || (c.order_id === link.order_id && c.return_order_id === null && c.keep_in_store === 0);
      const key = `${link.stop_id}:${link.role}:${c.id}`;
      if (!belongs || seen.has(key)) continue;
      seen.add(key);
      out.push({
        stopId: link.stop_id,
        role: link.role,
        cycleId: c.id,
        setId: c.set_id,
        serial: c.serial,
        giai: c.giai,
        typeName: c.type_name,
        state: c.state as CycleState,
        expiresOn: c.expires_on,
      });
    }
  }
  return out;
}

/** Why a set cannot be scanned at its stop now, or null when it can. */
function blockedReason(row: Pick<StopSetRow, "role" | "state">): string | null {
  if (row.role === "collect") {
    if (row.state === "booked") return null;
    return row.state === "collected" ? "Already collected." : `Already at the unit (${CYCLE_STATE_LABELS[row.state].toLowerCase()}).`;
  }
  if (row.state === "dispatched") return null;
  if (row.state === "delivered") return "Already delivered.";
  if (row.state === "released") return "Not loaded on the van at the dispatch station, so it should not be on board. Tell the dispatcher.";
  const t = transition(row.state, "deliver");
  return t.ok ? null : t.reason.replace("Cannot deliver this set: ", "Not ready to hand over: ");
}

function toSheetSet(row: StopSetRow, scanned: boolean): RunSheetSet {
  const done = row.role === "collect" ? row.state !== "booked" : row.state === "delivered";
  return {
    cycleId: row.cycleId,
    setId: row.setId,
    serial: row.serial,
    giai: row.giai,
    typeName: row.typeName,
    role: row.role,
    state: row.state,
    stateLabel: CYCLE_STATE_LABELS[row.state] ?? row.state,
    scanned,
    done,
    blocked: done ? null : blockedReason(row),
  };
}

/** The caller's run sheet, or 404 when the run is not theirs or not published. */
export async function getRunSheet(db: Executor, user: SessionUser, runId: number): Promise<RunSheet> {
  const run = await ownRun(db, user, runId);
  const stops = await db
    .selectFrom("route_stops")
    .innerJoin("sites", "sites.id", "route_stops.site_id")
    .innerJoin("organisations", "organisations.id", "route_stops.organisation_id")
    .select([
      "route_stops.id",
      "route_stops.position",
      "route_stops.status",
      "route_stops.kind",
      "route_stops.window_start_min",
      "route_stops.window_end_min",
      "route_stops.planned_start_min",
      "route_stops.planned_arrival_min",
      "route_stops.service_min",
      "route_stops.signed_by_name",
      "route_stops.served_at",
      "route_stops.not_served_reason",
      "route_stops.signature_file_id",
      "sites.name as site_name",
      "sites.address_line1",
      "sites.address_line2",
      "sites.town",
      "sites.postcode",
      "sites.delivery_notes",
      "sites.contact_name",
      "sites.contact_phone",
      "organisations.name as organisation_name",
    ])
    .where("route_stops.run_id", "=", run.id)
    .orderBy("route_stops.position")
    .orderBy("route_stops.id")
    .execute();
  const ids = stops.map((s) => s.id);
  const sets = await setsOfStops(db, ids);
  const scans = ids.length ? await db.selectFrom("stop_scans").select(["stop_id", "cycle_id"]).where("stop_id", "in", ids).execute() : [];
  const scanned = new Set(scans.map((s) => `${s.stop_id}:${s.cycle_id}`));
  const view: RunSheetStop[] = stops.map((s, index) => {
    const mine = sets.filter((x) => x.stopId === s.id);
    return {
      id: s.id,
      position: s.position ?? index + 1,
      status: s.status as StopStatus,
      kind: s.kind,
      siteName: s.site_name,
      organisationName: s.organisation_name,
      address: [s.address_line1, s.address_line2, `${s.town} ${s.postcode}`].filter(Boolean).join(", "),
      deliveryNotes: s.delivery_notes,
      contactName: s.contact_name,
      contactPhone: s.contact_phone,
      window: `${minutesText(s.window_start_min)}–${minutesText(s.window_end_min)}`,
      plannedTime: minutesText(s.planned_start_min ?? s.planned_arrival_min),
      serviceMin: s.service_min,
      collect: mine.filter((x) => x.role === "collect").map((x) => toSheetSet(x, scanned.has(`${s.id}:${x.cycleId}`))),
      deliver: mine.filter((x) => x.role === "deliver").map((x) => toSheetSet(x, scanned.has(`${s.id}:${x.cycleId}`))),
      signedByName: s.signed_by_name,
      servedAt: s.served_at,
      notServedReason: s.not_served_reason,
      signatureFileId: s.signature_file_id,
    };
  });
  return {
    runId: run.id,
    day: run.day,
    vanName: run.van_name,
    vanRegistration: run.registration,
    driverName: run.driver_name,
    startTime: minutesText(run.start_min),
    endTime: minutesText(run.end_min),
    stops: view,
  };
}

/** One stop of the caller's run (404 otherwise), with its site's organisation. */
async function ownStop(db: Executor, user: SessionUser, runId: number, stopId: number) {
  await ownRun(db, user, runId);
  const stop = await db
    .selectFrom("route_stops")
    .innerJoin("sites", "sites.id", "route_stops.site_id")
    .select(["route_stops.id", "route_stops.status", "route_stops.organisation_id", "route_stops.position", "sites.name as site_name"])
    .where("route_stops.id", "=", stopId)
    .where("route_stops.run_id", "=", runId)
    .executeTakeFirst();
  if (!stop) throw notFound("That stop");
  return stop;
}

function closedStopMessage(status: string): string {
  return status === "served"
    ? "This stop is already signed off. A set found afterwards goes back to the unit; tell the dispatcher."
    : "This stop was recorded as not served. Ask the dispatcher to plan it again.";
}

/** Records a set scanned (or tapped) at a stop, once per client id; the set moves when the stop is signed off. */
export async function scanAtStop(
  db: Kysely<Database>,
  user: SessionUser,
  runId: number,
  stopId: number,
  input: StopScanInput,
  now = new Date(),
): Promise<StopScanResult> {
  return db.transaction().execute(async (trx) => {
    const stop = await ownStop(trx, user, runId, stopId);
    const sets = await setsOfStops(trx, [stop.id]);
    const earlier = await trx.selectFrom("stop_scans").selectAll().where("client_event_id", "=", input.clientEventId).executeTakeFirst();
    if (earlier) {
      const row = sets.find((s) => s.cycleId === earlier.cycle_id && s.role === earlier.kind);
      if (earlier.stop_id !== stop.id || !row) throw new AppError("conflict", "That scan id was already used at another stop. Scan the set again.");
      return { duplicate: true, set: { cycleId: row.cycleId, serial: row.serial, typeName: row.typeName, role: row.role }, message: `${row.serial} was already recorded.` };
    }
    if (stop.status !== "planned") throw new AppError("conflict", closedStopMessage(stop.status));

    let candidates: StopSetRow[];
    let shown: string;
    if (input.code !== undefined) {
      const set = await findSetByScan(trx, user, input.code);
      candidates = sets.filter((s) => s.setId === set.id);
      shown = `${set.serial} (${set.setTypeName})`;
      if (candidates.length === 0) throw await notOnThisStop(trx, runId, stop.id, set.id, shown);
    } else {
      candidates = sets.filter((s) => s.cycleId === input.cycleId);
      if (candidates.length === 0) throw new AppError("not_found", "That set is not on this stop's list. Reload the stop.");
      shown = `${candidates[0]!.serial} (${candidates[0]!.typeName})`;
    }
    // A set on both lists (an express trip out and back the same day) is whichever it can be now.
    const row = candidates.find((c) => blockedReason(c) === null) ?? candidates[0]!;
    const blocked = blockedReason(row);
    if (blocked) throw new AppError("conflict", `${shown}: ${blocked}`);
    if (row.role === "deliver" && row.expiresOn && row.expiresOn < unitDay(now)) {
      throw new AppError("conflict", `${shown}: its sterile pack expired on ${row.expiresOn}. Do not hand it over; take it back to the unit.`);
    }

    const already = await trx.selectFrom("stop_scans").select("id").where("stop_id", "=", stop.id).where("cycle_id", "=", row.cycleId).executeTakeFirst();
    const set = { cycleId: row.cycleId, serial: row.serial, typeName: row.typeName, role: row.role };
    if (already) return { duplicate: true, set, message: `${row.serial} was already scanned here.` };
    await trx
      .insertInto("stop_scans")
      .values({
        client_event_id: input.clientEventId,
        stop_id: stop.id,
        cycle_id: row.cycleId,
        set_id: row.setId,
        kind: row.role,
        scanned_by: user.id,
        scanned_at: now.toISOString(),
      })
      .execute();
    return { duplicate: false, set, message: `${row.serial} ${row.role === "collect" ? "to collect" : "to hand over"}: scanned.` };
  });
}

/** The refusal for a set that is not on this stop: where it belongs instead, when that is known. */
async function notOnThisStop(db: Executor, runId: number, stopId: number, setId: number, shown: string): Promise<AppError> {
  const others = await db.selectFrom("route_stops").select("id").where("run_id", "=", runId).where("id", "!=", stopId).execute();
  const elsewhere = (await setsOfStops(db, others.map((o) => o.id))).find((s) => s.setId === setId);
  if (elsewhere) {
    const stop = await db
      .selectFrom("route_stops")
      .innerJoin("sites", "sites.id", "route_stops.site_id")
      .select(["route_stops.position", "sites.name"])
      .where("route_stops.id", "=", elsewhere.stopId)
      .executeTakeFirstOrThrow();
    return new AppError("conflict", `${shown} belongs to stop ${stop.position ?? "?"} (${stop.name}), not this one. Keep it on the van for that stop.`);
  }
  return new AppError("conflict", `${shown} is not on this stop's list. Keep it apart and tell the dispatcher; nothing was recorded.`);
}

/** Decodes a PNG data URL (or bare base64) into bytes; the storage checks it really is a PNG. */
export function decodeSignature(text: string): Uint8Array {
  const match = /^data:([a-z/+.-]+);base64,(.*)$/is.exec(text.trim());
  const base64 = (match ? match[2]! : text).replace(/\s+/g, "");
  if (!/^[A-Za-z0-9+/]*={0,2}$/.test(base64)) {
    throw new AppError("validation", "The signature did not come through as an image. Clear it and sign again.", { signature: ["Sign again."] });
  }
  return new Uint8Array(Buffer.from(base64, "base64"));
}

/** Signs off a stop (the receiver's name and signature; the scanned sets move) or records why it could not be served. */
export async function completeStop(
  db: Kysely<Database>,
  user: SessionUser,
  runId: number,
  stopId: number,
  input: CompleteStopInput,
  now = new Date(),
): Promise<CompleteStopResult> {
  let storedKey: string | null = null;
  try {
    return await db.transaction().execute(async (trx) => {
      const stop = await ownStop(trx, user, runId, stopId);
      if (stop.status !== "planned") {
        if (stop.status === input.outcome) {
          return { duplicate: true, status: stop.status as StopStatus, collected: 0, delivered: 0, message: "This stop was already recorded." };
        }
        throw new AppError("conflict", closedStopMessage(stop.status));
      }
      const iso = now.toISOString();
      if (input.outcome === "not_served") {
        const reason = notServedText(input.reason, input.note);
        await trx.updateTable("route_stops").set({ status: "not_served", not_served_reason: reason }).where("id", "=", stop.id).execute();
        await recordAudit(
          trx,
          { actorUserId: user.id, organisationId: stop.organisation_id, action: "stop.not_served", entity: "route_stop", entityId: stop.id, details: { reason: input.reason, note: input.note ?? null } },
          now,
        );
        return { duplicate: false, status: "not_served", collected: 0, delivered: 0, message: `Stop ${stop.position ?? ""} recorded as not served: ${reason}. Its sets stay as they were.` };
      }

      const scans = await trx.selectFrom("stop_scans").selectAll().where("stop_id", "=", stop.id).orderBy("id").execute();
      if (scans.length === 0) {
        throw new AppError("conflict", "No set has been scanned at this stop. Scan the sets handed over, or record why the stop could not be served.");
      }
      const bytes = decodeSignature(input.signature);
      const file = await saveUpload(
        trx,
        { bytes, originalName: `signature-stop-${stop.id}.png`, purpose: "signature", organisationId: stop.organisation_id, uploadedBy: user.id },
        now,
      ).catch((error: unknown) => {
        if (error instanceof AppError && error.fields?.file) throw new AppError("validation", error.message, { signature: error.fields.file });
        throw error;
      });
      storedKey = file.storage_key;

      const sets = await setsOfStops(trx, [stop.id]);
      let collected = 0;
      let delivered = 0;
      for (const scan of scans) {
        const set = sets.find((s) => s.cycleId === scan.cycle_id);
        try {
          const moved = await applyCycleEvent(trx, {
            cycleId: scan.cycle_id,
            event: scan.kind,
            station: "van",
            userId: user.id,
            at: now,
            clientEventId: scan.client_event_id,
            details: { runId, stopId: stop.id, receiver: input.receiverName },
          });
          if (!moved.duplicate) {
            if (scan.kind === "collect") collected++;
            else delivered++;
          }
        } catch (error) {
          if (error instanceof AppError && error.code === "conflict") {
            throw new AppError("conflict", `${set?.serial ?? "A scanned set"}: ${error.message} Nothing was signed off; tell the dispatcher.`);
          }
          throw error;
        }
      }
      await trx
        .updateTable("route_stops")
        .set({ status: "served", signature_file_id: file.id, signed_by_name: input.receiverName, served_at: iso, served_by: user.id })
        .where("id", "=", stop.id)
        .execute();
      await recordAudit(
        trx,
        { actorUserId: user.id, organisationId: stop.organisation_id, action: "stop.served", entity: "route_stop", entityId: stop.id, details: { collected, delivered, signatureFileId: file.id } },
        now,
      );
      const parts = [delivered ? `${delivered} handed over` : null, collected ? `${collected} collected` : null].filter(Boolean).join(", ");
      return { duplicate: false, status: "served", collected, delivered, message: `Stop ${stop.position ?? ""} signed off by ${input.receiverName}: ${parts || "no sets moved"}.` };
    });
  } catch (error) {
    if (storedKey) await discardStoredFile(storedKey);
    throw error;
  }
}
