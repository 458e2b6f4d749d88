import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { CYCLE_STATE_LABELS, type CycleState, transition } from "@/lib/cycles/lifecycle";
import { applyCycleEvent } from "@/lib/cycles/store";
import { AppError, notFound } from "@/lib/errors";
import { setsOfStops, unitDay } from "@/lib/runs/service";
import { minutesText } from "@/lib/runs/shared";
import { identifyAtStation } from "./identify";
import type { DispatchAnswer, DispatchBoard, DispatchRun, DispatchScanInput, DispatchSet } from "./dispatch-shared";

// The dispatch station: released sets are scanned onto the van of today's published run whose
// delivery stop they go to, which moves them by `dispatch` (out for delivery). Anything else is
// refused with the reason and what to do. The station shows, per run, what is still to load.

type Executor = Kysely<Database> | Transaction<Database>;

interface RunRow {
  id: number;
  start_min: number | null;
  van_name: string;
  registration: string;
  driver_name: string;
}

async function todaysRuns(db: Executor, now: Date, runId?: number): Promise<RunRow[]> {
  let query = db
    .selectFrom("route_runs")
    .innerJoin("route_plans", "route_plans.id", "route_runs.plan_id")
    .innerJoin("vans", "vans.id", "route_runs.van_id")
    .innerJoin("users", "users.id", "route_runs.driver_user_id")
    .select(["route_runs.id", "route_runs.start_min", "vans.name as van_name", "vans.registration", "users.name as driver_name"])
    .where("route_plans.day", "=", unitDay(now))
    .where("route_plans.status", "=", "published");
  if (runId !== undefined) query = query.where("route_runs.id", "=", runId);
  return query.orderBy("route_runs.start_min").orderBy("vans.name").execute();
}

/** Each run's delivery stops that are still to be served, with their sets sorted into to load, loaded, not ready. */
async function loadingOf(db: Executor, runs: RunRow[]): Promise<DispatchRun[]> {
  if (runs.length === 0) return [];
  const stops = await db
    .selectFrom("route_stops")
    .innerJoin("sites", "sites.id", "route_stops.site_id")
    .select(["route_stops.id", "route_stops.run_id", "route_stops.position", "sites.name as site_name"])
    .where("route_stops.run_id", "in", runs.map((r) => r.id))
    .where("route_stops.kind", "in", ["delivery", "both"])
    .where("route_stops.status", "=", "planned")
    .execute();
  const sets = (await setsOfStops(db, stops.map((s) => s.id))).filter((s) => s.role === "deliver");
  return runs.map((run) => {
    const out: DispatchRun = {
      runId: run.id,
      vanName: run.van_name,
      vanRegistration: run.registration,
      driverName: run.driver_name,
      startTime: minutesText(run.start_min),
      toLoad: [],
      loaded: [],
      notReady: [],
    };
    for (const stop of stops.filter((s) => s.run_id === run.id).sort((a, b) => (a.position ?? 0) - (b.position ?? 0))) {
      for (const set of sets.filter((s) => s.stopId === stop.id)) {
        const item: DispatchSet = { cycleId: set.cycleId, serial: set.serial, typeName: set.typeName, stopPosition: stop.position ?? 0, siteName: stop.site_name };
        if (set.state === "released") out.toLoad.push(item);
        else if (set.state === "dispatched") out.loaded.push(item);
        else if (set.state !== "delivered") out.notReady.push({ ...item, stateLabel: CYCLE_STATE_LABELS[set.state] ?? set.state });
      }
    }
    return out;
  });
}

/** Today's published runs and what each still has to load. */
export async function getDispatchBoard(db: Executor, now = new Date()): Promise<DispatchBoard> {
  return { day: unitDay(now), runs: await loadingOf(db, await todaysRuns(db, now)) };
}

/** Where a cycle is to be delivered today: the run and stop, if any. */
async function deliveryStopOf(db: Executor, cycleId: number, runIds: number[]) {
  if (runIds.length === 0) return null;
  const stops = await db
    .selectFrom("route_stops")
    .innerJoin("sites", "sites.id", "route_stops.site_id")
    .select(["route_stops.id", "route_stops.run_id", "route_stops.position", "route_stops.status", "sites.name as site_name"])
    .where("route_stops.run_id", "in", runIds)
    .where("route_stops.kind", "in", ["delivery", "both"])
    .execute();
  const sets = await setsOfStops(db, stops.map((s) => s.id));
  const hits = sets.filter((s) => s.role === "deliver" && s.cycleId === cycleId);
  // An open stop wins over one already closed (a set planned again after a missed delivery).
  const found = hits.map((h) => stops.find((s) => s.id === h.stopId)!).sort((a, b) => Number(a.status !== "planned") - Number(b.status !== "planned"))[0];
  return found ?? null;
}

/** Loads a scanned set onto a run's van (→ dispatched), or refuses with the reason and what to do. */
export async function dispatchScan(db: Kysely<Database>, user: SessionUser, input: DispatchScanInput, now = new Date()): Promise<DispatchAnswer> {
  return db.transaction().execute(async (trx) => {
    const runs = await todaysRuns(trx, now);
    const run = runs.find((r) => r.id === input.runId);
    if (!run) throw notFound("That run of today's published plan");

    const { set, type, cycle } = await identifyAtStation(trx, user, input.code);
    const shown = `${set.serial} (${set.setTypeName})`;
    if (!cycle) {
      throw new AppError("conflict", `${shown} is not on its way through the unit: there is nothing to deliver. Put it aside and tell the dispatcher.`);
    }
    const earlier = await trx.selectFrom("scan_events").select(["cycle_id", "event"]).where("client_event_id", "=", input.clientEventId).executeTakeFirst();
    if (earlier && (earlier.event !== "dispatch" || earlier.cycle_id !== cycle.id)) {
      throw new AppError("conflict", "That scan id was already used for another step. Scan the set again.");
    }
    const stop = await deliveryStopOf(trx, cycle.id, runs.map((r) => r.id));
    if (!earlier) {
      const state = cycle.state as CycleState;
      if (state === "dispatched") {
        const where = stop ? runs.find((r) => r.id === stop.run_id) : null;
        throw new AppError("conflict", `${shown} is already loaded${where ? ` on ${where.van_name}` : ""}. Nothing was recorded twice.`);
      }
      const move = transition(state, "dispatch");
      if (!move.ok) {
        const what = state === "sterilised" ? " Wait for the quality lead to release its load." : state === "on_hold" || state === "recalled" ? " Keep it off the van." : "";
        throw new AppError("conflict", `${move.reason.replace("this set", shown)}${what}`);
      }
      if (!stop) {
        throw new AppError("conflict", `${shown} is not on a delivery stop of today's plan. Keep it in the store and ask the dispatcher to plan its delivery.`);
      }
      if (stop.run_id !== run.id) {
        const other = runs.find((r) => r.id === stop.run_id)!;
        throw new AppError("conflict", `${shown} goes on ${other.van_name} (${other.driver_name}), stop ${stop.position ?? "?"} at ${stop.site_name}. Load it there.`);
      }
      if (stop.status !== "planned") {
        throw new AppError("conflict", `${shown}: its stop at ${stop.site_name} is already closed. Ask the dispatcher to plan the delivery again.`);
      }
      const expires = await trx.selectFrom("cycles").select("expires_on").where("id", "=", cycle.id).executeTakeFirstOrThrow();
      if (expires.expires_on && expires.expires_on < unitDay(now)) {
        throw new AppError("conflict", `${shown}: its sterile pack expired on ${expires.expires_on}. Do not load it; send it back for reprocessing.`);
      }
    }
    const moved = await applyCycleEvent(trx, {
      cycleId: cycle.id,
      event: "dispatch",
      station: "dispatch",
      userId: user.id,
      at: now,
      clientEventId: input.clientEventId,
      details: { runId: run.id, stopId: stop?.id ?? null },
    });
    const [board] = await loadingOf(trx, [run]);
    const expiry = await trx.selectFrom("cycles").select("expires_on").where("id", "=", cycle.id).executeTakeFirstOrThrow();
    return {
      duplicate: moved.duplicate,
      set: { serial: set.serial, typeName: set.setTypeName, customerName: set.organisationName, siteName: set.homeSiteName },
      stop: { position: stop?.position ?? 0, siteName: stop?.site_name ?? set.homeSiteName },
      processing: { flags: type.flags, notes: type.processingNotes, ifuFileId: type.ifu?.id ?? null },
      expiresOn: expiry.expires_on,
      run: board!,
    };
  });
}
