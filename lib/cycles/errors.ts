// Typed errors for cycle records that cannot be read, with the place in the file to fix.

export type CycleRecordIssueCode =
  | "empty"
  | "no_header"
  | "delimiter"
  | "missing_column"
  | "duplicate_column"
  | "unknown_unit"
  | "field_count"
  | "quotes"
  | "missing_value"
  | "not_a_number"
  | "bad_timestamp"
  | "out_of_range"
  | "unsorted_time"
  | "duplicate_time"
  | "too_few_samples";

export interface CycleRecordIssue {
  code: CycleRecordIssueCode;
  /** One-based line of the file, when the problem sits on one line. */
  line?: number;
  /** One-based column of the file, when the problem sits in one column. */
  column?: number;
  /** The header of that column, as written in the file. */
  columnName?: string;
  /** A plain sentence that names the place and says what to fix. */
  message: string;
}

/** At most this many issues are collected before parsing stops. */
export const MAX_RECORD_ISSUES = 20;

export class CycleRecordError extends Error {
  readonly issues: CycleRecordIssue[];

  constructor(issues: CycleRecordIssue[]) {
    if (issues.length === 0) throw new TypeError("CycleRecordError needs at least one issue");
    const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? "s" : ""})` : "";
    super(issues[0].message + more);
    this.name = "CycleRecordError";
    this.issues = issues;
  }

  /** The first problem's code, line and column, for callers that show only one. */
  get code(): CycleRecordIssueCode {
    return this.issues[0].code;
  }

  get line(): number | undefined {
    return this.issues[0].line;
  }

  get column(): number | undefined {
    return this.issues[0].column;
  }
}

/** Formats "Line 7, column 2 (temp_c)" or the parts that are known. */
export function placeOf(issue: Pick<CycleRecordIssue, "line" | "column" | "columnName">): string {
  const parts: string[] = [];
  if (issue.line !== undefined) parts.push(`Line ${issue.line}`);
  if (issue.column !== undefined) {
    const name = issue.columnName !== undefined ? ` (${issue.columnName})` : "";
    parts.push(`${parts.length === 0 ? "Column" : "column"} ${issue.column}${name}`);
  }
  return parts.join(", ");
}
