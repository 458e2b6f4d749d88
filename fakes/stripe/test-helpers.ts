import http from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";
import { startFakeStripe, type FakeStripe, type FakeStripeOptions } from "./server";

// Shared by the fake's own tests: a fake on a free port, an SDK client for it, and a small
// webhook receiver.

export const TEST_KEY = "sk_test_fakestripe_1234567890";

export async function startTestFake(options: FakeStripeOptions = {}): Promise<{ fake: FakeStripe; stripe: Stripe }> {
  const fake = await startFakeStripe({ port: 0, accountName: "Larkmoor Sterile Services (test)", log: () => {}, ...options });
  return { fake, stripe: sdkFor(fake) };
}

export function sdkFor(fake: FakeStripe, key = TEST_KEY): Stripe {
  return new Stripe(key, { ...fake.sdkConfig, maxNetworkRetries: 0, telemetry: false });
}

export async function control<T = Record<string, unknown>>(
  fake: FakeStripe,
  method: string,
  path: string,
  body?: unknown,
): Promise<{ status: number; json: T }> {
  const res = await fetch(`${fake.url}${path}`, {
    method,
    headers: body === undefined ? {} : { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await res.text();
  return { status: res.status, json: (text ? JSON.parse(text) : null) as T };
}

// Posts the hosted invoice page's form as a browser would.
export async function payOnHostedPage(url: string, card: { number: string; exp?: string; cvc?: string }): Promise<{ status: number; html: string }> {
  const form = new URLSearchParams({ card_number: card.number, exp: card.exp ?? "12/34", cvc: card.cvc ?? "123" });
  const res = await fetch(url, { method: "POST", body: form, headers: { "content-type": "application/x-www-form-urlencoded" } });
  return { status: res.status, html: await res.text() };
}

export interface Received {
  body: string;
  signature: string;
  status: number;
}

export interface Receiver {
  url: string;
  received: Received[];
  close(): Promise<void>;
}

/** A webhook endpoint; `answer(n)` gives the status for the n-th request (from 1), 200 by default. */
export async function startReceiver(answer: (n: number, body: string) => number = () => 200): Promise<Receiver> {
  const received: Received[] = [];
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const body = Buffer.concat(chunks).toString("utf8");
      const status = answer(received.length + 1, body);
      received.push({ body, signature: String(req.headers["stripe-signature"] ?? ""), status });
      res.writeHead(status, { "content-type": "text/plain" });
      res.end(status < 300 ? "ok" : "no");
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}/webhook`,
    received,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

/** A customer with one pending item of `amount`, invoiced with send_invoice and finalized. */
export async function openInvoice(stripe: Stripe, amount = 12_500, currency = "gbp"): Promise<Stripe.Invoice> {
  const customer = await stripe.customers.create({ name: "Fernhollow Dental Practice", email: "accounts@fernhollow.example" });
  await stripe.invoiceItems.create({ customer: customer.id, amount, currency, description: "Instrument set processing" });
  const draft = await stripe.invoices.create({
    customer: customer.id,
    collection_method: "send_invoice",
    days_until_due: 30,
    pending_invoice_items_behavior: "include",
  });
  return stripe.invoices.finalizeInvoice(draft.id);
}
