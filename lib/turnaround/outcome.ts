import type { ServiceCalendar } from "./calendar";
import { serviceMinutesBetween } from "./clock";
import { assertValidDate, TurnaroundError } from "./errors";
import { MINUTE_MS } from "./local-time";
import { promisedReturn } from "./promise";

export interface TurnaroundOutcomeInput {
  calendar: ServiceCalendar;
  /** When the clock started: receipt at the unit. */
  startedAt: Date;
  /** When it stopped: release or delivery, as the contract says. */
  finishedAt: Date;
  turnaroundHours: number;
}

/**
 * How one cycle did against its turnaround. The project's one definition of late:
 * `finishedAt` is after `dueAt` (finishing exactly at `dueAt` is on time).
 */
export interface TurnaroundOutcome {
  dueAt: Date;
  late: boolean;
  /** Real minutes from `dueAt` to `finishedAt`, rounded up to whole minutes; 0 when on time. */
  lateByMinutes: number;
  /**
   * Service minutes from `dueAt` to `finishedAt`, rounded up; 0 when on time. Can be 0 for a late
   * cycle that finished outside working hours before the next opening.
   */
  lateByServiceMinutes: number;
}

// Measures one cycle against its turnaround (SLA credits, on-time reports).
export function turnaroundOutcome(input: TurnaroundOutcomeInput): TurnaroundOutcome {
  const { calendar, startedAt, finishedAt, turnaroundHours } = input;
  assertValidDate(startedAt, "startedAt");
  assertValidDate(finishedAt, "finishedAt");
  if (finishedAt.getTime() < startedAt.getTime()) {
    throw new TurnaroundError(
      "invalid_input",
      `finishedAt (${finishedAt.toISOString()}) is before startedAt (${startedAt.toISOString()}).`,
      [{ path: "finishedAt", message: "must not be before startedAt" }],
    );
  }
  const dueAt = promisedReturn({ calendar, receivedAt: startedAt, turnaroundHours });
  const late = finishedAt.getTime() > dueAt.getTime();
  return {
    dueAt,
    late,
    lateByMinutes: late ? Math.ceil((finishedAt.getTime() - dueAt.getTime()) / MINUTE_MS) : 0,
    lateByServiceMinutes: late ? Math.ceil(serviceMinutesBetween(calendar, dueAt, finishedAt)) : 0,
  };
}

/** True when the cycle finished after its due time; see turnaroundOutcome. */
export function isLate(input: TurnaroundOutcomeInput): boolean {
  return turnaroundOutcome(input).late;
}
