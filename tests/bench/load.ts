// Mixed-load benchmark against the production build: clinics browsing (the order list API and an
// order's page), stations scanning (receiving and washing scan APIs) and a dispatcher re-planning
// the day, all at once, with a bounded number of requests per kind (autocannon, loopback only).
// The same mix is then sent to a bare node:http server answering a small JSON body, measured in
// the same run, as the baseline. Prints a Markdown table; exits non-zero on any failed request.
//
// Run: npm run bench:load
// Settings: LOAD_REQUESTS (300 per kind), LOAD_CONNECTIONS (4 per kind), LOAD_PORT (3406; mail
// catcher, its web inbox and the payments fake on LOAD_SMTP_PORT 2606, LOAD_MAIL_WEB_PORT 2686,
// LOAD_STRIPE_PORT 12406). Uses the build in NEXT_DIST_DIR (default .next); builds it first when
// missing.
import { spawnSync } from "node:child_process";
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import http from "node:http";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import { encode } from "next-auth/jwt";
import { openDatabase } from "../../db/connection";
import { runToEnd, SERVER_CONDITION } from "../../fakes/processes";
import { type StackOptions, startStack, stackEnv } from "../../fakes/stack";
import { loadSessionUser } from "../../lib/auth/session-user";
import { applyCycleEvent, openCycle } from "../../lib/cycles/store";
import { formatSetSerial, setGiai } from "../../lib/sets/identifiers";
import { openBatch } from "../../lib/washing/service";
import { failures, fire, type Requests } from "./_http-load";
import { fmt, markdownTable } from "./_stats";

const REQUESTS = Number(process.env.LOAD_REQUESTS ?? 300);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 4);
const PORT = Number(process.env.LOAD_PORT ?? 3406);
const DIST = process.env.NEXT_DIST_DIR || ".next";
/** Sets made for the bench are numbered from here, far above the demo's. */
const FIRST_SEQUENCE = 800_001;

interface Kind extends Requests {
  name: string;
}

const volley = { amount: REQUESTS, connections: CONNECTIONS, timeout: 60 };

/** Booked cycles of new sets at the main theatres (for receiving), and received ones (for washing). */
async function prepare(file: string, booked: number, received: number) {
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
        .where("size_stu", "<=", 1)
        .orderBy("code")
        .executeTakeFirstOrThrow();
      const users = await trx.selectFrom("users").select(["id", "email"]).where("email", "in", ["tech@larkmoor.example", "manager@quillby.example", "dispatch@larkmoor.example"]).execute();
      const idOf = (email: string) => users.find((u) => u.email === email)!.id;
      const now = new Date();
      const iso = now.toISOString();
      // The clinic browses one of its own demo orders; the bench's sets go on an order of their own.
      const shown = await trx.selectFrom("orders").select("id").where("organisation_id", "=", site.organisation_id).orderBy("id", "desc").executeTakeFirstOrThrow();
      const { id: orderId } = await trx
        .insertInto("orders")
        .values({
          organisation_id: site.organisation_id,
          site_id: site.id,
          reference: `${site.short_code}-L000001`,
          kind: "pickup",
          status: "booked",
          service_level: "standard",
          promised_return_at: new Date(now.getTime() + 86_400_000).toISOString(),
          created_at: iso,
          updated_at: iso,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      const receivingCodes: string[] = [];
      const washingCodes: string[] = [];
      for (let i = 0; i < booked + received; i++) {
        const serial = formatSetSerial(site.short_code, FIRST_SEQUENCE + i);
        const giai = setGiai(serial);
        const { id: setId } = await trx
          .insertInto("sets")
          .values({ organisation_id: site.organisation_id, set_type_id: type.id, home_site_id: site.id, serial, giai, status: "in_service", notes: null, created_at: iso, updated_at: iso })
          .returning("id")
          .executeTakeFirstOrThrow();
        const cycleId = await openCycle(trx, {
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
        if (i < booked) receivingCodes.push(`8004${giai}`);
        else {
          await applyCycleEvent(trx, { cycleId, event: "receive", station: "receiving", userId: idOf("tech@larkmoor.example"), at: now });
          washingCodes.push(`8004${giai}`);
        }
      }
      return { receivingCodes, washingCodes, orderId: shown.id, technicianId: idOf("tech@larkmoor.example"), managerId: idOf("manager@quillby.example"), dispatcherId: idOf("dispatch@larkmoor.example") };
    });
  } finally {
    await db.destroy();
  }
}

/** A loading batch on a washer with no open batch. */
async function loadingBatch(file: string, technicianId: number): Promise<{ id: number; capacity: number }> {
  const db = openDatabase(file);
  try {
    const tech = await loadSessionUser(db, { userId: technicianId, sessionVersion: 0 });
    const busy = (await db.selectFrom("washer_batches").select("machine_id").where("status", "in", ["loading", "running"]).execute()).map((b) => b.machine_id);
    const washer = (await db.selectFrom("machines").select(["id", "capacity_stu"]).where("kind", "=", "washer").orderBy("code").execute()).find((m) => !busy.includes(m.id));
    if (!washer || !tech) throw new Error("No free washer in the demo data.");
    const program = await db.selectFrom("programs").select("id").where("machine_id", "=", washer.id).orderBy("id").executeTakeFirstOrThrow();
    const batch = await openBatch(db, tech, { machineId: washer.id, programId: program.id });
    return { id: batch.id, capacity: Number(washer.capacity_stu ?? 1) };
  } finally {
    await db.destroy();
  }
}

/** The server action id of the dispatcher's "plan the day", from the build's manifest, if the build has it. */
function planDayActionId(): string | null {
  const file = path.join(DIST, "server", "server-reference-manifest.json");
  if (!fs.existsSync(file)) return null;
  const manifest = JSON.parse(fs.readFileSync(file, "utf8")) as { node: Record<string, { exportedName?: string; filename?: string }> };
  const entry = Object.entries(manifest.node).find(([, v]) => v.exportedName === "planDayAction");
  return entry?.[0] ?? null;
}

function baselineServer(): Promise<http.Server> {
  const server = http.createServer((req, res) => {
    req.resume();
    req.on("end", () => res.writeHead(200, { "content-type": "application/json" }).end('{"ok":true}'));
  });
  return new Promise((resolve) => server.listen(0, "127.0.0.1", () => resolve(server)));
}

async function main(): Promise<void> {
  if (!fs.existsSync(path.join(DIST, "BUILD_ID"))) {
    console.log(`No production build in ${DIST}: running \`next build\` first.`);
    const run = spawnSync(path.join("node_modules", ".bin", "next"), ["build"], { stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" } });
    if (run.status !== 0) throw new Error("next build failed.");
  }
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-load-bench-"));
  const options: StackOptions = {
    mode: "production",
    dataDir,
    port: PORT,
    mailSmtpPort: Number(process.env.LOAD_SMTP_PORT ?? 2606),
    mailWebPort: Number(process.env.LOAD_MAIL_WEB_PORT ?? 2686),
    stripePort: Number(process.env.LOAD_STRIPE_PORT ?? 12406),
    quiet: true,
  };
  const env = stackEnv(options);
  const dbFile = path.join(dataDir, "steamlane.db");
  let stop: (() => Promise<void>) | undefined;
  let baseline: http.Server | undefined;
  let failed = false;
  try {
    await runToEnd(path.join("node_modules", ".bin", "tsx"), [SERVER_CONDITION, "db/seed/index.ts"], env);
    const prepared = await prepare(dbFile, REQUESTS + 20, 12);
    const batch = await loadingBatch(dbFile, prepared.technicianId);
    const stack = await startStack(options);
    stop = stack.stop;
    const appUrl = `http://127.0.0.1:${PORT}`;
    const secret = stack.env.NEXTAUTH_SECRET!;
    const cookie = async (userId: number) => `next-auth.session-token=${await encode({ token: { sub: String(userId), sv: 0 }, secret })}`;
    const json = { "content-type": "application/json", accept: "application/json", origin: appUrl };
    const clinic = { accept: "application/json", cookie: await cookie(prepared.managerId) };
    const tech = { ...json, cookie: await cookie(prepared.technicianId) };
    const day = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);

    const kinds: Kind[] = [
      { name: "clinic: order list API", method: "GET", path: "/api/orders?pageSize=25&sort=created_at&dir=desc", headers: clinic },
      { name: "clinic: order page", method: "GET", path: `/clinic/orders/${prepared.orderId}`, headers: { ...clinic, accept: "text/html" } },
      {
        name: "station: receiving scan",
        method: "POST",
        path: "/api/stations/receiving/scan",
        headers: tech,
        body: (n) => JSON.stringify({ code: prepared.receivingCodes[n % prepared.receivingCodes.length], clientEventId: randomUUID() }),
      },
      {
        name: "station: washing scan",
        method: "POST",
        path: `/api/stations/washing/batches/${batch.id}/scan`,
        headers: tech,
        // The rack's sets, scanned again and again: the first scan loads a set, the next ones find it loaded.
        body: (n) => JSON.stringify({ code: prepared.washingCodes[n % Math.min(batch.capacity, prepared.washingCodes.length)] }),
      },
    ];
    const actionId = planDayActionId();
    let replanNote = "";
    if (actionId) {
      kinds.push({
        name: "dispatcher: re-plan the day",
        method: "POST",
        path: "/unit/dispatch",
        headers: { "content-type": "text/plain;charset=UTF-8", accept: "text/x-component", origin: appUrl, "next-action": actionId, cookie: await cookie(prepared.dispatcherId) },
        body: (n) => JSON.stringify([{ day, seed: (n % 50) + 1 }]),
      });
      // A server action answers 200 with its result: one call is checked for ok:true before the run.
      const probe = await fetch(`${appUrl}/unit/dispatch`, { method: "POST", headers: kinds[kinds.length - 1]!.headers, body: JSON.stringify([{ day, seed: 1 }]) });
      const text = await probe.text();
      if (probe.status !== 200 || !text.includes('"ok":true')) {
        kinds.pop();
        replanNote = `The re-planning action answered ${probe.status} ${text.slice(0, 160).replace(/\s+/g, " ")}; it is left out of this run.`;
      }
    } else {
      replanNote = "This build has no dispatcher planning action (planDayAction): re-planning is not measured.";
    }

    // Warm-up (not reported): each route's first requests load its code.
    for (const kind of kinds) {
      const res = await fetch(`${appUrl}${kind.path}`, { method: kind.method, headers: kind.headers, body: kind.body?.(REQUESTS + 1) });
      if (!res.ok) throw new Error(`${kind.name}: warm-up answered ${res.status} ${(await res.text()).slice(0, 200)}`);
    }

    const app = await Promise.all(kinds.map((k) => fire(appUrl, k, volley)));
    baseline = await baselineServer();
    const baseUrl = `http://127.0.0.1:${(baseline.address() as AddressInfo).port}`;
    const base = await Promise.all(kinds.map((k) => fire(baseUrl, { ...k, headers: { "content-type": "application/json" } }, volley)));

    let errors = 0;
    const rows = kinds.map((k, i) => {
      const a = app[i]!;
      const b = base[i]!;
      errors += failures(a) + failures(b);
      return [k.name, fmt(a.rate, 1), fmt(a.p50, 1), fmt(a.p99, 1), failures(a), fmt(b.rate), fmt(b.p50, 1), fmt(b.p99, 1), `${fmt(a.p50 / Math.max(b.p50, 0.01), 0)} ×`];
    });
    console.log(`## Mixed load: ${kinds.length} kinds at once, ${fmt(REQUESTS)} requests and ${CONNECTIONS} connections each (${os.cpus().length} cores, Node ${process.version})`);
    console.log("");
    const columns = ["kind", "app req/s", "app p50 ms", "app p99 ms", "errors", "baseline req/s", "baseline p50 ms", "baseline p99 ms", "p50 ÷ baseline"];
    for (const line of markdownTable(columns, "lrrrrrrrr", rows)) console.log(line);
    const total = app.reduce((s, m) => s + m.result.requests.total, 0);
    console.log("");
    const breakdown = app.map((m, i) => `${kinds[i]!.name}: ${m.result.errors} errors, ${m.result.timeouts} timeouts, ${m.result.non2xx} non-2xx`).join("; ");
    console.log(`Total: ${fmt(total)} requests to the app, ${errors} errors (${breakdown}).${replanNote ? ` ${replanNote}` : ""}`);
    if (errors > 0) failed = true;
  } finally {
    await new Promise<void>((resolve) => (baseline ? baseline.close(() => resolve()) : resolve()));
    await stop?.();
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
  if (failed) {
    console.error("FAILED: some requests did not answer 2xx.");
    process.exit(1);
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
