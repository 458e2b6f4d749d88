// Errors answered in Stripe's error shape. The HTTP status picks the SDK's error class:
// 400/404 StripeInvalidRequestError (StripeIdempotencyError when type is idempotency_error),
// 401 StripeAuthenticationError, 402 StripeCardError, 429 StripeRateLimitError, 5xx StripeAPIError.

export type StripeErrorType = "api_error" | "card_error" | "idempotency_error" | "invalid_request_error";

export interface StripeErrorBody {
  type: StripeErrorType;
  message: string;
  code?: string;
  param?: string;
  decline_code?: string;
  charge?: string;
  payment_intent?: unknown;
  payment_method?: unknown;
  doc_url?: string;
}

/**
 * An error the fake answers with. `validation` marks errors raised while reading the request,
 * before the endpoint began to act: like Stripe, their answers are not kept for idempotent replay,
 * so a corrected retry with the same key runs.
 */
export class FakeStripeError extends Error {
  constructor(
    readonly status: number,
    readonly body: StripeErrorBody,
    readonly validation = false,
  ) {
    super(body.message);
    this.name = "FakeStripeError";
  }
}

interface InvalidOptions {
  param?: string;
  code?: string;
  validation?: boolean;
}

// A 400 invalid_request_error.
export function invalidRequest(message: string, options: InvalidOptions = {}): FakeStripeError {
  const body: StripeErrorBody = { type: "invalid_request_error", message };
  if (options.code) body.code = options.code;
  if (options.param) body.param = options.param;
  return new FakeStripeError(400, body, options.validation ?? false);
}

// A 400 raised while reading parameters (never stored for idempotent replay).
export function invalidParam(message: string, param: string, code = "parameter_invalid"): FakeStripeError {
  return invalidRequest(message, { param, code, validation: true });
}

// A 404 for an id that names nothing, worded like Stripe: "No such invoice: 'in_123'".
export function noSuch(noun: string, id: string, param = "id"): FakeStripeError {
  return new FakeStripeError(
    404,
    { type: "invalid_request_error", code: "resource_missing", message: `No such ${noun}: '${id}'`, param },
    true,
  );
}

// A 400 for an action the object's current state does not allow (e.g. voiding a paid invoice).
export function badState(message: string, code = "status_transition_invalid"): FakeStripeError {
  return invalidRequest(message, { code });
}
