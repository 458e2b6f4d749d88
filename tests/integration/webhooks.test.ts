import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as webhookRoute } from "@/app/api/webhooks/stripe/route";
import type { SeedResult } from "@/db/seed/demo";
import type { FakeStripe } from "@/fakes/stripe/server";
import { ensureStripeInvoice } from "@/lib/billing/payments";
import { mayMove } from "@/lib/billing/webhooks";
import { stripeClient } from "@/lib/stripe";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { startPaymentService, type TestPaymentService } from "../support/payment-service";

// The payment service's webhook, end to end through the real SDK and the local fake: the fake
// posts signed events to a small server that hands them to the route handler, exactly as the
// running app receives them.

const SECRET = "whsec_test_steamlane_webhooks_0123456789";
const SEEDED_AT = new Date("2026-12-01T08:00:00Z");
const TABLES = ["webhook_events", "invoices", "payments", "outbox", "audit_log"] as const;

let t: DemoDatabase;
let seed: SeedResult;
let fake: FakeStripe;
let payments: TestPaymentService;

async function control(path: string, body?: unknown) {
  const res = await fetch(`${fake.url}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body ?? {}),
  });
  return { status: res.status, json: (await res.json()) as Record<string, unknown> };
}

const payByCard = (stripeInvoiceId: string, number: string) => control(`/_fake/invoices/${stripeInvoiceId}/pay`, { number, exp_month: 12, exp_year: 2034, cvc: "123" });

/** A seeded open invoice, by its number, given its copy in the payment service. */
async function openInvoice(number: string) {
  const id = seed.invoices?.invoices[number];
  if (!id) throw new Error(`the demo has no invoice ${number}`);
  const row = await t.db.selectFrom("invoices").select(["id", "number", "total_minor", "status"]).where("id", "=", id).executeTakeFirstOrThrow();
  expect(row.status).toBe("open");
  const copy = await ensureStripeInvoice(t.db, row.id);
  await fake.webhooksIdle();
  return { ...row, stripeInvoiceId: copy.stripeInvoiceId };
}

const invoiceRow = (id: number) => t.db.selectFrom("invoices").selectAll().where("id", "=", id).executeTakeFirstOrThrow();

async function eventsOf(stripeInvoiceId: string, type: string): Promise<Stripe.Event[]> {
  const events = await stripeClient().events.list({ type, limit: 100 }).autoPagingToArray({ limit: 1000 });
  return events.filter((e) => (e.data.object as { id?: string }).id === stripeInvoiceId);
}

async function redeliver(eventId: string) {
  return control(`/_fake/events/${eventId}/redeliver`, { url: payments.webhookUrl, secret: SECRET });
}

beforeAll(async () => {
  t = await useDemoDatabase(SEEDED_AT);
  seed = t.seed;
  payments = await startPaymentService({ secretKey: "sk_test_steamlane_webhooks", webhookSecret: SECRET, accountName: "Larkmoor Sterile Services" });
  fake = payments.fake;
});

afterAll(async () => {
  await payments?.stop();
  await t.cleanup();
});

describe("signatures", () => {
  it("refuses a forged or missing signature with 400 and changes nothing", async () => {
    const before = await countRows(t.db, [...TABLES]);
    const invoice = await t.db.selectFrom("invoices").select(["id", "stripe_invoice_id"]).where("status", "=", "open").executeTakeFirstOrThrow();
    const payload = JSON.stringify({
      id: "evt_forged_1",
      object: "event",
      type: "invoice.paid",
      api_version: Stripe.API_VERSION,
      created: Math.floor(Date.now() / 1000),
      data: { object: { id: "in_forged", object: "invoice", status: "paid", metadata: { steamlane_invoice_id: String(invoice.id) } } },
    });
    // Signed with another secret: what a forger without ours can do at best.
    const forged = stripeClient().webhooks.generateTestHeaderString({ payload, secret: "whsec_not_the_real_secret_000000" });
    const refused = await webhookRoute(
      new Request("http://localhost:3000/api/webhooks/stripe", { method: "POST", headers: { "stripe-signature": forged }, body: payload }),
    );
    expect(refused.status).toBe(400);
    expect(((await refused.json()) as { error: { message: string } }).error.message).toMatch(/signature/i);

    const missing = await webhookRoute(new Request("http://localhost:3000/api/webhooks/stripe", { method: "POST", body: payload }));
    expect(missing.status).toBe(400);

    // A correct signature over another body does not carry over to this one.
    const signedOther = stripeClient().webhooks.generateTestHeaderString({ payload: `${payload} `, secret: SECRET });
    const tampered = await webhookRoute(
      new Request("http://localhost:3000/api/webhooks/stripe", { method: "POST", headers: { "stripe-signature": signedOther }, body: payload }),
    );
    expect(tampered.status).toBe(400);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });
});

describe("paying online", () => {
  it("marks the invoice paid once, records the payment and queues one receipt per clinic manager", async () => {
    const invoice = await openInvoice("LSS-2026-11-QMH");
    const result = await payByCard(invoice.stripeInvoiceId, "4242 4242 4242 4242");
    expect(result.status).toBe(200);
    await fake.webhooksIdle();

    const row = await invoiceRow(invoice.id);
    expect(row).toMatchObject({ status: "paid", amount_paid_minor: invoice.total_minor, amount_due_minor: 0, last_payment_error: null });
    expect(row.paid_at).not.toBeNull();
    const payments = await t.db.selectFrom("payments").selectAll().where("invoice_id", "=", invoice.id).execute();
    expect(payments).toHaveLength(1);
    expect(payments[0]).toMatchObject({ amount_minor: invoice.total_minor, currency: "GBP", status: "paid" });
    expect(payments[0]!.stripe_payment_id).toMatch(/^inpay_/);

    const receipts = await t.db.selectFrom("outbox").selectAll().where("template", "=", "billing.receipt").where("dedupe_key", "like", `invoice_receipt:${invoice.id}:%`).execute();
    expect(receipts.map((r) => r.to_address)).toEqual(["manager@quillby.example"]);
    expect(receipts[0]!.subject).toBe(`Payment received for invoice ${invoice.number}`);
    expect(receipts[0]!.text_body).toContain("Nothing more is due");
    expect(receipts[0]!.html_body).toContain(invoice.number);

    // Both invoice.paid and invoice.payment_succeeded arrived and were processed, each once.
    const processed = await t.db.selectFrom("webhook_events").select(["id", "type", "processed_at"]).execute();
    const paidEvents = await eventsOf(invoice.stripeInvoiceId, "invoice.paid");
    const succeeded = await eventsOf(invoice.stripeInvoiceId, "invoice.payment_succeeded");
    expect(paidEvents).toHaveLength(1);
    expect(succeeded).toHaveLength(1);
    for (const e of [...paidEvents, ...succeeded]) {
      expect(processed.find((p) => p.id === e.id)?.processed_at).toBeTruthy();
    }

    // A replayed event is acknowledged and changes nothing.
    const before = await countRows(t.db, [...TABLES]);
    const rowBefore = await invoiceRow(invoice.id);
    const replay = await redeliver(paidEvents[0]!.id);
    expect(replay.status).toBe(200);
    const attempts = (replay.json.attempts as { status: number; body?: string }[]) ?? [];
    expect(attempts.at(-1)?.status).toBe(200);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    expect(await invoiceRow(invoice.id)).toEqual(rowBefore);
  });

  it("leaves a declined invoice open with the reason, and a later success pays it", async () => {
    const invoice = await openInvoice("LSS-2026-11-MDP");
    const declined = await payByCard(invoice.stripeInvoiceId, "4000 0000 0000 0002");
    expect(declined.status).toBe(402);
    await fake.webhooksIdle();
    let row = await invoiceRow(invoice.id);
    expect(row.status).toBe("open");
    expect(row.last_payment_error).toMatch(/declined/i);
    expect(row.amount_due_minor).toBe(invoice.total_minor);
    expect(await t.db.selectFrom("payments").selectAll().where("invoice_id", "=", invoice.id).execute()).toHaveLength(0);

    await payByCard(invoice.stripeInvoiceId, "4242424242424242");
    await fake.webhooksIdle();
    row = await invoiceRow(invoice.id);
    expect(row.status).toBe("paid");
    expect(row.last_payment_error).toBeNull();
  });
});

describe("events out of order", () => {
  it("takes a payment that arrives before the copy's id was stored, and a late failure or finalization changes nothing", async () => {
    fake.setWebhookEndpoint(null);
    try {
      const invoice = await openInvoice("LSS-2026-11-ODS");
      // As if the reply to our own call had not come back yet: we do not know the copy's id.
      await t.db.updateTable("invoices").set({ stripe_invoice_id: null, hosted_invoice_url: null }).where("id", "=", invoice.id).execute();
      await payByCard(invoice.stripeInvoiceId, "4000000000000002");
      await payByCard(invoice.stripeInvoiceId, "4242424242424242");

      const [succeeded] = await eventsOf(invoice.stripeInvoiceId, "invoice.payment_succeeded");
      const [failed] = await eventsOf(invoice.stripeInvoiceId, "invoice.payment_failed");
      const [finalized] = await eventsOf(invoice.stripeInvoiceId, "invoice.finalized");
      expect(succeeded && failed && finalized).toBeTruthy();

      // Payment first.
      expect((await redeliver(succeeded!.id)).status).toBe(200);
      let row = await invoiceRow(invoice.id);
      expect(row).toMatchObject({ status: "paid", stripe_invoice_id: invoice.stripeInvoiceId, amount_due_minor: 0 });
      const paidAt = row.paid_at;

      // Then the failure of the earlier attempt, and the finalization, both late.
      expect((await redeliver(failed!.id)).status).toBe(200);
      expect((await redeliver(finalized!.id)).status).toBe(200);
      row = await invoiceRow(invoice.id);
      expect(row).toMatchObject({ status: "paid", last_payment_error: null, paid_at: paidAt, amount_due_minor: 0 });
      expect(row.hosted_invoice_url).toMatch(/\/hosted\/invoices\//);
      const receipts = await t.db.selectFrom("outbox").select("id").where("dedupe_key", "like", `invoice_receipt:${invoice.id}:%`).execute();
      expect(receipts.length).toBeGreaterThan(0);
      const countBefore = receipts.length;
      // invoice.paid, delivered last, sends no second receipt.
      const [paid] = await eventsOf(invoice.stripeInvoiceId, "invoice.paid");
      await redeliver(paid!.id);
      expect(await t.db.selectFrom("outbox").select("id").where("dedupe_key", "like", `invoice_receipt:${invoice.id}:%`).execute()).toHaveLength(countBefore);
    } finally {
      fake.setWebhookEndpoint({ url: payments.webhookUrl, secret: SECRET });
    }
  });

  it("voids and writes off through the service's events, and never moves a paid or void invoice", async () => {
    const toVoid = await openInvoice("LSS-2026-10-PVC");
    await stripeClient().invoices.voidInvoice(toVoid.stripeInvoiceId);
    await fake.webhooksIdle();
    expect((await invoiceRow(toVoid.id)).status).toBe("void");

    const toWriteOff = await openInvoice("LSS-2026-11-PVC");
    await stripeClient().invoices.markUncollectible(toWriteOff.stripeInvoiceId);
    await fake.webhooksIdle();
    expect((await invoiceRow(toWriteOff.id)).status).toBe("uncollectible");
    // An uncollectible invoice may still be paid.
    await payByCard(toWriteOff.stripeInvoiceId, "4242424242424242");
    await fake.webhooksIdle();
    expect((await invoiceRow(toWriteOff.id)).status).toBe("paid");

    expect(mayMove("paid", "open")).toBe(false);
    expect(mayMove("paid", "void")).toBe(false);
    expect(mayMove("void", "paid")).toBe(false);
    expect(mayMove("uncollectible", "open")).toBe(false);
    expect(mayMove("open", "paid")).toBe(true);
  });
});

describe("other events", () => {
  it("records and acknowledges an event it does not act on, once", async () => {
    const [created] = await stripeClient().events.list({ type: "customer.created", limit: 1 }).autoPagingToArray({ limit: 1 });
    expect(created).toBeTruthy();
    const stored = await t.db.selectFrom("webhook_events").selectAll().where("id", "=", created!.id).executeTakeFirst();
    expect(stored).toMatchObject({ type: "customer.created" });
    expect(stored!.processed_at).toBeTruthy();
    const before = await countRows(t.db, [...TABLES]);
    const again = await redeliver(created!.id);
    expect(again.status).toBe(200);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    expect(seed.organisations.QMH).toBeDefined();
  });
});
