import Stripe from "stripe";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import type { FakeStripe } from "./server";
import { control, openInvoice, payOnHostedPage, startReceiver, startTestFake, type Receiver } from "./test-helpers";
import { backoffDelay, signatureHeader, type Delivery } from "./webhooks";

// Webhooks: every event is POSTed with a Stripe-Signature header that the SDK's own
// `stripe.webhooks.constructEvent` accepts (Stripe's webhook signing scheme), and retried
// when the receiver fails.

const SECRET = "whsec_test_steamlane_fake_0123456789abcdef";
const sdk = new Stripe("sk_test_unused", { telemetry: false });

describe("signatures", () => {
  it("match the SDK's own test header for the same payload, secret and time", () => {
    const payload = JSON.stringify({ id: "evt_1", object: "event" });
    const timestamp = 1_790_000_000;
    expect(signatureHeader(payload, SECRET, timestamp)).toBe(sdk.webhooks.generateTestHeaderString({ payload, secret: SECRET, timestamp }));
  });
});

describe("delivery", () => {
  let fake: FakeStripe;
  let stripe: Stripe;
  let receiver: Receiver;
  let failFirst = false;

  beforeAll(async () => {
    receiver = await startReceiver((n) => (failFirst && n === 1 ? 500 : 200));
    ({ fake, stripe } = await startTestFake({ webhookUrl: receiver.url, webhookSecret: SECRET, webhookRetry: { attempts: 3, baseDelayMs: 20 } }));
  });
  afterAll(async () => {
    await fake.close();
    await receiver.close();
  });
  afterEach(() => {
    receiver.received.length = 0;
    failFirst = false;
  });

  it("posts signed events that constructEvent verifies, and rejects a tampered body", async () => {
    const invoice = await openInvoice(stripe, 4_200, "gbp");
    await payOnHostedPage(invoice.hosted_invoice_url!, { number: "4242424242424242" });
    await fake.webhooksIdle();

    const events = receiver.received.map((r) => sdk.webhooks.constructEvent(r.body, r.signature, SECRET));
    const types = events.map((e) => e.type);
    for (const t of ["customer.created", "invoiceitem.created", "invoice.created", "invoice.finalized", "invoice.paid", "invoice.payment_succeeded"]) {
      expect(types).toContain(t);
    }
    const paid = events.find((e) => e.type === "invoice.paid")!;
    expect(paid.api_version).toBe(Stripe.API_VERSION);
    expect((paid.data.object as Stripe.Invoice).id).toBe(invoice.id);
    expect((paid.data.object as Stripe.Invoice).status).toBe("paid");
    expect(paid.request).toEqual({ id: null, idempotency_key: null });

    const stored = await stripe.events.retrieve(paid.id);
    expect(stored.pending_webhooks).toBe(0);

    const one = receiver.received[0];
    const tampered = one.body.replace('"livemode": false', '"livemode": true');
    expect(tampered).not.toBe(one.body);
    expect(() => sdk.webhooks.constructEvent(tampered, one.signature, SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => sdk.webhooks.constructEvent(one.body, one.signature, "whsec_other")).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  it("retries after the receiver answers 500 once, then delivers the same event", async () => {
    failFirst = true;
    const customer = await stripe.customers.create({ name: "Thornwhistle Clinic" });
    await fake.webhooksIdle();
    expect(receiver.received.map((r) => r.status)).toEqual([500, 200]);
    const [first, second] = receiver.received.map((r) => sdk.webhooks.constructEvent(r.body, r.signature, SECRET));
    expect(first.id).toBe(second.id);
    expect((second.data.object as Stripe.Customer).id).toBe(customer.id);

    const log = await control<{ data: Delivery[] }>(fake, "GET", "/_fake/webhooks");
    const delivery = log.json.data.find((d) => d.event_id === first.id)!;
    expect(delivery.state).toBe("delivered");
    expect(delivery.attempts.map((a) => a.status)).toEqual([500, 200]);
  });

  it("redelivers a stored event on request", async () => {
    await stripe.customers.create({ name: "Brindle Cross Clinic" });
    await fake.webhooksIdle();
    const [event] = (await stripe.events.list({ type: "customer.created", limit: 1 })).data;
    receiver.received.length = 0;
    const res = await control<Delivery>(fake, "POST", `/_fake/events/${event.id}/redeliver`);
    expect(res.status).toBe(200);
    expect(res.json.state).toBe("delivered");
    expect(receiver.received).toHaveLength(1);
    expect(sdk.webhooks.constructEvent(receiver.received[0].body, receiver.received[0].signature, SECRET).id).toBe(event.id);
    expect((await control(fake, "POST", "/_fake/events/evt_missing/redeliver")).status).toBe(404);
  });
});

describe("an unreachable endpoint", () => {
  it("is tried a bounded number of times with growing waits, then given up", async () => {
    const gone = await startReceiver();
    const url = gone.url;
    await gone.close();
    const { fake, stripe } = await startTestFake({ webhookUrl: url, webhookSecret: SECRET, webhookRetry: { attempts: 3, baseDelayMs: 30 } });
    try {
      const customer = await stripe.customers.create({ name: "Nowhere Clinic" });
      await fake.webhooksIdle();
      const log = await control<{ data: Delivery[] }>(fake, "GET", "/_fake/webhooks");
      expect(log.json.data).toHaveLength(1);
      const [delivery] = log.json.data;
      expect(delivery.state).toBe("failed");
      expect(delivery.attempts).toHaveLength(3);
      expect(delivery.attempts.every((a) => a.status === null && a.error)).toBe(true);
      const gaps = delivery.attempts.slice(1).map((a, i) => Date.parse(a.at) - Date.parse(delivery.attempts[i].at));
      expect(gaps[0]).toBeGreaterThanOrEqual(25);
      expect(gaps[1]).toBeGreaterThanOrEqual(55);
      const [event] = (await stripe.events.list({ type: "customer.created" })).data;
      expect((event.data.object as Stripe.Customer).id).toBe(customer.id);
      expect(event.pending_webhooks).toBe(1);
    } finally {
      await fake.close();
    }
  });

  it("waits base × 2^(n−1) between attempts, capped", () => {
    const policy = { attempts: 6, baseDelayMs: 500, maxDelayMs: 3000, timeoutMs: 1000 };
    expect([1, 2, 3, 4, 5].map((n) => backoffDelay(policy, n))).toEqual([500, 1000, 2000, 3000, 3000]);
  });
});
