import { randomBytes } from "node:crypto";
import http, { type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";
import type { FakeConfig } from "./context";
import { handleControl } from "./control";
import { FakeCore, type RequestLogEntry } from "./core";
import { FakeStripeError, type StripeErrorBody } from "./errors";
import { applyExpand, readExpand } from "./expand";
import { faultBody, type Fault } from "./faults";
import { handleHosted } from "./hosted";
import { BodyTooLarge, header, parseForm, readBody, sendJson } from "./http-util";
import { fingerprintOf } from "./idempotency";
import { Params, type RawParams } from "./params";
import { matchRoute } from "./routes";
import { newId } from "./state";
import type { RetryPolicy, WebhookEndpoint } from "./webhooks";

// A local stand-in for the Stripe API, spoken to by the official SDK unchanged:
//   new Stripe(key, { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0, telemetry: false })
// It keeps its state in memory (optionally in a JSON data file), replays idempotent POSTs,
// records every change as an event in the API version the installed SDK pins, and posts the
// events, signed, to a webhook endpoint.

/** The API version the installed `stripe` package pins; the fake speaks only this one. */
export const API_VERSION: string = Stripe.API_VERSION;

export interface FakeStripeOptions {
  /** 0 (the default) picks a free port. */
  port?: number;
  host?: string;
  /** Where events are POSTed; none are sent without it (it can be set later through /_fake/webhook-endpoint). */
  webhookUrl?: string;
  /** The `whsec_…` signing secret; a random one is made when left out. */
  webhookSecret?: string;
  /** A JSON file that keeps the state across restarts (written after every change). */
  dataFile?: string;
  /** Base of the hosted-page and PDF links handed out, when browsers reach the fake at another address. */
  publicUrl?: string;
  /** The seller's name on invoices and pages. */
  accountName?: string;
  /** Currency of invoices and items whose customer has none yet (default "eur"). */
  defaultCurrency?: string;
  /** When given, only these secret keys are accepted; otherwise any `sk_test_…` or `rk_test_…` key. */
  apiKeys?: string[];
  webhookRetry?: Partial<RetryPolicy>;
  /** Milliseconds since the epoch; lets tests move the fake's clock. Webhook signatures always use real time. */
  clock?: () => number;
  /** Diagnostics (a load warning, an internal error); defaults to console.error. */
  log?: (line: string) => void;
}

export interface FakeStripe {
  url: string;
  port: number;
  apiVersion: string;
  webhookSecret: string;
  /** Spread into the SDK's config: `new Stripe(key, { ...fake.sdkConfig, maxNetworkRetries: 0 })`. */
  sdkConfig: { host: string; port: number; protocol: "http" };
  /** Points webhooks somewhere else (or nowhere, with null). */
  setWebhookEndpoint(endpoint: WebhookEndpoint | null): void;
  /** Resolves once every webhook delivery started so far has settled (delivered or given up). */
  webhooksIdle(): Promise<void>;
  requests(): RequestLogEntry[];
  reset(): void;
  close(): Promise<void>;
}

const STRIPE_HEADERS = { "stripe-version": API_VERSION };

export async function startFakeStripe(options: FakeStripeOptions = {}): Promise<FakeStripe> {
  const host = options.host ?? "127.0.0.1";
  const log = options.log ?? ((line: string) => console.error(line));
  const webhookSecret = options.webhookSecret ?? `whsec_${randomBytes(24).toString("hex")}`;
  const config: FakeConfig = {
    apiVersion: API_VERSION,
    publicUrl: "",
    accountName: options.accountName ?? "Test account",
    defaultCurrency: (options.defaultCurrency ?? "eur").toLowerCase(),
    webhooksEnabled: () => core.endpoint !== null,
  };
  const core: FakeCore = new FakeCore({
    config,
    dataFile: options.dataFile,
    endpoint: options.webhookUrl ? { url: options.webhookUrl, secret: webhookSecret } : null,
    retry: options.webhookRetry,
    clock: options.clock ?? Date.now,
    log,
  });
  const started = Date.now();
  const info = () => ({
    api_version: API_VERSION,
    uptime_s: Math.round((Date.now() - started) / 1000),
    webhook_endpoint: core.endpoint?.url ?? null,
    data_file: options.dataFile ?? null,
    counts: {
      customers: core.state.customers.size,
      invoices: core.state.invoices.size,
      events: core.state.events.size,
      idempotency_keys: core.idempotency.size,
    },
  });

  const server = http.createServer((req, res) => {
    handle(core, options, req, res, info).catch((e: unknown) => {
      log(`fake stripe: ${req.method} ${req.url} failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
      sendJson(res, 500, { error: { type: "api_error", message: "The fake Stripe server failed on this request; see its log." } });
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, host, () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  const url = `http://${host.includes(":") ? `[${host}]` : host}:${port}`;
  config.publicUrl = (options.publicUrl ?? url).replace(/\/$/, "");

  return {
    url,
    port,
    apiVersion: API_VERSION,
    webhookSecret,
    sdkConfig: { host, port, protocol: "http" },
    setWebhookEndpoint: (endpoint) => {
      core.endpoint = endpoint;
    },
    webhooksIdle: () => core.dispatcher.idle(),
    requests: () => core.requestLog.map((e) => ({ ...e })),
    reset: () => core.reset(),
    close: async () => {
      await core.dispatcher.close();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
      core.persist();
    },
  };
}

async function handle(core: FakeCore, options: FakeStripeOptions, req: IncomingMessage, res: ServerResponse, info: () => Record<string, unknown>) {
  const url = new URL(req.url ?? "/", "http://fake.invalid");
  let body: string;
  try {
    body = await readBody(req);
  } catch (e) {
    if (e instanceof BodyTooLarge) return sendJson(res, 413, { error: { type: "invalid_request_error", message: "The request body is larger than 1 MiB." } });
    throw e;
  }
  if (url.pathname.startsWith("/_fake/")) return handleControl(core, req, res, url, body, info);
  if (url.pathname.startsWith("/hosted/")) return handleHosted(core, req, res, url.pathname, body);
  return handleApi(core, options, req, res, url, body);
}

async function handleApi(core: FakeCore, options: FakeStripeOptions, req: IncomingMessage, res: ServerResponse, url: URL, body: string) {
  const started = Date.now();
  const method = (req.method ?? "GET").toUpperCase();
  const requestId = newId("req", 14);
  const key = method === "POST" ? header(req, "idempotency-key") : null;
  const entry: RequestLogEntry = {
    id: requestId,
    at: new Date(core.nowMs()).toISOString(),
    method,
    path: url.pathname,
    idempotency_key: key,
    stripe_version: header(req, "stripe-version"),
    params: {},
    status: 0,
    replayed: false,
    fault: null,
    duration_ms: 0,
    error: null,
  };
  const headers: Record<string, string> = { ...STRIPE_HEADERS, "request-id": requestId };
  if (key) headers["idempotency-key"] = key;
  // Answers and logs; `payload` is the body object or its JSON text.
  const respond = (status: number, payload: unknown, extra: Record<string, string> = {}) => {
    entry.status = status;
    entry.duration_ms = Date.now() - started;
    const obj = typeof payload === "string" ? (JSON.parse(payload) as unknown) : payload;
    const err = (obj as { error?: StripeErrorBody } | null)?.error;
    if (err) entry.error = { type: err.type, code: err.code, message: err.message };
    core.record(entry);
    sendJson(res, status, payload, { ...headers, ...extra });
  };
  const drop = () => {
    entry.status = 0;
    entry.duration_ms = Date.now() - started;
    core.record(entry);
    req.socket.destroy();
  };

  let raw: RawParams;
  if (method === "POST") {
    const type = header(req, "content-type") ?? "";
    if (body !== "" && !type.includes("application/x-www-form-urlencoded")) {
      return respond(400, {
        error: {
          type: "invalid_request_error",
          message: `Send the parameters form-encoded (application/x-www-form-urlencoded), as Stripe's v1 API takes them; got ${type || "no content type"}.`,
        },
      });
    }
    raw = parseForm(body);
  } else {
    raw = parseForm(url.search.slice(1));
  }
  entry.params = raw;

  const fault = core.faults.take(method, url.pathname);
  if (fault) {
    entry.fault = `${fault.id} ${fault.mode}${fault.mode === "error" ? ` ${fault.status}` : ""}${fault.mode === "delay" ? ` ${fault.delay_ms}ms` : ""} ${fault.phase}`;
  }
  const runFaultBefore = (f: Fault | undefined): boolean => {
    if (!f || f.phase !== "before") return false;
    if (f.mode === "error") respond(f.status, faultBody(f));
    else if (f.mode === "drop") drop();
    else return false;
    return true;
  };

  if (runFaultBefore(fault)) return;
  // A delay stands for a slow endpoint: it holds the request after its key is taken.
  const slow = () => (fault?.mode === "delay" ? new Promise((r) => setTimeout(r, fault.delay_ms)) : Promise.resolve());

  const auth = authenticate(req, options.apiKeys);
  if (auth) return respond(401, { error: auth });

  const fingerprint = fingerprintOf(method, url.pathname, raw);
  if (key) {
    const found = core.idempotency.lookup(key, fingerprint);
    if (found.kind === "replay") {
      entry.replayed = true;
      await slow();
      if (fault?.phase === "after" && fault.mode === "error") return respond(fault.status, faultBody(fault));
      if (fault?.phase === "after" && fault.mode === "drop") return drop();
      return respond(found.answer.status, found.answer.body, { "idempotent-replayed": "true" });
    }
    if (found.kind === "mismatch") {
      return respond(400, {
        error: {
          type: "idempotency_error",
          message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
        },
      });
    }
    if (found.kind === "in_flight") {
      return respond(409, {
        error: {
          type: "idempotency_error",
          code: "idempotency_key_in_use",
          message: `There is currently another in-progress request using this idempotency key ('${key}'); try again once it has finished.`,
        },
      });
    }
    core.idempotency.begin(key, fingerprint);
  }
  await slow();

  // Run the endpoint.
  let status = 200;
  let payload: unknown;
  let keep = true;
  const ctx = core.ctx({ id: requestId, idempotency_key: key });
  try {
    const route = method === "GET" || method === "POST" || method === "DELETE" ? matchRoute(method, url.pathname) : null;
    if (!route) {
      throw new FakeStripeError(
        404,
        {
          type: "invalid_request_error",
          message: `Unrecognized request URL (${method}: ${url.pathname}). This local fake serves a subset of the Stripe API; see fakes/stripe/README.md.`,
        },
        true,
      );
    }
    const { expand, ...rest } = raw;
    const paths = readExpand(expand);
    const result = route.handler(ctx, Params.from(rest), route.path);
    payload = applyExpand(ctx, result, paths);
  } catch (e) {
    if (e instanceof FakeStripeError) {
      status = e.status;
      payload = { error: e.body };
      keep = !e.validation;
    } else {
      status = 500;
      payload = { error: { type: "api_error", message: `The fake failed inside the endpoint: ${(e as Error).message}` } };
      keep = false;
      core.log(`fake stripe: ${method} ${url.pathname}: ${(e as Error).stack ?? String(e)}`);
    }
  }
  const text = JSON.stringify(payload, null, 2);
  if (key) core.idempotency.finish(key, fingerprint, keep ? { status, body: text } : null);
  if (method !== "GET") core.commit(ctx);

  if (fault?.phase === "after") {
    if (fault.mode === "error") return respond(fault.status, faultBody(fault));
    if (fault.mode === "drop") return drop();
  }
  respond(status, text);
}

// Stripe's answers for a missing or unusable key (401 → StripeAuthenticationError).
function authenticate(req: IncomingMessage, allowed: string[] | undefined): StripeErrorBody | null {
  const value = header(req, "authorization") ?? "";
  let key = "";
  if (value.startsWith("Bearer ")) key = value.slice(7).trim();
  else if (value.startsWith("Basic ")) key = Buffer.from(value.slice(6), "base64").toString("utf8").split(":")[0];
  if (!key) {
    return {
      type: "invalid_request_error",
      message: "You did not provide an API key. Provide it in the Authorization header, using Bearer auth (Authorization: Bearer sk_test_…).",
    };
  }
  const masked = key.length > 12 ? `${key.slice(0, 8)}${"*".repeat(key.length - 12)}${key.slice(-4)}` : "****";
  if (allowed ? !allowed.includes(key) : !/^(sk|rk)_test_\w+$/.test(key)) {
    const hint = /^(sk|rk)_live_/.test(key) ? " This local fake accepts test-mode keys only." : "";
    return { type: "invalid_request_error", code: "api_key_invalid", message: `Invalid API Key provided: ${masked}.${hint}` };
  }
  return null;
}
