import { createHmac } from "node:crypto";

// Webhook delivery as Stripe does it: a POST of the event's JSON with a `Stripe-Signature`
// header, retried with exponential backoff when the endpoint answers non-2xx or cannot be
// reached, up to a bounded number of attempts.

/**
 * Stripe's signature header: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<raw body>">`,
 * keyed with the whole `whsec_…` secret (Stripe's webhook signing documentation).
 */
export function signatureHeader(payload: string, secret: string, timestamp: number): string {
  const v1 = createHmac("sha256", secret).update(`${timestamp}.${payload}`, "utf8").digest("hex");
  return `t=${timestamp},v1=${v1}`;
}

export interface WebhookEndpoint {
  url: string;
  secret: string;
}

export interface RetryPolicy {
  /** Attempts in all, the first included. */
  attempts: number;
  /** Wait before the second attempt; doubled before each further one. */
  baseDelayMs: number;
  maxDelayMs: number;
  /** Time allowed for one attempt before it counts as failed. */
  timeoutMs: number;
}

export const DEFAULT_RETRY: RetryPolicy = { attempts: 6, baseDelayMs: 500, maxDelayMs: 30_000, timeoutMs: 10_000 };

export interface DeliveryAttempt {
  attempt: number;
  at: string;
  status: number | null;
  error: string | null;
  duration_ms: number;
}

export interface Delivery {
  event_id: string;
  type: string;
  url: string;
  state: "pending" | "delivered" | "failed";
  attempts: DeliveryAttempt[];
}

// The wait before attempt n + 1 (n ≥ 1): base × 2^(n−1), at most maxDelayMs.
export function backoffDelay(policy: RetryPolicy, attemptsMade: number): number {
  return Math.min(policy.maxDelayMs, policy.baseDelayMs * 2 ** (attemptsMade - 1));
}

export class WebhookDispatcher {
  private readonly log: Delivery[] = [];
  private readonly active = new Set<Promise<Delivery>>();
  private readonly sleeps = new Map<NodeJS.Timeout, () => void>();
  private readonly aborts = new Set<AbortController>();
  private closed = false;

  constructor(
    private readonly policy: RetryPolicy,
    private readonly onDelivered: (eventId: string) => void = () => {},
  ) {}

  /** Sends one event to the endpoint, retrying as the policy says; resolves when it is settled. */
  deliver(endpoint: WebhookEndpoint, event: { id: string; type: string }, payload: string): Promise<Delivery> {
    const delivery: Delivery = { event_id: event.id, type: event.type, url: endpoint.url, state: "pending", attempts: [] };
    this.log.push(delivery);
    if (this.log.length > 5000) this.log.splice(0, this.log.length - 5000);
    const run = this.run(endpoint, delivery, payload);
    this.active.add(run);
    void run.finally(() => this.active.delete(run));
    return run;
  }

  private async run(endpoint: WebhookEndpoint, delivery: Delivery, payload: string): Promise<Delivery> {
    for (let n = 1; n <= this.policy.attempts && !this.closed; n++) {
      if (n > 1) await this.sleep(backoffDelay(this.policy, n - 1));
      if (this.closed) break;
      const attempt = await this.attempt(endpoint, payload, n);
      delivery.attempts.push(attempt);
      if (attempt.status !== null && attempt.status >= 200 && attempt.status < 300) {
        delivery.state = "delivered";
        this.onDelivered(delivery.event_id);
        return delivery;
      }
    }
    delivery.state = "failed";
    return delivery;
  }

  private async attempt(endpoint: WebhookEndpoint, payload: string, n: number): Promise<DeliveryAttempt> {
    const started = Date.now();
    const abort = new AbortController();
    this.aborts.add(abort);
    const timer = setTimeout(() => abort.abort(), this.policy.timeoutMs);
    try {
      // Signed with the real time, so receivers' tolerance checks hold whatever the fake's clock says.
      const signature = signatureHeader(payload, endpoint.secret, Math.floor(Date.now() / 1000));
      const res = await fetch(endpoint.url, {
        method: "POST",
        headers: {
          "content-type": "application/json; charset=utf-8",
          "stripe-signature": signature,
          "user-agent": "Stripe/1.0 (+https://stripe.com/docs/webhooks)",
        },
        body: payload,
        signal: abort.signal,
      });
      await res.arrayBuffer().catch(() => undefined);
      return { attempt: n, at: new Date(started).toISOString(), status: res.status, error: null, duration_ms: Date.now() - started };
    } catch (e) {
      const cause = e instanceof Error && e.cause instanceof Error ? `: ${e.cause.message}` : "";
      const error = abort.signal.aborted ? `no answer within ${this.policy.timeoutMs} ms` : `${e instanceof Error ? e.message : String(e)}${cause}`;
      return { attempt: n, at: new Date(started).toISOString(), status: null, error, duration_ms: Date.now() - started };
    } finally {
      clearTimeout(timer);
      this.aborts.delete(abort);
    }
  }

  private sleep(ms: number): Promise<void> {
    return new Promise((resolve) => {
      const t = setTimeout(() => {
        this.sleeps.delete(t);
        resolve();
      }, ms);
      this.sleeps.set(t, resolve);
    });
  }

  /** Resolves once every delivery started so far (and any started meanwhile) has settled. */
  async idle(): Promise<void> {
    while (this.active.size > 0) await Promise.allSettled([...this.active]);
  }

  deliveries(): Delivery[] {
    return this.log.map((d) => ({ ...d, attempts: d.attempts.map((a) => ({ ...a })) }));
  }

  pending(): number {
    return this.active.size;
  }

  clearLog(): void {
    this.log.length = 0;
  }

  /** Stops retrying and cancels attempts in flight. */
  async close(): Promise<void> {
    this.closed = true;
    for (const [t, wake] of this.sleeps) {
      clearTimeout(t);
      wake();
    }
    this.sleeps.clear();
    for (const a of this.aborts) a.abort();
    await this.idle();
  }
}
