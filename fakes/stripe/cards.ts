import { createHash } from "node:crypto";

// Stripe's published test card numbers and what each one does (Stripe's public testing
// documentation, docs.stripe.com/testing; card numbers and decline codes as published there,
// the wording of the messages from memory of Stripe's answers).

export type CardBrand = "visa" | "mastercard" | "amex" | "unknown";

export interface Decline {
  /** The error code: card_declined, expired_card, incorrect_number, … */
  code: string;
  /** The bank's reason, for card_declined (generic_decline, insufficient_funds, …). */
  declineCode: string | null;
  message: string;
  /** For charge.outcome.seller_message. */
  sellerMessage: string;
}

export interface TestCard {
  brand: CardBrand;
  funding: "credit" | "debit";
  decline: Decline | null;
}

const GENERIC: Decline = {
  code: "card_declined",
  declineCode: "generic_decline",
  message: "Your card was declined.",
  sellerMessage: "The bank did not return any further details with this decline.",
};
const INSUFFICIENT: Decline = {
  code: "card_declined",
  declineCode: "insufficient_funds",
  message: "Your card has insufficient funds.",
  sellerMessage: "The bank returned the decline code `insufficient_funds`.",
};
const EXPIRED: Decline = {
  code: "expired_card",
  declineCode: "expired_card",
  message: "Your card has expired.",
  sellerMessage: "The bank returned the decline code `expired_card`.",
};
const LIVE_CARD: Decline = {
  code: "card_declined",
  declineCode: "test_mode_live_card",
  message: "Your card was declined. Your request was in test mode, but used a non test card. Use one of the test card numbers.",
  sellerMessage: "A card that is not a test card was used in test mode.",
};

export const TEST_CARDS: Readonly<Record<string, TestCard>> = {
  "4242424242424242": { brand: "visa", funding: "credit", decline: null },
  "4000056655665556": { brand: "visa", funding: "debit", decline: null },
  "5555555555554444": { brand: "mastercard", funding: "credit", decline: null },
  "2223003122003222": { brand: "mastercard", funding: "credit", decline: null },
  "5200828282828210": { brand: "mastercard", funding: "debit", decline: null },
  "378282246310005": { brand: "amex", funding: "credit", decline: null },
  "4000000000000002": { brand: "visa", funding: "credit", decline: GENERIC },
  "4000000000009995": { brand: "visa", funding: "credit", decline: INSUFFICIENT },
  "4000000000000069": { brand: "visa", funding: "credit", decline: EXPIRED },
};

/** Stripe's test payment method ids (docs.stripe.com/testing) and the card each stands for. */
export const TEST_PAYMENT_METHODS: Readonly<Record<string, string>> = {
  pm_card_visa: "4242424242424242",
  pm_card_visa_debit: "4000056655665556",
  pm_card_mastercard: "5555555555554444",
  pm_card_amex: "378282246310005",
  pm_card_chargeDeclined: "4000000000000002",
  pm_card_visa_chargeDeclined: "4000000000000002",
  pm_card_chargeDeclinedInsufficientFunds: "4000000000009995",
  pm_card_visa_chargeDeclinedInsufficientFunds: "4000000000009995",
  pm_card_chargeDeclinedExpiredCard: "4000000000000069",
  pm_card_visa_chargeDeclinedExpiredCard: "4000000000000069",
};

export interface CardInput {
  number: string;
  expMonth: number;
  expYear: number;
  cvc: string;
}

/** A card as entered, checked, with what charging it does. */
export interface CheckedCard {
  number: string;
  brand: CardBrand;
  funding: "credit" | "debit";
  last4: string;
  expMonth: number;
  expYear: number;
  fingerprint: string;
  decline: Decline | null;
}

/** Why a card was refused before any charge was made (a card_error like Stripe's own). */
export interface CardProblem {
  code: "incorrect_number" | "invalid_expiry_month" | "invalid_expiry_year" | "invalid_cvc";
  message: string;
  param: "number" | "exp_month" | "exp_year" | "cvc";
}

// Spaces and dashes as people type them are dropped.
export function normaliseCardNumber(input: string): string {
  return input.replace(/[\s-]/g, "");
}

// The Luhn check digit test of ISO/IEC 7812-1.
export function luhnValid(digits: string): boolean {
  if (!/^\d+$/.test(digits)) return false;
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let d = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return sum % 10 === 0;
}

export function brandOf(number: string): CardBrand {
  if (/^4/.test(number)) return "visa";
  if (/^(5[1-5]|2[2-7])/.test(number)) return "mastercard";
  if (/^3[47]/.test(number)) return "amex";
  return "unknown";
}

/**
 * Checks a card as a payment form would (number, expiry at or after `now`, CVC) and looks up
 * its test outcome. Luhn-valid numbers that are not test cards are declined, as in Stripe's
 * test mode.
 */
export function checkCard(input: CardInput, now: Date): { card: CheckedCard } | { problem: CardProblem } {
  const number = normaliseCardNumber(input.number);
  if (!/^\d{12,19}$/.test(number) || !luhnValid(number)) {
    return { problem: { code: "incorrect_number", message: "Your card number is incorrect.", param: "number" } };
  }
  if (!Number.isInteger(input.expMonth) || input.expMonth < 1 || input.expMonth > 12) {
    return { problem: { code: "invalid_expiry_month", message: "Your card's expiration month is invalid.", param: "exp_month" } };
  }
  const year = input.expYear < 100 ? 2000 + input.expYear : input.expYear;
  const thisYear = now.getUTCFullYear();
  const thisMonth = now.getUTCMonth() + 1;
  if (!Number.isInteger(year) || year < thisYear || year > thisYear + 50 || (year === thisYear && input.expMonth < thisMonth)) {
    return { problem: { code: "invalid_expiry_year", message: "Your card's expiration year is invalid.", param: "exp_year" } };
  }
  const brand = brandOf(number);
  const cvcLength = brand === "amex" ? 4 : 3;
  if (!new RegExp(`^\\d{${cvcLength}}$`).test(input.cvc)) {
    return { problem: { code: "invalid_cvc", message: "Your card's security code is invalid.", param: "cvc" } };
  }
  const known = TEST_CARDS[number];
  return {
    card: {
      number,
      brand,
      funding: known?.funding ?? "credit",
      last4: number.slice(-4),
      expMonth: input.expMonth,
      expYear: year,
      fingerprint: createHash("sha256").update(number).digest("base64url").slice(0, 16),
      decline: known ? known.decline : LIVE_CARD,
    },
  };
}

// The card behind one of Stripe's test payment method ids, expiring in December of next year.
export function cardForTestPaymentMethod(id: string, now: Date): CheckedCard | null {
  const number = TEST_PAYMENT_METHODS[id];
  if (!number) return null;
  const checked = checkCard({ number, expMonth: 12, expYear: now.getUTCFullYear() + 1, cvc: number.length === 15 ? "1234" : "123" }, now);
  return "card" in checked ? checked.card : null;
}
