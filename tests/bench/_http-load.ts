// A fixed number of HTTP requests fired with autocannon (loopback only), each answer timed here:
// shared by the benchmarks that load a running server (load.ts, scan.ts).
import { createRequire } from "node:module";
import { quantile } from "./_stats";

// autocannon has no bundled types: the part of its API used here.
interface CannonResult {
  requests: { total: number };
  errors: number;
  timeouts: number;
  non2xx: number;
}
interface CannonRequest {
  method: string;
  path: string;
  headers: Record<string, string>;
  body?: string;
}
/** The run: a promise of the result that also emits "response" (client, status, bytes, milliseconds) per answer. */
type CannonRun = PromiseLike<CannonResult> & {
  on(event: "response", listener: (client: unknown, status: number, bytes: number, ms: number) => void): void;
};
type Autocannon = (opts: {
  url: string;
  connections: number;
  amount: number;
  timeout?: number;
  requests: (CannonRequest & { setupRequest?: (req: CannonRequest) => CannonRequest })[];
}) => CannonRun;
const autocannon = createRequire(__filename)("autocannon") as Autocannon;

/** One kind of request, sent again and again. */
export interface Requests {
  method: "GET" | "POST";
  path: string;
  headers: Record<string, string>;
  /** The body of the n-th request (counted from 0), when the requests have one. */
  body?: (n: number) => string;
}

export interface Volley {
  /** Requests in all. */
  amount: number;
  /** Requests in flight at once. */
  connections: number;
  /** Seconds before a request counts as timed out. */
  timeout: number;
}

export interface Measured {
  result: CannonResult;
  /** Answers per second from the start to the last answer, timed here (autocannon ends a run on its 1 s tick). */
  rate: number;
  /** Median and 99th percentile latency in ms, from autocannon's per-response times (its histogram keeps whole ms only). */
  p50: number;
  p99: number;
}

/** Sends `volley.amount` requests of one kind to `url` and measures the answers. */
export async function fire(url: string, requests: Requests, volley: Volley): Promise<Measured> {
  let n = 0;
  const latencies: number[] = [];
  const started = performance.now();
  let last = started;
  const run = autocannon({
    url,
    connections: volley.connections,
    amount: volley.amount,
    timeout: volley.timeout,
    requests: [
      {
        method: requests.method,
        path: requests.path,
        headers: requests.headers,
        setupRequest: (req) => (requests.body ? { ...req, body: requests.body(n++) } : req),
      },
    ],
  });
  run.on("response", (_client, _status, _bytes, ms) => {
    latencies.push(ms);
    last = performance.now();
  });
  const result = await run;
  return { result, rate: result.requests.total / ((last - started) / 1000), p50: quantile(latencies, 0.5), p99: quantile(latencies, 0.99) };
}

/** Requests of a run that failed: errors, timeouts and answers other than 2xx. */
export const failures = (m: Measured) => m.result.errors + m.result.timeouts + m.result.non2xx;
