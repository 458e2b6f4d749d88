// Reports benchmark: every report over one million cycles (two years of history for 40
// customers, two scan events per cycle, washer batches, invoices and the coming days' bookings),
// built in a temporary database, against a baseline measured in the same run (one plain SELECT of
// the period's cycles).
// Run: npm run bench:reports  (prints a Markdown table; REPORTS_BENCH_RUNS sets the runs,
// REPORTS_BENCH_CYCLES the number of cycles, a multiple of 40 such as 100000 for a quicker run).
//
// The rows are written straight into the tables with prepared INSERTs inside one transaction, not
// through applyCycleEvent, which would take hours for a million cycles and is not what is measured.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import SQLite from "better-sqlite3";
import { openDatabase } from "../../db/connection";
import { migrateToLatest } from "../../db/migrator";
import type { SessionUser } from "../../lib/auth/session-user";
import { buildReport, REPORT_NAMES, type ReportName, reportQuerySchema } from "../../lib/reports/service";
import { localDateRange } from "../../lib/reports/periods";
import { mulberry32 } from "../../lib/routing/random";
import { markdownTable, median, quantile } from "./_stats";

const CUSTOMERS = 40;
const CYCLES = Number(process.env.REPORTS_BENCH_CYCLES ?? 1_000_000);
const RUNS = Number(process.env.REPORTS_BENCH_RUNS ?? 5);
if (!Number.isInteger(CYCLES / CUSTOMERS) || CYCLES <= 0) {
  throw new Error(`REPORTS_BENCH_CYCLES must be a positive multiple of ${CUSTOMERS} (got ${process.env.REPORTS_BENCH_CYCLES}).`);
}
const ZONE = "Europe/London";
const NOW = new Date("2026-12-01T09:00:00Z");
const HISTORY_START = Date.parse("2024-12-01T00:00:00Z");
const HISTORY_END = Date.parse("2026-11-30T23:00:00Z");
const CLASSES = ["single_instrument", "basic_tray", "major_tray", "specialist_tray", "dental_cassette"] as const;
const STATIONS = ["receiving", "washing", "packing", "sterilising", "release", "dispatch", "clinic"] as const;

process.env.UNIT_TIME_ZONE = ZONE;

const ms = (x: number) => (x >= 1000 ? `${(x / 1000).toFixed(2)} s` : `${x.toFixed(0)} ms`);

function build(file: string): { unitId: number } {
  const sqlite = new SQLite(file);
  sqlite.pragma("journal_mode = WAL");
  const random = mulberry32(20261201);
  const iso = "2024-11-01T00:00:00.000Z";
  const calendar = JSON.stringify({
    timeZone: ZONE,
    hours: Object.fromEntries(["mon", "tue", "wed", "thu", "fri"].map((d) => [d, [{ start: "07:00", end: "19:00" }]]).concat([["sat", [{ start: "08:00", end: "12:00" }]], ["sun", []]])),
    holidays: ["2025-12-25", "2025-12-26", "2026-01-01", "2026-12-25"],
  });
  const org = sqlite.prepare("insert into organisations (kind, name, short_code, created_at, updated_at) values (?, ?, ?, ?, ?)");
  const site = sqlite.prepare(
    "insert into sites (organisation_id, name, address_line1, town, postcode, latitude, longitude, opening_hours, created_at, updated_at) values (?, ?, 'Invented Row', 'Larkmoor', 'LK1 1AA', 53.7, -1.5, '{}', ?, ?)",
  );
  const contract = sqlite.prepare(
    `insert into contracts (organisation_id, reference, valid_from, valid_until, currency, vat_category, vat_rate_bp, payment_terms_days,
      turnaround_standard_hours, turnaround_express_hours, clock_stops_at, service_calendar, minimum_monthly_fee_minor, sla_credit_bp, created_at, updated_at)
     values (?, ?, '2024-01-01', null, 'GBP', 'S', 2000, 30, 24, 6, ?, ?, 0, 1000, ?, ?)`,
  );
  const setType = sqlite.prepare(
    "insert into set_types (organisation_id, code, name, set_class, packaging, sterilisation_method, weight_g, size_stu, created_at, updated_at) values (?, ?, ?, ?, 'wrap', 'steam_134', 2000, ?, ?, ?)",
  );
  const set = sqlite.prepare("insert into sets (organisation_id, set_type_id, home_site_id, serial, giai, status, created_at, updated_at) values (?, ?, ?, ?, ?, 'in_service', ?, ?)");
  const cycle = sqlite.prepare(
    `insert into cycles (organisation_id, site_id, set_id, order_id, state, service_level, booked_at, received_at, released_at, delivered_at, created_at, updated_at)
     values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const scan = sqlite.prepare("insert into scan_events (cycle_id, set_id, organisation_id, event, from_state, to_state, station, at) values (?, ?, ?, ?, ?, ?, ?, ?)");
  const machine = sqlite.prepare("insert into machines (kind, code, name, capacity_stu, created_at, updated_at) values (?, ?, ?, ?, ?, ?)");
  const program = sqlite.prepare("insert into programs (machine_id, code, name, requirement) values (?, 'P1', 'Instruments', '{}')");
  const batch = sqlite.prepare("insert into washer_batches (number, machine_id, program_id, status, started_at, ended_at, reasons, created_at) values (?, ?, ?, ?, ?, ?, ?, ?)");
  const invoice = sqlite.prepare(
    `insert into invoices (organisation_id, number, currency, period_start, period_end, issue_date, due_date, status, line_total_minor, tax_exclusive_minor, vat_minor, total_minor, amount_due_minor, vat_breakdown, created_at, updated_at)
     values (?, ?, 'GBP', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, '[]', ?, ?)`,
  );
  const order = sqlite.prepare("insert into orders (organisation_id, site_id, reference, kind, status, service_level, collection_from, collection_until, created_at, updated_at) values (?, ?, ?, 'pickup', 'booked', 'standard', ?, ?, ?, ?)");

  let unitId = 0;
  sqlite.transaction(() => {
    unitId = Number(org.run("unit", "Benchmark Reprocessing Unit", "BRU", iso, iso).lastInsertRowid);
    const washers = [1, 2, 3].map((n) => {
      const id = Number(machine.run("washer", `W${n}`, `Washer ${n}`, 6, iso, iso).lastInsertRowid);
      return { id, program: Number(program.run(id).lastInsertRowid) };
    });
    machine.run("steriliser", "S1", "Steriliser 1", 6, iso, iso);
    machine.run("steriliser", "S2", "Steriliser 2", 8, iso, iso);
    const span = HISTORY_END - HISTORY_START;
    let batchNo = 0;
    for (let b = 0; b < CYCLES / 12; b++) {
      const w = washers[b % washers.length]!;
      const started = HISTORY_START + Math.floor(random() * span);
      const failed = random() < 0.02;
      batch.run(`WB${++batchNo}`, w.id, w.program, failed ? "failed" : "passed", new Date(started).toISOString(), new Date(started + 55 * 60_000).toISOString(), failed ? JSON.stringify(["A0 below the program's requirement."]) : null, new Date(started).toISOString());
    }
    let orderNo = 0;
    for (let c = 0; c < CUSTOMERS; c++) {
      const orgId = Number(org.run("customer", `Benchmark customer ${c + 1}`, `B${String(c + 1).padStart(3, "0")}`, iso, iso).lastInsertRowid);
      const sites = [1, 2].map((n) => Number(site.run(orgId, `Site ${n} of customer ${c + 1}`, iso, iso).lastInsertRowid));
      contract.run(orgId, `B${c + 1}-2024-01`, c % 4 === 0 ? "released" : "delivered", calendar, iso, iso);
      const types = CLASSES.map((setClass, i) => Number(setType.run(orgId, `T${c}-${i}`, `Benchmark ${setClass}`, setClass, i === 0 ? 0.25 : 1, iso, iso).lastInsertRowid));
      const sets = Array.from({ length: 400 }, (_, i) => {
        const serial = `B${c + 1}-${String(i).padStart(5, "0")}`;
        return Number(set.run(orgId, types[i % types.length]!, sites[i % 2]!, serial, `952${serial}`, iso, iso).lastInsertRowid);
      });
      for (let k = 0; k < CYCLES / CUSTOMERS; k++) {
        const received = HISTORY_START + Math.floor(random() * span);
        const released = received + (4 + random() * 40) * 3_600_000;
        const delivered = released + (1 + random() * 6) * 3_600_000;
        const setId = sets[k % sets.length]!;
        const siteId = sites[(k % sets.length) % 2]!;
        const id = Number(
          cycle.run(orgId, siteId, setId, null, "delivered", random() < 0.06 ? "express" : "standard", new Date(received - 8 * 3_600_000).toISOString(), new Date(received).toISOString(), new Date(released).toISOString(), new Date(delivered).toISOString(), iso, iso)
            .lastInsertRowid,
        );
        scan.run(id, setId, orgId, "receive", "collected", "received", STATIONS[0], new Date(received).toISOString());
        scan.run(id, setId, orgId, "release", "sterilised", "released", STATIONS[1 + (k % (STATIONS.length - 1))], new Date(released).toISOString());
      }
      // Invoices: one a month for two years; the last three months still open.
      for (let m = 0; m < 24; m++) {
        const start = new Date(Date.UTC(2024, 11 + m, 1)).toISOString();
        const end = new Date(Date.UTC(2024, 12 + m, 1)).toISOString();
        const net = 5 * (40_000 + Math.floor(random() * 20_000));
        const open = m >= 21;
        const due = new Date(Date.UTC(2024, 12 + m, 31)).toISOString().slice(0, 10);
        invoice.run(orgId, `BRU-${c}-${m}`, start, end, end.slice(0, 10), due, open ? "open" : "paid", net, net, net / 5, (net * 6) / 5, open ? (net * 6) / 5 : 0, iso, iso);
      }
      // The coming fortnight's bookings: one per set type's first 60 sets, on their own sets.
      for (let k = 0; k < 60; k++) {
        const from = NOW.getTime() + Math.floor(random() * 14 * 86_400_000);
        const orderId = Number(order.run(orgId, sites[k % 2]!, `BO-${c}-${++orderNo}`, new Date(from).toISOString(), new Date(from + 2 * 3_600_000).toISOString(), iso, iso).lastInsertRowid);
        const extra = Number(set.run(orgId, types[k % types.length]!, sites[k % 2]!, `BK${c}-${k}`, `952BK${c}-${k}`, iso, iso).lastInsertRowid);
        cycle.run(orgId, sites[k % 2]!, extra, orderId, "booked", "standard", iso, null, null, null, iso, iso);
      }
    }
  })();
  sqlite.close();
  return { unitId };
}

async function main() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-reports-bench-"));
  const file = path.join(dir, "bench.db");
  try {
    const db = openDatabase(file);
    await migrateToLatest(db);
    let t = performance.now();
    const { unitId } = build(file);
    const buildMs = performance.now() - t;
    if (process.env.REPORTS_BENCH_NO_INDEXES === "1") {
      // For comparison: the same run without the reports' indexes (migration 2026_12_02_0070).
      for (const name of ["cycles_released_idx", "cycles_delivered_idx", "cycles_received_idx"]) await db.schema.dropIndex(name).ifExists().execute();
    }
    const user: SessionUser = { id: 1, name: "Bench", email: "bench@example.invalid", role: "admin", organisationId: unitId, organisationName: "Benchmark Reprocessing Unit", organisationKind: "unit", siteId: null };

    const periods = [
      { label: "90 days", from: "2026-09-02", to: "2026-11-30" },
      { label: "1 year", from: "2025-12-01", to: "2026-11-30" },
    ];
    const rows: string[][] = [];
    for (const p of periods) {
      const range = localDateRange(p.from, p.to, ZONE);
      const baseline: number[] = [];
      let cycles = 0;
      for (let i = 0; i <= RUNS; i++) {
        t = performance.now();
        const result = await db
          .selectFrom("cycles")
          .select(["cycles.id", "cycles.organisation_id", "cycles.received_at", "cycles.released_at", "cycles.delivered_at"])
          .where("cycles.delivered_at", ">=", range.start)
          .where("cycles.delivered_at", "<", range.end)
          .execute();
        if (i > 0) baseline.push(performance.now() - t);
        cycles = result.length;
      }
      const base = median(baseline);
      rows.push(["baseline: SELECT the period's cycles", p.label, `${cycles.toLocaleString("en-GB")} rows`, ms(base), ms(quantile(baseline, 0.99)), "1.0×"]);
      for (const name of REPORT_NAMES) {
        if (p.label !== "90 days" && (name === "capacity" || name === "receivables")) continue;
        const times: number[] = [];
        let size = 0;
        for (let i = 0; i <= RUNS; i++) {
          t = performance.now();
          const { report } = await buildReport(db, user, name as ReportName, reportQuerySchema.parse({ from: p.from, to: p.to }), NOW);
          if (i > 0) times.push(performance.now() - t);
          size = report.tables.reduce((n, x) => n + x.rows.length, 0);
        }
        const med = median(times);
        rows.push([name, p.label, `${size.toLocaleString("en-GB")} table rows`, ms(med), ms(quantile(times, 0.99)), `${(med / base).toFixed(1)}×`]);
      }
    }
    console.log(`Built ${CYCLES.toLocaleString("en-GB")} cycles, ${(2 * CYCLES).toLocaleString("en-GB")} scan events and ${Math.round(CYCLES / 12).toLocaleString("en-GB")} washer batches in ${ms(buildMs)}; ${RUNS} timed runs each after one warm-up (p99 of ${RUNS} runs is their slowest).\n`);
    for (const line of markdownTable(["report", "period", "answer", "median", "p99", "ratio to baseline"], "llrrrr", rows)) console.log(line);
    await db.destroy();
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
