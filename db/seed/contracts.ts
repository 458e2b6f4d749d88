import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import type { SetClass } from "@/lib/catalogue/vocabulary";
import { addDaysToDate, localDateOf } from "@/lib/contracts/dates";
import { serverEnv } from "@/lib/env";
import type { SurchargeRule, VolumeBand } from "@/lib/pricing/types";
import type { ServiceCalendar, WorkingInterval } from "@/lib/turnaround/calendar";
import type { SeedResult } from "./demo";

// The demo's contracts: every customer has a version in force today; the hospital group also has
// an ended earlier version at lower prices, and the day-surgery centre has its next version
// starting on the first of next month. Prices are invented. Turnaround 24 h standard and about
// 5 h express follows common practice (published NHS contract figures, see CHECKS.md).

// Bank holidays of England and Wales in 2026 and 2027, from memory (substitute days included:
// 26 December 2026 and 25–26 December 2027 fall on a weekend).
export const UK_BANK_HOLIDAYS_2026_2027 = [
  "2026-01-01",
  "2026-04-03",
  "2026-04-06",
  "2026-05-04",
  "2026-05-25",
  "2026-08-31",
  "2026-12-25",
  "2026-12-28",
  "2027-01-01",
  "2027-03-26",
  "2027-03-29",
  "2027-05-03",
  "2027-05-31",
  "2027-08-30",
  "2027-12-27",
  "2027-12-28",
];

function calendar(timeZone: string, days: number, interval: WorkingInterval): ServiceCalendar {
  const open = (n: number) => (days >= n ? [interval] : []);
  return {
    timeZone,
    hours: { mon: open(1), tue: open(2), wed: open(3), thu: open(4), fri: open(5), sat: open(6), sun: [] },
    holidays: [...UK_BANK_HOLIDAYS_2026_2027],
  };
}

const flat = (pence: number): VolumeBand[] => [{ upToQuantity: null, unitPriceMinor: pence }];

interface DemoVersion {
  reference: string;
  validFrom: string;
  validUntil: string | null;
  paymentTermsDays: number;
  standardHours: number;
  expressHours: number;
  clockStopsAt: "released" | "delivered";
  serviceCalendar: ServiceCalendar;
  minimumMonthlyFeeMinor: number;
  slaCreditBasisPoints: number;
  rates: Record<SetClass, VolumeBand[]>;
  surcharges: SurchargeRule[];
  notes?: string;
}

/** Every price of a rate card scaled by `factor`, rounded to whole pence (for earlier and later versions). */
function scaled(rates: Record<SetClass, VolumeBand[]>, factor: number): Record<SetClass, VolumeBand[]> {
  return Object.fromEntries(
    Object.entries(rates).map(([setClass, bands]) => [
      setClass,
      bands.map((band) => ({ ...band, unitPriceMinor: Math.round(band.unitPriceMinor * factor) })),
    ]),
  ) as Record<SetClass, VolumeBand[]>;
}

/** The first day of the month `months` after the month of `date`. */
function firstOfMonth(date: string, months: number): string {
  const [y, m] = date.split("-").map(Number) as [number, number];
  const index = y * 12 + (m - 1) + months;
  return `${Math.floor(index / 12)}-${String((index % 12) + 1).padStart(2, "0")}-01`;
}

const year = (date: string) => date.slice(0, 4);

export async function seedContracts(trx: Transaction<Database>, seed: SeedResult, now: Date): Promise<void> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const today = localDateOf(now, timeZone);
  const finance = seed.users["finance@larkmoor.example"] ?? null;

  const hospitalRates: Record<SetClass, VolumeBand[]> = {
    single_instrument: [
      { upToQuantity: 2000, unitPriceMinor: 185 },
      { upToQuantity: null, unitPriceMinor: 160 },
    ],
    basic_tray: [
      { upToQuantity: 400, unitPriceMinor: 1450 },
      { upToQuantity: 1000, unitPriceMinor: 1320 },
      { upToQuantity: null, unitPriceMinor: 1210 },
    ],
    major_tray: [
      { upToQuantity: 200, unitPriceMinor: 2800 },
      { upToQuantity: null, unitPriceMinor: 2550 },
    ],
    specialist_tray: flat(3600),
    rigid_container: flat(3100),
    dental_cassette: flat(980),
    loaner_set: flat(4800),
  };
  const hospitalSurcharges: SurchargeRule[] = [
    { kind: "express", basis: "percent_of_fee", basisPoints: 5000 },
    { kind: "out_of_hours", basis: "per_set", amountMinor: 1200 },
    { kind: "heavy_soil", basis: "per_set", amountMinor: 450 },
    { kind: "missing_instrument_investigation", basis: "per_set", amountMinor: 2500 },
    { kind: "low_temperature", basis: "percent_of_fee", basisPoints: 3500 },
    { kind: "loaner", basis: "per_set", amountMinor: 1500 },
  ];
  const dayCaseRates: Record<SetClass, VolumeBand[]> = {
    single_instrument: flat(210),
    basic_tray: flat(1590),
    major_tray: flat(3050),
    specialist_tray: flat(3900),
    rigid_container: flat(3300),
    dental_cassette: flat(1050),
    loaner_set: flat(5200),
  };
  const smallSurcharges: SurchargeRule[] = [
    { kind: "express", basis: "percent_of_fee", basisPoints: 6000 },
    { kind: "out_of_hours", basis: "per_set", amountMinor: 1500 },
    { kind: "heavy_soil", basis: "per_set", amountMinor: 500 },
    { kind: "missing_instrument_investigation", basis: "per_set", amountMinor: 2000 },
  ];

  const hospitalStart = firstOfMonth(today, -5);
  const dayCaseNext = firstOfMonth(today, 1);
  const dayCaseStart = firstOfMonth(today, -8);
  const versions: [string, DemoVersion][] = [
    [
      "QMH",
      {
        reference: `QMH-${year(firstOfMonth(today, -17))}-01`,
        validFrom: firstOfMonth(today, -17),
        validUntil: addDaysToDate(hospitalStart, -1),
        paymentTermsDays: 30,
        standardHours: 24,
        expressHours: 6,
        clockStopsAt: "delivered",
        serviceCalendar: calendar(timeZone, 6, { start: "06:00", end: "22:00" }),
        minimumMonthlyFeeMinor: 350_000,
        slaCreditBasisPoints: 1000,
        rates: scaled(hospitalRates, 0.95),
        surcharges: hospitalSurcharges,
        notes: "First agreement with the hospital group; replaced by the current version.",
      },
    ],
    [
      "QMH",
      {
        reference: `QMH-${year(hospitalStart)}-02`,
        validFrom: hospitalStart,
        validUntil: null,
        paymentTermsDays: 30,
        standardHours: 24,
        expressHours: 5,
        clockStopsAt: "delivered",
        serviceCalendar: calendar(timeZone, 6, { start: "06:00", end: "22:00" }),
        minimumMonthlyFeeMinor: 400_000,
        slaCreditBasisPoints: 1000,
        rates: hospitalRates,
        surcharges: hospitalSurcharges,
        notes: "Volume bands count each set class separately per calendar month.",
      },
    ],
    [
      "ODS",
      {
        reference: `ODS-${year(dayCaseStart)}-01`,
        validFrom: dayCaseStart,
        validUntil: addDaysToDate(dayCaseNext, -1),
        paymentTermsDays: 30,
        standardHours: 24,
        expressHours: 5,
        clockStopsAt: "delivered",
        serviceCalendar: calendar(timeZone, 5, { start: "07:00", end: "19:00" }),
        minimumMonthlyFeeMinor: 75_000,
        slaCreditBasisPoints: 500,
        rates: dayCaseRates,
        surcharges: smallSurcharges,
      },
    ],
    [
      "ODS",
      {
        reference: `ODS-${year(dayCaseNext)}-02`,
        validFrom: dayCaseNext,
        validUntil: null,
        paymentTermsDays: 30,
        standardHours: 24,
        expressHours: 5,
        clockStopsAt: "delivered",
        serviceCalendar: calendar(timeZone, 6, { start: "07:00", end: "19:00" }),
        minimumMonthlyFeeMinor: 80_000,
        slaCreditBasisPoints: 500,
        rates: scaled(dayCaseRates, 1.035),
        surcharges: smallSurcharges,
        notes: "Adds Saturday service hours.",
      },
    ],
    [
      "MDP",
      {
        reference: `MDP-${year(firstOfMonth(today, -11))}-01`,
        validFrom: firstOfMonth(today, -11),
        validUntil: null,
        paymentTermsDays: 14,
        standardHours: 48,
        expressHours: 8,
        clockStopsAt: "delivered",
        serviceCalendar: calendar(timeZone, 5, { start: "08:00", end: "18:00" }),
        minimumMonthlyFeeMinor: 25_000,
        slaCreditBasisPoints: 500,
        rates: {
          single_instrument: flat(195),
          basic_tray: flat(1490),
          major_tray: flat(2990),
          specialist_tray: flat(3850),
          rigid_container: flat(3250),
          dental_cassette: [
            { upToQuantity: 300, unitPriceMinor: 840 },
            { upToQuantity: null, unitPriceMinor: 790 },
          ],
          loaner_set: flat(5100),
        },
        surcharges: [
          { kind: "express", basis: "percent_of_fee", basisPoints: 5000 },
          { kind: "heavy_soil", basis: "per_set", amountMinor: 350 },
          { kind: "missing_instrument_investigation", basis: "per_set", amountMinor: 1800 },
        ],
      },
    ],
    [
      "PVC",
      {
        reference: `PVC-${year(firstOfMonth(today, -3))}-01`,
        validFrom: firstOfMonth(today, -3),
        validUntil: null,
        paymentTermsDays: 30,
        standardHours: 24,
        expressHours: 6,
        clockStopsAt: "released",
        serviceCalendar: calendar(timeZone, 5, { start: "07:30", end: "18:30" }),
        minimumMonthlyFeeMinor: 15_000,
        slaCreditBasisPoints: 750,
        rates: {
          single_instrument: flat(220),
          basic_tray: flat(1650),
          major_tray: flat(3150),
          specialist_tray: flat(4050),
          rigid_container: flat(3400),
          dental_cassette: flat(1100),
          loaner_set: flat(5400),
        },
        surcharges: [
          { kind: "express", basis: "percent_of_fee", basisPoints: 6000 },
          { kind: "heavy_soil", basis: "per_set", amountMinor: 600 },
          { kind: "low_temperature", basis: "percent_of_fee", basisPoints: 4000 },
        ],
        notes: "The clock stops at release; the practice collects urgent sets itself.",
      },
    ],
  ];

  const iso = now.toISOString();
  const ids: Record<string, number> = (seed.contracts ??= {});
  for (const [code, version] of versions) {
    const organisationId = seed.organisations[code];
    if (organisationId === undefined) throw new Error(`The demo has no organisation ${code}.`);
    const { id } = await trx
      .insertInto("contracts")
      .values({
        organisation_id: organisationId,
        reference: version.reference,
        valid_from: version.validFrom,
        valid_until: version.validUntil,
        currency: "GBP",
        vat_category: "S",
        vat_rate_bp: 2000,
        payment_terms_days: version.paymentTermsDays,
        turnaround_standard_hours: version.standardHours,
        turnaround_express_hours: version.expressHours,
        clock_stops_at: version.clockStopsAt,
        service_calendar: JSON.stringify(version.serviceCalendar),
        minimum_monthly_fee_minor: version.minimumMonthlyFeeMinor,
        sla_credit_bp: version.slaCreditBasisPoints,
        notes: version.notes ?? null,
        created_by: finance,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await trx
      .insertInto("contract_rates")
      .values(
        Object.entries(version.rates).flatMap(([setClass, bands]) =>
          bands.map((band, index) => ({
            contract_id: id,
            set_class: setClass,
            band_index: index,
            up_to_quantity: band.upToQuantity,
            unit_price_minor: band.unitPriceMinor,
          })),
        ),
      )
      .execute();
    await trx
      .insertInto("contract_surcharges")
      .values(
        version.surcharges.map((rule) => ({
          contract_id: id,
          kind: rule.kind,
          basis: rule.basis,
          amount_minor: rule.basis === "per_set" ? rule.amountMinor : null,
          basis_points: rule.basis === "percent_of_fee" ? rule.basisPoints : null,
        })),
      )
      .execute();
    ids[version.reference] = id;
  }
}
