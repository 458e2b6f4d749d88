import { SET_CLASSES } from "@/lib/catalogue/vocabulary";
import type { ServiceCalendar } from "@/lib/turnaround/calendar";
import { addDaysToDate } from "./dates";
import { basisPointsToPercentText, minorToDecimalText, suggestNextReference } from "./format";
import type { ContractVersionFormValues } from "./schemas";
import type { ContractDetail } from "./service";

// The text values the contract form starts from: blank for a first contract, a copy of a version
// for its correction or for the next version.

export interface ContractFormValues {
  organisationId: string;
  reference: string;
  validFrom: string;
  validUntil: string;
  currency: string;
  vat: { category: "S" | "Z"; ratePercent: string };
  paymentTermsDays: string;
  turnaround: { standardHours: string; expressHours: string };
  clockStopsAt: "released" | "delivered";
  serviceCalendar: ServiceCalendar;
  minimumMonthlyFee: string;
  slaCreditPercent: string;
  rates: { setClass: (typeof SET_CLASSES)[number]; bands: { upToQuantity: string; unitPrice: string }[] }[];
  surcharges: { kind: ContractVersionFormValues["surcharges"][number]["kind"]; basis: "per_set" | "percent_of_fee"; amount: string; percent: string }[];
  notes: string;
}

// The form's values must be what the schema parses.
const _fitsSchema: (values: ContractFormValues) => ContractVersionFormValues = (values) => values;

/** Monday to Friday, 07:00–19:00, in the given zone: a starting point to edit. */
export function weekdayCalendar(timeZone: string): ServiceCalendar {
  const day = [{ start: "07:00", end: "19:00" }];
  return { timeZone, hours: { mon: day, tue: day, wed: day, thu: day, fri: day, sat: [], sun: [] }, holidays: [] };
}

export function blankContractValues(timeZone: string, organisationId?: number): ContractFormValues {
  return {
    organisationId: organisationId ? String(organisationId) : "",
    reference: "",
    validFrom: "",
    validUntil: "",
    currency: "GBP",
    vat: { category: "S", ratePercent: "20" },
    paymentTermsDays: "30",
    turnaround: { standardHours: "24", expressHours: "5" },
    clockStopsAt: "delivered",
    serviceCalendar: weekdayCalendar(timeZone),
    minimumMonthlyFee: "0.00",
    slaCreditPercent: "0",
    rates: SET_CLASSES.map((setClass) => ({ setClass, bands: [{ upToQuantity: "", unitPrice: "" }] })),
    surcharges: [],
    notes: "",
  };
}

/**
 * The form values of a version. With `asNextVersion`, a copy to start the following version
 * from: a suggested next reference, starting the day after the version's last day (left empty
 * when the version is open-ended: it must be ended first), open-ended.
 */
export function contractFormValues(detail: ContractDetail, options: { asNextVersion?: boolean } = {}): ContractFormValues {
  const byClass = new Map(detail.rates.map((rate) => [rate.setClass, rate]));
  const next = options.asNextVersion === true;
  return {
    organisationId: String(detail.organisationId),
    reference: next ? suggestNextReference(detail.reference) : detail.reference,
    validFrom: next ? (detail.validUntil ? addDaysToDate(detail.validUntil, 1) : "") : detail.validFrom,
    validUntil: next ? "" : (detail.validUntil ?? ""),
    currency: detail.currency,
    vat: { category: detail.vatCategory, ratePercent: basisPointsToPercentText(detail.vatRateBasisPoints) },
    paymentTermsDays: String(detail.paymentTermsDays),
    turnaround: { standardHours: String(detail.turnaroundStandardHours), expressHours: String(detail.turnaroundExpressHours) },
    clockStopsAt: detail.clockStopsAt,
    serviceCalendar: structuredClone(detail.serviceCalendar),
    minimumMonthlyFee: minorToDecimalText(detail.minimumMonthlyFeeMinor),
    slaCreditPercent: basisPointsToPercentText(detail.slaCreditBasisPoints),
    rates: SET_CLASSES.map((setClass) => ({
      setClass,
      bands: byClass.get(setClass)?.bands.map((band) => ({
        upToQuantity: band.upToQuantity === null ? "" : String(band.upToQuantity),
        unitPrice: minorToDecimalText(band.unitPriceMinor),
      })) ?? [{ upToQuantity: "", unitPrice: "" }],
    })),
    surcharges: detail.surcharges.map((rule) => ({
      kind: rule.kind,
      basis: rule.basis,
      amount: rule.basis === "per_set" ? minorToDecimalText(rule.amountMinor) : "",
      percent: rule.basis === "percent_of_fee" ? basisPointsToPercentText(rule.basisPoints) : "",
    })),
    notes: detail.notes ?? "",
  };
}
