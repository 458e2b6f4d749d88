import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import { contractVersionSchema, type ContractVersionInput } from "@/lib/contracts/schemas";
import { contractHistory, contractTermsBetween, contractTermsFor, createContract, endContract, getContract, updateContract } from "@/lib/contracts/service";
import { AppError } from "@/lib/errors";
import { calendarMonthPeriod } from "@/lib/pricing/period";
import { priceInvoicePeriod } from "@/lib/pricing/price-period";
import type { PricedCycleInput } from "@/lib/pricing/types";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { sessionUser } from "../support/session";
import { validFormValues } from "../unit/contracts/fixtures";

// The demo scenario seeded as on 1 December 2026 (UK winter time), so every version's dates are known:
//   QMH-2025-01 2025-07-01 … 2026-06-30 · QMH-2026-02 2026-07-01 … open
//   ODS-2026-01 2026-04-01 … 2026-12-31 · ODS-2027-02 2027-01-01 … open
//   MDP-2026-01 2026-01-01 … open       · PVC-2026-01 2026-09-01 … open
const NOW = new Date("2026-12-01T10:00:00Z");
const LONDON = "Europe/London";
const TABLES = ["contracts", "contract_rates", "contract_surcharges", "audit_log"] as const;

let t: DemoDatabase;
let seed: SeedResult;
let finance: SessionUser;

beforeAll(async () => {
  t = await useDemoDatabase(NOW);
  seed = t.seed;
  finance = await sessionUser(t.db, seed.users["finance@larkmoor.example"]!);
});
afterAll(() => t.cleanup());

function version(organisationId: number, reference: string, validFrom: string, validUntil: string | null): ContractVersionInput {
  return contractVersionSchema.parse(validFormValues({ organisationId: String(organisationId), reference, validFrom, validUntil: validUntil ?? "" }));
}

async function refusal(promise: Promise<unknown>): Promise<AppError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(AppError);
  return error as AppError;
}

const cycle = (id: string, setClass: string, deliveredAt: string, extra: Partial<PricedCycleInput> = {}): PricedCycleInput => ({
  cycleId: id,
  setClass,
  serviceLevel: "standard",
  flags: { heavySoil: false, outOfHours: false, missingInstrumentInvestigation: false, lowTemperature: false, loaner: false },
  late: false,
  deliveredAt,
  ...extra,
});

describe("the seeded versions", () => {
  it("gives every customer a version in force today", async () => {
    for (const code of ["QMH", "ODS", "MDP", "PVC"]) {
      const terms = await contractTermsFor(t.db, seed.organisations[code]!, NOW, LONDON);
      expect(terms, code).not.toBeNull();
      expect(terms!.currency).toBe("GBP");
      expect(terms!.vat).toEqual({ category: "S", rateBasisPoints: 2000 });
    }
    expect(Object.keys(seed.contracts!).sort()).toEqual(["MDP-2026-01", "ODS-2026-01", "ODS-2027-02", "PVC-2026-01", "QMH-2025-01", "QMH-2026-02"]);
  });
});

describe("contractTermsFor", () => {
  it("switches version at local midnight in summer time (BST, UTC+1)", async () => {
    const qmh = seed.organisations.QMH!;
    // 1 July 2026 00:00 in London is 30 June 23:00 UTC (UK summer time, IANA tz database).
    const before = await contractTermsFor(t.db, qmh, new Date("2026-06-30T22:59:59.999Z"), LONDON);
    const after = await contractTermsFor(t.db, qmh, new Date("2026-06-30T23:00:00.000Z"), LONDON);
    expect(before!.reference).toBe("QMH-2025-01");
    expect(before!.validTo).toBe("2026-06-30T23:00:00.000Z");
    expect(after!.reference).toBe("QMH-2026-02");
    expect(after!.validFrom).toBe("2026-06-30T23:00:00.000Z");
    expect(after!.validTo).toBeNull();
  });

  it("switches version at local midnight in winter time and is null before the first version", async () => {
    const ods = seed.organisations.ODS!;
    expect((await contractTermsFor(t.db, ods, new Date("2026-12-31T23:59:59.999Z"), LONDON))!.reference).toBe("ODS-2026-01");
    const next = await contractTermsFor(t.db, ods, new Date("2027-01-01T00:00:00.000Z"), LONDON);
    expect(next!.reference).toBe("ODS-2027-02");
    expect(next!.validFromDate).toBe("2027-01-01");
    // PVC's first version starts on 1 September 2026, 31 August 23:00 UTC.
    const pvc = seed.organisations.PVC!;
    expect(await contractTermsFor(t.db, pvc, new Date("2026-08-31T22:59:59Z"), LONDON)).toBeNull();
    expect((await contractTermsFor(t.db, pvc, new Date("2026-08-31T23:00:00Z"), LONDON))!.clockStopsAt).toBe("released");
  });

  it("maps bands, surcharges and the calendar so that the pricing engine prices a month", async () => {
    const terms = (await contractTermsFor(t.db, seed.organisations.QMH!, NOW, LONDON))!;
    expect(terms.contractId).toBe("QMH-2026-02");
    expect(terms.turnaroundHours).toEqual({ standard: 24, express: 5 });
    expect(terms.serviceCalendar.hours.sat).toEqual([{ start: "06:00", end: "22:00" }]);
    expect(terms.serviceCalendar.hours.sun).toEqual([]);
    expect(terms.serviceCalendar.holidays).toContain("2026-12-25");
    const basic = terms.rateCard.classes.find((c) => c.setClass === "basic_tray")!;
    expect(basic.bands).toEqual([
      { upToQuantity: 400, unitPriceMinor: 1450 },
      { upToQuantity: 1000, unitPriceMinor: 1320 },
      { upToQuantity: null, unitPriceMinor: 1210 },
    ]);
    expect(terms.rateCard.classes.map((c) => c.setClass)).toEqual([
      "single_instrument",
      "basic_tray",
      "major_tray",
      "specialist_tray",
      "rigid_container",
      "dental_cassette",
      "loaner_set",
    ]);
    expect(terms.rateCard.surcharges[0]).toEqual({ kind: "express", basis: "percent_of_fee", basisPoints: 5000 });

    // November 2026: 450 basic trays, the last two express, one of them late.
    const november = calendarMonthPeriod("2026-11", LONDON);
    const trays = Array.from({ length: 450 }, (_, i) =>
      cycle(`N${String(i + 1).padStart(3, "0")}`, "basic_tray", new Date(Date.UTC(2026, 10, 2) + i * 60_000).toISOString(), {
        serviceLevel: i >= 448 ? "express" : "standard",
        late: i === 449,
      }),
    );
    const priced = priceInvoicePeriod(terms, [...trays, cycle("N-major", "major_tray", "2026-11-20T10:00:00Z", { flags: { heavySoil: true, outOfHours: false, missingInstrumentInvestigation: false, lowTemperature: false, loaner: false } })], november);
    // By hand: 400 × 14.50 = 5,800.00; 50 × 13.20 = 660.00; 1 × 28.00 = 28.00 → 6,488.00.
    // Express 50 % of the two express sets' fees 2 × 13.20 = 26.40 → 13.20; heavy soil 1 × 4.50.
    // Minimum fee 4,000.00 is exceeded, no top-up. SLA credit 10 % of 13.20 = 1.32.
    expect(priced.summary.processingMinor).toBe(648_800);
    expect(priced.summary.surchargesMinor).toBe(1320 + 450);
    expect(priced.summary.minimumFeeTopUpMinor).toBe(0);
    expect(priced.summary.slaCreditMinor).toBe(132);
    expect(priced.summary.netMinor).toBe(648_800 + 1770 - 132);
    expect(priced.warnings).toEqual([]);
  });

  it("prices a quiet month of the next version up to its minimum fee", async () => {
    const terms = (await contractTermsFor(t.db, seed.organisations.ODS!, new Date("2027-01-15T12:00:00Z"), LONDON))!;
    const january = calendarMonthPeriod("2027-01", LONDON);
    const priced = priceInvoicePeriod(
      terms,
      [cycle("J1", "basic_tray", "2027-01-05T09:00:00Z"), cycle("J2", "dental_cassette", "2027-01-06T09:00:00Z", { serviceLevel: "express" })],
      january,
    );
    // The next version raises the day-surgery prices by 3.5 %: basic tray 15.90 → 16.46 (15.9 × 1.035 = 16.4565),
    // dental cassette 10.50 → 10.87 (10.8675). Express 60 % of 10.87 = 6.522 → 6.52.
    // 16.46 + 10.87 + 6.52 = 33.85; minimum fee 800.00 → top-up 766.15.
    expect(priced.lines.map((l) => [l.itemCode, l.netAmountMinor])).toEqual([
      ["set:basic_tray", 1646],
      ["set:dental_cassette", 1087],
      ["surcharge:express", 652],
      ["minimum-fee", 76_615],
    ]);
  });

  it("lists each version in force during a period that a change of version splits", async () => {
    const parts = await contractTermsBetween(
      t.db,
      seed.organisations.QMH!,
      { start: new Date("2026-06-15T00:00:00Z"), end: new Date("2026-07-15T00:00:00Z") },
      LONDON,
    );
    expect(parts.map((p) => p.reference)).toEqual(["QMH-2025-01", "QMH-2026-02"]);
    const june = await contractTermsBetween(t.db, seed.organisations.QMH!, calendarMonthPeriod("2026-06", LONDON), LONDON);
    expect(june.map((p) => p.reference)).toEqual(["QMH-2025-01"]);
    const july = await contractTermsBetween(t.db, seed.organisations.QMH!, calendarMonthPeriod("2026-07", LONDON), LONDON);
    expect(july.map((p) => p.reference)).toEqual(["QMH-2026-02"]);
  });
});

describe("overlapping versions", () => {
  it("refuses every shape of overlap with a message naming the version in the way, writing nothing", async () => {
    const pvc = seed.organisations.PVC!;
    const [current] = await t.db.selectFrom("contracts").select("id").where("reference", "=", "PVC-2026-01").execute();
    await endContract(t.db, finance, { id: current!.id, validUntil: "2026-12-31" }, NOW);
    // PVC-2026-01 now runs 2026-09-01 … 2026-12-31.
    const before = await countRows(t.db, [...TABLES]);
    const shapes: [string, string, string | null][] = [
      ["inside", "2026-10-01", "2026-10-31"],
      ["straddling its start", "2026-08-01", "2026-09-15"],
      ["straddling its end", "2026-12-15", "2027-01-31"],
      ["covering it", "2026-08-01", "2027-02-01"],
      ["open-ended from before it", "2026-08-01", null],
      ["open-ended from its last day", "2026-12-31", null],
      ["ending on its first day", "2026-06-01", "2026-09-01"],
    ];
    for (const [shape, from, until] of shapes) {
      const error = await refusal(createContract(t.db, finance, version(pvc, `PVC-X-${from}`, from, until), NOW));
      expect(error.code, shape).toBe("conflict");
      expect(error.status).toBe(409);
      expect(error.message, shape).toContain("overlap version PVC-2026-01, valid 1 September 2026 to 31 December 2026");
      expect(error.fields?.validFrom?.[0]).toBe("Overlaps PVC-2026-01 (1 September 2026 to 31 December 2026).");
    }
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    // The day after the last day is free; so is the time before the first day.
    const next = await createContract(t.db, finance, version(pvc, "PVC-2027-01", "2027-01-01", null), NOW);
    const earlier = await createContract(t.db, finance, version(pvc, "PVC-2026-00", "2026-06-01", "2026-08-31"), NOW);
    expect(next.id).toBeGreaterThan(0);
    expect(earlier.id).toBeGreaterThan(next.id);

    // An open-ended version overlaps everything after its start.
    const afterOpen = await refusal(createContract(t.db, finance, version(pvc, "PVC-2027-06", "2027-06-01", "2027-06-30"), NOW));
    expect(afterOpen.message).toContain("overlap version PVC-2027-01, valid from 1 January 2027, open-ended");

    // Moving dates by correction or by ending is checked the same way.
    const counts = await countRows(t.db, [...TABLES]);
    const moved = await refusal(updateContract(t.db, finance, next.id, version(pvc, "PVC-2027-01", "2026-12-31", null), NOW));
    expect(moved.code).toBe("conflict");
    const extended = await refusal(endContract(t.db, finance, { id: current!.id, validUntil: "2027-01-05" }, NOW));
    expect(extended.message).toContain("overlap version PVC-2027-01");
    expect(await countRows(t.db, [...TABLES])).toEqual(counts);

    // Versions of other customers never clash.
    await createContract(t.db, finance, version(seed.organisations.MDP!, "MDP-ELSE", "2020-01-01", "2020-12-31"), NOW);
  });

  it("refuses a reference already in use and a customer that is not one", async () => {
    const before = await countRows(t.db, [...TABLES]);
    const taken = await refusal(createContract(t.db, finance, version(seed.organisations.MDP!, "QMH-2026-02", "2019-01-01", "2019-12-31"), NOW));
    expect(taken.code).toBe("conflict");
    expect(taken.fields?.reference).toBeDefined();
    const unit = await refusal(createContract(t.db, finance, version(seed.organisations.LSS!, "LSS-1", "2019-01-01", "2019-12-31"), NOW));
    expect(unit.code).toBe("validation");
    expect(unit.fields?.organisationId).toBeDefined();
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });
});

describe("correcting and ending versions", () => {
  it("audits each changed field with its value before and after, and writes nothing when nothing changed", async () => {
    const mdp = seed.organisations.MDP!;
    const id = seed.contracts!["MDP-2026-01"]!;
    const detail = await getContract(t.db, finance, id, NOW);
    expect(detail.status).toBe("current");
    const values = validFormValues({
      organisationId: String(mdp),
      reference: "MDP-2026-01",
      validFrom: detail.validFrom,
      paymentTermsDays: "21",
    });
    const first = await updateContract(t.db, finance, id, contractVersionSchema.parse(values), NOW);
    expect(first.changed).toContain("paymentTermsDays");
    expect(first.changed).toContain("rates");
    const after = await getContract(t.db, finance, id, NOW);
    expect(after.paymentTermsDays).toBe(21);
    expect(after.rates.find((r) => r.setClass === "basic_tray")!.bands).toHaveLength(3);
    const history = await contractHistory(t.db, finance, id);
    expect(history[0]!.action).toBe("contract.updated");
    expect(history[0]!.actorName).toBe("Rufus Ellingham");
    expect(history[0]!.changes.find((c) => c.field === "paymentTermsDays")).toEqual({ field: "paymentTermsDays", before: 14, after: 21 });
    const entry = await t.db.selectFrom("audit_log").select("details").where("id", "=", history[0]!.id).executeTakeFirstOrThrow();
    expect(JSON.parse(entry.details).statusAtChange).toBe("current");

    const counts = await countRows(t.db, [...TABLES]);
    const again = await updateContract(t.db, finance, id, contractVersionSchema.parse(values), NOW);
    expect(again.changed).toEqual([]);
    expect(await countRows(t.db, [...TABLES])).toEqual(counts);

    const moved = await refusal(updateContract(t.db, finance, id, contractVersionSchema.parse({ ...values, organisationId: String(seed.organisations.PVC) }), NOW));
    expect(moved.fields?.organisationId?.[0]).toBe("This version belongs to Marrowgate Dental Partners.");
  });

  it("ends a version on a day not before its first, audited", async () => {
    const id = seed.contracts!["QMH-2026-02"]!;
    const tooEarly = await refusal(endContract(t.db, finance, { id, validUntil: "2026-06-30" }, NOW));
    expect(tooEarly.fields?.validUntil?.[0]).toBe("Choose 2026-07-01 or later.");
    await endContract(t.db, finance, { id, validUntil: "2027-06-30" }, NOW);
    const history = await contractHistory(t.db, finance, id);
    expect(history[0]).toMatchObject({ action: "contract.ended", changes: [{ field: "validUntil", before: null, after: "2027-06-30" }] });
    const terms = await contractTermsFor(t.db, seed.organisations.QMH!, NOW, LONDON);
    expect(terms!.validTo).toBe("2027-06-30T23:00:00.000Z");
  });

  it("keeps a clinic manager to its own organisation's versions", async () => {
    const manager = await sessionUser(t.db, seed.users["manager@quillby.example"]!);
    const own = await getContract(t.db, manager, seed.contracts!["QMH-2026-02"]!, NOW);
    expect(own.organisationName).toBe("Quillby Moor Hospitals");
    const other = await refusal(getContract(t.db, manager, seed.contracts!["ODS-2026-01"]!, NOW));
    expect(other.code).toBe("not_found");
    const history = await refusal(contractHistory(t.db, manager, seed.contracts!["ODS-2026-01"]!));
    expect(history.code).toBe("not_found");
  });
});
