import { addDays, addHours, addMonths, addYears, format } from "date-fns";
import { tz, TZDate } from "@date-fns/tz";

// Shelf life of a sterilised pack, by its packaging and how the receiving site stores it. Shelf
// life is event-related; these are the guide values of DIN 58953-8 (as quoted in the project's
// check values): a single sterile barrier (one pouch) stored unprotected ≤ 48 h, the same in
// protected storage (closed cabinet) 6 months, a packaging system (sterile barrier plus
// protective packaging: double pouch, rigid container, two-layer wrap) up to 5 years — never
// beyond the manufacturer's date. The unit's quality lead may change each rule. Pure.

export const STORAGE_KINDS = ["protected", "unprotected"] as const;
export type StorageKind = (typeof STORAGE_KINDS)[number];
export const STORAGE_LABELS: Record<StorageKind, string> = {
  protected: "Protected (closed cabinet or drawer)",
  unprotected: "Unprotected (open shelf)",
};

export const SHELF_LIFE_UNITS = ["hours", "days", "months", "years"] as const;
export type ShelfLifeUnitName = (typeof SHELF_LIFE_UNITS)[number];

export interface ShelfLifeRule {
  packaging: string;
  storage: StorageKind;
  amount: number;
  unit: ShelfLifeUnitName;
}

/** Packagings that form a packaging system (sterile barrier plus protective packaging). */
const PACKAGING_SYSTEMS = new Set(["double_pouch", "rigid_container", "wrap"]);

/**
 * The default rules: DIN 58953-8 guide values. A wrapped tray counts as a packaging system
 * because it is wrapped twice, the outer wrap protecting the inner one (common practice).
 */
export const DEFAULT_SHELF_LIFE_RULES: readonly ShelfLifeRule[] = [
  { packaging: "single_pouch", storage: "unprotected", amount: 48, unit: "hours" },
  { packaging: "single_pouch", storage: "protected", amount: 6, unit: "months" },
  ...["double_pouch", "rigid_container", "wrap"].flatMap((packaging) =>
    STORAGE_KINDS.map((storage) => ({ packaging, storage, amount: 5, unit: "years" as const })),
  ),
];

export function isPackagingSystem(packaging: string): boolean {
  return PACKAGING_SYSTEMS.has(packaging);
}

export function describeRule(rule: Pick<ShelfLifeRule, "amount" | "unit">): string {
  const unit = rule.amount === 1 ? rule.unit.replace(/s$/, "") : rule.unit;
  return `${rule.amount} ${unit}`;
}

/** The rule for a packaging and storage, or null when none is set. */
export function ruleFor(rules: readonly ShelfLifeRule[], packaging: string, storage: StorageKind): ShelfLifeRule | null {
  return rules.find((r) => r.packaging === packaging && r.storage === storage) ?? null;
}

/**
 * The use-by date (YYYY-MM-DD in the unit's time zone) of a pack sterilised at `sterilisedAt`:
 * hours count from the instant; days, months and years from the local calendar date (adding
 * months keeps the day of the month, or takes the month's last day when it is shorter: 31 August
 * plus one month is 30 September). The pack may be used up to and including that day.
 */
export function expiryDate(sterilisedAt: Date, rule: Pick<ShelfLifeRule, "amount" | "unit">, timeZone: string): string {
  if (!Number.isInteger(rule.amount) || rule.amount <= 0) throw new RangeError(`A shelf life is a whole positive number, got ${rule.amount}`);
  const local = new TZDate(sterilisedAt.getTime(), timeZone);
  let end: Date;
  switch (rule.unit) {
    case "hours":
      end = addHours(local, rule.amount);
      break;
    case "days":
      end = addDays(local, rule.amount);
      break;
    case "months":
      end = addMonths(local, rule.amount);
      break;
    case "years":
      end = addYears(local, rule.amount);
      break;
  }
  return format(end, "yyyy-MM-dd", { in: tz(timeZone) });
}

/** The expiry for a pack, or why none can be given. */
export function expiryFor(
  rules: readonly ShelfLifeRule[],
  input: { packaging: string; storage: StorageKind; sterilisedAt: Date; timeZone: string },
): { ok: true; date: string; rule: ShelfLifeRule } | { ok: false; reason: string } {
  const rule = ruleFor(rules, input.packaging, input.storage);
  if (!rule) {
    return { ok: false, reason: `No shelf-life rule is set for ${input.packaging.replace(/_/g, " ")} in ${input.storage} storage; add one under Shelf life.` };
  }
  return { ok: true, date: expiryDate(input.sterilisedAt, rule, input.timeZone), rule };
}
