// One customer's invoice for one billing month, from its delivered cycles not yet priced and the
// contract versions in force during the month (pure: the data comes in, the lines go out).
//
// Decisions:
// - Late is the turnaround clock's verdict (lib/turnaround/cycle.ts) under the version in force
//   when the set was delivered; a cycle with no receipt time has no verdict and is not late.
// - A customer is invoiced all or nothing: a cycle delivered while no version was in force, a set
//   class the rate card does not price, or versions in different currencies leave the customer
//   out of the run with the reasons, and its cycles wait for a later run.
// - A month split by a change of version is priced per part (see run-periods.ts); on an invoice
//   of more than one part every line names its version and dates.
// - A later run over a month already invoiced to the customer (sets whose delivery was recorded
//   late) continues the month: volume bands count on from the sets already billed in the same
//   part, and the minimum fee is settled against what was billed: the top-up becomes
//   max(0, minimum − everything billed in the part) minus the top-up already invoiced, which is
//   negative when the new sets fill part of a top-up already paid for.

import { PricingError } from "@/lib/pricing/errors";
import { formatMinor } from "@/lib/pricing/money";
import { priceInvoicePeriod } from "@/lib/pricing/price-period";
import { computeInvoiceTotals } from "@/lib/pricing/totals";
import type { ContractTerms, InvoiceLineKind, InvoiceTotals, PricedCycleInput, VatTreatment } from "@/lib/pricing/types";
import { type CycleClock, cycleClock, type CycleClockTerms } from "@/lib/turnaround/cycle";
import { continueBands, type Interval, localDate, localDaysIn, partAt, partLabel, type PeriodPart, proratedMinimumFee, splitPeriod } from "./run-periods";

/** A contract version as billing needs it (lib/contracts' ContractTermsInForce has this shape). */
export interface RunTerms extends ContractTerms, CycleClockTerms {
  id: number;
  reference: string;
}

export interface BillableCycle {
  id: number;
  serial: string;
  setName: string;
  setClass: string;
  serviceLevel: "standard" | "express";
  heavySoil: boolean;
  outOfHours: boolean;
  missingInstrument: boolean;
  lowTemperature: boolean;
  loaner: boolean;
  receivedAt: string | null;
  releasedAt: string | null;
  deliveredAt: string;
}

/** What earlier invoices of the same month already billed under one version. */
export interface EarlierPartBilling {
  contractId: number;
  /** Sets billed per set class. */
  classCounts: Map<string, number>;
  /** Processing fees plus surcharges billed. */
  baseMinor: number;
  /** Minimum-fee top-ups billed (net of any reduction). */
  topUpMinor: number;
  invoiceNumbers: string[];
}

export interface RunLine {
  position: number;
  kind: InvoiceLineKind;
  itemCode: string;
  description: string;
  note: string | null;
  quantity: number;
  unitPriceMinor: number;
  netMinor: number;
  vat: VatTreatment;
  cycleIds: number[];
  contractId: number;
  contractReference: string;
}

export interface CycleEvidence {
  cycleId: number;
  serial: string;
  setName: string;
  deliveredAt: string;
  late: boolean;
  /** When the set was due under its contract (null without a verdict). */
  dueAt: string | null;
  contractReference: string | null;
  /** Its processing fee, once priced. */
  feeMinor: number | null;
}

export interface CustomerPricingInput {
  period: Interval;
  timeZone: string;
  versions: readonly RunTerms[];
  cycles: readonly BillableCycle[];
  earlier?: readonly EarlierPartBilling[];
}

export interface PricedPart {
  contractId: number;
  reference: string;
  label: string;
  cycles: number;
}

export type CustomerPricing =
  | {
      ok: true;
      currency: string;
      /** The version in force at the end of the month's billed parts: its payment terms apply. */
      contract: RunTerms;
      parts: PricedPart[];
      lines: RunLine[];
      totals: InvoiceTotals;
      evidence: CycleEvidence[];
      warnings: string[];
    }
  | { ok: false; problems: string[]; evidence: CycleEvidence[]; warnings: string[] };

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function examples(cycles: readonly BillableCycle[]): string {
  const serials = cycles.slice(0, 3).map((c) => c.serial);
  return cycles.length > 3 ? `${serials.join(", ")} and ${cycles.length - 3} more` : serials.join(", ");
}

/** Prices one customer's month, or says why it cannot be invoiced. */
export function priceCustomerMonth(input: CustomerPricingInput): CustomerPricing {
  const { period, timeZone } = input;
  const parts = splitPeriod(period, input.versions);
  const problems: string[] = [];
  const warnings: string[] = [];
  const evidence = new Map<number, CycleEvidence>();
  const byPart = new Map<PeriodPart<RunTerms>, BillableCycle[]>();
  const uncovered: BillableCycle[] = [];
  // One turnaround clock per part: its service calendar is compiled once, not once per cycle.
  const clocks = new Map<PeriodPart<RunTerms>, CycleClock>();

  for (const cycle of input.cycles) {
    const part = partAt(parts, cycle.deliveredAt);
    const entry: CycleEvidence = {
      cycleId: cycle.id,
      serial: cycle.serial,
      setName: cycle.setName,
      deliveredAt: cycle.deliveredAt,
      late: false,
      dueAt: null,
      contractReference: part?.terms.reference ?? null,
      feeMinor: null,
    };
    evidence.set(cycle.id, entry);
    if (!part) {
      uncovered.push(cycle);
      continue;
    }
    try {
      let clock = clocks.get(part);
      if (!clock) clocks.set(part, (clock = cycleClock(part.terms)));
      const outcome = clock(
        { serviceLevel: cycle.serviceLevel, receivedAt: cycle.receivedAt, releasedAt: cycle.releasedAt, deliveredAt: cycle.deliveredAt },
      );
      if (outcome) {
        entry.late = outcome.late;
        entry.dueAt = outcome.dueAt.toISOString();
      }
    } catch (error) {
      problems.push(`Set ${cycle.serial}: its turnaround could not be measured (${(error as Error).message}).`);
    }
    const list = byPart.get(part) ?? [];
    list.push(cycle);
    byPart.set(part, list);
  }
  const evidenceList = () => [...evidence.values()];

  if (input.versions.length === 0) {
    return {
      ok: false,
      problems: [
        `No contract version is in force during this month, so ${plural(input.cycles.length, "delivered set")} cannot be priced. ` +
          "Add a contract version that covers these dates, then preview again.",
      ],
      evidence: evidenceList(),
      warnings,
    };
  }
  if (uncovered.length > 0) {
    const days = [...new Set(uncovered.map((c) => localDate(c.deliveredAt, timeZone)))].sort();
    problems.push(
      `${plural(uncovered.length, "set")} (${examples(uncovered)}) ${uncovered.length === 1 ? "was" : "were"} delivered on ` +
        `${days.slice(0, 4).join(", ")}${days.length > 4 ? " …" : ""}, when no contract version was in force. ` +
        "Extend a version to cover these days, then preview again.",
    );
  }
  const priced = parts.filter((part) => byPart.has(part));
  const currencies = [...new Set(priced.map((part) => part.terms.currency))];
  if (currencies.length > 1) {
    problems.push(
      `The versions in force this month bill in different currencies (${priced.map((p) => `${p.terms.reference}: ${p.terms.currency}`).join(", ")}); ` +
        "one invoice has one currency. Correct the versions, then preview again.",
    );
  }
  for (const part of priced) {
    const classes = new Set(part.terms.rateCard.classes.map((rate) => rate.setClass));
    const missing = new Map<string, BillableCycle[]>();
    for (const cycle of byPart.get(part)!) {
      if (classes.has(cycle.setClass)) continue;
      missing.set(cycle.setClass, [...(missing.get(cycle.setClass) ?? []), cycle]);
    }
    for (const [setClass, cycles] of missing) {
      problems.push(
        `${plural(cycles.length, "set")} of class "${setClass}" (${examples(cycles)}) ${cycles.length === 1 ? "is" : "are"} not priced by the rate card of ` +
          `${part.terms.reference}. Add the class to that version's rate card, then preview again.`,
      );
    }
  }
  if (problems.length > 0) return { ok: false, problems, evidence: evidenceList(), warnings };

  const earlierByContract = new Map((input.earlier ?? []).map((e) => [e.contractId, e]));
  const several = priced.length > 1;
  const lines: Omit<RunLine, "position">[] = [];
  const pricedParts: PricedPart[] = [];
  for (const part of priced) {
    const terms = part.terms;
    const cycles = byPart.get(part)!;
    const label = partLabel(part, timeZone);
    const minimum = part.wholePeriod ? terms.minimumMonthlyFeeMinor : proratedMinimumFee(terms.minimumMonthlyFeeMinor, part, period, timeZone);
    const earlier = earlierByContract.get(terms.id);
    const engineTerms: ContractTerms = {
      ...terms,
      minimumMonthlyFeeMinor: earlier ? 0 : minimum,
      rateCard: {
        ...terms.rateCard,
        classes: terms.rateCard.classes.map((rate) => ({ ...rate, bands: continueBands(rate.bands, earlier?.classCounts.get(rate.setClass) ?? 0) })),
      },
    };
    const inputs: PricedCycleInput[] = cycles.map((cycle) => ({
      cycleId: String(cycle.id),
      setClass: cycle.setClass,
      serviceLevel: cycle.serviceLevel,
      flags: {
        heavySoil: cycle.heavySoil,
        outOfHours: cycle.outOfHours,
        missingInstrumentInvestigation: cycle.missingInstrument,
        lowTemperature: cycle.lowTemperature,
        loaner: cycle.loaner,
      },
      late: evidence.get(cycle.id)!.late,
      deliveredAt: cycle.deliveredAt,
    }));
    let result;
    try {
      result = priceInvoicePeriod(engineTerms, inputs, part);
    } catch (error) {
      if (error instanceof PricingError) {
        return { ok: false, problems: [`${terms.reference}: ${error.message}`], evidence: evidenceList(), warnings };
      }
      throw error;
    }
    for (const cycle of result.cycles) evidence.get(Number(cycle.cycleId))!.feeMinor = cycle.feeMinor;
    warnings.push(...result.warnings.map((w) => w.message));

    const partLines: Omit<RunLine, "position">[] = result.lines.map((line) => ({
      kind: line.kind,
      itemCode: line.itemCode,
      description: several ? `${line.description} (${terms.reference}, ${label})` : line.description,
      note: line.note ?? null,
      quantity: line.quantity,
      unitPriceMinor: line.unitPriceMinor,
      netMinor: line.netAmountMinor,
      vat: { ...line.vat },
      cycleIds: line.cycleIds.map(Number),
      contractId: terms.id,
      contractReference: terms.reference,
    }));
    const daysNote = part.wholePeriod ? "" : `; pro-rated for ${localDaysIn(part, timeZone)} of ${localDaysIn(period, timeZone)} days`;
    for (const line of partLines) {
      if (line.kind === "minimum_fee_top_up" && daysNote) line.note = `${line.note}${daysNote}`;
    }
    if (earlier) {
      const billed = earlier.baseMinor + earlier.topUpMinor;
      const topUp = Math.max(0, minimum - (earlier.baseMinor + result.summary.minimumFeeBaseMinor)) - earlier.topUpMinor;
      if (topUp !== 0) {
        const line: Omit<RunLine, "position"> = {
          kind: "minimum_fee_top_up",
          itemCode: "minimum-fee",
          description: `${topUp > 0 ? "Minimum monthly fee top-up" : "Minimum monthly fee top-up already invoiced, now met by these sets"}${several ? ` (${terms.reference}, ${label})` : ""}`,
          note:
            `minimum ${formatMinor(minimum)} ${terms.currency}${daysNote}; already invoiced ${formatMinor(billed)} ${terms.currency} ` +
            `on ${earlier.invoiceNumbers.join(", ")}; these sets ${formatMinor(result.summary.minimumFeeBaseMinor)} ${terms.currency}`,
          quantity: topUp > 0 ? 1 : -1,
          unitPriceMinor: Math.abs(topUp),
          netMinor: topUp,
          vat: { ...terms.vat },
          cycleIds: cycles.map((c) => c.id),
          contractId: terms.id,
          contractReference: terms.reference,
        };
        const creditAt = partLines.findIndex((l) => l.kind === "sla_credit");
        partLines.splice(creditAt === -1 ? partLines.length : creditAt, 0, line);
      }
    }
    lines.push(...partLines);
    pricedParts.push({ contractId: terms.id, reference: terms.reference, label, cycles: cycles.length });
  }

  const numbered: RunLine[] = lines.map((line, index) => ({ ...line, position: index + 1 }));
  const totals = computeInvoiceTotals(numbered.map((line) => ({ netAmountMinor: line.netMinor, vat: line.vat })));
  return {
    ok: true,
    currency: currencies[0]!,
    contract: priced.at(-1)!.terms,
    parts: pricedParts,
    lines: numbered,
    totals,
    evidence: evidenceList(),
    warnings,
  };
}
