import Stripe from "stripe";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { RequestLogEntry } from "./core";
import { DAY_MS } from "./idempotency";
import type { FakeStripe } from "./server";
import { control, sdkFor, startTestFake } from "./test-helpers";

// The transport the SDK relies on: keys, errors and their SDK classes, lists and paging,
// idempotency, expansion, injected faults and the request log.

let fake: FakeStripe;
let stripe: Stripe;
let clockOffset = 0;

beforeAll(async () => {
  ({ fake, stripe } = await startTestFake({ clock: () => Date.now() + clockOffset }));
});
afterAll(async () => {
  await fake.close();
});
beforeEach(async () => {
  clockOffset = 0;
  await control(fake, "POST", "/_fake/reset");
});

async function requests(): Promise<RequestLogEntry[]> {
  return (await control<{ data: RequestLogEntry[] }>(fake, "GET", "/_fake/requests")).json.data;
}

describe("API keys", () => {
  it("answers 401 (StripeAuthenticationError) without a usable test key", async () => {
    await expect(sdkFor(fake, "sk_live_abcdefghijklmnop").customers.list()).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    await expect(sdkFor(fake, "not-a-key").customers.list()).rejects.toMatchObject({ statusCode: 401 });
    const res = await fetch(`${fake.url}/v1/customers`);
    expect(res.status).toBe(401);
    const body = (await res.json()) as { error: { type: string; message: string } };
    expect(body.error.type).toBe("invalid_request_error");
    expect(body.error.message).toContain("API key");
  });

  it("accepts only the configured keys when apiKeys is given", async () => {
    const { fake: strict } = await startTestFake({ apiKeys: ["sk_test_only_this_one"] });
    try {
      await expect(sdkFor(strict).customers.list()).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
      await expect(sdkFor(strict, "sk_test_only_this_one").customers.list()).resolves.toMatchObject({ object: "list" });
    } finally {
      await strict.close();
    }
  });
});

describe("errors", () => {
  it("answers 404 resource_missing (StripeInvalidRequestError) for an unknown id", async () => {
    const err = await stripe.invoices.retrieve("in_doesnotexist").catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 404, code: "resource_missing", message: "No such invoice: 'in_doesnotexist'", param: "id" });
  });

  it("names an unknown or malformed parameter", async () => {
    const customer = await stripe.customers.create({ name: "Harrowmere Clinic" });
    const unknown = await stripe.invoiceItems
      .create({ customer: customer.id, amount: 100, currency: "eur", price: "price_123" } as Stripe.InvoiceItemCreateParams)
      .catch((e: unknown) => e);
    expect(unknown).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(unknown).toMatchObject({ code: "parameter_unknown", param: "price" });
    const malformed = await stripe.rawRequest("POST", "/v1/invoiceitems", { customer: customer.id, amount: "12.5", currency: "eur" }).catch((e: unknown) => e);
    expect(malformed).toMatchObject({ code: "parameter_invalid_integer", param: "amount" });
  });

  it("answers an unknown path with Stripe's unrecognised-URL error", async () => {
    const err = await stripe.rawRequest("GET", "/v1/subscriptions", {}).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect((err as Error).message).toContain("Unrecognized request URL (GET: /v1/subscriptions)");
  });
});

describe("lists", () => {
  it("pages newest first with starting_after and ending_before, and auto-paginates", async () => {
    const ids: string[] = [];
    for (let i = 0; i < 7; i++) ids.push((await stripe.customers.create({ name: `Clinic ${i}`, email: `c${i}@example.test` })).id);
    const newest = [...ids].reverse();

    const first = await stripe.customers.list({ limit: 3 });
    expect(first).toMatchObject({ object: "list", has_more: true, url: "/v1/customers" });
    expect(first.data.map((c) => c.id)).toEqual(newest.slice(0, 3));
    const second = await stripe.customers.list({ limit: 3, starting_after: first.data[2].id });
    expect(second.data.map((c) => c.id)).toEqual(newest.slice(3, 6));
    const last = await stripe.customers.list({ limit: 3, starting_after: second.data[2].id });
    expect(last.data.map((c) => c.id)).toEqual(newest.slice(6));
    expect(last.has_more).toBe(false);
    const back = await stripe.customers.list({ limit: 2, ending_before: newest[3] });
    expect(back.data.map((c) => c.id)).toEqual(newest.slice(1, 3));
    expect(back.has_more).toBe(true);

    const all = await stripe.customers.list({ limit: 2 }).autoPagingToArray({ limit: 100 });
    expect(all.map((c) => c.id)).toEqual(newest);
    expect((await stripe.customers.list({ email: "c4@example.test" })).data.map((c) => c.id)).toEqual([ids[4]]);

    await expect(stripe.customers.list({ limit: 101 })).rejects.toMatchObject({ param: "limit" });
  });
});

describe("idempotency", () => {
  it("replays the first answer for a key, with Idempotent-Replayed: true", async () => {
    const first = await stripe.customers.create({ name: "Tamsworth Clinic" }, { idempotencyKey: "cust-tamsworth" });
    const again = await stripe.customers.create({ name: "Tamsworth Clinic" }, { idempotencyKey: "cust-tamsworth" });
    expect(again.id).toBe(first.id);
    expect(again.lastResponse.headers["idempotent-replayed"]).toBe("true");
    expect(first.lastResponse.headers["idempotent-replayed"]).toBeUndefined();
    expect((await stripe.customers.list()).data).toHaveLength(1);
    const log = await requests();
    expect(log.filter((r) => r.idempotency_key === "cust-tamsworth").map((r) => r.replayed)).toEqual([false, true]);
  });

  it("refuses the same key with other parameters (StripeIdempotencyError)", async () => {
    await stripe.customers.create({ name: "Ravenquill Clinic" }, { idempotencyKey: "cust-ravenquill" });
    const err = await stripe.customers.create({ name: "Another" }, { idempotencyKey: "cust-ravenquill" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(err).toMatchObject({ statusCode: 400, type: "StripeIdempotencyError", rawType: "idempotency_error" });
  });

  it("replays errors raised while acting, but lets a corrected request run after a parameter error", async () => {
    const customer = await stripe.customers.create({ name: "Elmquarry Clinic" });
    await stripe.invoiceItems.create({ customer: customer.id, amount: 500, currency: "eur" });
    const draft = await stripe.invoices.create({ customer: customer.id, pending_invoice_items_behavior: "include" });
    await stripe.invoices.finalizeInvoice(draft.id);
    const declined = () => stripe.invoices.pay(draft.id, { payment_method: "pm_card_chargeDeclined" }, { idempotencyKey: "pay-1" });
    await expect(declined()).rejects.toBeInstanceOf(Stripe.errors.StripeCardError);
    const replay = await declined().then(
      () => {
        throw new Error("expected the stored decline to be replayed");
      },
      (e: Stripe.errors.StripeError) => e,
    );
    expect(replay).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(replay.headers?.["idempotent-replayed"]).toBe("true");
    expect((await stripe.invoices.retrieve(draft.id)).attempt_count).toBe(1);

    // A parameter error is refused before the endpoint runs, so nothing is kept for its key and
    // the corrected request with the same key runs.
    const bad = { customer: customer.id, amount: "x", currency: "eur" };
    await expect(stripe.rawRequest("POST", "/v1/invoiceitems", bad, { idempotencyKey: "item-1" })).rejects.toMatchObject({ statusCode: 400 });
    const fixed = await stripe.invoiceItems.create({ customer: customer.id, amount: 300, currency: "eur" }, { idempotencyKey: "item-1" });
    expect(fixed.amount).toBe(300);
    expect(fixed.lastResponse.headers["idempotent-replayed"]).toBeUndefined();
  });

  it("answers 409 while a request with the same key is still running", async () => {
    await control(fake, "POST", "/_fake/faults", { mode: "delay", delay_ms: 300, method: "POST", path: "/v1/customers" });
    const first = stripe.customers.create({ name: "Slowfield Clinic" }, { idempotencyKey: "slow-1" });
    await new Promise((r) => setTimeout(r, 60));
    const second = await stripe.customers.create({ name: "Slowfield Clinic" }, { idempotencyKey: "slow-1" }).catch((e: unknown) => e);
    // The SDK has no class of its own for 409 and raises StripeAPIError.
    expect(second).toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect(second).toMatchObject({ statusCode: 409, code: "idempotency_key_in_use" });
    const created = await first;
    expect((await stripe.customers.create({ name: "Slowfield Clinic" }, { idempotencyKey: "slow-1" })).id).toBe(created.id);
  });

  it("keeps keys for 24 hours", async () => {
    const first = await stripe.customers.create({ name: "Quillby Clinic" }, { idempotencyKey: "cust-quillby" });
    clockOffset = DAY_MS - 60_000;
    expect((await stripe.customers.create({ name: "Quillby Clinic" }, { idempotencyKey: "cust-quillby" })).id).toBe(first.id);
    clockOffset = DAY_MS + 1000;
    expect((await stripe.customers.create({ name: "Quillby Clinic" }, { idempotencyKey: "cust-quillby" })).id).not.toBe(first.id);
  });
});

describe("customers and events", () => {
  it("updates a customer, removing a metadata key posted empty, and records what changed", async () => {
    const customer = await stripe.customers.create({ name: "Old Name Clinic", metadata: { a: "1", b: "2" } });
    const updated = await stripe.customers.update(customer.id, { name: "New Name Clinic", metadata: { a: "" } });
    expect(updated).toMatchObject({ name: "New Name Clinic", metadata: { b: "2" } });
    const [event] = (await stripe.events.list({ type: "customer.updated" })).data;
    expect(event.data.previous_attributes).toEqual({ name: "Old Name Clinic", metadata: { a: "1", b: "2" } });
    const deleted = await stripe.customers.del(customer.id);
    expect(deleted).toEqual(expect.objectContaining({ id: customer.id, deleted: true }));
    expect(await stripe.customers.retrieve(customer.id)).toMatchObject({ deleted: true });
  });

  it("filters events by type, with a wildcard, and pages them", async () => {
    const customer = await stripe.customers.create({ name: "Event Clinic" });
    const draft = await stripe.invoices.create({ customer: customer.id });
    await stripe.invoices.finalizeInvoice(draft.id);
    const invoiceEvents = await stripe.events.list({ type: "invoice.*" });
    expect(invoiceEvents.data.map((e) => e.type)).toEqual(["invoice.paid", "invoice.finalized", "invoice.created"]);
    const two = await stripe.events.list({ types: ["customer.created", "invoice.created"] });
    expect(two.data.map((e) => e.type)).toEqual(["invoice.created", "customer.created"]);
    const page = await stripe.events.list({ limit: 1, starting_after: invoiceEvents.data[0].id, type: "invoice.*" });
    expect(page.data.map((e) => e.type)).toEqual(["invoice.finalized"]);
    expect((await stripe.events.retrieve(invoiceEvents.data[2].id)).data.object).toMatchObject({ id: draft.id, status: "draft" });
  });
});

describe("expand[]", () => {
  it("expands ids on objects and on list items, and refuses fields that are not ids", async () => {
    const customer = await stripe.customers.create({ name: "Yarrowby Clinic" });
    const draft = await stripe.invoices.create({ customer: customer.id });
    const one = await stripe.invoices.retrieve(draft.id, { expand: ["customer"] });
    expect((one.customer as Stripe.Customer).name).toBe("Yarrowby Clinic");
    const list = await stripe.invoices.list({ expand: ["data.customer"] });
    expect((list.data[0].customer as Stripe.Customer).id).toBe(customer.id);
    expect(one.payments).toBeUndefined();
    expect((await stripe.invoices.retrieve(draft.id, { expand: ["payments"] })).payments).toMatchObject({ object: "list", data: [] });
    await expect(stripe.invoices.retrieve(draft.id, { expand: ["currency"] })).rejects.toMatchObject({ param: "expand" });
  });
});

describe("faults", () => {
  it("answers 500 to the next matching request (StripeAPIError), then recovers", async () => {
    const fault = await control(fake, "POST", "/_fake/faults", { mode: "error", status: 500, path: "/v1/customers", count: 1 });
    expect(fault.status).toBe(200);
    await expect(stripe.customers.create({ name: "Dunwhistle Clinic" }, { idempotencyKey: "cust-dunwhistle" })).rejects.toBeInstanceOf(Stripe.errors.StripeAPIError);
    // The injected failure happened before the endpoint ran, so the same key now runs it.
    const created = await stripe.customers.create({ name: "Dunwhistle Clinic" }, { idempotencyKey: "cust-dunwhistle" });
    expect(created.lastResponse.headers["idempotent-replayed"]).toBeUndefined();
    const log = await requests();
    expect(log.map((r) => r.status)).toEqual([500, 200]);
    expect(log[0].fault).toContain("error 500");
  });

  it("answers 429 as a rate limit (StripeRateLimitError) only on the matching path and method", async () => {
    await control(fake, "POST", "/_fake/faults", { mode: "error", status: 429, method: "GET", path: "/v1/invoices/*" });
    await stripe.customers.list();
    await expect(stripe.invoices.retrieve("in_anything")).rejects.toBeInstanceOf(Stripe.errors.StripeRateLimitError);
    await expect(stripe.invoices.retrieve("in_anything")).rejects.toMatchObject({ statusCode: 404 });
  });

  it("drops the connection after the request ran: the SDK's one automatic retry gets the stored answer", async () => {
    await control(fake, "POST", "/_fake/faults", { mode: "drop", phase: "after", path: "/v1/customers" });
    const created = await stripe.customers.create({ name: "Gorsequill Clinic" });
    expect(created.lastResponse.headers["idempotent-replayed"]).toBe("true");
    const log = (await requests()).filter((r) => r.path === "/v1/customers");
    expect(log.map((r) => [r.status, r.replayed])).toEqual([
      [0, false],
      [200, true],
    ]);
    expect(log[0].idempotency_key).toBe(log[1].idempotency_key);
    expect((await stripe.customers.list()).data).toHaveLength(1);
  });

  it("raises StripeConnectionError when the connection drops on every try", async () => {
    await control(fake, "POST", "/_fake/faults", { mode: "drop", count: 2, path: "/v1/customers" });
    await expect(stripe.customers.create({ name: "Lost Clinic" })).rejects.toBeInstanceOf(Stripe.errors.StripeConnectionError);
    expect((await stripe.customers.list()).data).toHaveLength(0);
  });

  it("delays a response by the given time", async () => {
    await control(fake, "POST", "/_fake/faults", { mode: "delay", delay_ms: 300, path: "/v1/customers" });
    const started = Date.now();
    await stripe.customers.list();
    expect(Date.now() - started).toBeGreaterThanOrEqual(290);
    expect((await control<{ data: unknown[] }>(fake, "GET", "/_fake/faults")).json.data).toHaveLength(0);
  });

  it("refuses a malformed fault with the field named", async () => {
    const res = await control<{ error: { message: string } }>(fake, "POST", "/_fake/faults", { mode: "explode" });
    expect(res.status).toBe(400);
    expect(res.json.error.message).toContain("mode");
  });
});

describe("the request log and API version", () => {
  it("records method, path, key, parameters, status and the Stripe-Version sent", async () => {
    await stripe.customers.create({ name: "Pellow Clinic", metadata: { a: "1" } }, { idempotencyKey: "log-1" });
    await stripe.customers.list({ limit: 2 });
    const [post, get] = await requests();
    expect(post).toMatchObject({
      method: "POST",
      path: "/v1/customers",
      idempotency_key: "log-1",
      params: { name: "Pellow Clinic", metadata: { a: "1" } },
      status: 200,
      replayed: false,
      stripe_version: Stripe.API_VERSION,
    });
    expect(get).toMatchObject({ method: "GET", params: { limit: "2" }, idempotency_key: null });
  });

  it("stamps events with the API version the SDK pins", async () => {
    await stripe.customers.create({ name: "Sallowby Clinic" });
    const events = await stripe.events.list();
    expect(events.data[0]).toMatchObject({ type: "customer.created", api_version: Stripe.API_VERSION, object: "event" });
    expect(events.data[0].id).toMatch(/^evt_/);
    expect(events.data[0].request?.idempotency_key).toMatch(/^stripe-node-retry-/);
    const health = await control<{ api_version: string }>(fake, "GET", "/_fake/health");
    expect(health.json.api_version).toBe(Stripe.API_VERSION);
  });
});
