// Invoice-run benchmark: the preview of one month for 60 customers with 300,000 delivered cycles,
// built in a temporary database, against a baseline measured in the same run (reading the same
// cycles with one plain SELECT), and what the time scales with.
// Run: npx tsx --conditions=react-server tests/bench/billing.ts  (prints Markdown tables).
//
// The data is written straight into the tables (one prepared INSERT per row inside one
// transaction) rather than through the stations' applyCycleEvent, which would take hours for
// 300,000 cycles and is not what is measured here. Customers get different numbers of cycles
// (1,000 to about 9,000) so that a straight-line fit of the time per customer separates the
// fixed cost of a customer (its queries, its contract) from the cost per cycle.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import SQLite from "better-sqlite3";
import { openDatabase } from "../../db/connection";
import { migrateToLatest } from "../../db/migrator";
import { previewRun, unpricedCycles } from "../../lib/billing/run";
import { billingPeriod } from "../../lib/billing/run-periods";
import { priceCustomerMonth } from "../../lib/billing/run-pricing";
import { contractTermsBetween } from "../../lib/contracts/service";
import { mulberry32 } from "../../lib/routing/random";
import { markdownTable, median, quantile } from "./_stats";

const CUSTOMERS = 60;
const CYCLES = 300_000;
const RUNS = Number(process.env.BILLING_BENCH_RUNS ?? 5);
const MONTH = "2026-11";
const ZONE = "Europe/London";
const NOW = new Date("2026-12-02T09:00:00Z");
const CLASSES = ["single_instrument", "basic_tray", "major_tray", "specialist_tray", "dental_cassette"] as const;

const ms = (x: number) => `${x.toFixed(0)} ms`;

/** Cycles per customer: growing linearly from 1,000, adding up to exactly CYCLES. */
function sizes(): number[] {
  const step = Math.floor((2 * (CYCLES - CUSTOMERS * 1000)) / (CUSTOMERS * (CUSTOMERS - 1)));
  const list = Array.from({ length: CUSTOMERS }, (_, i) => 1000 + i * step);
  list[CUSTOMERS - 1]! += CYCLES - list.reduce((a, b) => a + b, 0);
  return list;
}

function build(file: string): number[] {
  const sqlite = new SQLite(file);
  sqlite.pragma("journal_mode = WAL");
  const random = mulberry32(20261130);
  const iso = "2026-01-01T00:00:00.000Z";
  const calendar = JSON.stringify({
    timeZone: ZONE,
    hours: { mon: [{ start: "06:00", end: "22:00" }], tue: [{ start: "06:00", end: "22:00" }], wed: [{ start: "06:00", end: "22:00" }], thu: [{ start: "06:00", end: "22:00" }], fri: [{ start: "06:00", end: "22:00" }], sat: [{ start: "06:00", end: "22:00" }], sun: [] },
    holidays: ["2026-12-25", "2026-12-28", "2027-01-01"],
  });
  const org = sqlite.prepare("insert into organisations (kind, name, short_code, created_at, updated_at) values (?, ?, ?, ?, ?)");
  const site = sqlite.prepare(
    "insert into sites (organisation_id, name, address_line1, town, postcode, latitude, longitude, opening_hours, created_at, updated_at) values (?, ?, 'Invented Row', 'Larkmoor', 'LK1 1AA', 53.7, -1.5, '{}', ?, ?)",
  );
  const contract = sqlite.prepare(
    `insert into contracts (organisation_id, reference, valid_from, valid_until, currency, vat_category, vat_rate_bp, payment_terms_days,
      turnaround_standard_hours, turnaround_express_hours, clock_stops_at, service_calendar, minimum_monthly_fee_minor, sla_credit_bp, created_at, updated_at)
     values (?, ?, '2026-01-01', null, 'GBP', 'S', 2000, 30, 24, 5, 'delivered', ?, 400000, 1000, ?, ?)`,
  );
  const rate = sqlite.prepare("insert into contract_rates (contract_id, set_class, band_index, up_to_quantity, unit_price_minor) values (?, ?, ?, ?, ?)");
  const surcharge = sqlite.prepare("insert into contract_surcharges (contract_id, kind, basis, amount_minor, basis_points) values (?, ?, ?, ?, ?)");
  const setType = sqlite.prepare(
    "insert into set_types (organisation_id, code, name, set_class, packaging, sterilisation_method, weight_g, size_stu, created_at, updated_at) values (?, ?, ?, ?, 'wrap', ?, 2000, 0.5, ?, ?)",
  );
  const set = sqlite.prepare("insert into sets (organisation_id, set_type_id, home_site_id, serial, giai, status, created_at, updated_at) values (?, ?, ?, ?, ?, 'in_service', ?, ?)");
  const cycle = sqlite.prepare(
    `insert into cycles (organisation_id, site_id, set_id, state, service_level, heavy_soil, out_of_hours, loaner, missing_instrument,
      booked_at, collected_at, received_at, washed_at, packed_at, sterilised_at, released_at, dispatched_at, delivered_at, created_at, updated_at)
     values (?, ?, ?, 'delivered', ?, ?, ?, 0, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const monthStart = Date.parse(billingPeriod(MONTH, ZONE).start);
  const monthMs = Date.parse(billingPeriod(MONTH, ZONE).end) - monthStart;
  const counts = sizes();
  sqlite.transaction(() => {
    org.run("unit", "Benchmark Reprocessing Unit", "BRU", iso, iso);
    for (let c = 0; c < CUSTOMERS; c++) {
      const orgId = Number(org.run("customer", `Benchmark customer ${c + 1}`, `B${String(c + 1).padStart(3, "0")}`, iso, iso).lastInsertRowid);
      const siteId = Number(site.run(orgId, `Site of customer ${c + 1}`, iso, iso).lastInsertRowid);
      const contractId = Number(contract.run(orgId, `B${c + 1}-2026-01`, calendar, iso, iso).lastInsertRowid);
      for (const setClass of CLASSES) {
        rate.run(contractId, setClass, 0, 500, 1450);
        rate.run(contractId, setClass, 1, 2000, 1320);
        rate.run(contractId, setClass, 2, null, 1210);
      }
      surcharge.run(contractId, "express", "percent_of_fee", null, 5000);
      surcharge.run(contractId, "heavy_soil", "per_set", 450, null);
      surcharge.run(contractId, "out_of_hours", "per_set", 1200, null);
      surcharge.run(contractId, "missing_instrument_investigation", "per_set", 2500, null);
      surcharge.run(contractId, "low_temperature", "percent_of_fee", null, 3500);
      const types = CLASSES.map((setClass, i) =>
        Number(setType.run(orgId, `T${c}-${i}`, `Benchmark ${setClass}`, setClass, i === 0 ? "low_temperature" : "steam_134", iso, iso).lastInsertRowid),
      );
      const sets = Array.from({ length: 300 }, (_, i) => {
        const serial = `B${c + 1}-${String(i).padStart(5, "0")}`;
        return Number(set.run(orgId, types[i % types.length]!, siteId, serial, `952${serial}`, iso, iso).lastInsertRowid);
      });
      for (let k = 0; k < counts[c]!; k++) {
        const delivered = monthStart + Math.floor(random() * monthMs);
        const hours = 6 + random() * 30;
        const received = delivered - hours * 3_600_000;
        const at = (f: number) => new Date(received + f * (delivered - received)).toISOString();
        cycle.run(
          orgId,
          siteId,
          sets[k % sets.length]!,
          random() < 0.06 ? "express" : "standard",
          random() < 0.04 ? 1 : 0,
          random() < 0.03 ? 1 : 0,
          random() < 0.01 ? 1 : 0,
          new Date(received - 8 * 3_600_000).toISOString(),
          new Date(received - 2 * 3_600_000).toISOString(),
          at(0),
          at(0.2),
          at(0.4),
          at(0.6),
          at(0.8),
          at(0.9),
          new Date(delivered).toISOString(),
          iso,
          iso,
        );
      }
    }
  })();
  sqlite.close();
  return counts;
}

/** Least-squares line through (x, y). */
function fit(points: [number, number][]): { slope: number; intercept: number; r2: number } {
  const n = points.length;
  const mx = points.reduce((s, [x]) => s + x, 0) / n;
  const my = points.reduce((s, [, y]) => s + y, 0) / n;
  const sxy = points.reduce((s, [x, y]) => s + (x - mx) * (y - my), 0);
  const sxx = points.reduce((s, [x]) => s + (x - mx) ** 2, 0);
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  const ssr = points.reduce((s, [x, y]) => s + (y - (intercept + slope * x)) ** 2, 0);
  const sst = points.reduce((s, [, y]) => s + (y - my) ** 2, 0);
  return { slope, intercept, r2: 1 - ssr / sst };
}

async function main() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-billing-bench-"));
  const file = path.join(dir, "bench.db");
  try {
    const db = openDatabase(file);
    await migrateToLatest(db);
    let t = performance.now();
    const counts = build(file);
    const buildMs = performance.now() - t;
    const period = billingPeriod(MONTH, ZONE);

    // Baseline: the same cycles, one plain SELECT with the joins the preview needs.
    const baseline: number[] = [];
    let rows = 0;
    for (let i = 0; i <= RUNS; i++) {
      t = performance.now();
      const result = await db
        .selectFrom("cycles")
        .innerJoin("sets", "sets.id", "cycles.set_id")
        .innerJoin("set_types", "set_types.id", "sets.set_type_id")
        .select(["cycles.id", "cycles.organisation_id", "sets.serial", "set_types.set_class", "cycles.delivered_at", "cycles.received_at", "cycles.released_at"])
        .where("cycles.delivered_at", ">=", period.start)
        .where("cycles.delivered_at", "<", period.end)
        .where("cycles.state", "=", "delivered")
        .execute();
      if (i > 0) baseline.push(performance.now() - t);
      rows = result.length;
    }

    const preview: number[] = [];
    let invoices = 0;
    for (let i = 0; i <= RUNS; i++) {
      t = performance.now();
      const result = await previewRun(db, MONTH, NOW);
      if (i > 0) preview.push(performance.now() - t);
      invoices = result.customers.filter((c) => c.status === "ready").length;
    }

    // Where the time goes, customer by customer: loading (queries) and pricing (turnaround + engine).
    const orgs = await db.selectFrom("organisations").select("id").where("kind", "=", "customer").orderBy("id").execute();
    const perCustomer: { cycles: number; loadMs: number; priceMs: number }[] = [];
    for (const org of orgs) {
      t = performance.now();
      const cycles = await unpricedCycles(db, org.id, period);
      const versions = await contractTermsBetween(db, org.id, period, ZONE);
      const loadMs = performance.now() - t;
      t = performance.now();
      priceCustomerMonth({ period, timeZone: ZONE, versions, cycles });
      perCustomer.push({ cycles: cycles.length, loadMs, priceMs: performance.now() - t });
    }
    await db.destroy();

    const total = fit(perCustomer.map((c) => [c.cycles, c.loadMs + c.priceMs]));
    const load = fit(perCustomer.map((c) => [c.cycles, c.loadMs]));
    const price = fit(perCustomer.map((c) => [c.cycles, c.priceMs]));
    const fitRow = (part: string, f: ReturnType<typeof fit>) => [part, ms(f.slope * 10_000), ms(f.intercept), f.r2.toFixed(3)];
    const med = median(preview);
    const base = median(baseline);
    console.log(
      [
        `## Preview of ${MONTH}: ${CUSTOMERS} customers, ${rows.toLocaleString("en-GB")} delivered cycles (${Math.min(...counts)}–${Math.max(...counts)} per customer)`,
        "",
        `Data built in ${ms(buildMs)}; ${RUNS} timed runs after one warm-up; ${invoices} invoices would be made.`,
        "",
        ...markdownTable(["measure", "median", "p99", "ratio to baseline"], "lrrr", [
          ["baseline: one plain SELECT of the month's cycles", ms(base), ms(quantile(baseline, 0.99)), "1.0"],
          ["previewRun (queries, turnaround per cycle, pricing, totals)", ms(med), ms(quantile(preview, 0.99)), (med / base).toFixed(1)],
        ]),
        "",
        "## What it scales with (least-squares fit of one preview's time per customer against its cycles)",
        "",
        ...markdownTable(["part", "per 10,000 cycles", "per customer (fixed)", "R²"], "lrrr", [
          fitRow("loading (queries)", load),
          fitRow("pricing (turnaround + engine)", price),
          fitRow("total", total),
        ]),
        "",
        `Per 10,000 cycles of the whole preview: ${ms((med / rows) * 10_000)}; the plain SELECT: ${ms((base / rows) * 10_000)}.`,
      ].join("\n"),
    );
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
