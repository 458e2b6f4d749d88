import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { brandOf, checkCard, luhnValid, TEST_CARDS } from "./cards";
import { pathMatches } from "./faults";
import { fingerprintOf, IdempotencyStore } from "./idempotency";
import { paginate } from "./list";
import { amountFromDecimal, formatAmount, minorUnitDigits } from "./money";
import { normaliseDecimal, Params } from "./params";

// The fake's pure parts, checked on their own.

const NOW = new Date("2027-03-15T10:00:00Z");

describe("test cards", () => {
  it("are the numbers Stripe publishes, all passing the Luhn check", () => {
    // Card numbers: Stripe's testing documentation (docs.stripe.com/testing). Luhn: ISO/IEC 7812-1.
    for (const n of ["4242424242424242", "4000000000000002", "4000000000009995", "4000000000000069", "5555555555554444", "378282246310005"]) {
      expect(n in TEST_CARDS).toBe(true);
      expect(luhnValid(n)).toBe(true);
    }
    // One digit off breaks the check.
    expect(luhnValid("4242424242424241")).toBe(false);
    expect(luhnValid("79927398713")).toBe(true); // the worked example of the Luhn algorithm (common practice)
    expect(luhnValid("79927398710")).toBe(false);
  });

  it("decline as Stripe documents: generic_decline, insufficient_funds, expired_card", () => {
    const outcome = (number: string) => {
      const r = checkCard({ number, expMonth: 12, expYear: 2030, cvc: "123" }, NOW);
      if (!("card" in r)) throw new Error(r.problem.message);
      return r.card.decline && [r.card.decline.code, r.card.decline.declineCode];
    };
    expect(outcome("4242 4242 4242 4242")).toBeNull();
    expect(outcome("4000-0000-0000-0002")).toEqual(["card_declined", "generic_decline"]);
    expect(outcome("4000000000009995")).toEqual(["card_declined", "insufficient_funds"]);
    expect(outcome("4000000000000069")).toEqual(["expired_card", "expired_card"]);
    // A valid number that is no test card is declined in test mode.
    expect(outcome("4111111111111111")).toEqual(["card_declined", "test_mode_live_card"]);
  });

  it("refuses bad numbers, past expiry dates and short codes before charging", () => {
    const problem = (number: string, expMonth: number, expYear: number, cvc: string) => {
      const r = checkCard({ number, expMonth, expYear, cvc }, NOW);
      return "problem" in r ? r.problem.code : null;
    };
    expect(problem("1234", 12, 30, "123")).toBe("incorrect_number");
    expect(problem("4242424242424242", 13, 30, "123")).toBe("invalid_expiry_month");
    expect(problem("4242424242424242", 2, 27, "123")).toBe("invalid_expiry_year"); // February 2027 is before March 2027
    expect(problem("4242424242424242", 3, 27, "123")).toBeNull();
    expect(problem("4242424242424242", 3, 27, "12")).toBe("invalid_cvc");
    expect(problem("378282246310005", 3, 27, "123")).toBe("invalid_cvc"); // American Express takes four digits
    expect(brandOf("5555555555554444")).toBe("mastercard");
    expect(brandOf("2223003122003222")).toBe("mastercard");
  });
});

describe("money", () => {
  it("multiplies decimal unit amounts exactly and rounds half away from zero (common practice)", () => {
    expect(amountFromDecimal("1250.5", 3)).toBe(3752);
    expect(amountFromDecimal("0.145", 100)).toBe(15); // exactly 14.5; in floating point 0.145 × 100 is 14.4999…, which would round to 14
    expect(amountFromDecimal("0.5", 1)).toBe(1);
    expect(amountFromDecimal("-0.5", 1)).toBe(-1);
    expect(amountFromDecimal("1850", 3)).toBe(5550);
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1_000_000 }), fc.integer({ min: 0, max: 10_000 }), (unit, q) => amountFromDecimal(String(unit), q) === unit * q),
    );
  });

  it("knows zero- and three-decimal currencies (Stripe's currency list, from memory)", () => {
    expect(minorUnitDigits("JPY")).toBe(0);
    expect(minorUnitDigits("kwd")).toBe(3);
    expect(minorUnitDigits("eur")).toBe(2);
    expect(formatAmount(12_500, "gbp")).toBe("£125.00");
    expect(formatAmount(500, "jpy")).toBe("JP¥500");
  });

  it("normalises decimal strings", () => {
    expect(normaliseDecimal("0012.500")).toBe("12.5");
    expect(normaliseDecimal("-0.0")).toBe("0");
    expect(normaliseDecimal("7")).toBe("7");
  });
});

describe("paging", () => {
  it("walks every item exactly once, forwards with starting_after", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 60 }), fc.integer({ min: 1, max: 15 }), (n, limit) => {
        const items = Array.from({ length: n }, (_, i) => ({ id: `x_${i}` }));
        const seen: string[] = [];
        let page = paginate(items, { limit }, "/v1/x");
        seen.push(...page.data.map((d) => d.id));
        while (page.has_more) {
          page = paginate(items, { limit, startingAfter: seen[seen.length - 1] }, "/v1/x");
          seen.push(...page.data.map((d) => d.id));
        }
        return seen.join() === items.map((i) => i.id).join();
      }),
    );
  });

  it("refuses a cursor that is not in the list", () => {
    expect(() => paginate([{ id: "a" }], { limit: 10, startingAfter: "zzz" }, "/v1/x")).toThrow(/starting_after/);
  });
});

describe("idempotency store", () => {
  it("replays equal requests, refuses changed ones and forgets keys after the TTL", () => {
    let now = 0;
    const store = new IdempotencyStore(() => now, 1000);
    const a = fingerprintOf("POST", "/v1/customers", { name: "A", metadata: { x: "1", y: "2" } });
    const sameReordered = fingerprintOf("POST", "/v1/customers", { metadata: { y: "2", x: "1" }, name: "A" });
    expect(sameReordered).toBe(a);
    expect(store.lookup("k", a)).toEqual({ kind: "new" });
    store.begin("k", a);
    expect(store.lookup("k", a)).toEqual({ kind: "in_flight" });
    store.finish("k", a, { status: 200, body: "{}" });
    expect(store.lookup("k", a)).toEqual({ kind: "replay", answer: { status: 200, body: "{}" } });
    expect(store.lookup("k", fingerprintOf("POST", "/v1/customers", { name: "B" }))).toEqual({ kind: "mismatch" });
    expect(store.lookup("k", fingerprintOf("POST", "/v1/invoices", { name: "A", metadata: { x: "1", y: "2" } }))).toEqual({ kind: "mismatch" });
    now = 1000;
    expect(store.lookup("k", a)).toEqual({ kind: "new" });
    store.begin("v", a);
    store.finish("v", a, null);
    expect(store.lookup("v", a)).toEqual({ kind: "new" });
  });
});

describe("fault paths", () => {
  it("match exactly, by prefix at a segment boundary, or with * for one segment", () => {
    expect(pathMatches("/v1/invoices", "/v1/invoices")).toBe(true);
    expect(pathMatches("/v1/invoices", "/v1/invoices/in_1/pay")).toBe(true);
    expect(pathMatches("/v1/invoice", "/v1/invoiceitems")).toBe(false);
    expect(pathMatches("/v1/invoices/*/pay", "/v1/invoices/in_1/pay")).toBe(true);
    expect(pathMatches("/v1/invoices/*/pay", "/v1/invoices/in_1/void")).toBe(false);
    expect(pathMatches(undefined, "/anything")).toBe(true);
  });
});

describe("parameters", () => {
  it("hold metadata to Stripe's documented limits and name the offending key", () => {
    const tooMany = Object.fromEntries(Array.from({ length: 51 }, (_, i) => [`k${i}`, "v"]));
    expect(() => new Params({ metadata: tooMany }).metadata()).toThrow(/at most 50 keys/);
    expect(() => new Params({ metadata: { ["k".repeat(41)]: "v" } }).metadata()).toThrow(/longer than 40/);
    expect(() => new Params({ metadata: { k: "v".repeat(501) } }).metadata()).toThrow(/500 characters/);
    expect(new Params({ metadata: "" }).metadata()).toBeNull();
  });

  it("name nested parameters as Stripe prints them", () => {
    const p = new Params({ lines: [{ amount: "1.5" }] });
    const [line] = p.objectArray("lines")!;
    expect(() => line.integer("amount")).toThrow(expect.objectContaining({ body: expect.objectContaining({ param: "lines[0][amount]" }) }));
    const q = new Params({ name: "x", surprise: "1" });
    q.string("name");
    expect(() => q.done()).toThrow(/Received unknown parameter: surprise/);
  });
});
