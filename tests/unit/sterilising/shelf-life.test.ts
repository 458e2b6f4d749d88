import { describe, expect, it } from "vitest";
import { DEFAULT_SHELF_LIFE_RULES, describeRule, expiryDate, expiryFor, isPackagingSystem, ruleFor } from "@/lib/sterilising/shelf-life";

// Shelf life by packaging and storage against the DIN 58953-8 guide values quoted in the
// project's check values: single sterile barrier (pouch) unprotected ≤ 48 h, in protected
// storage 6 months; a packaging system (barrier plus protective packaging: double pouch,
// container) up to 5 years. A two-layer wrap counts as a packaging system (common practice).

const ZONE = "Europe/London";

describe("default rules (DIN 58953-8 guide values)", () => {
  it("single pouch, unprotected storage: 48 hours", () => {
    expect(ruleFor(DEFAULT_SHELF_LIFE_RULES, "single_pouch", "unprotected")).toMatchObject({ amount: 48, unit: "hours" });
  });
  it("single pouch, protected storage (closed cabinet): 6 months", () => {
    expect(ruleFor(DEFAULT_SHELF_LIFE_RULES, "single_pouch", "protected")).toMatchObject({ amount: 6, unit: "months" });
  });
  it("packaging systems (double pouch, rigid container): 5 years in either storage", () => {
    for (const packaging of ["double_pouch", "rigid_container"]) {
      expect(isPackagingSystem(packaging)).toBe(true);
      for (const storage of ["protected", "unprotected"] as const) {
        expect(ruleFor(DEFAULT_SHELF_LIFE_RULES, packaging, storage)).toMatchObject({ amount: 5, unit: "years" });
      }
    }
    expect(isPackagingSystem("single_pouch")).toBe(false);
  });
  it("has a rule for every packaging the catalogue knows", () => {
    for (const packaging of ["wrap", "rigid_container", "single_pouch", "double_pouch"]) {
      for (const storage of ["protected", "unprotected"] as const) expect(ruleFor(DEFAULT_SHELF_LIFE_RULES, packaging, storage)).not.toBeNull();
    }
  });
});

describe("expiry dates", () => {
  it("48 h from the instant, read as the unit's calendar day", () => {
    // 2 December 2026 10:00 UTC is 10:00 in London (GMT): +48 h = 4 December.
    expect(expiryDate(new Date("2026-12-02T10:00:00Z"), { amount: 48, unit: "hours" }, ZONE)).toBe("2026-12-04");
    // 23:30 UTC on 30 June is 00:30 BST on 1 July: +48 h = 3 July in London.
    expect(expiryDate(new Date("2026-06-30T23:30:00Z"), { amount: 48, unit: "hours" }, ZONE)).toBe("2026-07-03");
  });
  it("6 months and 5 years on the calendar", () => {
    expect(expiryDate(new Date("2026-12-02T10:00:00Z"), { amount: 6, unit: "months" }, ZONE)).toBe("2027-06-02");
    expect(expiryDate(new Date("2026-12-02T10:00:00Z"), { amount: 5, unit: "years" }, ZONE)).toBe("2031-12-02");
    // A month-end start keeps to the shorter month's last day (computed).
    expect(expiryDate(new Date("2026-08-31T12:00:00Z"), { amount: 6, unit: "months" }, ZONE)).toBe("2027-02-28");
    expect(expiryDate(new Date("2028-02-29T12:00:00Z"), { amount: 5, unit: "years" }, ZONE)).toBe("2033-02-28");
  });
  it("refuses a shelf life that is not a whole positive number", () => {
    expect(() => expiryDate(new Date(), { amount: 0, unit: "days" }, ZONE)).toThrow(RangeError);
    expect(() => expiryDate(new Date(), { amount: 1.5, unit: "days" }, ZONE)).toThrow(RangeError);
  });
  it("says what to do when no rule is set", () => {
    const result = expiryFor([], { packaging: "wrap", storage: "protected", sterilisedAt: new Date(), timeZone: ZONE });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toMatch(/No shelf-life rule/);
    expect(describeRule({ amount: 1, unit: "years" })).toBe("1 year");
    expect(describeRule({ amount: 48, unit: "hours" })).toBe("48 hours");
  });
});
