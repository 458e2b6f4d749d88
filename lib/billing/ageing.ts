// The age of an open invoice (pure): how many whole days past its due date, in buckets. The
// invoice list, its totals and the receivables report all bucket with this one function.

export const AGE_BUCKETS = ["current", "1_30", "31_60", "61_90", "over_90"] as const;
export type AgeBucket = (typeof AGE_BUCKETS)[number];

/** The age bucket of an open invoice `daysOverdue` days past its due date (0 or less: not yet due). */
export function ageBucketOf(daysOverdue: number): AgeBucket {
  if (daysOverdue <= 0) return "current";
  if (daysOverdue <= 30) return "1_30";
  if (daysOverdue <= 60) return "31_60";
  if (daysOverdue <= 90) return "61_90";
  return "over_90";
}

/** Whole days from a due date to a local date today, both "YYYY-MM-DD" (positive once overdue). */
export function daysPastDue(dueDate: string, today: string): number {
  return Math.round((Date.parse(`${today}T00:00:00Z`) - Date.parse(`${dueDate}T00:00:00Z`)) / 86_400_000);
}
