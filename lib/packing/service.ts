import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { isPackaging, type Packaging, PACKAGING_LABELS, type ProcessingFlag } from "@/lib/catalogue/vocabulary";
import { CYCLE_STATE_LABELS, type CycleState, transition } from "@/lib/cycles/lifecycle";
import { applyCycleEvent } from "@/lib/cycles/store";
import { AppError, type FieldErrors, notFound } from "@/lib/errors";
import { identifyAtStation } from "@/lib/stations/identify";
import { type ContentsItem, checkCounts, holdReasonFor, type Irregularity, irregularityText, missingCount } from "./checklist";
import { pouchText } from "./pouch";
import { currentPackRecord, packRecordOfEvent, type PackRecordView } from "./records";
import type { PackInput } from "./schemas";

// The packing station: what a scanned set is and whether it may be packed, and packing it — the
// contents counted against its list, the packaging, and the outcome (packed, packed with an
// irregularity printed on its label, or held) — in one transaction with its scan event.

type Db = Kysely<Database>;

export interface PackingSetView {
  set: {
    id: number;
    serial: string;
    humanReadable: string;
    status: "in_service" | "retired";
    organisationName: string;
    homeSiteName: string;
  };
  type: {
    id: number;
    code: string;
    name: string;
    packaging: Packaging;
    packagingLabel: string;
    flags: ProcessingFlag[];
    processingNotes: string | null;
    ifuFileId: number | null;
    items: ContentsItem[];
  };
  cycle: {
    id: number;
    state: CycleState;
    stateLabel: string;
    holdReason: string | null;
    serviceLevel: "standard" | "express";
    promisedAt: string | null;
  } | null;
  /** Null when the set may be packed now; otherwise why not, from the cycle's state machine. */
  refusal: string | null;
  /** What happens to the set next, in words. */
  nextStep: string;
  /** The record that packed it, when the cycle is packed (to print its label again). */
  packed: PackResult | null;
}

export interface PackResult {
  cycleId: number;
  setId: number;
  serial: string;
  outcome: "packed" | "held";
  state: CycleState;
  stateLabel: string;
  /** True when this answers a retried request: nothing was recorded again. */
  duplicate: boolean;
  record: PackRecordView;
  irregularityTexts: string[];
  holdReason: string | null;
  labelUrl: string | null;
  labelPdfUrl: string | null;
}

const NEXT_STEP: Record<CycleState, string> = {
  booked: "Next: receiving, when it arrives at the unit.",
  collected: "Next: receiving.",
  received: "Next: washing. It comes back here once washed.",
  reprocess: "Next: washing again. It comes back here once washed.",
  washed: "Count the contents, choose the packaging and pack it.",
  packed: "It is packed: it goes into a steriliser load next.",
  sterilised: "It is sterilised and waits for its load to be released.",
  released: "It is released and waits for a van.",
  dispatched: "It is out for delivery.",
  delivered: "It was delivered; its next pickup opens a new cycle.",
  on_hold: "It is on hold: the quality lead decides whether it is cleared or sent back to washing.",
  recalled: "It is recalled: it goes back to washing when it returns.",
  cancelled: "Its pickup was cancelled.",
};

function labelUrls(setId: number, cycleId: number) {
  return { labelUrl: `/unit/sets/${setId}/label?cycle=${cycleId}`, labelPdfUrl: `/api/sets/${setId}/label.pdf?cycle=${cycleId}` };
}

/** What a scan at the packing station is, and whether it may be packed now. */
export async function identifyForPacking(db: Db, user: SessionUser, raw: string): Promise<PackingSetView> {
  const found = await identifyAtStation(db, user, raw);
  const { set, type, cycle } = found;
  const packaging: Packaging = isPackaging(type.packaging) ? type.packaging : "wrap";
  let refusal: string | null = null;
  if (set.status === "retired") refusal = "Cannot pack this set: it is retired. Return it to service first.";
  else if (!cycle) refusal = "Cannot pack this set: it has no open cycle. It has to be booked and received first.";
  else {
    const move = transition(cycle.state, "pack");
    if (!move.ok) refusal = move.reason;
  }
  const packedRecord = cycle && cycle.state !== "washed" ? await currentPackRecord(db, cycle.id) : null;
  return {
    set: {
      id: set.id,
      serial: set.serial,
      humanReadable: set.humanReadable,
      status: set.status,
      organisationName: set.organisationName,
      homeSiteName: set.homeSiteName,
    },
    type: {
      id: type.id,
      code: type.code,
      name: type.name,
      packaging,
      packagingLabel: PACKAGING_LABELS[packaging],
      flags: type.flags,
      processingNotes: type.processingNotes,
      ifuFileId: type.ifu?.id ?? null,
      items: type.items.map((i) => ({ position: i.position, name: i.name, quantity: i.quantity })),
    },
    cycle: cycle
      ? {
          id: cycle.id,
          state: cycle.state,
          stateLabel: cycle.stateLabel,
          holdReason: cycle.holdReason,
          serviceLevel: cycle.serviceLevel,
          promisedAt: cycle.promisedAt,
        }
      : null,
    refusal,
    nextStep: cycle ? NEXT_STEP[cycle.state] : set.status === "retired" ? "" : "Book its pickup, then receive and wash it first.",
    packed: packedRecord && cycle ? resultOf(set, cycle.id, cycle.state, cycle.holdReason, packedRecord, false) : null,
  };
}

function resultOf(
  set: { id: number; serial: string },
  cycleId: number,
  state: CycleState,
  holdReason: string | null,
  record: PackRecordView,
  duplicate: boolean,
): PackResult {
  const packed = record.outcome === "packed";
  return {
    cycleId,
    setId: set.id,
    serial: set.serial,
    outcome: record.outcome,
    state,
    stateLabel: CYCLE_STATE_LABELS[state] ?? state,
    duplicate,
    record,
    irregularityTexts: record.irregularities.map(irregularityText),
    holdReason,
    ...(packed ? labelUrls(set.id, cycleId) : { labelUrl: null, labelPdfUrl: null }),
  };
}

function validation(message: string, fields: FieldErrors): AppError {
  return new AppError("validation", message, fields);
}

/** "135 × 260 mm" or "135 × 260 mm inside 190 × 330 mm" */
function pouchWords(pouch: NonNullable<PackInput["pouch"]>): string {
  return pouch.outer ? `${pouchText(pouch.inner)} inside ${pouchText(pouch.outer)}` : pouchText(pouch.inner);
}

/** Checks the packaging and pouch of a pack against the set type's; throws 422 naming the field. */
function checkPackaging(input: PackInput, typePackaging: Packaging): void {
  const changed = input.packaging !== typePackaging;
  if (changed && input.packagingReason.length < 3) {
    throw validation(`This set type is packed in: ${PACKAGING_LABELS[typePackaging]}. Say why this pack is different.`, {
      packagingReason: [`Say why it is packed as ${PACKAGING_LABELS[input.packaging].toLowerCase()} this time.`],
    });
  }
  if (!changed && input.packagingReason) {
    throw validation("The packaging is the set type's own: a reason is only for a change.", {
      packagingReason: ["Leave this empty when the packaging is not changed."],
    });
  }
  const pouch = input.pouch;
  if (!pouch) return;
  if (input.packaging !== "single_pouch" && input.packaging !== "double_pouch") {
    throw validation("A pouch size goes only with pouch packaging.", { pouch: ["Choose single or double pouch, or leave the size out."] });
  }
  if (input.packaging === "single_pouch" && pouch.outer) {
    throw validation("A single pouch has no outer pouch.", { pouch: ["Leave the outer pouch out, or choose double pouch."] });
  }
  if (input.packaging === "double_pouch") {
    if (!pouch.outer) throw validation("A double pouch needs the outer pouch's size too.", { pouch: ["Give the outer pouch's size."] });
    if (!(pouch.inner.widthMm < pouch.outer.widthMm && pouch.inner.lengthMm < pouch.outer.lengthMm)) {
      throw validation(`A ${pouchText(pouch.inner)} pouch does not fit inside a ${pouchText(pouch.outer)} one.`, {
        pouch: ["The inner pouch must be narrower and shorter than the outer one."],
      });
    }
  }
}

/**
 * Packs (or holds) one cycle at the packing station, in one transaction: the counts are checked
 * against the contents list, the packaging against the set type's, the decision against what was
 * found; then the scan event, the packing record and — for a set packed with an instrument
 * missing — the cycle's missing-instrument flag (a billed investigation). A request repeated with
 * the same clientEventId answers the first result and records nothing. Bad input writes nothing.
 */
export async function packCycle(db: Db, user: SessionUser, input: PackInput, now = new Date()): Promise<PackResult> {
  return db.transaction().execute(async (trx) => {
    const earlier = await trx
      .selectFrom("scan_events")
      .select(["id", "cycle_id", "station", "set_id"])
      .where("client_event_id", "=", input.clientEventId)
      .executeTakeFirst();
    if (earlier) {
      const record = earlier.cycle_id === input.cycleId && earlier.station === "packing" ? await packRecordOfEvent(trx, earlier.id) : null;
      if (!record) throw new AppError("conflict", "This request's id was already used for another scan. Scan the set again and repeat the packing.");
      const cycle = await trx
        .selectFrom("cycles")
        .innerJoin("sets", "sets.id", "cycles.set_id")
        .select(["cycles.state", "cycles.hold_reason", "sets.serial"])
        .where("cycles.id", "=", earlier.cycle_id)
        .executeTakeFirstOrThrow();
      return resultOf({ id: earlier.set_id, serial: cycle.serial }, earlier.cycle_id, cycle.state as CycleState, cycle.hold_reason, record, true);
    }

    const cycle = await trx
      .selectFrom("cycles")
      .innerJoin("sets", "sets.id", "cycles.set_id")
      .innerJoin("set_types", "set_types.id", "sets.set_type_id")
      .select([
        "cycles.id",
        "cycles.state",
        "cycles.set_id",
        "sets.serial",
        "sets.status as set_status",
        "set_types.id as set_type_id",
        "set_types.packaging",
      ])
      .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
      .where("cycles.id", "=", input.cycleId)
      .executeTakeFirst();
    if (!cycle) throw notFound("That cycle");
    if (cycle.set_status === "retired") throw new AppError("conflict", "Cannot pack this set: it is retired. Return it to service first.");
    const move = transition(cycle.state as CycleState, "pack");
    if (!move.ok) throw new AppError("conflict", move.reason);

    const items = await trx
      .selectFrom("set_type_items")
      .select(["position", "name", "quantity"])
      .where("set_type_id", "=", cycle.set_type_id)
      .orderBy("position")
      .execute();
    if (items.length === 0) {
      throw new AppError("conflict", "This set type has no contents list to check against. Add its contents in the catalogue first.");
    }
    const check = checkCounts(items, input.counts);
    if (!check.ok) {
      const fields: FieldErrors = {};
      for (const item of check.uncounted) fields[`line.${item.position}`] = ["Count this line."];
      for (const problem of check.problems) (fields[`line.${problem.position}`] ??= []).push(problem.message);
      const parts: string[] = [];
      if (check.uncounted.length) parts.push(`Count every line before packing. Not counted: ${check.uncounted.map((i) => i.name).join("; ")}.`);
      parts.push(...check.problems.map((p) => p.message));
      throw validation(parts.join(" "), fields);
    }
    const typePackaging: Packaging = isPackaging(cycle.packaging) ? cycle.packaging : "wrap";
    checkPackaging(input, typePackaging);

    const irregularities: Irregularity[] = check.irregularities;
    const found = irregularities.map(irregularityText).join("; ");
    if (input.decision === "pack" && irregularities.length > 0) {
      throw validation(`${found}. Hold the set, or pack it with the irregularity recorded on its label.`, {
        decision: ["Hold the set or pack it with the irregularity."],
      });
    }
    if (input.decision === "pack_with_irregularity" && irregularities.length === 0) {
      throw validation("Nothing is missing or damaged: pack the set as it is.", { decision: ["Pack it without an irregularity."] });
    }
    if (input.decision === "hold" && irregularities.length === 0 && !input.note) {
      throw validation("Nothing is missing or damaged: say why the set is held.", { note: ["Say why the set is held."] });
    }

    const held = input.decision === "hold";
    const holdReason = held ? [holdReasonFor(irregularities), input.note].filter(Boolean).join(". ") : null;
    const pouch = input.pouch ? pouchWords(input.pouch) : null;
    const event = await applyCycleEvent(trx, {
      cycleId: cycle.id,
      event: held ? "hold" : "pack",
      station: "packing",
      userId: user.id,
      at: now,
      clientEventId: input.clientEventId,
      details: {
        ...(held ? { reason: holdReason } : {}),
        packaging: input.packaging,
        ...(input.packaging !== typePackaging ? { packagingChangedFrom: typePackaging, packagingReason: input.packagingReason } : {}),
        ...(pouch ? { pouch } : {}),
        irregularities,
      },
    });
    const { id: recordId } = await trx
      .insertInto("pack_records")
      .values({
        cycle_id: cycle.id,
        packed_by: user.id,
        packaging: input.packaging,
        counts: JSON.stringify(check.lines),
        irregularities: JSON.stringify(irregularities),
        outcome: held ? "held" : "packed",
        notes: input.note || null,
        at: now.toISOString(),
        packaging_reason: input.packaging !== typePackaging ? input.packagingReason : null,
        pouch,
        scan_event_id: event.eventId,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    if (input.decision === "pack_with_irregularity" && missingCount(irregularities) > 0) {
      await trx.updateTable("cycles").set({ missing_instrument: 1, updated_at: now.toISOString() }).where("id", "=", cycle.id).execute();
    }
    const record = await packRecordOfEvent(trx, event.eventId);
    if (!record || record.id !== recordId) throw new Error("The packing record was not written.");
    return resultOf({ id: cycle.set_id, serial: cycle.serial }, cycle.id, event.to, holdReason, record, false);
  });
}
