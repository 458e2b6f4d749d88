import { z } from "zod";
import { SET_CLASS_LABELS, SET_CLASSES, type SetClass } from "@/lib/catalogue/vocabulary";
import { listQuerySchema } from "@/lib/http/paging";
import { PricingError } from "@/lib/pricing/errors";
import { assertCurrency } from "@/lib/pricing/money";
import { SURCHARGE_KINDS, type SurchargeKind, type SurchargeRule } from "@/lib/pricing/types";
import { serviceCalendarSchema } from "@/lib/turnaround/calendar";
import { CONTRACT_STATUSES, isLocalDate } from "./dates";
import { SURCHARGE_KIND_LABELS } from "./format";

// A contract version as the form edits it, shared by the form (zodResolver) and the server,
// which parses it again. The form works in text: money as "1250.00", percentages as "20" or
// "5.5", counts as "500"; the parsed output is integer minor units, basis points and counts.
//
// Decisions:
// - Every set class of the catalogue must have a rate: a version without a price for a class
//   could not invoice a set of that class, so the form refuses it rather than leaving billing
//   stuck later.
// - A class's bands are graduated monthly volume bands; each band but the last gives the count
//   of sets it goes up to, strictly increasing, and the last band is open-ended.
// - A surcharge kind is charged only when the version lists it, once.
// - VAT is standard rate (above 0 %) or zero rate (0 %); the exempt categories need a reason
//   text on every invoice and are not offered here.

export const BAND_LIMIT = 10;

type Ctx = z.core.$RefinementCtx<unknown> | z.core.ParsePayload<unknown>;

function fail(ctx: Ctx, input: unknown, message: string): never {
  ctx.issues.push({ code: "custom", input, message });
  return z.NEVER;
}

const textOrNumber = z.union([z.string(), z.number()]);

/** Money as decimal text ("1250.00", "1,250.5", "12") → integer minor units. */
export function moneyText(what: string) {
  return textOrNumber.transform((raw, ctx) => {
    const text = String(raw).trim();
    if (text === "") return fail(ctx, raw, `Enter ${what}, like 1250.00 (0 if none).`);
    const plain = /^\d{1,3}(,\d{3})+(\.\d+)?$/.test(text) ? text.replaceAll(",", "") : text;
    const match = /^(\d{1,10})(?:\.(\d{1,2}))?$/.exec(plain);
    if (!match) return fail(ctx, raw, `Write ${what} as an amount like 1250.00: digits, at most two decimals.`);
    return Number(match[1]) * 100 + Number((match[2] ?? "").padEnd(2, "0"));
  });
}

/** A percentage with up to two decimals ("20", "5.5", "12.75") → basis points. */
export function percentText(what: string, maxPercent: number) {
  return textOrNumber.transform((raw, ctx) => {
    const text = String(raw).trim();
    if (text === "") return fail(ctx, raw, `Enter ${what} as a percentage, like 20 (0 if none).`);
    const match = /^(\d{1,4})(?:\.(\d{1,2}))?$/.exec(text);
    if (!match) return fail(ctx, raw, `Write ${what} as a percentage like 20 or 5.5: digits, at most two decimals.`);
    const basisPoints = Number(match[1]) * 100 + Number((match[2] ?? "").padEnd(2, "0"));
    if (basisPoints > maxPercent * 100) return fail(ctx, raw, `${capitalise(what)} can be at most ${maxPercent} %.`);
    return basisPoints;
  });
}

/** A whole number written in digits, from min to max. */
export function wholeNumberText(what: string, min: number, max: number) {
  return textOrNumber.transform((raw, ctx) => {
    const text = String(raw).trim();
    if (text === "") return fail(ctx, raw, `Enter ${what}.`);
    if (!/^\d{1,9}$/.test(text)) return fail(ctx, raw, `Write ${what} as a whole number in digits.`);
    const value = Number(text);
    if (value < min || value > max) return fail(ctx, raw, `${capitalise(what)} must be from ${min} to ${max}.`);
    return value;
  });
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function localDate(what: string) {
  return z
    .string({ error: `Enter ${what} as a date.` })
    .trim()
    .min(1, `Enter ${what}.`)
    .refine(isLocalDate, { error: `Enter ${what} as a real date written YYYY-MM-DD.` });
}

/** ISO 4217 code with two minor digits, which is what the pricing engine accepts. */
export const currencySchema = z
  .string({ error: "Enter the currency code." })
  .trim()
  .transform((code, ctx) => {
    const upper = code.toUpperCase();
    try {
      return assertCurrency(upper, "currency");
    } catch (error) {
      if (!(error instanceof PricingError)) throw error;
      const decimals = /has (\d+) minor digits/.exec(error.message)?.[1];
      return fail(
        ctx,
        code,
        decimals !== undefined
          ? `${upper} has ${decimals} decimal places; contracts are priced in currencies with two (pence, cents), such as GBP or EUR.`
          : `Enter the three-letter ISO 4217 code of the currency, such as GBP or EUR.`,
      );
    }
  });

export const bandSchema = z.object({
  /** Empty for the open-ended last band. */
  upToQuantity: z
    .union([z.string(), z.number(), z.null()])
    .optional()
    .transform((raw, ctx): number | null => {
      const text = raw === null || raw === undefined ? "" : String(raw).trim();
      if (text === "") return null;
      if (!/^\d{1,7}$/.test(text) || Number(text) < 1) {
        return fail(ctx, raw, "Write the number of sets as a whole number, like 500, or leave it empty on the last band.");
      }
      return Number(text);
    }),
  unitPrice: moneyText("the price per set"),
});

export const classRateSchema = z
  .object({
    setClass: z.enum(SET_CLASSES, { error: "Choose one of the catalogue's set classes." }),
    bands: z.array(bandSchema).max(BAND_LIMIT, `Use at most ${BAND_LIMIT} bands per set class.`),
  })
  .superRefine((rate, ctx) => {
    const label = SET_CLASS_LABELS[rate.setClass];
    if (rate.bands.length === 0) {
      ctx.addIssue({ code: "custom", path: ["bands"], message: `${label}: give at least one price band.` });
      return;
    }
    let previous: number | null = null;
    rate.bands.forEach((band, index) => {
      const path = ["bands", index, "upToQuantity"];
      const name = `${label}, band ${index + 1}`;
      const last = index === rate.bands.length - 1;
      if (last) {
        if (band.upToQuantity !== null) {
          ctx.addIssue({
            code: "custom",
            path,
            message:
              rate.bands.length === 1
                ? `${name}: leave “up to” empty — a single band is one price for every set.`
                : `${name}: the last band is open-ended — leave “up to” empty so it covers every set above ${previous ?? "the previous band"}.`,
          });
        }
        return;
      }
      if (band.upToQuantity === null) {
        ctx.addIssue({
          code: "custom",
          path,
          message: `${name}: enter the number of sets this band goes up to; only the last band is open-ended.`,
        });
        return;
      }
      if (previous !== null && band.upToQuantity <= previous) {
        ctx.addIssue({
          code: "custom",
          path,
          message: `${name}: “up to” must be more than band ${index}'s ${previous}; bands go up in order.`,
        });
      }
      previous = Math.max(previous ?? 0, band.upToQuantity);
    });
  });

export const ratesSchema = z.array(classRateSchema).superRefine((rates, ctx) => {
  const seen = new Map<SetClass, number>();
  rates.forEach((rate, index) => {
    if (seen.has(rate.setClass)) {
      ctx.addIssue({
        code: "custom",
        path: [index, "setClass"],
        message: `${SET_CLASS_LABELS[rate.setClass]} is priced twice; keep one rate per set class.`,
      });
    }
    seen.set(rate.setClass, index);
  });
  const missing = SET_CLASSES.filter((setClass) => !seen.has(setClass));
  if (missing.length > 0) {
    ctx.addIssue({
      code: "custom",
      path: [],
      message: `Give a price for ${missing.map((c) => SET_CLASS_LABELS[c]).join(", ")}: every set class needs a rate, or its sets could not be invoiced.`,
    });
  }
});

const optionalMoney = (what: string) =>
  z
    .union([z.string(), z.number(), z.null()])
    .optional()
    .transform((raw) => (raw === null || raw === undefined || String(raw).trim() === "" ? null : raw))
    .pipe(z.union([z.null(), moneyText(what)]));

const optionalPercent = (what: string) =>
  z
    .union([z.string(), z.number(), z.null()])
    .optional()
    .transform((raw) => (raw === null || raw === undefined || String(raw).trim() === "" ? null : raw))
    .pipe(z.union([z.null(), percentText(what, 1000)]));

export const surchargeSchema = z
  .object({
    kind: z.enum(SURCHARGE_KINDS, { error: "Choose which surcharge this is." }),
    basis: z.enum(["per_set", "percent_of_fee"], { error: "Choose a fixed amount per set or a percentage of the fee." }),
    amount: optionalMoney("the amount per set"),
    percent: optionalPercent("the percentage"),
  })
  .superRefine((rule, ctx) => {
    const label = SURCHARGE_KIND_LABELS[rule.kind];
    if (rule.basis === "per_set" && rule.amount === null) {
      ctx.addIssue({ code: "custom", path: ["amount"], message: `${label}: enter the amount charged per set.` });
    }
    if (rule.basis === "percent_of_fee" && rule.percent === null) {
      ctx.addIssue({ code: "custom", path: ["percent"], message: `${label}: enter the percentage of the processing fee.` });
    }
  })
  .transform(
    (rule): SurchargeRule =>
      rule.basis === "per_set"
        ? { kind: rule.kind, basis: "per_set", amountMinor: rule.amount ?? 0 }
        : { kind: rule.kind, basis: "percent_of_fee", basisPoints: rule.percent ?? 0 },
  );

export const surchargesSchema = z
  .array(surchargeSchema)
  .max(SURCHARGE_KINDS.length)
  .superRefine((rules, ctx) => {
    const seen = new Set<SurchargeKind>();
    rules.forEach((rule, index) => {
      if (seen.has(rule.kind)) {
        ctx.addIssue({
          code: "custom",
          path: [index, "kind"],
          message: `${SURCHARGE_KIND_LABELS[rule.kind]} is listed twice; keep one line per surcharge.`,
        });
      }
      seen.add(rule.kind);
    });
  });

export const turnaroundSchema = z
  .object({
    standardHours: wholeNumberText("the standard turnaround in hours", 1, 2000),
    expressHours: wholeNumberText("the express turnaround in hours", 1, 2000),
  })
  .superRefine((t, ctx) => {
    if (t.expressHours >= t.standardHours) {
      ctx.addIssue({
        code: "custom",
        path: ["expressHours"],
        message: `Express must be quicker than standard: fewer than ${t.standardHours} hours.`,
      });
    }
  });

export const vatSchema = z
  .object({
    category: z.enum(["S", "Z"], { error: "Choose standard rate or zero rate." }),
    ratePercent: percentText("the VAT rate", 100),
  })
  .superRefine((vat, ctx) => {
    if (vat.category === "S" && vat.ratePercent === 0) {
      ctx.addIssue({ code: "custom", path: ["ratePercent"], message: "A standard-rated contract needs a VAT rate above 0 %; choose zero rate for 0 %." });
    }
    if (vat.category === "Z" && vat.ratePercent !== 0) {
      ctx.addIssue({ code: "custom", path: ["ratePercent"], message: "A zero-rated contract has a VAT rate of 0 %." });
    }
  });

export const contractVersionSchema = z
  .object({
    organisationId: z.coerce.number({ error: "Choose the customer." }).int().positive("Choose the customer."),
    reference: z
      .string({ error: "Enter a reference." })
      .trim()
      .min(1, "Enter a reference for this version, like QMH-2027-01.")
      .max(40, "Use at most 40 characters.")
      .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, "Use letters, digits and . _ / - only, without spaces."),
    validFrom: localDate("the first day of this version"),
    validUntil: z
      .union([z.string(), z.null()])
      .optional()
      .transform((v) => (v === null || v === undefined || v.trim() === "" ? null : v.trim()))
      .refine((v) => v === null || isLocalDate(v), {
        error: "Enter the last day as a real date written YYYY-MM-DD, or leave it empty for an open-ended version.",
      }),
    currency: currencySchema,
    vat: vatSchema,
    paymentTermsDays: wholeNumberText("the payment terms in days", 0, 365),
    turnaround: turnaroundSchema,
    clockStopsAt: z.enum(["released", "delivered"], { error: "Choose when the turnaround clock stops." }),
    serviceCalendar: serviceCalendarSchema,
    minimumMonthlyFee: moneyText("the minimum monthly fee"),
    slaCreditPercent: percentText("the credit for a late set", 100),
    rates: ratesSchema,
    surcharges: surchargesSchema,
    notes: z
      .string()
      .trim()
      .max(2000, "Keep notes under 2000 characters.")
      .optional()
      .transform((v) => (v ? v : null)),
  })
  .superRefine(
    (value, ctx) => {
      if (value.validUntil !== null && isLocalDate(value.validFrom) && value.validUntil < value.validFrom) {
        ctx.addIssue({
          code: "custom",
          path: ["validUntil"],
          message: `The last day must be on or after the first day (${value.validFrom}).`,
        });
      }
    },
    {
      // Compare the dates even while other fields still need attention.
      when: (payload) => {
        const v = payload.value as { validFrom?: unknown; validUntil?: unknown } | undefined;
        return isLocalDate(v?.validFrom) && (v?.validUntil === null || isLocalDate(v?.validUntil));
      },
    },
  );

export type ContractVersionFormValues = z.input<typeof contractVersionSchema>;
export type ContractVersionInput = z.output<typeof contractVersionSchema>;

export const updateContractSchema = z.object({
  id: z.coerce.number().int().positive(),
  values: contractVersionSchema,
});
export type UpdateContractInput = z.input<typeof updateContractSchema>;

export const endContractSchema = z.object({
  id: z.coerce.number().int().positive(),
  validUntil: localDate("the last day of this version"),
});
export type EndContractInput = z.input<typeof endContractSchema>;

export const listContractsQuerySchema = listQuerySchema(["organisation", "reference", "valid_from", "valid_until", "status"], {
  status: z.enum(CONTRACT_STATUSES).optional(),
  organisationId: z.coerce.number().int().positive().optional(),
});
export type ListContractsQuery = z.infer<typeof listContractsQuerySchema>;
