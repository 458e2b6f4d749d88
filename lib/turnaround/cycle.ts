import type { ServiceCalendar } from "./calendar";
import { type TurnaroundOutcome, turnaroundOutcome } from "./outcome";
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
  const startedAt = asDate(cycle.receivedAt);
  const finishedAt = asDate(terms.clockStopsAt === "released" ? cycle.releasedAt : cycle.deliveredAt);
  if (!startedAt || !finishedAt) return null;
  return turnaroundOutcome({
    calendar: terms.serviceCalendar,
    startedAt,
    finishedAt,
    turnaroundHours: terms.turnaroundHours[cycle.serviceLevel],
  });
}
