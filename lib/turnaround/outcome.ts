import { compileCalendar, type CompiledCalendar, type ServiceCalendar } from "./calendar";
import { addCompiledServiceTime, compiledServiceMinutesBetween } from "./clock";
import { assertDuration, assertValidDate, TurnaroundError } from "./errors";
import { MINUTE_MS } from "./local-time";

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
  return turnaroundOutcomeIn(() => compileCalendar(input.calendar), input);
}

/**
 * turnaroundOutcome with the calendar compiled by `compiled` (called once, after the arguments
 * are checked, as turnaroundOutcome compiles it), so that many cycles can share one compilation.
 */
export function turnaroundOutcomeIn(
  compiled: () => CompiledCalendar,
  input: Omit<TurnaroundOutcomeInput, "calendar">,
): TurnaroundOutcome {
  const { startedAt, finishedAt, turnaroundHours } = input;
  assertValidDate(startedAt, "startedAt");
  assertValidDate(finishedAt, "finishedAt");
  if (finishedAt.getTime() < startedAt.getTime()) {
    throw new TurnaroundError(
      "invalid_input",
      `finishedAt (${finishedAt.toISOString()}) is before startedAt (${startedAt.toISOString()}).`,
      [{ path: "finishedAt", message: "must not be before startedAt" }],
    );
  }
  // dueAt is promisedReturn(calendar, startedAt, turnaroundHours), with its checks in its order,
  // on a calendar compiled once for both measurements.
  assertDuration(turnaroundHours, "turnaroundHours", "hours", true);
  const minutes = turnaroundHours * 60;
  assertDuration(minutes, "minutes", "minutes");
  const calendar = compiled();
  const due = addCompiledServiceTime(calendar, startedAt.getTime(), minutes);
  const finished = finishedAt.getTime();
  const late = finished > due;
  return {
    dueAt: new Date(due),
    late,
    lateByMinutes: late ? Math.ceil((finished - due) / MINUTE_MS) : 0,
    lateByServiceMinutes: late ? Math.ceil(compiledServiceMinutesBetween(calendar, due, finished)) : 0,
  };
}

/** True when the cycle finished after its due time; see turnaroundOutcome. */
export function isLate(input: TurnaroundOutcomeInput): boolean {
  return turnaroundOutcome(input).late;
}
