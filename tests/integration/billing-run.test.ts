import type Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as previewRoute } from "@/app/api/billing/preview/route";
import { GET as runRoute } from "@/app/api/billing/runs/[id]/route";
import { GET as runsRoute } from "@/app/api/billing/runs/route";
import type { SeedResult } from "@/db/seed/demo";
import { startFakeStripe, type FakeStripe } from "@/fakes/stripe/server";
import { approveRun, createRun, discardRun, getRunDetail, previewRun } from "@/lib/billing/run";
import { issueRun } from "@/lib/billing/run-issue";
import { AppError } from "@/lib/errors";
import { resetStripeClient } from "@/lib/stripe";
import { addCustomer, deliver, type TestCustomer } from "../unit/billing/db-fixtures";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

// Invoice runs end to end against the demo database and the local fake of the payment service
// through the real SDK: the preview of a prepared month (worked by hand below), creating,
// approving and issuing it, a second run that finds nothing left, a month split by a change of
// contract version, customers that cannot be invoiced, and sets delivered late into a month
// already invoiced.

let t: DemoDatabase;
let seed: SeedResult;
let fake: FakeStripe;
const NOW = new Date("2026-12-01T10:00:00Z");
const TABLES = ["invoice_runs", "invoices", "invoice_lines", "priced_cycles", "audit_log"] as const;

let brindle: TestCustomer;
let corrow: TestCustomer;
let dunmere: TestCustomer;

const nov = (day: number, hour: number, minute = 0) => new Date(Date.UTC(2026, 10, day, hour, minute)).toISOString();

beforeAll(async () => {
  fake = await startFakeStripe({ port: 0, log: () => {} });
  process.env.STRIPE_SECRET_KEY = "sk_test_billing_runs";
  process.env.STRIPE_API_HOST = "127.0.0.1";
  process.env.STRIPE_API_PORT = String(fake.port);
  process.env.STRIPE_API_PROTOCOL = "http";
  process.env.STRIPE_WEBHOOK_SECRET = fake.webhookSecret;
  resetStripeClient();
  // The demo invoices October and November 2026 itself; the customers below are new, so
  // November's preview holds only them.
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;

  // Brindle Hollow Clinic: graduated basic trays, a minimum fee and a 10 % turnaround credit,
  // on a clock that runs around the clock (lateness = more than 24 h from receipt to delivery).
  brindle = await addCustomer(t.db, {
    code: "BHC",
    name: "Brindle Hollow Clinic",
    classes: ["basic_tray", "major_tray"],
    versions: [
      {
        reference: "BHC-2026-01",
        validFrom: "2026-01-01",
        validUntil: null,
        minimumMonthlyFeeMinor: 10_000,
        slaCreditBasisPoints: 1000,
        rates: {
          basic_tray: [
            { upToQuantity: 3, unitPriceMinor: 1000 },
            { upToQuantity: null, unitPriceMinor: 800 },
          ],
          major_tray: [{ upToQuantity: null, unitPriceMinor: 2500 }],
        },
        surcharges: [
          { kind: "express", basis: "percent_of_fee", basisPoints: 5000 },
          { kind: "heavy_soil", basis: "per_set", amountMinor: 300 },
        ],
      },
    ],
  });
  await deliver(t.db, brindle, { setClass: "basic_tray", receivedAt: nov(2, 10), deliveredAt: nov(3, 9) }); // 23 h: on time
  await deliver(t.db, brindle, { setClass: "basic_tray", receivedAt: nov(4, 10), deliveredAt: nov(4, 15), serviceLevel: "express", heavySoil: true }); // 5 h of 6: on time
  await deliver(t.db, brindle, { setClass: "basic_tray", receivedAt: nov(5, 10), deliveredAt: nov(6, 12) }); // 26 h: late
  await deliver(t.db, brindle, { setClass: "basic_tray", receivedAt: nov(9, 8), deliveredAt: nov(10, 4) }); // 20 h: on time
  await deliver(t.db, brindle, { setClass: "major_tray", receivedAt: nov(10, 10), deliveredAt: nov(11, 11), heavySoil: true }); // 25 h: late

  // Corrow Lane Practice: its version changes on 15 November.
  corrow = await addCustomer(t.db, {
    code: "CLP",
    name: "Corrow Lane Practice",
    classes: ["basic_tray"],
    versions: [
      { reference: "CLP-2026-01", validFrom: "2026-06-01", validUntil: "2026-11-14", minimumMonthlyFeeMinor: 3000, rates: { basic_tray: [{ upToQuantity: null, unitPriceMinor: 1200 }] } },
      { reference: "CLP-2026-02", validFrom: "2026-11-15", validUntil: null, minimumMonthlyFeeMinor: 3000, rates: { basic_tray: [{ upToQuantity: null, unitPriceMinor: 1300 }] } },
    ],
  });
  await deliver(t.db, corrow, { setClass: "basic_tray", receivedAt: nov(4, 9), deliveredAt: nov(5, 8) });
  await deliver(t.db, corrow, { setClass: "basic_tray", receivedAt: nov(4, 9), deliveredAt: nov(5, 8, 30) });
  await deliver(t.db, corrow, { setClass: "basic_tray", receivedAt: nov(19, 9), deliveredAt: nov(20, 8) });

  // Dunmere Eye Rooms: a specialist tray its rate card does not price.
  dunmere = await addCustomer(t.db, {
    code: "DER",
    name: "Dunmere Eye Rooms",
    classes: ["basic_tray", "specialist_tray"],
    versions: [{ reference: "DER-2026-01", validFrom: "2026-01-01", validUntil: null, rates: { basic_tray: [{ upToQuantity: null, unitPriceMinor: 1500 }] } }],
  });
  await deliver(t.db, dunmere, { setClass: "basic_tray", receivedAt: nov(12, 9), deliveredAt: nov(13, 8) });
  await deliver(t.db, dunmere, { setClass: "specialist_tray", receivedAt: nov(12, 9), deliveredAt: nov(13, 8) });

  // Eskholt Surgery: sets delivered, but no contract at all.
  const eskholt = await addCustomer(t.db, { code: "ESK", name: "Eskholt Surgery", classes: ["basic_tray"], versions: [] });
  await deliver(t.db, eskholt, { setClass: "basic_tray", receivedAt: nov(16, 9), deliveredAt: nov(17, 8) });
});

afterAll(async () => {
  await t?.cleanup();
  await fake?.close();
  resetStripeClient();
});

const finance = () => sessionUser(t.db, seed.users["finance@larkmoor.example"]!);

async function refused(promise: Promise<unknown>, code: AppError["code"], pattern: RegExp): Promise<AppError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).code).toBe(code);
  expect((error as AppError).message).toMatch(pattern);
  return error as AppError;
}

describe("the preview of a month", () => {
  it("prices a small month as worked by hand, with the evidence behind every line", async () => {
    const preview = await previewRun(t.db, "2026-11", NOW);
    expect(preview).toMatchObject({ period: "2026-11", label: "November 2026", ended: true });
    // The demo's own customers were invoiced for November by the seed: nothing of theirs is left.
    expect(preview.customers.map((c) => c.shortCode)).toEqual(["BHC", "CLP", "DER", "ESK"]);
    const bhc = preview.customers.find((c) => c.shortCode === "BHC")!;
    expect(bhc).toMatchObject({ status: "ready", invoiceNumber: "LSS-2026-11-BHC", currency: "GBP", contractReference: "BHC-2026-01", paymentTermsDays: 30, lateCount: 2 });
    // Worked by hand (GBP pence):
    //   basic trays, sets 1–3 at 10.00: 3 × 1000 = 3000; set 4 at 8.00: 800; major tray: 2500
    //   → processing 6300
    //   express 50 % of the express set's fee 1000 = 500; heavy soil 2 × 300 = 600 → surcharges 1100
    //   minimum 10 000 − (6300 + 1100) = 2600 top-up
    //   turnaround credit 10 % of the late sets' fees (1000 + 2500) = 350
    //   net 6300 + 1100 + 2600 − 350 = 9650; VAT 20 % = 1930 (EN 16931 BR-CO-17: on the sum); total 11 580
    expect(bhc.lines.map((l) => [l.kind, l.itemCode, l.quantity, l.unitPriceMinor, l.netMinor])).toEqual([
      ["processing", "set:basic_tray", 3, 1000, 3000],
      ["processing", "set:basic_tray", 1, 800, 800],
      ["processing", "set:major_tray", 1, 2500, 2500],
      ["surcharge", "surcharge:express", 1, 500, 500],
      ["surcharge", "surcharge:heavy_soil", 2, 300, 600],
      ["minimum_fee_top_up", "minimum-fee", 1, 2600, 2600],
      ["sla_credit", "sla-credit", -1, 350, -350],
    ]);
    expect(bhc.totals).toMatchObject({ lineTotalMinor: 9650, taxExclusiveMinor: 9650, vatMinor: 1930, totalMinor: 11_580 });
    expect(bhc.totals!.vatBreakdown).toEqual([{ category: "S", rateBasisPoints: 2000, taxableAmountMinor: 9650, taxAmountMinor: 1930 }]);
    // Evidence: the late line lists the two late sets, each with its due time (receipt + 24 h).
    const credit = bhc.lines.find((l) => l.kind === "sla_credit")!;
    const late = bhc.cycles.filter((c) => credit.cycleIds.includes(c.cycleId));
    expect(late.map((c) => [c.late, c.dueAt, c.deliveredAt])).toEqual([
      [true, nov(6, 10), nov(6, 12)],
      [true, nov(11, 10), nov(11, 11)],
    ]);
    expect(bhc.cycles.filter((c) => !c.late).every((c) => c.dueAt !== null && c.dueAt >= c.deliveredAt)).toBe(true);
    expect(bhc.lines[0]!.cycleIds).toHaveLength(3);
  });

  it("prices a month split by a change of version per part, with the minimum fee pro-rated by days", async () => {
    const clp = (await previewRun(t.db, "2026-11", NOW)).customers.find((c) => c.shortCode === "CLP")!;
    // CLP-2026-01 covers 1–14 Nov: 2 × 1200 = 2400 ≥ its pro-rated minimum 3000 × 14/30 = 1400.
    // CLP-2026-02 covers 15–30 Nov: 1 × 1300 = 1300 < 3000 × 16/30 = 1600 → top-up 300.
    // Net 4000, VAT 800, total 4800 (worked by hand).
    expect(clp.parts.map((p) => [p.reference, p.label, p.cycles])).toEqual([
      ["CLP-2026-01", "1–14 Nov 2026", 2],
      ["CLP-2026-02", "15–30 Nov 2026", 1],
    ]);
    expect(clp.lines.map((l) => [l.description, l.quantity, l.unitPriceMinor, l.netMinor])).toEqual([
      ["Basic tray (up to 25 instruments) (CLP-2026-01, 1–14 Nov 2026)", 2, 1200, 2400],
      ["Basic tray (up to 25 instruments) (CLP-2026-02, 15–30 Nov 2026)", 1, 1300, 1300],
      ["Minimum monthly fee top-up (CLP-2026-02, 15–30 Nov 2026)", 1, 300, 300],
    ]);
    expect(clp.lines[2]!.note).toContain("pro-rated for 16 of 30 days");
    expect(clp.totals).toMatchObject({ lineTotalMinor: 4000, vatMinor: 800, totalMinor: 4800 });
    expect(clp).toMatchObject({ contractReference: "CLP-2026-02" });
  });

  it("shows customers that cannot be invoiced with the reason, and no invoice", async () => {
    const preview = await previewRun(t.db, "2026-11", NOW);
    const der = preview.customers.find((c) => c.shortCode === "DER")!;
    expect(der).toMatchObject({ status: "blocked", invoiceNumber: null, totals: null, lines: [] });
    expect(der.problems).toEqual([expect.stringMatching(/^1 set of class "specialist_tray" \(T\d+\) is not priced by the rate card of DER-2026-01\. Add the class/)]);
    const esk = preview.customers.find((c) => c.shortCode === "ESK")!;
    expect(esk.problems).toEqual([expect.stringMatching(/^No contract version is in force during this month, so 1 delivered set cannot be priced/)]);
    expect(preview.totals).toEqual([{ currency: "GBP", invoices: 2, totalMinor: 11_580 + 4800 }]);
  });

  it("answers finance through the route handler, and refuses everyone else", async () => {
    const financeId = seed.users["finance@larkmoor.example"]!;
    const ok = await previewRoute(await requestAs(financeId, "/api/billing/preview?period=2026-11"), params({}));
    expect(ok.status).toBe(200);
    expect(((await ok.json()) as { customers: unknown[] }).customers).toHaveLength(4);
    const bad = await previewRoute(await requestAs(financeId, "/api/billing/preview?period=November"), params({}));
    expect(bad.status).toBe(422);
    const future = await previewRoute(await requestAs(financeId, "/api/billing/preview?period=2027-02"), params({}));
    expect(future.status).toBe(422);
    expect(((await future.json()) as { error: { message: string } }).error.message).toMatch(/February 2027 has not started yet/);
    for (const email of ["admin@larkmoor.example", "manager@quillby.example", "tech@larkmoor.example"]) {
      const res = await previewRoute(await requestAs(seed.users[email]!, "/api/billing/preview?period=2026-11"), params({}));
      expect(res.status).toBe(403);
    }
    // Runs are the unit's documents: a clinic manager (who may see its own invoices) gets 404.
    const runs = await runsRoute(await requestAs(seed.users["manager@quillby.example"]!, "/api/billing/runs"), params({}));
    expect(runs.status).toBe(404);
    const admin = await runsRoute(await requestAs(seed.users["admin@larkmoor.example"]!, "/api/billing/runs"), params({}));
    expect(admin.status).toBe(200);
    expect(((await admin.json()) as { period: string }[]).map((r) => r.period)).toEqual(["2026-11", "2026-10"]);
  });
});

describe("creating, approving and issuing a run", () => {
  let runId = 0;

  it("refuses a month that has not ended and a stale preview, writing nothing", async () => {
    const user = await finance();
    const before = await countRows(t.db, [...TABLES]);
    await refused(createRun(t.db, user, { period: "2026-12" }, NOW), "validation", /December 2026 has not ended yet/);
    await refused(createRun(t.db, user, { period: "2026-11", token: "0123456789abcdef" }, NOW), "conflict", /has changed since you previewed it/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("creates a draft run with one invoice per customer that can be invoiced, and prices each cycle once", async () => {
    const user = await finance();
    const preview = await previewRun(t.db, "2026-11", NOW);
    const created = await createRun(t.db, user, { period: "2026-11", token: preview.token }, NOW);
    runId = created.runId;
    expect(created.invoices.map((i) => [i.number, i.totalMinor])).toEqual([
      ["LSS-2026-11-BHC", 11_580],
      ["LSS-2026-11-CLP", 4800],
    ]);
    expect(created.skipped.map((s) => s.organisationName)).toEqual(["Dunmere Eye Rooms", "Eskholt Surgery"]);
    const priced = await t.db
      .selectFrom("priced_cycles")
      .innerJoin("invoices", "invoices.id", "priced_cycles.invoice_id")
      .select(["invoices.number", "priced_cycles.fee_minor", "priced_cycles.late"])
      .where("invoices.run_id", "=", runId)
      .orderBy("priced_cycles.cycle_id")
      .execute();
    expect(priced.map((p) => [p.number, p.fee_minor, p.late])).toEqual([
      ["LSS-2026-11-BHC", 1000, 0],
      ["LSS-2026-11-BHC", 1000, 0],
      ["LSS-2026-11-BHC", 1000, 1],
      ["LSS-2026-11-BHC", 800, 0],
      ["LSS-2026-11-BHC", 2500, 1],
      ["LSS-2026-11-CLP", 1200, 0],
      ["LSS-2026-11-CLP", 1200, 0],
      ["LSS-2026-11-CLP", 1300, 0],
    ]);
    const detail = await getRunDetail(t.db, user, runId);
    expect(detail).toMatchObject({ status: "draft", invoices: 2, totals: [{ currency: "GBP", totalMinor: 16_380 }] });
    expect(detail.invoiceList[0]!.lines[5]!.cycles).toHaveLength(5);
  });

  it("finds nothing left to price in a second run over the same month", async () => {
    const user = await finance();
    const preview = await previewRun(t.db, "2026-11", NOW);
    expect(preview.customers.filter((c) => c.status === "ready")).toEqual([]);
    const before = await countRows(t.db, [...TABLES]);
    await refused(createRun(t.db, user, { period: "2026-11" }, NOW), "validation", /No customer can be invoiced for November 2026 yet: Dunmere Eye Rooms/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    // The database refuses a cycle priced twice, whatever the code does.
    const one = await t.db.selectFrom("priced_cycles").selectAll().limit(1).executeTakeFirstOrThrow();
    await expect(t.db.insertInto("priced_cycles").values({ ...one, priced_at: NOW.toISOString() }).execute()).rejects.toThrow(/UNIQUE|PRIMARY|duplicate key/);
  });

  it("approves once, audited with who created it; an approved run cannot be discarded", async () => {
    const user = await finance();
    await refused(issueRun(t.db, user, runId), "conflict", /Approve this run before issuing it/);
    expect(await approveRun(t.db, user, runId, NOW)).toEqual({ runId, sameAsCreator: true });
    await refused(approveRun(t.db, user, runId, NOW), "conflict", /already approved/);
    await refused(discardRun(t.db, user, runId, NOW), "conflict", /Only a draft run can be discarded/);
    const audit = await t.db.selectFrom("audit_log").select(["action", "actor_user_id"]).where("entity", "=", "invoice_run").where("entity_id", "=", String(runId)).orderBy("id").execute();
    expect(audit.map((a) => a.action)).toEqual(["billing.run_created", "billing.run_approved"]);
  });

  it("issues every invoice through the payment service, each object created once, amounts equal to ours", async () => {
    const user = await finance();
    const result = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(result).toMatchObject({ status: "issued", issued: 2, failed: 0, remaining: 0 });
    const invoices = await t.db.selectFrom("invoices").selectAll().where("run_id", "=", runId).orderBy("number").execute();
    for (const invoice of invoices) {
      expect(invoice.status).toBe("open");
      expect(invoice.stripe_invoice_id).toMatch(/^in_/);
      expect(invoice.stripe_number).toMatch(/^[A-Z0-9]+-\d{4}$/);
      expect(invoice.hosted_invoice_url).toContain("/hosted/invoices/");
      // The payment service dates the invoice when it finalizes it (its own clock, today), and it
      // falls due after the contract's 30 days.
      const today = new Intl.DateTimeFormat("en-CA", { timeZone: "Europe/London" }).format(new Date());
      expect(invoice.issue_date).toBe(today);
      const due = new Date(`${today}T00:00:00Z`);
      due.setUTCDate(due.getUTCDate() + 30);
      expect(invoice.due_date).toBe(due.toISOString().slice(0, 10));
    }
    expect(result.invoices.map((r) => [r.number, r.outcome, r.stripeNumber])).toEqual(invoices.map((i) => [i.number, "issued", i.stripe_number]));

    const log = fake.requests().filter((r) => r.method === "POST" && r.status === 200);
    const created = (path: string) => log.filter((r) => r.path === path && !r.replayed);
    expect(created("/v1/customers").map((r) => r.idempotency_key).sort()).toEqual([`steamlane:customer:${brindle.organisationId}`, `steamlane:customer:${corrow.organisationId}`]);
    expect(created("/v1/invoices").map((r) => r.idempotency_key)).toEqual(invoices.map((i) => `steamlane:invoice:${i.id}`));
    const lines = await t.db.selectFrom("invoice_lines").select(["id", "invoice_id", "net_minor", "stripe_invoice_item_id"]).where("invoice_id", "in", invoices.map((i) => i.id)).execute();
    const itemKeys = created("/v1/invoiceitems").map((r) => r.idempotency_key!);
    // One item per line and one per VAT rate, each key used once.
    expect(itemKeys).toHaveLength(lines.length + invoices.length);
    expect(new Set(itemKeys).size).toBe(itemKeys.length);
    expect(lines.every((l) => l.stripe_invoice_item_id?.startsWith("ii_"))).toBe(true);
    // The turnaround credit went in as a negative amount, pending items were excluded.
    const creditItem = created("/v1/invoiceitems").find((r) => (r.params as { description?: string }).description?.startsWith("Turnaround credit"));
    expect((creditItem!.params as { amount: string }).amount).toBe("-350");
    const draftParams = created("/v1/invoices")[0]!.params as Record<string, unknown>;
    expect(draftParams).toMatchObject({ collection_method: "send_invoice", days_until_due: "30", pending_invoice_items_behavior: "exclude" });

    const stripe = new (await import("stripe")).default("sk_test_billing_runs", { ...fake.sdkConfig, maxNetworkRetries: 0, telemetry: false });
    for (const invoice of invoices) {
      const copy: Stripe.Invoice = await stripe.invoices.retrieve(invoice.stripe_invoice_id!);
      expect([copy.status, copy.total, copy.amount_due, copy.number]).toEqual(["open", invoice.total_minor, invoice.amount_due_minor, invoice.stripe_number]);
      expect(copy.metadata).toMatchObject({ steamlane_invoice_id: String(invoice.id), steamlane_invoice_number: invoice.number });
    }
    expect(created("/v1/invoices/" + invoices[0]!.stripe_invoice_id + "/send")).toHaveLength(1);

    // Issuing again changes nothing and calls nothing that creates.
    const before = fake.requests().length;
    const again = await issueRun(t.db, user, runId);
    expect(again.invoices.map((r) => r.outcome)).toEqual(["already_issued", "already_issued"]);
    expect(fake.requests().slice(before).filter((r) => r.method === "POST")).toEqual([]);

    const detail = await runRoute(await requestAs(seed.users["finance@larkmoor.example"]!, `/api/billing/runs/${runId}`), params({ id: String(runId) }));
    const body = (await detail.json()) as { status: string; invoiceList: { status: string; stage: string; stripeNumber: string }[] };
    expect(body.status).toBe("issued");
    expect(body.invoiceList.map((i) => [i.status, i.stage])).toEqual([
      ["open", "issued"],
      ["open", "issued"],
    ]);
    const other = await runRoute(await requestAs(seed.users["finance@larkmoor.example"]!, "/api/billing/runs/9999"), params({ id: "9999" }));
    expect(other.status).toBe(404);
  });
});

describe("sets delivered late into a month already invoiced", () => {
  it("continues the month: bands count on, and the minimum-fee top-up already invoiced is taken back", async () => {
    // Deliveries recorded after the run (a driver's phone that was offline): one basic tray and
    // two major trays in November.
    await deliver(t.db, brindle, { setClass: "basic_tray", receivedAt: nov(20, 8), deliveredAt: nov(21, 7) });
    await deliver(t.db, brindle, { setClass: "major_tray", receivedAt: nov(20, 8), deliveredAt: nov(21, 7) });
    await deliver(t.db, brindle, { setClass: "major_tray", receivedAt: nov(20, 8), deliveredAt: nov(21, 7, 10) });
    const bhc = (await previewRun(t.db, "2026-11", NOW)).customers.find((c) => c.shortCode === "BHC")!;
    // Worked by hand: the 5th basic tray of the month is in the 8.00 band: 800; majors 2 × 2500.
    // Billed before: 7400 of fees and surcharges plus a 2600 top-up = the 10 000 minimum. With
    // these 5800 the month's fees are 13 200, above the minimum, so the 2600 top-up is taken back.
    // Net 800 + 5000 − 2600 = 3200; VAT 640; total 3840.
    expect(bhc.invoiceNumber).toBe("LSS-2026-11-BHC-2");
    expect(bhc.lines.map((l) => [l.kind, l.quantity, l.unitPriceMinor, l.netMinor])).toEqual([
      ["processing", 1, 800, 800],
      ["processing", 2, 2500, 5000],
      ["minimum_fee_top_up", -1, 2600, -2600],
    ]);
    expect(bhc.lines[2]!.note).toContain("already invoiced 100.00 GBP on LSS-2026-11-BHC");
    expect(bhc.totals).toMatchObject({ lineTotalMinor: 3200, vatMinor: 640, totalMinor: 3840 });
  });

  it("discards a draft run, which frees its cycles for the next one", async () => {
    const user = await finance();
    const { runId } = await createRun(t.db, user, { period: "2026-11" }, NOW);
    const before = await countRows(t.db, ["priced_cycles", "invoices"]);
    expect(await discardRun(t.db, user, runId, NOW)).toEqual({ runId, invoices: 1 });
    expect(await countRows(t.db, ["priced_cycles", "invoices"])).toEqual({ priced_cycles: before.priced_cycles - 3, invoices: before.invoices - 1 });
    expect((await previewRun(t.db, "2026-11", NOW)).customers.find((c) => c.shortCode === "BHC")!.invoiceNumber).toBe("LSS-2026-11-BHC-2");
  });
});
