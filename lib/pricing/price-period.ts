// Prices one billing period of delivered cycles under a contract version: processing fees with
// graduated volume bands, surcharges, the SLA credit for late sets and the minimum-fee top-up.
//
// Decisions, in one place:
// - The period is one volume period (a calendar month in the unit's time zone, see
//   `calendarMonthPeriod`): band counts start at zero at its start and the minimum monthly fee
//   applies once to it. A contract version that starts or ends mid-month is priced for the part
//   of the month it covers, with the full minimum fee; pass adjusted terms to pro-rate.
// - Sets of a class are counted in delivery order (`deliveredAt`, then cycle id), so the n-th set
//   delivered in the month is priced at the band containing n. That band price is the set's own
//   fee (its marginal band price), which the percentage surcharges and the SLA credit use.
// - Fixed surcharges make one line of quantity × amount. A percentage surcharge, and the SLA
//   credit, is a share of the sum of the fees of the sets it applies to, rounded once (half away
//   from zero) on that sum, and is written as one lump-sum line (quantity 1, unit code LS), so
//   quantity × unit price always equals the line amount.
// - The SLA credit is a share of the late sets' processing fees only; surcharges are not credited.
// - The minimum fee is compared with processing fees plus surcharges, before the SLA credit
//   (common practice); the credit is then taken off the topped-up amount.
// - Line order: processing lines (rate-card class order, then band), surcharges (in
//   `SURCHARGE_KINDS` order), the minimum-fee top-up, the SLA credit. Line ids are "1", "2", …

import { PricingError } from "./errors";
import { applyBasisPoints, assertCurrency, formatBasisPoints, formatMinor, multiplyExact, sumExact } from "./money";
import { parseInstant } from "./period";
import { assertVatTreatment } from "./totals";
import {
  SERVICE_LEVELS,
  SURCHARGE_KINDS,
  type BillingPeriod,
  type ContractTerms,
  type InvoiceLine,
  type PricedCycleInput,
  type ServiceLevel,
  type SetClassRate,
  type SurchargeKind,
  type SurchargeRule,
} from "./types";

/** How one input cycle was priced; one per input cycle, in delivery order. */
export interface PricedCycle {
  cycleId: string;
  setClass: string;
  serviceLevel: ServiceLevel;
  late: boolean;
  deliveredAt: string;
  /** 1-based rank of the set among its class's sets delivered in the period. */
  volumePosition: number;
  /** Index into the class's `bands`. */
  bandIndex: number;
  /** The set's processing fee: the unit price of its band. */
  feeMinor: number;
  processingLineId: string;
  /** Surcharge kinds the contract priced for this cycle. */
  surcharges: SurchargeKind[];
}

export interface PricingWarning {
  code: "surcharge_not_in_contract";
  kind: SurchargeKind;
  cycleIds: string[];
  message: string;
}

export interface PricedPeriod {
  contractId: string;
  currency: string;
  period: { start: string; end: string };
  lines: InvoiceLine[];
  cycles: PricedCycle[];
  summary: {
    processingMinor: number;
    surchargesMinor: number;
    /** Processing fees plus surcharges: what the minimum fee is compared with. */
    minimumFeeBaseMinor: number;
    minimumFeeTopUpMinor: number;
    /** Positive amount credited (the line itself is negative). */
    slaCreditMinor: number;
    /** Σ line net amounts. */
    netMinor: number;
  };
  warnings: PricingWarning[];
}

const SURCHARGE_LABELS: Record<SurchargeKind, string> = {
  express: "Express turnaround",
  out_of_hours: "Out-of-hours collection",
  heavy_soil: "Heavy soil or no pre-clean",
  missing_instrument_investigation: "Missing-instrument investigation",
  low_temperature: "Low-temperature sterilisation",
  loaner: "Loaner set handling",
};

const FLAG_NAMES = ["heavySoil", "outOfHours", "missingInstrumentInvestigation", "lowTemperature", "loaner"] as const;

function surchargeApplies(kind: SurchargeKind, cycle: PricedCycleInput): boolean {
  switch (kind) {
    case "express":
      return cycle.serviceLevel === "express";
    case "out_of_hours":
      return cycle.flags.outOfHours;
    case "heavy_soil":
      return cycle.flags.heavySoil;
    case "missing_instrument_investigation":
      return cycle.flags.missingInstrumentInvestigation;
    case "low_temperature":
      return cycle.flags.lowTemperature;
    case "loaner":
      return cycle.flags.loaner;
  }
}

function termsError(terms: ContractTerms, message: string, field: string): PricingError {
  return new PricingError("invalid_terms", `contract ${terms.contractId}: ${message}`, { contractId: terms.contractId, field });
}

function assertTermsInteger(terms: ContractTerms, value: unknown, field: string, min: number, max = Number.MAX_SAFE_INTEGER) {
  if (typeof value !== "number" || !Number.isSafeInteger(value) || value < min || value > max) {
    throw termsError(terms, `${field} must be a whole number from ${min} to ${max}, got ${String(value)}`, field);
  }
}

function assertBands(terms: ContractTerms, rate: SetClassRate) {
  const where = `rate of set class ${rate.setClass}`;
  if (!Array.isArray(rate.bands) || rate.bands.length === 0) {
    throw termsError(terms, `${where} has no price band`, `${where}.bands`);
  }
  let previous = 0;
  rate.bands.forEach((band, index) => {
    const field = `${where}, band ${index + 1}`;
    assertTermsInteger(terms, band.unitPriceMinor, `${field} unit price`, 0);
    const last = index === rate.bands.length - 1;
    if (band.upToQuantity === null) {
      if (!last) throw termsError(terms, `${field} has no upper limit but is not the last band`, field);
      return;
    }
    if (last) throw termsError(terms, `${field} is the last band and must have no upper limit (upToQuantity: null)`, field);
    assertTermsInteger(terms, band.upToQuantity, `${field} upper limit`, previous + 1);
    previous = band.upToQuantity;
  });
}

// Throws an `invalid_terms` (or `currency_mismatch`) error naming the first thing to fix.
export function assertContractTerms(terms: ContractTerms): void {
  if (!terms || typeof terms.contractId !== "string" || terms.contractId.trim() === "") {
    throw new PricingError("invalid_terms", "contract terms need a contractId");
  }
  const validFrom = parseInstant(terms.validFrom, `contract ${terms.contractId} validFrom`, "invalid_terms");
  if (terms.validTo !== null) {
    const validTo = parseInstant(terms.validTo, `contract ${terms.contractId} validTo`, "invalid_terms");
    if (validTo <= validFrom) throw termsError(terms, "validTo must be after validFrom", "validTo");
  }
  assertCurrency(terms.currency, `contract ${terms.contractId} currency`);
  const card = terms.rateCard;
  if (!card || !Array.isArray(card.classes) || !Array.isArray(card.surcharges)) {
    throw termsError(terms, "rateCard needs classes and surcharges lists", "rateCard");
  }
  assertCurrency(card.currency, `contract ${terms.contractId} rate card currency`);
  if (card.currency !== terms.currency) {
    throw new PricingError(
      "currency_mismatch",
      `contract ${terms.contractId} is in ${terms.currency} but its rate card is in ${card.currency}; both must use one currency`,
      { contractId: terms.contractId, contractCurrency: terms.currency, rateCardCurrency: card.currency },
    );
  }
  assertVatTreatment(terms.vat, `contract ${terms.contractId} VAT`);
  assertTermsInteger(terms, terms.paymentTermsDays, "paymentTermsDays", 0, 3650);
  assertTermsInteger(terms, terms.minimumMonthlyFeeMinor, "minimumMonthlyFeeMinor", 0);
  assertTermsInteger(terms, terms.slaCreditBasisPoints, "slaCreditBasisPoints", 0, 10_000);
  for (const level of SERVICE_LEVELS) {
    const hours = terms.turnaroundHours?.[level];
    if (typeof hours !== "number" || !Number.isFinite(hours) || hours <= 0) {
      throw termsError(terms, `turnaroundHours.${level} must be a positive number of hours`, `turnaroundHours.${level}`);
    }
  }
  const classes = new Set<string>();
  for (const rate of card.classes) {
    if (typeof rate.setClass !== "string" || rate.setClass.trim() === "") {
      throw termsError(terms, "every rate needs a setClass", "rateCard.classes");
    }
    if (classes.has(rate.setClass)) throw termsError(terms, `set class ${rate.setClass} is priced twice`, "rateCard.classes");
    classes.add(rate.setClass);
    if (typeof rate.label !== "string" || rate.label.trim() === "") {
      throw termsError(terms, `set class ${rate.setClass} needs a label for the invoice line`, "rateCard.classes");
    }
    assertBands(terms, rate);
  }
  const kinds = new Set<string>();
  for (const rule of card.surcharges) {
    if (!SURCHARGE_KINDS.includes(rule.kind)) {
      throw termsError(terms, `unknown surcharge kind ${JSON.stringify(rule.kind)}; use one of ${SURCHARGE_KINDS.join(", ")}`, "rateCard.surcharges");
    }
    if (kinds.has(rule.kind)) throw termsError(terms, `surcharge ${rule.kind} is priced twice`, "rateCard.surcharges");
    kinds.add(rule.kind);
    if (rule.basis === "per_set") assertTermsInteger(terms, rule.amountMinor, `surcharge ${rule.kind} amountMinor`, 0);
    else if (rule.basis === "percent_of_fee") assertTermsInteger(terms, rule.basisPoints, `surcharge ${rule.kind} basisPoints`, 0, 100_000);
    else throw termsError(terms, `surcharge ${(rule as SurchargeRule).kind} basis must be "per_set" or "percent_of_fee"`, "rateCard.surcharges");
  }
}

function cycleError(code: "invalid_cycle", index: number, cycleId: unknown, message: string): PricingError {
  const name = typeof cycleId === "string" && cycleId !== "" ? `cycle ${cycleId}` : `cycle #${index + 1}`;
  return new PricingError(code, `${name}: ${message}`, { cycleId, index });
}

function assertCycleShape(cycle: PricedCycleInput, index: number): void {
  if (!cycle || typeof cycle.cycleId !== "string" || cycle.cycleId.trim() === "") {
    throw cycleError("invalid_cycle", index, cycle?.cycleId, "needs a non-empty cycleId");
  }
  if (typeof cycle.setClass !== "string" || cycle.setClass === "") {
    throw cycleError("invalid_cycle", index, cycle.cycleId, "needs a setClass");
  }
  if (!SERVICE_LEVELS.includes(cycle.serviceLevel)) {
    throw cycleError("invalid_cycle", index, cycle.cycleId, `serviceLevel must be one of ${SERVICE_LEVELS.join(", ")}, got ${JSON.stringify(cycle.serviceLevel)}`);
  }
  for (const flag of FLAG_NAMES) {
    if (typeof cycle.flags?.[flag] !== "boolean") {
      throw cycleError("invalid_cycle", index, cycle.cycleId, `flags.${flag} must be true or false`);
    }
  }
  if (typeof cycle.late !== "boolean") throw cycleError("invalid_cycle", index, cycle.cycleId, "late must be true or false");
}

function bandDescription(rate: SetClassRate, bandIndex: number): string {
  if (rate.bands.length === 1) return rate.label;
  const from = bandIndex === 0 ? 1 : (rate.bands[bandIndex - 1].upToQuantity as number) + 1;
  const to = rate.bands[bandIndex].upToQuantity;
  return to === null ? `${rate.label}, sets ${from} and over in the period` : `${rate.label}, sets ${from}–${to} in the period`;
}

interface SortableCycle {
  input: PricedCycleInput;
  deliveredMs: number;
  deliveredAt: string;
}

function compareDelivery(a: SortableCycle, b: SortableCycle): number {
  if (a.deliveredMs !== b.deliveredMs) return a.deliveredMs - b.deliveredMs;
  return a.input.cycleId < b.input.cycleId ? -1 : a.input.cycleId > b.input.cycleId ? 1 : 0;
}

/**
 * Prices the delivered cycles of one billing period under `terms` and returns the invoice lines,
 * each with the cycle ids it was priced from. Throws a `PricingError` for a cycle id given twice
 * (`duplicate_cycle`), a set class missing from the rate card (`unknown_set_class`, naming the
 * class and the cycle), a currency mismatch between contract and rate card
 * (`currency_mismatch`), a cycle delivered outside the period (`outside_period`) or outside the
 * contract's validity (`outside_contract`), and malformed terms or cycles.
 */
export function priceInvoicePeriod(
  terms: ContractTerms,
  cycles: readonly PricedCycleInput[],
  period: BillingPeriod,
): PricedPeriod {
  assertContractTerms(terms);
  const periodStart = parseInstant(period?.start, "period start");
  const periodEnd = parseInstant(period?.end, "period end");
  if (periodEnd <= periodStart) {
    throw new PricingError("invalid_period", "period end must be after period start");
  }
  const validFrom = parseInstant(terms.validFrom, "validFrom", "invalid_terms");
  const validTo = terms.validTo === null ? null : parseInstant(terms.validTo, "validTo", "invalid_terms");
  if (periodEnd <= validFrom || (validTo !== null && periodStart >= validTo)) {
    throw new PricingError(
      "outside_contract",
      `the period ${periodStart.toISOString()} to ${periodEnd.toISOString()} lies outside contract ${terms.contractId}'s validity`,
      { contractId: terms.contractId },
    );
  }

  const rates = new Map(terms.rateCard.classes.map((rate) => [rate.setClass, rate]));
  const seen = new Set<string>();
  const sortable: SortableCycle[] = cycles.map((cycle, index) => {
    assertCycleShape(cycle, index);
    if (seen.has(cycle.cycleId)) {
      throw new PricingError("duplicate_cycle", `cycle ${cycle.cycleId} appears more than once; a cycle is priced exactly once`, {
        cycleId: cycle.cycleId,
        index,
      });
    }
    seen.add(cycle.cycleId);
    if (!rates.has(cycle.setClass)) {
      throw new PricingError(
        "unknown_set_class",
        `cycle ${cycle.cycleId} has set class ${JSON.stringify(cycle.setClass)}, which the rate card of contract ${terms.contractId} does not price; add the class to the rate card or correct the cycle`,
        { cycleId: cycle.cycleId, setClass: cycle.setClass, contractId: terms.contractId },
      );
    }
    const delivered = parseInstant(cycle.deliveredAt, `cycle ${cycle.cycleId} deliveredAt`, "invalid_cycle");
    if (delivered < periodStart || delivered >= periodEnd) {
      throw new PricingError(
        "outside_period",
        `cycle ${cycle.cycleId} was delivered at ${delivered.toISOString()}, outside the period ${periodStart.toISOString()} to ${periodEnd.toISOString()}`,
        { cycleId: cycle.cycleId },
      );
    }
    if (delivered < validFrom || (validTo !== null && delivered >= validTo)) {
      throw new PricingError(
        "outside_contract",
        `cycle ${cycle.cycleId} was delivered at ${delivered.toISOString()}, when contract ${terms.contractId} was not in force`,
        { cycleId: cycle.cycleId, contractId: terms.contractId },
      );
    }
    return { input: cycle, deliveredMs: delivered.getTime(), deliveredAt: delivered.toISOString() };
  });
  sortable.sort(compareDelivery);

  const lines: InvoiceLine[] = [];
  const vat = { ...terms.vat };
  const addLine = (line: Omit<InvoiceLine, "id" | "vat">): InvoiceLine => {
    const full: InvoiceLine = { id: String(lines.length + 1), ...line, vat: { ...vat } };
    lines.push(full);
    return full;
  };

  // Processing fees, band by band.
  const priced = new Map<string, PricedCycle>();
  for (const rate of terms.rateCard.classes) {
    const ofClass = sortable.filter((entry) => entry.input.setClass === rate.setClass);
    const byBand: SortableCycle[][] = rate.bands.map(() => []);
    const positions = new Map<string, number>();
    ofClass.forEach((entry, index) => {
      const position = index + 1;
      const bandIndex = rate.bands.findIndex((band) => band.upToQuantity === null || position <= band.upToQuantity);
      byBand[bandIndex].push(entry);
      positions.set(entry.input.cycleId, position);
    });
    byBand.forEach((entries, bandIndex) => {
      if (entries.length === 0) return;
      const unitPriceMinor = rate.bands[bandIndex].unitPriceMinor;
      const line = addLine({
        kind: "processing",
        itemCode: `set:${rate.setClass}`,
        description: bandDescription(rate, bandIndex),
        quantity: entries.length,
        unitCode: "C62",
        unitPriceMinor,
        netAmountMinor: multiplyExact(entries.length, unitPriceMinor, `processing fees of ${rate.setClass}`),
        cycleIds: entries.map((entry) => entry.input.cycleId),
      });
      for (const entry of entries) {
        priced.set(entry.input.cycleId, {
          cycleId: entry.input.cycleId,
          setClass: rate.setClass,
          serviceLevel: entry.input.serviceLevel,
          late: entry.input.late,
          deliveredAt: entry.deliveredAt,
          volumePosition: positions.get(entry.input.cycleId) as number,
          bandIndex,
          feeMinor: unitPriceMinor,
          processingLineId: line.id,
          surcharges: [],
        });
      }
    });
  }
  const processingMinor = sumExact(
    lines.map((line) => line.netAmountMinor),
    "processing fees",
  );
  const pricedInOrder = sortable.map((entry) => priced.get(entry.input.cycleId) as PricedCycle);

  // Surcharges, one line per kind.
  const rules = new Map<SurchargeKind, SurchargeRule>(terms.rateCard.surcharges.map((rule) => [rule.kind, rule]));
  const warnings: PricingWarning[] = [];
  const surchargeAmounts: number[] = [];
  for (const kind of SURCHARGE_KINDS) {
    const carrying = pricedInOrder.filter((_, index) => surchargeApplies(kind, sortable[index].input));
    if (carrying.length === 0) continue;
    const cycleIds = carrying.map((cycle) => cycle.cycleId);
    const rule = rules.get(kind);
    if (!rule) {
      warnings.push({
        code: "surcharge_not_in_contract",
        kind,
        cycleIds,
        message: `${carrying.length} cycle(s) carry ${SURCHARGE_LABELS[kind].toLowerCase()}, but contract ${terms.contractId} prices no such surcharge, so none is charged`,
      });
      continue;
    }
    const description = rule.label?.trim() || SURCHARGE_LABELS[kind];
    let line: InvoiceLine;
    if (rule.basis === "per_set") {
      line = addLine({
        kind: "surcharge",
        itemCode: `surcharge:${kind}`,
        description,
        quantity: carrying.length,
        unitCode: "C62",
        unitPriceMinor: rule.amountMinor,
        netAmountMinor: multiplyExact(carrying.length, rule.amountMinor, `surcharge ${kind}`),
        cycleIds,
      });
    } else {
      const baseMinor = sumExact(
        carrying.map((cycle) => cycle.feeMinor),
        `fees under surcharge ${kind}`,
      );
      const amount = applyBasisPoints(baseMinor, rule.basisPoints);
      line = addLine({
        kind: "surcharge",
        itemCode: `surcharge:${kind}`,
        description,
        note: `${formatBasisPoints(rule.basisPoints)} % of ${formatMinor(baseMinor)} ${terms.currency} processing fees of ${carrying.length} set(s)`,
        quantity: 1,
        unitCode: "LS",
        unitPriceMinor: amount,
        netAmountMinor: amount,
        cycleIds,
      });
    }
    surchargeAmounts.push(line.netAmountMinor);
    for (const cycle of carrying) cycle.surcharges.push(kind);
  }
  const surchargesMinor = sumExact(surchargeAmounts, "surcharges");

  // Minimum monthly fee, compared with processing fees plus surcharges before credits.
  const minimumFeeBaseMinor = sumExact([processingMinor, surchargesMinor], "processing fees and surcharges");
  const minimumFeeTopUpMinor = Math.max(0, terms.minimumMonthlyFeeMinor - minimumFeeBaseMinor);
  if (minimumFeeTopUpMinor > 0) {
    addLine({
      kind: "minimum_fee_top_up",
      itemCode: "minimum-fee",
      description: "Minimum monthly fee top-up",
      note: `minimum ${formatMinor(terms.minimumMonthlyFeeMinor)} ${terms.currency}; processing fees and surcharges ${formatMinor(minimumFeeBaseMinor)} ${terms.currency}`,
      quantity: 1,
      unitCode: "LS",
      unitPriceMinor: minimumFeeTopUpMinor,
      netAmountMinor: minimumFeeTopUpMinor,
      cycleIds: pricedInOrder.map((cycle) => cycle.cycleId),
    });
  }

  // SLA credit: a share of each late set's own processing fee, rounded once on the sum.
  let slaCreditMinor = 0;
  const late = pricedInOrder.filter((cycle) => cycle.late);
  if (late.length > 0 && terms.slaCreditBasisPoints > 0) {
    const baseMinor = sumExact(
      late.map((cycle) => cycle.feeMinor),
      "fees of late sets",
    );
    slaCreditMinor = applyBasisPoints(baseMinor, terms.slaCreditBasisPoints);
    addLine({
      kind: "sla_credit",
      itemCode: "sla-credit",
      description: "Turnaround credit for late sets",
      note: `${formatBasisPoints(terms.slaCreditBasisPoints)} % of ${formatMinor(baseMinor)} ${terms.currency} processing fees of ${late.length} late set(s)`,
      quantity: -1,
      unitCode: "LS",
      unitPriceMinor: slaCreditMinor,
      netAmountMinor: -slaCreditMinor,
      cycleIds: late.map((cycle) => cycle.cycleId),
    });
  }

  return {
    contractId: terms.contractId,
    currency: terms.currency,
    period: { start: periodStart.toISOString(), end: periodEnd.toISOString() },
    lines,
    cycles: pricedInOrder,
    summary: {
      processingMinor,
      surchargesMinor,
      minimumFeeBaseMinor,
      minimumFeeTopUpMinor,
      slaCreditMinor,
      netMinor: sumExact(
        lines.map((line) => line.netAmountMinor),
        "invoice net amount",
      ),
    },
    warnings,
  };
}
