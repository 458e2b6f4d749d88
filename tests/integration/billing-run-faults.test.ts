import fs from "node:fs";
import http from "node:http";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SeedResult } from "@/db/seed/demo";
import type { RequestLogEntry } from "@/fakes/stripe/core";
import { startFakeStripe, type FakeStripe } from "@/fakes/stripe/server";
import type { SessionUser } from "@/lib/auth/session-user";
import { approveRun, createRun } from "@/lib/billing/run";
import { issueRun } from "@/lib/billing/run-issue";
import { AppError } from "@/lib/errors";
import { resetStripeClient } from "@/lib/stripe";
import { addCustomer, deliver, type TestCustomer } from "../unit/billing/db-fixtures";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { sessionUser } from "../support/session";

// Issuing a run while the payment service fails: stopped mid-run, answering 500, losing its
// replies, answering after the SDK has given up, and a copy whose total differs from ours. After
// each, issuing is resumed and must finish with every object created exactly once (counted by
// idempotency key in the fake's request log and by our metadata on the fake's objects) and every
// invoice finalized once.

const KEY = "sk_test_billing_faults";
const NOW = new Date("2026-12-01T10:00:00Z");
let t: DemoDatabase;
let seed: SeedResult;
let user: SessionUser;
let dataDir: string;
let fakePort = 0;
let fake: FakeStripe;
/** Request logs of fakes already stopped (a restarted fake starts a new log). */
const archived: RequestLogEntry[] = [];
let direct: Stripe;
const customers: TestCustomer[] = [];

// ——— A proxy between the SDK and the fake that can stop the payment service after N requests ———

interface Proxy {
  port: number;
  stopAfter: number | null;
  seen: number;
  stopped: boolean;
  closing: Promise<void> | null;
  server: http.Server;
}
let proxy: Proxy;

function startProxy(): Promise<Proxy> {
  const p: Proxy = { port: 0, stopAfter: null, seen: 0, stopped: false, closing: null, server: http.createServer() };
  p.server.on("request", (req, res) => {
    if (p.stopped) return req.socket.destroy();
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const upstream = http.request({ host: "127.0.0.1", port: fakePort, method: req.method, path: req.url, headers: req.headers }, (answer) => {
        const body: Buffer[] = [];
        answer.on("data", (c: Buffer) => body.push(c));
        answer.on("end", () => {
          p.seen += 1;
          if (p.stopAfter !== null && p.seen >= p.stopAfter && !p.stopped) {
            // From here on the payment service is gone: nothing more reaches the fake.
            p.stopped = true;
            archived.push(...fake.requests());
            p.closing = fake.close();
          }
          if (!res.destroyed) {
            res.writeHead(answer.statusCode ?? 500, answer.headers);
            res.end(Buffer.concat(body));
          }
        });
      });
      upstream.on("error", () => req.socket.destroy());
      upstream.end(Buffer.concat(chunks));
    });
  });
  return new Promise((resolve) =>
    p.server.listen(0, "127.0.0.1", () => {
      p.port = (p.server.address() as AddressInfo).port;
      resolve(p);
    }),
  );
}

/** Stops the payment service after the n-th request from now. */
function stopAfter(n: number) {
  proxy.seen = 0;
  proxy.stopAfter = n;
}

/** Starts the payment service again with the state it had (its data file). */
async function restart() {
  await proxy.closing;
  fake = await startFakeStripe({ port: fakePort, dataFile: path.join(dataDir, "fake-stripe.json"), log: () => {} });
  proxy.stopped = false;
  proxy.stopAfter = null;
  proxy.closing = null;
}

const allRequests = () => [...archived, ...fake.requests()];

async function fault(body: Record<string, unknown>) {
  const res = await fetch(`${fake.url}/_fake/faults`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  expect(res.status).toBe(200);
}

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-billing-faults-"));
  fake = await startFakeStripe({ port: 0, dataFile: path.join(dataDir, "fake-stripe.json"), log: () => {} });
  fakePort = fake.port;
  proxy = await startProxy();
  process.env.STRIPE_SECRET_KEY = KEY;
  process.env.STRIPE_API_HOST = "127.0.0.1";
  process.env.STRIPE_API_PORT = String(proxy.port);
  process.env.STRIPE_API_PROTOCOL = "http";
  process.env.STRIPE_WEBHOOK_SECRET = fake.webhookSecret;
  resetStripeClient();
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  user = await sessionUser(t.db, seed.users["finance@larkmoor.example"]!);
  direct = new Stripe(KEY, { host: "127.0.0.1", port: fakePort, protocol: "http", maxNetworkRetries: 0, telemetry: false });

  const names: [string, string][] = [
    ["AFC", "Astley Fold Clinic"],
    ["BDU", "Bramwick Day Unit"],
    ["CMP", "Cullen Moss Practice"],
  ];
  for (const [code, name] of names) {
    const customer = await addCustomer(t.db, {
      code,
      name,
      classes: ["basic_tray"],
      versions: [{ reference: `${code}-2026-01`, validFrom: "2026-01-01", validUntil: null, slaCreditBasisPoints: 1000, rates: { basic_tray: [{ upToQuantity: null, unitPriceMinor: 1500 }] } }],
    });
    customers.push(customer);
    // Two sets a month from March to June: one on time, one late (a credit line, negative).
    for (const month of [2, 3, 4, 5]) {
      const day = (d: number, h: number) => new Date(Date.UTC(2026, month, d, h)).toISOString();
      await deliver(t.db, customer, { setClass: "basic_tray", receivedAt: day(3, 8), deliveredAt: day(4, 7) });
      await deliver(t.db, customer, { setClass: "basic_tray", receivedAt: day(10, 8), deliveredAt: day(11, 12) });
    }
  }
});

afterAll(async () => {
  await t?.cleanup();
  await proxy?.closing;
  if (!proxy?.stopped) await fake?.close();
  await new Promise<void>((resolve) => proxy?.server.close(() => resolve()));
  fs.rmSync(dataDir, { recursive: true, force: true });
  resetStripeClient();
});

async function approvedRun(month: string): Promise<number> {
  const { runId, invoices } = await createRun(t.db, user, { period: month }, NOW);
  expect(invoices).toHaveLength(3);
  await approveRun(t.db, user, runId, NOW);
  return runId;
}

/** Every object of the run was created once, by key and by our metadata, and finalized once. */
async function expectCreatedOnce(runId: number) {
  const invoices = await t.db.selectFrom("invoices").selectAll().where("run_id", "=", runId).orderBy("number").execute();
  const lines = await t.db.selectFrom("invoice_lines").selectAll().where("invoice_id", "in", invoices.map((i) => i.id)).execute();
  // Run by the fake: answered, or answered into a connection that was then dropped.
  const created = allRequests().filter((r) => r.method === "POST" && !r.replayed && (r.status === 200 || (r.fault?.endsWith(" after") ?? false)));
  const byKey = new Map<string, number>();
  for (const r of created) if (r.idempotency_key) byKey.set(r.idempotency_key, (byKey.get(r.idempotency_key) ?? 0) + 1);
  for (const invoice of invoices) {
    expect(invoice.status).toBe("open");
    expect(byKey.get(`steamlane:invoice:${invoice.id}`)).toBe(1);
    expect(byKey.get(`steamlane:finalize:${invoice.id}`)).toBe(1);
    expect(byKey.get(`steamlane:send:${invoice.id}`)).toBe(1);
    for (const line of lines.filter((l) => l.invoice_id === invoice.id)) expect(byKey.get(`steamlane:invoice-line:${line.id}`)).toBe(1);
    expect(byKey.get(`steamlane:invoice-vat:${invoice.id}:S:2000`)).toBe(1);

    // By our metadata on the fake's own objects: one copy, one item per line and VAT rate.
    const copies: Stripe.Invoice[] = [];
    for await (const copy of direct.invoices.list({ limit: 100 })) if (copy.metadata?.steamlane_invoice_id === String(invoice.id)) copies.push(copy);
    expect(copies.map((c) => [c.id, c.status, c.total])).toEqual([[invoice.stripe_invoice_id, "open", invoice.total_minor]]);
    const items: string[] = [];
    for await (const line of direct.invoices.listLineItems(copies[0]!.id!, { limit: 100 })) items.push(line.metadata.steamlane_item!);
    expect(items.sort()).toEqual([...lines.filter((l) => l.invoice_id === invoice.id).map((l) => `line:${l.id}`), "vat:S:2000"].sort());
    const finalized = await direct.events.list({ type: "invoice.finalized", limit: 100 });
    expect(finalized.data.filter((e) => (e.data.object as Stripe.Invoice).id === invoice.stripe_invoice_id)).toHaveLength(1);
  }
  // One customer per organisation, whatever happened.
  for (const customer of customers) {
    expect(created.filter((r) => r.path === "/v1/customers" && r.idempotency_key === `steamlane:customer:${customer.organisationId}`)).toHaveLength(1);
  }
  const stripeCustomers = await direct.customers.list({ limit: 100 });
  expect(stripeCustomers.data.map((c) => c.metadata.steamlane_organisation_id).sort()).toEqual(customers.map((c) => String(c.organisationId)).sort());
  const run = await t.db.selectFrom("invoice_runs").select("status").where("id", "=", runId).executeTakeFirstOrThrow();
  expect(run.status).toBe("issued");
}

describe("issuing while the payment service fails", () => {
  it("continues where it stopped when the payment service stops mid-run", async () => {
    const runId = await approvedRun("2026-03");
    // Gone after the 2nd request: the first customer is made, its invoice is not.
    stopAfter(2);
    const first = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(first.status).toBe("issuing");
    expect(first.invoices.map((r) => r.outcome)).toEqual(["failed", "not_attempted", "not_attempted"]);
    expect(first.invoices[0]!.reason).toMatch(/The payment service did not answer in time or could not be reached while creating the invoice\. What was done is kept; resume issuing/);
    expect(first.invoices[1]!.reason).toMatch(/Left for a retry/);
    await restart();

    // Gone again part-way through the second invoice's lines.
    stopAfter(12);
    const second = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(second.invoices.map((r) => r.outcome)).toEqual(["issued", "failed", "not_attempted"]);
    const half = await t.db.selectFrom("invoices").selectAll().where("run_id", "=", runId).orderBy("number").execute();
    expect(half[1]!.stripe_invoice_id).toMatch(/^in_/);
    expect(half[1]!.status).toBe("draft");
    await restart();

    const third = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(third).toMatchObject({ status: "issued", remaining: 0 });
    expect(third.invoices.map((r) => r.outcome)).toEqual(["already_issued", "issued", "issued"]);
    await expectCreatedOnce(runId);
    const audit = await t.db.selectFrom("audit_log").select("action").where("action", "=", "billing.invoice_issue_failed").execute();
    expect(audit).toHaveLength(2);
  });

  it("resumes after answers of 500 and after replies lost once the request had run", async () => {
    const runId = await approvedRun("2026-04");
    await fault({ mode: "error", status: 500, method: "POST", path: "/v1/invoiceitems", count: 1 });
    const first = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(first.invoices.map((r) => r.outcome)).toEqual(["failed", "not_attempted", "not_attempted"]);
    expect(first.invoices[0]!.reason).toMatch(/answered with an error \(500/);

    // The finalization runs at the payment service but its answer never arrives (twice, so the
    // SDK's own reconnect does not hide it).
    await fault({ mode: "drop", phase: "after", method: "POST", path: "/v1/invoices/*/finalize", count: 2 });
    const second = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(second.invoices.map((r) => r.outcome)).toEqual(["failed", "not_attempted", "not_attempted"]);
    expect(second.invoices[0]!.reason).toMatch(/while finalizing the invoice/);

    const third = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(third.invoices.map((r) => r.outcome)).toEqual(["issued", "issued", "issued"]);
    // The finalization ran once; its answer was lost twice (the SDK's reconnect got the stored
    // answer replayed, and lost too), and resuming read the finalized copy back instead.
    const [lost] = await t.db.selectFrom("invoices").select("id").where("run_id", "=", runId).orderBy("number").execute();
    expect(allRequests().filter((r) => r.idempotency_key === `steamlane:finalize:${lost!.id}`).map((r) => [r.replayed, r.status])).toEqual([
      [false, 0],
      [true, 0],
    ]);
    await expectCreatedOnce(runId);
  });

  it("resumes after the payment service answered too slowly for the SDK", async () => {
    const runId = await approvedRun("2026-05");
    await fault({ mode: "delay", delay_ms: 1500, method: "POST", path: "/v1/invoiceitems", count: 1 });
    const started = Date.now();
    const first = await issueRun(t.db, user, runId, { now: () => NOW, requestTimeoutMs: 400 });
    expect(first.invoices.map((r) => r.outcome)).toEqual(["failed", "not_attempted", "not_attempted"]);
    expect(first.invoices[0]!.reason).toMatch(/did not answer in time/);
    // At once: the slow request is still running under its key.
    const second = await issueRun(t.db, user, runId, { now: () => NOW, requestTimeoutMs: 400 });
    expect(second.invoices[0]!.reason).toMatch(/was still working on an earlier request/);
    await new Promise((r) => setTimeout(r, Math.max(0, 1700 - (Date.now() - started))));
    const third = await issueRun(t.db, user, runId, { now: () => NOW, requestTimeoutMs: 2000 });
    expect(third.invoices.map((r) => r.outcome)).toEqual(["issued", "issued", "issued"]);
    await expectCreatedOnce(runId);
  });

  it("refuses to finalize a copy whose total differs from ours, and issues the rest", async () => {
    const runId = await approvedRun("2026-06");
    await fault({ mode: "error", status: 503, method: "POST", path: "/v1/invoices/*/finalize", count: 1 });
    const first = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(first.invoices.map((r) => r.outcome)).toEqual(["failed", "not_attempted", "not_attempted"]);
    const [draft] = await t.db.selectFrom("invoices").selectAll().where("run_id", "=", runId).orderBy("number").execute();
    // Someone adds a line to the draft in the payment service.
    const extra = await direct.invoiceItems.create({ customer: (await direct.invoices.retrieve(draft!.stripe_invoice_id!)).customer as string, invoice: draft!.stripe_invoice_id!, amount: 999, currency: "gbp", description: "Added by hand" });

    const second = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(second.invoices.map((r) => r.outcome)).toEqual(["failed", "issued", "issued"]);
    expect(second.invoices[0]!.reason).toBe(
      `The payment service's copy of ${draft!.number} totals £${((draft!.total_minor + 999) / 100).toFixed(2)}, ours £${(draft!.total_minor / 100).toFixed(2)}; it was not finalized. ` +
        "Compare its lines with ours in the payment service, remove what does not belong, then resume issuing.",
    );
    expect(second).toMatchObject({ status: "issuing", remaining: 1 });
    expect((await direct.invoices.retrieve(draft!.stripe_invoice_id!)).status).toBe("draft");

    await direct.invoiceItems.del(extra.id);
    const third = await issueRun(t.db, user, runId, { now: () => NOW });
    expect(third.invoices.map((r) => r.outcome)).toEqual(["issued", "already_issued", "already_issued"]);
    await expectCreatedOnce(runId);
  });

  it("lets one issuing of a run run at a time", async () => {
    const months = await t.db.selectFrom("invoice_runs").select("id").where("period", "=", "2026-03").executeTakeFirstOrThrow();
    const [a, b] = await Promise.allSettled([issueRun(t.db, user, months.id), issueRun(t.db, user, months.id)]);
    expect(a.status).toBe("fulfilled");
    expect(b.status).toBe("rejected");
    expect((b as PromiseRejectedResult).reason).toBeInstanceOf(AppError);
    expect(((b as PromiseRejectedResult).reason as AppError).message).toMatch(/being issued right now/);
  });
});
