import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { parseFlags } from "@/lib/catalogue/set-types";
import type { ProcessingFlag } from "@/lib/catalogue/vocabulary";
import { CYCLE_STATE_LABELS, type CycleState, transition } from "@/lib/cycles/lifecycle";
import { applyCycleEvent } from "@/lib/cycles/store";
import { AppError, notFound } from "@/lib/errors";
import { identifyAtStation } from "@/lib/stations/identify";
import { MANUAL_WASH_STEP_LABELS, type ManualWashStep, manualWashSteps, unconfirmedSteps } from "./checklist";

// The manual-washing station: a set washed by hand (its type says manual washing only, or the
// technician chose to) is scanned, the steps are confirmed, and the cycle moves to washed with a
// "manual_wash" event that carries the confirmed checklist and the operator.

export interface ManualWashSet {
  cycleId: number;
  serial: string;
  setTypeName: string;
  organisationName: string;
  homeSiteName: string;
  stateLabel: string;
  flags: ProcessingFlag[];
  processingNotes: string | null;
  ifuFileId: number | null;
  steps: { step: ManualWashStep; label: string }[];
}

async function openBatchOf(db: Kysely<Database> | Transaction<Database>, cycleId: number) {
  return db
    .selectFrom("washer_batch_items as i")
    .innerJoin("washer_batches as b", "b.id", "i.batch_id")
    .innerJoin("machines as m", "m.id", "b.machine_id")
    .select(["b.number", "b.status", "m.code"])
    .where("i.cycle_id", "=", cycleId)
    .where("b.status", "in", ["loading", "running"])
    .executeTakeFirst();
}

function inBatch(serial: string, batch: { number: string; status: string; code: string }): AppError {
  return new AppError(
    "conflict",
    `${serial} is in washer batch ${batch.number} on ${batch.code} (${batch.status}); take it out of the batch at the washing station before washing it by hand.`,
  );
}

/** What a scan at the manual-washing station is, and the steps to confirm; refused when it cannot be washed now. */
export async function identifyForManualWash(db: Kysely<Database>, user: SessionUser, code: string): Promise<ManualWashSet> {
  const { set, type, cycle } = await identifyAtStation(db, user, code);
  if (!cycle) {
    throw new AppError("conflict", `${set.serial} is not on its way through the unit: it has no open cycle, so it cannot be washed. Receive it first.`);
  }
  const step = transition(cycle.state, "manual_wash");
  if (!step.ok) throw new AppError("conflict", step.reason);
  const batch = await openBatchOf(db, cycle.id);
  if (batch) throw inBatch(set.serial, batch);
  return {
    cycleId: cycle.id,
    serial: set.serial,
    setTypeName: type.name,
    organisationName: set.organisationName,
    homeSiteName: set.homeSiteName,
    stateLabel: cycle.stateLabel,
    flags: type.flags,
    processingNotes: type.processingNotes,
    ifuFileId: type.ifu?.id ?? null,
    steps: manualWashSteps(type.flags).map((s) => ({ step: s, label: MANUAL_WASH_STEP_LABELS[s] })),
  };
}

/** Records the manual wash of a cycle once every step its set type needs is confirmed. */
export async function confirmManualWash(
  db: Kysely<Database>,
  user: SessionUser,
  input: { cycleId: number; checks: Partial<Record<ManualWashStep, boolean>>; clientEventId: string },
  now = new Date(),
): Promise<{ cycleId: number; serial: string; stateLabel: string; duplicate: boolean }> {
  return db.transaction().execute(async (trx) => {
    const cycle = await trx
      .selectFrom("cycles")
      .innerJoin("sets", "sets.id", "cycles.set_id")
      .innerJoin("set_types", "set_types.id", "sets.set_type_id")
      .select(["cycles.id", "cycles.state", "sets.serial", "set_types.processing_flags"])
      .where("cycles.id", "=", input.cycleId)
      .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
      .executeTakeFirst();
    if (!cycle) throw notFound("That set's cycle");
    const earlier = await trx.selectFrom("scan_events").select("cycle_id").where("client_event_id", "=", input.clientEventId).executeTakeFirst();
    if (earlier) {
      if (earlier.cycle_id !== cycle.id) throw new AppError("conflict", "That request id was already used for another set; scan the set again.");
      return { cycleId: cycle.id, serial: cycle.serial, stateLabel: CYCLE_STATE_LABELS[cycle.state as CycleState], duplicate: true };
    }
    const flags = parseFlags(cycle.processing_flags);
    const missing = unconfirmedSteps(flags, input.checks);
    if (missing.length > 0) {
      const fields = Object.fromEntries(missing.map((s) => [`checks.${s}`, [`Confirm: ${MANUAL_WASH_STEP_LABELS[s].toLowerCase()}.`]]));
      throw new AppError(
        "validation",
        `Confirm every step before recording the wash: ${missing.map((s) => MANUAL_WASH_STEP_LABELS[s].toLowerCase()).join("; ")}.`,
        fields,
      );
    }
    const batch = await openBatchOf(trx, cycle.id);
    if (batch) throw inBatch(cycle.serial, batch);
    const confirmed = Object.fromEntries(manualWashSteps(flags).map((s) => [s, true]));
    const result = await applyCycleEvent(trx, {
      cycleId: cycle.id,
      event: "manual_wash",
      station: "manual_washing",
      userId: user.id,
      at: now,
      clientEventId: input.clientEventId,
      details: { checklist: confirmed, operator: user.name },
    });
    return { cycleId: cycle.id, serial: cycle.serial, stateLabel: CYCLE_STATE_LABELS[result.to], duplicate: result.duplicate };
  });
}
