import "server-only";
import { type Kysely, sql } from "kysely";
import type { Database } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { CYCLE_STATE_LABELS, type CycleState } from "@/lib/cycles/lifecycle";
import { BOARD_COLUMNS, BOARD_STATES, type BoardState, isDueSoon, isOverdue, overdueMinutes } from "./definitions";

// The unit's board: how many sets are where right now, which are overdue against their promised
// return time, which are on hold and why, by customer and by service level. One data function,
// so the board and any later report count the same way.

export type ServiceLevel = "standard" | "express";
export type StateCounts = Record<BoardState, number>;

export interface BoardCycle {
  cycleId: number;
  serial: string;
  setName: string;
  customerName: string;
  siteName: string;
  orderReference: string | null;
  state: CycleState;
  stateLabel: string;
  serviceLevel: ServiceLevel;
  promisedAt: string | null;
  overdueMinutes: number;
}

export interface BoardHold extends BoardCycle {
  reason: string | null;
  heldFrom: CycleState | null;
  heldFromLabel: string | null;
  since: string | null;
}

export interface BoardGroup {
  key: string;
  label: string;
  /** Sets in any board column. */
  total: number;
  /** Before release and past the promised time. */
  overdue: number;
  dueSoon: number;
  onHold: number;
  byState: StateCounts;
}

export interface UnitBoard {
  generatedAt: string;
  columns: { state: BoardState; label: string; hint: string; count: number; express: number; overdue: number }[];
  totals: { sets: number; overdue: number; dueSoon: number; onHold: number; express: number };
  /** Express first, then the longest overdue first. */
  overdue: BoardCycle[];
  /** The longest held first. */
  holds: BoardHold[];
  /** Express first, then standard. */
  byLevel: (BoardGroup & { level: ServiceLevel })[];
  /** Customers with sets on the board, by name. */
  byCustomer: (BoardGroup & { organisationId: number; shortCode: string })[];
}

const emptyCounts = (): StateCounts => Object.fromEntries(BOARD_STATES.map((s) => [s, 0])) as StateCounts;

function group(key: string, label: string): BoardGroup {
  return { key, label, total: 0, overdue: 0, dueSoon: 0, onHold: 0, byState: emptyCounts() };
}

/** The board as of `now`, over every cycle in a board column within the caller's scope. */
export async function getUnitBoard(db: Kysely<Database>, user: SessionUser, now = new Date()): Promise<UnitBoard> {
  const rows = await db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("organisations", "organisations.id", "cycles.organisation_id")
    .innerJoin("sites", "sites.id", "cycles.site_id")
    .leftJoin("orders", "orders.id", "cycles.order_id")
    .select([
      "cycles.id",
      "cycles.state",
      "cycles.service_level",
      "cycles.promised_at",
      "cycles.hold_reason",
      "cycles.held_from",
      "cycles.organisation_id",
      "organisations.name as organisation_name",
      "organisations.short_code",
      "sites.name as site_name",
      "sets.serial",
      "set_types.name as set_name",
      "orders.reference as order_reference",
      sql<string | null>`(select max(e.at) from scan_events e where e.cycle_id = cycles.id and e.event = 'hold')`.as("held_since"),
    ])
    .where("cycles.state", "in", [...BOARD_STATES])
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .execute();

  const columns = BOARD_COLUMNS.map((c) => ({ state: c.state, label: c.label, hint: c.hint, count: 0, express: 0, overdue: 0 }));
  const column = new Map(columns.map((c) => [c.state as BoardState, c]));
  const levels = {
    express: { ...group("express", "Express"), level: "express" as const },
    standard: { ...group("standard", "Standard"), level: "standard" as const },
  };
  const customers = new Map<number, BoardGroup & { organisationId: number; shortCode: string }>();
  const overdue: BoardCycle[] = [];
  const holds: BoardHold[] = [];
  const totals = { sets: 0, overdue: 0, dueSoon: 0, onHold: 0, express: 0 };

  for (const r of rows) {
    const state = r.state as BoardState;
    const view: BoardCycle = {
      cycleId: r.id,
      serial: r.serial,
      setName: r.set_name,
      customerName: r.organisation_name,
      siteName: r.site_name,
      orderReference: r.order_reference,
      state,
      stateLabel: CYCLE_STATE_LABELS[state],
      serviceLevel: r.service_level,
      promisedAt: r.promised_at,
      overdueMinutes: overdueMinutes({ state, promisedAt: r.promised_at }, now),
    };
    const late = isOverdue(view, now);
    const soon = isDueSoon(view, now);
    const held = state === "on_hold";
    const express = r.service_level === "express";

    const col = column.get(state)!;
    col.count++;
    if (express) col.express++;
    if (late) col.overdue++;

    let customer = customers.get(r.organisation_id);
    if (!customer) {
      customer = { ...group(r.short_code, r.organisation_name), organisationId: r.organisation_id, shortCode: r.short_code };
      customers.set(r.organisation_id, customer);
    }
    for (const g of [levels[r.service_level], customer]) {
      g.total++;
      g.byState[state]++;
      if (late) g.overdue++;
      if (soon) g.dueSoon++;
      if (held) g.onHold++;
    }
    totals.sets++;
    if (late) totals.overdue++;
    if (soon) totals.dueSoon++;
    if (held) totals.onHold++;
    if (express) totals.express++;

    if (late) overdue.push(view);
    if (held) {
      const from = r.held_from as CycleState | null;
      holds.push({ ...view, reason: r.hold_reason, heldFrom: from, heldFromLabel: from ? CYCLE_STATE_LABELS[from] ?? from : null, since: r.held_since });
    }
  }

  overdue.sort(
    (a, b) => Number(b.serviceLevel === "express") - Number(a.serviceLevel === "express") || b.overdueMinutes - a.overdueMinutes || a.serial.localeCompare(b.serial),
  );
  holds.sort((a, b) => (a.since ?? "").localeCompare(b.since ?? "") || a.serial.localeCompare(b.serial));
  return {
    generatedAt: now.toISOString(),
    columns,
    totals,
    overdue,
    holds,
    byLevel: [levels.express, levels.standard],
    byCustomer: [...customers.values()].sort((a, b) => a.label.localeCompare(b.label)),
  };
}
