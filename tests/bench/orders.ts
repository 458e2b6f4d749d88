// Order list benchmark: GET /api/orders on a database of 200,000 orders (2 years, 8 customers,
// 40 sites, at least one cycle per order), called as the route handler runs in the app — a real
// session cookie, parsing, the permission and tenant scope, the count and page queries, and the
// JSON body — for every filter and sort the list offers, as the unit, a clinic manager and clinic
// staff. Prints each query's EXPLAIN QUERY PLAN with the indexes it uses and flags scans of the
// whole table; measures everything twice, without and with the indexes of
// migrations/2026_12_01_0013_order_list_indexes.ts, and ends with a Markdown table.
//
// Run: npx tsx tests/bench/orders.ts, or `npm run bench` (under --conditions=react-server the file
// runs itself again without it: the route module needs React's client build, see main()).
// Settings: ORDERS_BENCH_ORDERS (200000), ORDERS_BENCH_RUNS (at most this many timed runs per
// case, 25), ORDERS_BENCH_BUDGET_MS (time per case, 2500; at least 5 runs), ORDERS_BENCH_DB (a
// file to build once and reuse; kept), ORDERS_BENCH_CASES (a regular expression on "role case").
//
// Times depend on the machine; each is reported with its ratio to a baseline measured in the same
// run, interleaved with the case's own runs: GET /api/orders/:id for one order (the same stack, a
// primary-key lookup). A bare `select count(*) from orders` on the file is printed beside it.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import Module, { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import { markdownTable, median, quantile } from "./_stats";

const ORDERS = Number(process.env.ORDERS_BENCH_ORDERS ?? 200_000);
const MAX_RUNS = Number(process.env.ORDERS_BENCH_RUNS ?? 25);
const BUDGET_MS = Number(process.env.ORDERS_BENCH_BUDGET_MS ?? 2500);
const MIN_RUNS = 5;
const KEEP_DB = process.env.ORDERS_BENCH_DB;
const ONLY = process.env.ORDERS_BENCH_CASES ? new RegExp(process.env.ORDERS_BENCH_CASES) : null;
const DAY = 86_400_000;
/** The benchmark's "now": the data spans the two years before it. */
const NOW = Date.parse("2026-12-01T10:00:00Z");

// --- statistics -----------------------------------------------------------------------------
const ms = (x: number) => (x < 10 ? `${x.toFixed(2)} ms` : `${x.toFixed(1)} ms`);

/**
 * Times `run` and, alternating with it, the baseline, so that both see the same machine: a busy
 * moment slows both and the ratio of their medians stays comparable.
 */
async function timeRuns(run: () => Promise<void>, baseline: () => Promise<void>): Promise<{ times: number[]; baseline: number[] }> {
  await run(); // warm-up: statement and page caches
  await baseline();
  const times: number[] = [];
  const base: number[] = [];
  const started = performance.now();
  while (times.length < MAX_RUNS && (times.length < MIN_RUNS || performance.now() - started < BUDGET_MS)) {
    let t = performance.now();
    await baseline();
    base.push(performance.now() - t);
    t = performance.now();
    await run();
    times.push(performance.now() - t);
  }
  return { times, baseline: base };
}

// --- the data -------------------------------------------------------------------------------
function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface BenchPeople {
  unit: number;
  manager: number;
  staff: number;
  staffSite: number;
  managerOrganisation: number;
  /** A site of the manager's organisation other than the staff's. */
  otherSite: number;
  anyOrderId: number;
}

const SITE_WORDS = ["Theatres", "Day Unit", "Dental", "Clinic", "Treatment Rooms", "Eye Unit", "Surgery", "Endoscopy"];

/** Fills a migrated database with the benchmark's customers, sites, sets, orders and cycles. */
function buildData(file: string, SQLite: typeof import("better-sqlite3")): void {
  const db = new SQLite(file);
  db.pragma("journal_mode = WAL");
  db.pragma("synchronous = OFF");
  const rand = mulberry32(20261201);
  const iso = (t: number) => new Date(t).toISOString();
  const created = iso(NOW - 800 * DAY);
  const insert = {
    organisation: db.prepare("insert into organisations (kind, name, short_code, created_at, updated_at) values (?, ?, ?, ?, ?)"),
    site: db.prepare(
      "insert into sites (organisation_id, name, address_line1, town, postcode, latitude, longitude, opening_hours, created_at, updated_at) values (?, ?, '1 Bench Road', 'Benchton', 'LK1 1AA', 53.7, -1.5, ?, ?, ?)",
    ),
    user: db.prepare("insert into users (organisation_id, site_id, email, name, role, status, created_at, updated_at) values (?, ?, ?, ?, ?, 'active', ?, ?)"),
    setType: db.prepare(
      "insert into set_types (organisation_id, code, name, set_class, packaging, sterilisation_method, weight_g, size_stu, created_at, updated_at) values (?, ?, 'Basic tray', 'basic_tray', 'wrap', 'steam_134', 4000, 1, ?, ?)",
    ),
    set: db.prepare("insert into sets (organisation_id, set_type_id, home_site_id, serial, giai, status, created_at, updated_at) values (?, ?, ?, ?, ?, 'in_service', ?, ?)"),
    order: db.prepare(
      `insert into orders (organisation_id, site_id, reference, kind, status, service_level, collection_from, collection_until, needed_back_by,
        promised_return_at, notes, created_at, updated_at, collected_at, cancelled_at) values (?, ?, ?, 'pickup', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    ),
    cycle: db.prepare(
      `insert into cycles (organisation_id, site_id, set_id, order_id, state, service_level, promised_at, booked_at, received_at, delivered_at, cancelled_at,
        created_at, updated_at) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    ),
  };
  const hours = JSON.stringify(Object.fromEntries(["mon", "tue", "wed", "thu", "fri", "sat", "sun"].map((d) => [d, [{ start: "00:00", end: "24:00" }]])));
  db.transaction(() => {
    const unitOrg = Number(insert.organisation.run("unit", "Bench Sterile Services", "BSS", created, created).lastInsertRowid);
    insert.user.run(unitOrg, null, "dispatch@bench.example", "Bench Dispatcher", "dispatcher", created, created);
    // Eight customers of very different sizes: the first is a hospital group with 40 % of orders.
    const orgWeights = [0.4, 0.15, 0.12, 0.1, 0.08, 0.07, 0.05, 0.03];
    const sites: { id: number; org: number; weight: number; sets: number[] }[] = [];
    const orgIds: number[] = [];
    orgWeights.forEach((weight, o) => {
      const code = `C${o + 1}`;
      const org = Number(insert.organisation.run("customer", `Bench Customer ${o + 1}`, code, created, created).lastInsertRowid);
      orgIds.push(org);
      const type = Number(insert.setType.run(org, `${code}-T1`, created, created).lastInsertRowid);
      const siteCount = o === 0 ? 12 : 4;
      for (let s = 0; s < siteCount; s++) {
        const site = Number(insert.site.run(org, `${code} ${SITE_WORDS[(o + s) % SITE_WORDS.length]} ${s + 1}`, hours, created, created).lastInsertRowid);
        const setIds: number[] = [];
        for (let k = 0; k < 150; k++) {
          const serial = `${code}-${String(s * 1000 + k + 1).padStart(6, "0")}`;
          setIds.push(Number(insert.set.run(org, type, site, serial, `9521234${serial.replace("-", "")}`, created, created).lastInsertRowid));
        }
        // Within a customer, the first site is the busiest.
        sites.push({ id: site, org, weight: (weight * (siteCount - s)) / ((siteCount * (siteCount + 1)) / 2), sets: setIds });
      }
    });
    insert.user.run(orgIds[0]!, null, "manager@c1.example", "Bench Manager", "clinic_manager", created, created);
    // Clinic staff at the hospital group's third site (about 5 % of all orders).
    const staffSite = sites.filter((s) => s.org === orgIds[0])[2]!;
    insert.user.run(orgIds[0]!, staffSite.id, "staff@c1.example", "Bench Staff", "clinic_staff", created, created);

    const cumulative: number[] = [];
    sites.reduce((sum, s) => (cumulative.push(sum + s.weight), sum + s.weight), 0);
    const total = cumulative.at(-1)!;
    const counters = new Map<number, number>();
    const openSetCursor = new Map<number, number>();
    const notes = ["Please ring on arrival.", "Two trays from the emergency list.", "Heavy soil after a long list.", "Collect from the side door."];
    // Orders in time order over two years, so ids grow with creation time as in the app.
    for (let i = 0; i < ORDERS; i++) {
      const createdAt = NOW - 730 * DAY + Math.floor(((i + rand()) / ORDERS) * 730 * DAY);
      const pick = rand() * total;
      const site = sites[cumulative.findIndex((c) => c >= pick)]!;
      const n = (counters.get(site.org) ?? 0) + 1;
      counters.set(site.org, n);
      const code = `C${orgIds.indexOf(site.org) + 1}`;
      const from = createdAt + (1 + Math.floor(rand() * 3)) * DAY;
      const until = from + 2 * 3_600_000;
      const promised = until + 30 * 3_600_000;
      const age = NOW - from;
      const cancelled = rand() < 0.03;
      // Recent orders are still on their way; the rest are back.
      const status = cancelled ? "cancelled" : age < 0 ? "booked" : age < 2 * DAY ? (["collected", "in_process", "ready", "out_for_delivery"] as const)[Math.floor(rand() * 4)] : "delivered";
      const level = rand() < 0.06 ? "express" : "standard";
      const orderId = Number(
        insert.order.run(
          site.org,
          site.id,
          `${code}-P${String(n).padStart(6, "0")}`,
          status,
          level,
          iso(from),
          iso(until),
          iso(promised + 6 * 3_600_000),
          iso(promised),
          rand() < 0.1 ? notes[Math.floor(rand() * notes.length)]! : null,
          iso(createdAt),
          iso(Math.min(NOW, promised)),
          status === "booked" || cancelled ? null : iso(from + 3_600_000),
          cancelled ? iso(from - 3_600_000) : null,
        ).lastInsertRowid,
      );
      const cycles = 1 + Math.floor(rand() * rand() * 6);
      for (let c = 0; c < cycles; c++) {
        const open = status !== "delivered" && status !== "cancelled";
        // An open cycle takes a set of its own (one open cycle per set); closed ones any set.
        let setId: number;
        if (open) {
          const cursor = openSetCursor.get(site.id) ?? 0;
          openSetCursor.set(site.id, cursor + 1);
          setId = site.sets[cursor % site.sets.length]!;
        } else setId = site.sets[Math.floor(rand() * site.sets.length)]!;
        const state = cancelled
          ? "cancelled"
          : status === "delivered"
            ? "delivered"
            : status === "booked"
              ? "booked"
              : status === "collected"
                ? "collected"
                : status === "in_process"
                  ? (["received", "washed", "packed", "on_hold"] as const)[Math.floor(rand() * 4)]
                  : status === "ready"
                    ? "released"
                    : "dispatched";
        insert.cycle.run(
          site.org,
          site.id,
          setId,
          orderId,
          state,
          level,
          iso(promised),
          iso(createdAt),
          ["booked", "collected", "cancelled"].includes(state) ? null : iso(from + 2 * 3_600_000),
          state === "delivered" ? iso(promised - 3_600_000) : null,
          state === "cancelled" ? iso(from - 3_600_000) : null,
          iso(createdAt),
          iso(createdAt),
        );
      }
    }
  })();
  db.close();
}

/** The benchmark's users and the ids the cases need, read back from the database. */
function peopleOf(db: import("better-sqlite3").Database): BenchPeople {
  const user = (email: string) => db.prepare("select id, organisation_id, site_id from users where email = ?").get(email) as { id: number; organisation_id: number; site_id: number | null };
  const unit = user("dispatch@bench.example");
  const manager = user("manager@c1.example");
  const staff = user("staff@c1.example");
  // The hospital group's busiest site.
  const otherSite = db.prepare("select id from sites where organisation_id = ? and id != ? order by id limit 1").get(manager.organisation_id, staff.site_id) as { id: number };
  const count = db.prepare("select max(id) as n from orders").get() as { n: number };
  return {
    unit: unit.id,
    manager: manager.id,
    staff: staff.id,
    staffSite: staff.site_id!,
    managerOrganisation: manager.organisation_id,
    otherSite: otherSite.id,
    anyOrderId: Math.floor(count.n / 2),
  };
}

// --- query plans ----------------------------------------------------------------------------
interface Plan {
  /** Median time of the statement alone, run on the file directly (ms). */
  ms: number;
  lines: string[];
  indexes: string[];
  /** Tables read from end to end (a SCAN without a search key). */
  fullScans: string[];
  /** "all": every matching row goes through a sorter; "ties": only rows equal on the index's order. */
  sort: "all" | "ties" | null;
}

function explain(sqlite: import("better-sqlite3").Database, sqlText: string, parameters: readonly unknown[]): Plan {
  const rows = sqlite.prepare(`explain query plan ${sqlText}`).all(...(parameters as unknown[])) as { id: number; parent: number; detail: string }[];
  const statement = sqlite.prepare(sqlText);
  const times = [0, 1, 2].map(() => {
    const t = performance.now();
    statement.all(...(parameters as unknown[]));
    return performance.now() - t;
  });
  const depth = new Map<number, number>([[0, -1]]);
  const lines = rows.map((r) => {
    const d = (depth.get(r.parent) ?? -1) + 1;
    depth.set(r.id, d);
    return `${"  ".repeat(d)}${r.detail}`;
  });
  const indexes = new Set<string>();
  const fullScans = new Set<string>();
  for (const r of rows) {
    const index = /USING (?:COVERING )?INDEX (\S+)/.exec(r.detail);
    if (index) indexes.add(index[1]!);
    if (/USING INTEGER PRIMARY KEY/.test(r.detail)) indexes.add(`${/(?:SEARCH|SCAN) (\S+)/.exec(r.detail)?.[1]} primary key`);
    const scan = /^SCAN (\S+)/.exec(r.detail);
    // "SCAN t" or "SCAN t USING [COVERING] INDEX i" without a key: every row of the table.
    if (scan && !/^SCAN (CONSTANT ROW|SUBQUERY)/.test(r.detail)) fullScans.add(scan[1]!);
  }
  const sort = rows.some((r) => /USE TEMP B-TREE FOR ORDER BY/.test(r.detail))
    ? "all"
    : rows.some((r) => /USE TEMP B-TREE FOR (?:RIGHT PART|LAST TERM) OF ORDER BY/.test(r.detail))
      ? "ties"
      : null;
  return { ms: median(times), lines, indexes: [...indexes], fullScans: [...fullScans], sort };
}

// --- the cases ------------------------------------------------------------------------------
type Role = "unit" | "manager" | "staff";
interface Case {
  name: string;
  role: Role;
  query: string;
  check?: (rows: Record<string, unknown>[]) => string | null;
}

function sortedBy(key: string, dir: "asc" | "desc") {
  return (rows: Record<string, unknown>[]) => {
    for (let i = 1; i < rows.length; i++) {
      const a = rows[i - 1]![key] as string;
      const b = rows[i]![key] as string;
      if (a !== b && (dir === "asc" ? a > b : a < b)) return `rows not sorted by ${key} ${dir}`;
    }
    return null;
  };
}

function cases(p: BenchPeople): Case[] {
  const list: Case[] = [];
  const every = (f: (r: Record<string, unknown>) => boolean, what: string) => (rows: Record<string, unknown>[]) => (rows.every(f) ? null : what);
  for (const role of ["unit", "manager", "staff"] as const) {
    const site = role === "staff" ? p.staffSite : p.otherSite;
    list.push(
      { name: "no filter (newest first)", role, query: "sort=created_at&dir=desc", check: sortedBy("createdAt", "desc") },
      { name: "status: delivered", role, query: "status=delivered&sort=created_at&dir=desc", check: every((r) => r.status === "delivered", "wrong status") },
      { name: "status: at the unit", role, query: "status=in_process&sort=created_at&dir=desc", check: every((r) => r.status === "in_process", "wrong status") },
      { name: "site", role, query: `siteId=${site}&sort=created_at&dir=desc`, check: every((r) => r.siteId === site, "wrong site") },
      {
        name: "date range (one month)",
        role,
        query: "from=2026-06-01&to=2026-06-30&sort=created_at&dir=desc",
        check: every((r) => (r.createdAt as string) >= "2026-05-31T23" && (r.createdAt as string) < "2026-07-01", "outside the range"),
      },
      { name: "search text", role, query: "q=emergency&sort=created_at&dir=desc" },
      { name: "sort: reference", role, query: "sort=reference&dir=asc", check: sortedBy("reference", "asc") },
      { name: "sort: status", role, query: "sort=status&dir=asc", check: sortedBy("status", "asc") },
      { name: "sort: site", role, query: "sort=site&dir=asc", check: sortedBy("siteName", "asc") },
      { name: "sort: collection", role, query: "sort=collection_from&dir=desc", check: sortedBy("collectionFrom", "desc") },
      { name: "sort: promised return", role, query: "sort=promised_return_at&dir=asc", check: sortedBy("promisedReturnAt", "asc") },
      { name: "deep page (400)", role, query: "page=400&sort=created_at&dir=desc", check: sortedBy("createdAt", "desc") },
    );
  }
  return ONLY ? list.filter((c) => ONLY.test(`${c.role} ${c.name}`)) : list;
}

interface Result {
  median: number;
  p99: number;
  runs: number;
  total: number;
  plans: Plan[];
  /** Median of the case over the median of the baseline runs interleaved with it. */
  ratio: number;
}

async function main() {
  // The route module imports next/navigation, which needs React's client build: under the
  // react-server condition (as `npm run bench` runs every benchmark) run again without it.
  const localRequire = createRequire(__filename);
  if (typeof (localRequire("react") as { createContext?: unknown }).createContext !== "function") {
    const rerun = spawnSync(path.join(process.cwd(), "node_modules", ".bin", "tsx"), [__filename], { stdio: "inherit" });
    process.exit(rerun.status ?? 1);
  }
  // The app's data modules import "server-only", which throws outside Next's server bundle; map it
  // to the package's empty module, as the Vitest setup does.
  const emptyServerOnly = path.join(path.dirname(localRequire.resolve("server-only")), "empty.js");
  const loader = Module as unknown as { _resolveFilename: (request: string, ...rest: unknown[]) => string };
  const resolve = loader._resolveFilename;
  loader._resolveFilename = function (request: string, ...rest: unknown[]) {
    return request === "server-only" ? emptyServerOnly : resolve.call(this, request, ...rest);
  };

  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-bench-orders-"));
  process.env.STEAMLANE_DATA_DIR = dir;
  if (KEEP_DB) process.env.DATABASE_PATH = path.resolve(KEEP_DB);
  else delete process.env.DATABASE_PATH;
  process.env.NEXTAUTH_SECRET ??= "bench-secret-of-sufficient-length-0123456789";
  process.env.MAIL_WORKER = "off";
  const { default: SQLite } = await import("better-sqlite3");
  const { Kysely, SqliteDialect } = await import("kysely");
  const { closeDb, getDb } = await import("@/db");
  const { migrateToLatest } = await import("@/db/migrator");
  const { resetServerEnvCache, serverEnv } = await import("@/lib/env");
  resetServerEnvCache();
  await closeDb();
  const file = serverEnv().databasePath;
  try {
    const reuse = KEEP_DB !== undefined && fs.existsSync(file);
    await migrateToLatest(getDb());
    let t = performance.now();
    if (!reuse) {
      buildData(file, SQLite);
      console.log(`Built ${ORDERS.toLocaleString("en-GB")} orders in ${((performance.now() - t) / 1000).toFixed(1)} s (${file}).`);
    }

    const { GET: listRoute } = await import("@/app/api/orders/route");
    const { GET: orderRoute } = await import("@/app/api/orders/[id]/route");
    const { requestAs, params, sessionUser } = await import("../support/session");
    const { listOrders } = await import("@/lib/orders/service");
    const { listOrdersQuerySchema } = await import("@/lib/orders/schemas");
    const migration = await import("../../migrations/2026_12_01_0013_order_list_indexes");

    const raw = new SQLite(file, { readonly: true });
    const people = peopleOf(raw);
    const orderCount = (raw.prepare("select count(*) as n from orders").get() as { n: number }).n;
    if (reuse) console.log(`Reusing ${file}: ${orderCount.toLocaleString("en-GB")} orders.`);
    // A second handle on the same file that records the SQL listOrders runs, for the plans.
    const captured: { sql: string; parameters: readonly unknown[] }[] = [];
    const capture = new Kysely<import("@/db/schema").Database>({
      dialect: new SqliteDialect({ database: new SQLite(file, { readonly: true }) }),
      log: (event) => {
        if (event.level === "query") captured.push({ sql: event.query.sql, parameters: event.query.parameters });
      },
    });
    const users: Record<Role, number> = { unit: people.unit, manager: people.manager, staff: people.staff };
    const sessionUsers = {
      unit: await sessionUser(getDb(), people.unit),
      manager: await sessionUser(getDb(), people.manager),
      staff: await sessionUser(getDb(), people.staff),
    };

    const list = async (c: Case) => {
      const req = await requestAs(users[c.role], `/api/orders?${c.query}`);
      const res = await listRoute(req, params({}));
      const body = await res.text();
      if (res.status !== 200) throw new Error(`${c.name} (${c.role}) answered ${res.status}: ${body}`);
      return JSON.parse(body) as { rows: Record<string, unknown>[]; total: number };
    };

    const baselineRun = async () => {
      const res = await orderRoute(await requestAs(people.unit, `/api/orders/${people.anyOrderId}`), params({ id: String(people.anyOrderId) }));
      if (res.status !== 200) throw new Error(`baseline answered ${res.status}`);
      await res.text();
    };
    const countRun = async () => {
      raw.prepare("select count(*) from orders").get();
    };
    // Pages of the database in use (free pages left by dropped indexes not counted).
    const usedBytes = () => {
      const pragma = (name: string) => Number(raw.pragma(name, { simple: true }));
      return (pragma("page_count") - pragma("freelist_count")) * pragma("page_size");
    };

    const measure = async (label: string) => {
      console.log(`\n## ${label}\n`);
      const bare = await timeRuns(countRun, baselineRun);
      console.log(`baseline GET /api/orders/:id — median ${ms(median(bare.baseline))}, p99 ${ms(quantile(bare.baseline, 0.99))}`);
      console.log(`bare select count(*) from orders — median ${ms(median(bare.times))}, p99 ${ms(quantile(bare.times, 0.99))}`);
      console.log(`database in use: ${(usedBytes() / 1024 / 1024).toFixed(1)} MiB\n`);
      const results = new Map<string, Result>();
      const baselines: number[] = [...bare.baseline];
      for (const c of cases(people)) {
        const first = await list(c);
        const problem = c.check?.(first.rows) ?? null;
        if (problem) throw new Error(`${c.name} (${c.role}): ${problem}`);
        const { times, baseline } = await timeRuns(async () => {
          await list(c);
        }, baselineRun);
        baselines.push(...baseline);
        captured.length = 0;
        await listOrders(capture, sessionUsers[c.role], listOrdersQuerySchema.parse(Object.fromEntries(new URLSearchParams(c.query))));
        const plans = captured.map((q) => explain(raw, q.sql, q.parameters));
        const result = { median: median(times), p99: quantile(times, 0.99), runs: times.length, total: first.total, plans, ratio: median(times) / median(baseline) };
        results.set(`${c.role}|${c.name}`, result);
        console.log(
          `### ${c.name} — as ${c.role} (${first.total.toLocaleString("en-GB")} orders; median ${ms(result.median)}, p99 ${ms(result.p99)}, ` +
            `${times.length} runs; ${result.ratio.toFixed(1)} × the baseline's ${ms(median(baseline))})`,
        );
        ["count", "page"].forEach((what, i) => {
          const plan = plans[i];
          if (!plan) return;
          console.log(`${what} (${ms(plan.ms)} alone):\n${plan.lines.map((l) => `    ${l}`).join("\n")}`);
          console.log(`    indexes: ${plan.indexes.join(", ") || "none"}${plan.fullScans.length ? ` — SCANS THE WHOLE TABLE: ${plan.fullScans.join(", ")}` : ""}`);
        });
      }
      return { baseline: median(baselines), count: median(bare.times), bytes: usedBytes(), results };
    };

    // Before: the indexes of 0013 dropped; after: created again, as the migration does.
    await migration.down(getDb());
    const before = await measure("Without the order-list indexes (migration 0013 reverted)");
    t = performance.now();
    await migration.up(getDb());
    console.log(`\nMigration 0013 built its indexes in ${((performance.now() - t) / 1000).toFixed(1)} s.`);
    const after = await measure("With the order-list indexes (migration 0013)");

    // What the plans of a case do that grows with the table.
    const flags = (r: Result) => {
      const [count, page] = r.plans;
      const notes: string[] = [];
      if (count?.fullScans.includes("orders")) notes.push("count scans orders");
      if (page?.fullScans.includes("orders") && page.sort === "all") notes.push("page scans orders");
      if (page?.sort === "all") notes.push("page sorts every row");
      else if (page?.sort === "ties") notes.push("page sorts ties");
      return notes.join(", ") || "—";
    };
    const table = [
      `## GET /api/orders on ${orderCount.toLocaleString("en-GB")} orders — median / p99 (ms), ratio of medians to the baseline`,
      "",
      `Baseline, interleaved with every case's runs: GET /api/orders/:id (one order by primary key, through the same stack), median ${ms(before.baseline)} before, ${ms(after.baseline)} after; the ratio divides a case's median by the median of the baseline runs interleaved with it. A bare \`select count(*) from orders\` takes ${ms(before.count)} / ${ms(after.count)}. Database in use: ${(before.bytes / 1048576).toFixed(1)} MiB before, ${(after.bytes / 1048576).toFixed(1)} MiB after.`,
      "",
    ];
    const rows: string[][] = [];
    for (const c of cases(people)) {
      const key = `${c.role}|${c.name}`;
      const b = before.results.get(key)!;
      const a = after.results.get(key)!;
      const used = a.plans.map((p) => p.indexes.filter((i) => !i.endsWith("primary key")).join(", ") || "—").join("; ");
      rows.push([
        c.name,
        c.role,
        a.total.toLocaleString("en-GB"),
        `${b.median.toFixed(1)} / ${b.p99.toFixed(1)}`,
        b.ratio.toFixed(1),
        flags(b),
        `${a.median.toFixed(1)} / ${a.p99.toFixed(1)}`,
        a.ratio.toFixed(1),
        flags(a),
        used,
      ]);
    }
    table.push(
      ...markdownTable(["case", "as", "orders", "before", "ratio", "plan before", "after", "ratio", "plan after", "indexes after (count; page)"], "llrrrlrrll", rows),
      "",
      "Plan: \"count scans orders\" — the count reads every row of orders (or of an index over all of them), as an unfiltered or text-searched count must; \"page scans orders\" — the page reads every row before it can pick 25; \"page sorts every row\" — every row in scope goes through a temporary B-tree, with both of the list's per-order subqueries computed for each; \"page sorts ties\" — the index gives the order and only rows equal on it are sorted by id, which is cheap for the first pages but computes every skipped row of a deep page.",
    );
    console.log(`\n${table.join("\n")}`);
    raw.close();
    await capture.destroy();
  } finally {
    await closeDb();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
