// Receiving scan benchmark: the production build's POST /api/stations/receiving/scan under
// concurrent load (autocannon, loopback only, a fixed number of requests per level, each request
// a different booked set), against a baseline measured in the same run: a bare node:http server
// doing one scan_events insert in a transaction with better-sqlite3 on a copy of the same
// database. Prints a Markdown table; exits non-zero if any request failed or was not recorded.
//
// Run: npx tsx --conditions=react-server tests/bench/scan.ts   (`npm run bench` runs every bench)
// Settings: SCAN_BENCH_REQUESTS (2000 per level), SCAN_BENCH_LEVELS ("1,8,32"), SCAN_BENCH_PORT
// (3310; the mail catcher and the payments fake take the next ports). Builds first when .next has
// no build, holding the end-to-end lock (/tmp/steamlane-e2e.lock) unless STEAMLANE_E2E_LOCK_HELD=1.
import { spawn, spawnSync } from "node:child_process";
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { encode } from "next-auth/jwt";
import { openDatabase } from "../../db/connection";
import { runToEnd, SERVER_CONDITION, waitForHttp } from "../../fakes/processes";
import { type StackOptions, startStack, stackEnv } from "../../fakes/stack";
import { openCycle } from "../../lib/cycles/store";
import { formatSetSerial, setGiai } from "../../lib/sets/identifiers";
import { failures, fire, type Requests } from "./_http-load";
import { fmt, markdownTable } from "./_stats";

/** What a scanner sends for a set's DataMatrix label: its GS1 element string, AI (8004) and the GIAI. */
const scanOf = (giai: string) => `8004${giai}`;

// ---------------------------------------------------------------------------------------------
// The baseline server (run as a child process: `scan.ts --baseline-server <db> <port>`)

function baselineServer(file: string, port: number): void {
  const db = new Database(file);
  db.pragma("journal_mode = WAL");
  db.pragma("foreign_keys = ON");
  db.pragma("busy_timeout = 5000");
  db.pragma("synchronous = NORMAL");
  const cycles = new Map<string, { cycleId: number; setId: number; organisationId: number }>();
  const rows = db
    .prepare("select c.id, c.set_id, c.organisation_id, s.giai from cycles c join sets s on s.id = c.set_id where c.state = 'booked'")
    .all() as { id: number; set_id: number; organisation_id: number; giai: string }[];
  for (const r of rows) cycles.set(scanOf(r.giai), { cycleId: r.id, setId: r.set_id, organisationId: r.organisation_id });
  const insert = db.prepare(
    `insert into scan_events (cycle_id, set_id, organisation_id, event, from_state, to_state, station, user_id, at, client_event_id, details)
     values (?, ?, ?, 'receive', 'booked', 'received', 'receiving', null, ?, ?, '{}')`,
  );
  const record = db.transaction((c: { cycleId: number; setId: number; organisationId: number }, clientEventId: string) =>
    insert.run(c.cycleId, c.setId, c.organisationId, new Date().toISOString(), clientEventId),
  );
  http
    .createServer((req, res) => {
      if (req.method !== "POST") {
        res.writeHead(200, { "content-type": "text/plain" }).end("ok");
        return;
      }
      let body = "";
      req.setEncoding("utf8");
      req.on("data", (chunk: string) => (body += chunk));
      req.on("end", () => {
        try {
          const input = JSON.parse(body) as { code: string; clientEventId: string };
          const cycle = cycles.get(input.code);
          if (!cycle) {
            res.writeHead(404, { "content-type": "application/json" }).end('{"error":"unknown set"}');
            return;
          }
          const { lastInsertRowid } = record(cycle, input.clientEventId);
          res.writeHead(200, { "content-type": "application/json" }).end(JSON.stringify({ eventId: Number(lastInsertRowid) }));
        } catch (error) {
          res.writeHead(500, { "content-type": "application/json" }).end(JSON.stringify({ error: String(error) }));
        }
      });
    })
    .listen(port, "127.0.0.1");
}

// ---------------------------------------------------------------------------------------------
// The run

const REQUESTS = Number(process.env.SCAN_BENCH_REQUESTS ?? 2000);
const LEVELS = (process.env.SCAN_BENCH_LEVELS ?? "1,8,32").split(",").map(Number);
const WARMUP = 200;
const BASE_PORT = Number(process.env.SCAN_BENCH_PORT ?? 3310);
const LOCK = "/tmp/steamlane-e2e.lock";
const TECHNICIAN = "tech@larkmoor.example";
/** Sets made for the bench are numbered from here, far above the demo's. */
const FIRST_SEQUENCE = 900_001;

function ensureBuild(): void {
  if (fs.existsSync(path.join(".next", "BUILD_ID"))) return;
  console.log("No production build found: running `next build` first.");
  const next = path.join("node_modules", ".bin", "next");
  const env = { ...process.env, NEXT_TELEMETRY_DISABLED: "1" };
  const run = process.env.STEAMLANE_E2E_LOCK_HELD === "1" ? spawnSync(next, ["build"], { stdio: "inherit", env }) : spawnSync("flock", [LOCK, next, "build"], { stdio: "inherit", env });
  if (run.status !== 0) throw new Error("next build failed.");
}

/** N booked cycles, each of its own new set, on orders of 50 sets at the main theatres. */
async function prepare(file: string, count: number): Promise<{ codes: string[]; technicianId: number }> {
  const db = openDatabase(file);
  try {
    return await db.transaction().execute(async (trx) => {
      const site = await trx
        .selectFrom("sites")
        .innerJoin("organisations", "organisations.id", "sites.organisation_id")
        .select(["sites.id", "sites.organisation_id", "organisations.short_code"])
        .where("sites.name", "=", "Quillby Moor General – Main Theatres")
        .executeTakeFirstOrThrow();
      const type = await trx
        .selectFrom("set_types")
        .select("id")
        .where("organisation_id", "=", site.organisation_id)
        .where("processing_flags", "=", "[]")
        .where("set_class", "!=", "loaner_set")
        .orderBy("code")
        .executeTakeFirstOrThrow();
      const technician = await trx.selectFrom("users").select("id").where("email", "=", TECHNICIAN).executeTakeFirstOrThrow();
      const now = new Date();
      const iso = now.toISOString();
      const codes: string[] = [];
      let orderId = 0;
      for (let i = 0; i < count; i++) {
        if (i % 50 === 0) {
          ({ id: orderId } = await trx
            .insertInto("orders")
            .values({
              organisation_id: site.organisation_id,
              site_id: site.id,
              reference: `${site.short_code}-B${String(i / 50 + 1).padStart(6, "0")}`,
              kind: "pickup",
              status: "booked",
              service_level: "standard",
              promised_return_at: new Date(now.getTime() + 86_400_000).toISOString(),
              created_at: iso,
              updated_at: iso,
            })
            .returning("id")
            .executeTakeFirstOrThrow());
        }
        const serial = formatSetSerial(site.short_code, FIRST_SEQUENCE + i);
        const giai = setGiai(serial);
        const { id: setId } = await trx
          .insertInto("sets")
          .values({
            organisation_id: site.organisation_id,
            set_type_id: type.id,
            home_site_id: site.id,
            serial,
            giai,
            status: "in_service",
            notes: null,
            created_at: iso,
            updated_at: iso,
          })
          .returning("id")
          .executeTakeFirstOrThrow();
        await openCycle(trx, {
          organisationId: site.organisation_id,
          siteId: site.id,
          setId,
          orderId,
          serviceLevel: "standard",
          heavySoil: false,
          outOfHours: false,
          loaner: false,
          neededBackBy: null,
          promisedAt: new Date(now.getTime() + 86_400_000).toISOString(),
          userId: null,
          at: now,
        });
        codes.push(scanOf(giai));
      }
      return { codes, technicianId: technician.id };
    });
  } finally {
    await db.destroy();
  }
}

function countReceives(file: string): number {
  const db = new Database(file, { readonly: true });
  try {
    return (db.prepare("select count(*) as n from scan_events where event = 'receive' and station = 'receiving'").get() as { n: number }).n;
  } finally {
    db.close();
  }
}

async function main(): Promise<void> {
  ensureBuild();
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-scan-bench-"));
  const options: StackOptions = {
    mode: "production",
    dataDir,
    port: BASE_PORT,
    mailSmtpPort: BASE_PORT + 1,
    mailWebPort: BASE_PORT + 2,
    stripePort: BASE_PORT + 3,
    quiet: true,
  };
  const baselinePort = BASE_PORT + 4;
  const env = stackEnv(options);
  const dbFile = path.join(dataDir, "steamlane.db");
  const copy = path.join(dataDir, "baseline.db");
  let stop: (() => Promise<void>) | undefined;
  let baseline: ReturnType<typeof spawn> | undefined;
  let failed = false;
  try {
    await runToEnd(path.join("node_modules", ".bin", "tsx"), [SERVER_CONDITION, "db/seed/index.ts"], env);
    const perLevel = LEVELS.map(() => REQUESTS);
    const total = WARMUP + perLevel.reduce((a, b) => a + b, 0);
    const { codes: scans, technicianId } = await prepare(dbFile, total);
    const raw = new Database(dbFile);
    raw.exec(`vacuum into '${copy.replaceAll("'", "''")}'`);
    raw.close();

    const receivedBefore = countReceives(dbFile);
    const stack = await startStack(options);
    stop = stack.stop;
    baseline = spawn(path.join("node_modules", ".bin", "tsx"), [SERVER_CONDITION, __filename, "--baseline-server", copy, String(baselinePort)], { stdio: "inherit", detached: true });
    await waitForHttp(`http://127.0.0.1:${baselinePort}/`, 30_000);

    const appUrl = `http://127.0.0.1:${BASE_PORT}`;
    const token = await encode({ token: { sub: String(technicianId), sv: 0 }, secret: stack.env.NEXTAUTH_SECRET! });
    const appHeaders = {
      "content-type": "application/json",
      accept: "application/json",
      origin: appUrl,
      cookie: `next-auth.session-token=${token}`,
    };
    const check = await fetch(`${appUrl}/api/board`, { headers: appHeaders });
    if (check.status !== 200) throw new Error(`The technician's session was refused: GET /api/board answered ${check.status}.`);

    const baseUrl = `http://127.0.0.1:${baselinePort}`;
    // Each request scans the next of the given sets, with a new client event id.
    const scansOf = (route: string, headers: Record<string, string>, codes: string[]): Requests => ({
      method: "POST",
      path: route,
      headers,
      body: (n) => JSON.stringify({ code: codes[n % codes.length], clientEventId: randomUUID() }),
    });
    const appScans = (codes: string[]) => scansOf("/api/stations/receiving/scan", appHeaders, codes);
    const baseScans = (codes: string[]) => scansOf("/scan", { "content-type": "application/json" }, codes);
    const volley = (codes: string[], connections: number) => ({ amount: codes.length, connections, timeout: 30 });
    let offset = 0;
    const take = (n: number) => scans.slice(offset, (offset += n));
    // Warm-up (not reported): the route's first requests load its code and warm the caches.
    const warm = take(WARMUP);
    const warmApp = await fire(appUrl, appScans(warm), volley(warm, 4));
    const warmBase = await fire(baseUrl, baseScans(warm), volley(warm, 4));
    if (failures(warmApp) || failures(warmBase)) throw new Error(`Warm-up requests failed: app ${failures(warmApp)}, baseline ${failures(warmBase)}.`);

    const rows: string[][] = [];
    let errors = 0;
    for (const [i, connections] of LEVELS.entries()) {
      const codes = take(perLevel[i]!);
      const app = await fire(appUrl, appScans(codes), volley(codes, connections));
      const base = await fire(baseUrl, baseScans(codes), volley(codes, connections));
      const bad = failures(app) + failures(base);
      errors += bad;
      rows.push([
        String(connections),
        fmt(codes.length),
        fmt(app.rate),
        fmt(app.p50, 2),
        fmt(app.p99, 2),
        fmt(base.rate),
        fmt(base.p50, 2),
        fmt(base.p99, 2),
        `${fmt(base.rate / app.rate, 1)} ×`,
        String(bad),
      ]);
    }
    // The demo's own history holds receive events too: count what this run added.
    const recordedApp = countReceives(dbFile) - receivedBefore;
    const recordedBase = countReceives(copy) - receivedBefore;
    console.log(`## Receiving scans: the app's route against a bare node:http + SQLite insert (${os.cpus().length} cores, Node ${process.version})`);
    console.log("");
    const columns = ["connections", "requests", "app req/s", "app p50 ms", "app p99 ms", "baseline req/s", "baseline p50 ms", "baseline p99 ms", "baseline ÷ app", "errors"];
    for (const line of markdownTable(columns, "rrrrrrrrrr", rows)) console.log(line);
    console.log("");
    console.log(`Receive events recorded: app ${fmt(recordedApp)}, baseline ${fmt(recordedBase)} (expected ${fmt(total)} each, warm-up included).`);
    if (errors > 0 || recordedApp !== total || recordedBase !== total) {
      console.error(`FAILED: ${errors} failed requests; ${total - recordedApp} app and ${total - recordedBase} baseline scans not recorded.`);
      failed = true;
    }
  } finally {
    if (baseline?.pid && baseline.exitCode === null) process.kill(-baseline.pid, "SIGTERM");
    await stop?.();
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
  if (failed) process.exit(1);
}

if (process.argv[2] === "--baseline-server") {
  baselineServer(process.argv[3]!, Number(process.argv[4]));
} else {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
