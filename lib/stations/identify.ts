import "server-only";
import type { Kysely } from "kysely";
import type { CycleRow, Database } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session-user";
import { getSetType, type SetTypeDetail } from "@/lib/catalogue/set-types";
import { allowedEvents, CYCLE_STATE_LABELS, type CycleEvent, type CycleState } from "@/lib/cycles/lifecycle";
import { findSetByScan } from "@/lib/sets/service";
import type { SetView } from "@/lib/sets/service";

// What a scan at a station is: the set, its type's processing notes, contents and IFU, and its
// open cycle with what may happen to it next. Every station starts from here.

export interface OpenCycleView {
  id: number;
  state: CycleState;
  stateLabel: string;
  orderId: number | null;
  siteId: number;
  serviceLevel: "standard" | "express";
  heavySoil: boolean;
  loaner: boolean;
  promisedAt: string | null;
  holdReason: string | null;
  allowed: CycleEvent[];
}

export interface SetAtStation {
  set: SetView;
  type: SetTypeDetail;
  cycle: OpenCycleView | null;
}

export function toOpenCycleView(c: CycleRow): OpenCycleView {
  const state = c.state as CycleState;
  return {
    id: c.id,
    state,
    stateLabel: CYCLE_STATE_LABELS[state] ?? c.state,
    orderId: c.order_id,
    siteId: c.site_id,
    serviceLevel: c.service_level,
    heavySoil: c.heavy_soil === 1,
    loaner: c.loaner === 1,
    promisedAt: c.promised_at,
    holdReason: c.hold_reason,
    allowed: allowedEvents(state),
  };
}

/** Reads a scan (GS1 label or typed serial) into the set, its type and its open cycle. */
export async function identifyAtStation(db: Kysely<Database>, user: SessionUser, raw: string): Promise<SetAtStation> {
  const set = await findSetByScan(db, user, raw);
  const type = await getSetType(db, user, set.setTypeId);
  const cycle = await db
    .selectFrom("cycles")
    .selectAll()
    .where("set_id", "=", set.id)
    .where("state", "not in", ["delivered", "cancelled"])
    .executeTakeFirst();
  return { set, type, cycle: cycle ? toOpenCycleView(cycle) : null };
}
