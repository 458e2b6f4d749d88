import { compileCalendar, type CompiledCalendar, type ServiceCalendar } from "./calendar";
import { type TurnaroundOutcome, turnaroundOutcomeIn } from "./outcome";
import type { ServiceLevel, TurnaroundHours } from "./promise";

// The turnaround of one cycle under its contract: the clock runs from receipt at the unit to
// release or to delivery, as the contract says, in the contract's service calendar. This is the
// one definition the invoice's SLA credit, the on-time report and the customer's own view share.

export interface CycleClockTimes {
  serviceLevel: ServiceLevel;
  receivedAt: string | Date | null;
  releasedAt: string | Date | null;
  deliveredAt: string | Date | null;
}

export interface CycleClockTerms {
  serviceCalendar: ServiceCalendar;
  turnaroundHours: TurnaroundHours;
  clockStopsAt: "released" | "delivered";
}

const asDate = (v: string | Date | null): Date | null => (v === null ? null : v instanceof Date ? v : new Date(v));

/**
 * The cycle's outcome, or null while its clock is still running (not yet received, or not yet at
 * the event that stops the clock).
 */
export function cycleTurnaround(cycle: CycleClockTimes, terms: CycleClockTerms): TurnaroundOutcome | null {
  return measure(cycle, terms, () => compileCalendar(terms.serviceCalendar));
}

/** cycleTurnaround for one set of terms, applied to cycle after cycle. */
export type CycleClock = (cycle: CycleClockTimes) => TurnaroundOutcome | null;

/**
 * cycleTurnaround under fixed terms, for many cycles: the service calendar is checked and compiled
 * on the first cycle that has an outcome and reused for the others (an invalid calendar throws the
 * same error on every such cycle, as cycleTurnaround does). Make a new clock when the terms change.
 */
export function cycleClock(terms: CycleClockTerms): CycleClock {
  let compiled: CompiledCalendar | undefined;
  const calendar = () => (compiled ??= compileCalendar(terms.serviceCalendar));
  return (cycle) => measure(cycle, terms, calendar);
}

function measure(cycle: CycleClockTimes, terms: CycleClockTerms, calendar: () => CompiledCalendar): TurnaroundOutcome | null {
  const startedAt = asDate(cycle.receivedAt);
  const finishedAt = asDate(terms.clockStopsAt === "released" ? cycle.releasedAt : cycle.deliveredAt);
  if (!startedAt || !finishedAt) return null;
  return turnaroundOutcomeIn(calendar, {
    startedAt,
    finishedAt,
    turnaroundHours: terms.turnaroundHours[cycle.serviceLevel],
  });
}
