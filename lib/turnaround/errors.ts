/** What went wrong, so a caller can map it to a field error or an HTTP status. */
export type TurnaroundErrorCode =
  /** The service calendar does not pass `serviceCalendarSchema`. */
  | "invalid_calendar"
  /** An argument is out of range: an invalid Date, negative minutes, a finish before the start. */
  | "invalid_input"
  /** The calendar offers no working time for longer than its weekly hours and holidays allow. */
  | "no_service_time";

/** One problem found in the input, with the dotted path of the field ("" for the whole input). */
export interface TurnaroundIssue {
  path: string;
  message: string;
}

export class TurnaroundError extends Error {
  readonly code: TurnaroundErrorCode;
  readonly issues: TurnaroundIssue[];

  constructor(code: TurnaroundErrorCode, message: string, issues: TurnaroundIssue[] = []) {
    super(message);
    this.name = "TurnaroundError";
    this.code = code;
    this.issues = issues;
  }
}

// Throws unless `value` is a Date holding a real instant.
export function assertValidDate(value: unknown, name: string): asserts value is Date {
  if (!(value instanceof Date) || Number.isNaN(value.getTime())) {
    throw new TurnaroundError("invalid_input", `${name} must be a valid Date.`, [
      { path: name, message: "must be a valid Date" },
    ]);
  }
}

// Throws unless `value` is a finite number, at least 0 (or above 0 when `positive`).
export function assertDuration(value: unknown, name: string, unit: string, positive = false): asserts value is number {
  const ok = typeof value === "number" && Number.isFinite(value) && (positive ? value > 0 : value >= 0);
  if (!ok) {
    const rule = positive ? "a number of " + unit + " above 0" : "a number of " + unit + ", 0 or more";
    throw new TurnaroundError("invalid_input", `${name} must be ${rule} (got ${String(value)}).`, [
      { path: name, message: `must be ${rule}` },
    ]);
  }
}
