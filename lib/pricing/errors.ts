// The one error type of the pricing domain. `code` says what went wrong, `message` what to fix.

export type PricingErrorCode =
  | "invalid_terms"
  | "invalid_period"
  | "invalid_cycle"
  | "duplicate_cycle"
  | "unknown_set_class"
  | "currency_mismatch"
  | "outside_period"
  | "outside_contract"
  | "invalid_amount"
  | "invalid_vat"
  | "invalid_document"
  | "invalid_credit";

export class PricingError extends Error {
  readonly code: PricingErrorCode;
  /** Machine-readable context, e.g. `{ cycleId, setClass }`. */
  readonly details: Record<string, unknown>;

  constructor(code: PricingErrorCode, message: string, details: Record<string, unknown> = {}) {
    super(message);
    this.name = "PricingError";
    this.code = code;
    this.details = details;
  }
}
