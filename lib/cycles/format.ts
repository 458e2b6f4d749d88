// Number formatting for check reasons. A value reported as short of a limit is rounded down and a
// value reported as over a limit is rounded up, so the sentence never shows "600 is below 600".

// Rounds down to `decimals` places for display.
export function formatBelow(value: number, decimals: number): string {
  const f = 10 ** decimals;
  return (Math.floor(value * f + 1e-9) / f).toFixed(decimals);
}

// Rounds up to `decimals` places for display.
export function formatAbove(value: number, decimals: number): string {
  const f = 10 ** decimals;
  return (Math.ceil(value * f - 1e-9) / f).toFixed(decimals);
}

/** Relative slack for comparisons against limits, so floating-point rounding never decides a check. */
export const LIMIT_RELATIVE_SLACK = 1e-9;

// value ≥ limit, allowing floating-point rounding.
export function meetsMinimum(value: number, limit: number): boolean {
  return value >= limit - Math.abs(limit) * LIMIT_RELATIVE_SLACK;
}

// value ≤ limit, allowing floating-point rounding.
export function withinMaximum(value: number, limit: number): boolean {
  return value <= limit + Math.abs(limit) * LIMIT_RELATIVE_SLACK;
}
