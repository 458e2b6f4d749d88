import "server-only";
import Stripe from "stripe";
import { serverEnv } from "@/lib/env";

// The one configured client of the payment service. In development, tests and the demo the SDK
// talks to the local fake (fakes/stripe) through STRIPE_API_HOST/PORT/PROTOCOL.

let client: Stripe | undefined;

export function stripeClient(): Stripe {
  if (client) return client;
  const env = serverEnv();
  if (!env.STRIPE_SECRET_KEY) throw new Error("STRIPE_SECRET_KEY is not set: online billing is not configured.");
  client = new Stripe(env.STRIPE_SECRET_KEY, {
    host: env.STRIPE_API_HOST,
    port: env.STRIPE_API_PORT,
    protocol: env.STRIPE_API_PROTOCOL,
    // Our own retries (with the same idempotency keys) decide; the SDK does not retry silently.
    maxNetworkRetries: 0,
    timeout: 20_000,
    telemetry: false,
  });
  return client;
}

/** Forget the client (tests point it at another fake between files). */
export function resetStripeClient(): void {
  client = undefined;
}

export function webhookSecret(): string {
  const secret = serverEnv().STRIPE_WEBHOOK_SECRET;
  if (!secret) throw new Error("STRIPE_WEBHOOK_SECRET is not set: webhooks cannot be verified.");
  return secret;
}
