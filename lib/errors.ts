import { ZodError } from "zod";

// The one application error type. Each code maps to one HTTP status.
export const ERROR_STATUS = {
  invalid: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  validation: 422,
  throttled: 429,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

/** Field errors keyed by the dotted path of the input field. */
export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly fields?: FieldErrors;

  constructor(code: ErrorCode, message: string, fields?: FieldErrors) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.fields = fields;
  }

  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

export const notFound = (what = "That record") => new AppError("not_found", `${what} was not found.`);
export const forbidden = (message = "Your role does not allow this.") => new AppError("forbidden", message);

/** Field errors from a zod error, keyed by path ("" for the whole input). */
export function zodFieldErrors(error: ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".");
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/** Turns anything thrown into an AppError; unknown errors become a 500-free generic message. */
export function toAppError(error: unknown): AppError | null {
  if (error instanceof AppError) return error;
  if (error instanceof ZodError) {
    return new AppError("validation", "Some fields need attention.", zodFieldErrors(error));
  }
  return null;
}

/** The JSON body every failed request answers with. */
export interface ErrorBody {
  error: { code: ErrorCode | "internal"; message: string; fields?: FieldErrors };
}
