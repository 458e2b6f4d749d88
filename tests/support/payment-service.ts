import http from "node:http";
import type { AddressInfo } from "node:net";
import { POST as webhookRoute } from "@/app/api/webhooks/stripe/route";
import { type FakeStripe, startFakeStripe } from "@/fakes/stripe/server";
import { resetServerEnvCache } from "@/lib/env";
import { resetStripeClient } from "@/lib/stripe";

// The payment service for a test file: the local fake, which the app's real SDK client is pointed
// at, posting its signed webhook events to a small server that hands each to the webhook route
// handler, exactly as the running app receives them.

export interface TestPaymentService {
  fake: FakeStripe;
  /** Where the fake delivers events (the bridge to the route handler). */
  webhookUrl: string;
  /** Stops the fake and the bridge and drops the app's client. */
  stop(): Promise<void>;
}

/** Receives the fake's deliveries and answers with whatever the route answers. */
async function startBridge(): Promise<{ url: string; close(): Promise<void> }> {
  const server = http.createServer(async (req, res) => {
    const chunks: Buffer[] = [];
    for await (const chunk of req) chunks.push(chunk as Buffer);
    const headers = new Headers({ "content-type": "application/json" });
    if (req.headers["stripe-signature"]) headers.set("stripe-signature", String(req.headers["stripe-signature"]));
    const answer = await webhookRoute(new Request("http://localhost:3000/api/webhooks/stripe", { method: "POST", headers, body: Buffer.concat(chunks) }));
    res.writeHead(answer.status, { "content-type": "application/json" });
    res.end(await answer.text());
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}/api/webhooks/stripe`,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

/**
 * Starts the fake (invoices in pounds, two quick webhook attempts) and the bridge, and sets the
 * app's STRIPE_* settings to them with the given secret key and webhook signing secret.
 */
export async function startPaymentService(options: { secretKey: string; webhookSecret: string; accountName?: string }): Promise<TestPaymentService> {
  const bridge = await startBridge();
  const fake = await startFakeStripe({
    port: 0,
    webhookUrl: bridge.url,
    webhookSecret: options.webhookSecret,
    accountName: options.accountName,
    defaultCurrency: "gbp",
    webhookRetry: { attempts: 2, baseDelayMs: 20 },
    log: () => {},
  });
  Object.assign(process.env, {
    STRIPE_SECRET_KEY: options.secretKey,
    STRIPE_API_HOST: "127.0.0.1",
    STRIPE_API_PORT: String(fake.port),
    STRIPE_API_PROTOCOL: "http",
    STRIPE_WEBHOOK_SECRET: options.webhookSecret,
  });
  resetServerEnvCache();
  resetStripeClient();
  return {
    fake,
    webhookUrl: bridge.url,
    stop: async () => {
      await fake.close();
      await bridge.close();
      resetStripeClient();
    },
  };
}
