import fs from "node:fs";
import path from "node:path";
import { Ctx, type FakeConfig, type RequestInfo } from "./context";
import { FaultBoard } from "./faults";
import { IdempotencyStore } from "./idempotency";
import type { RawParams } from "./params";
import { FakeState, type StateSnapshot } from "./state";
import { DEFAULT_RETRY, WebhookDispatcher, type Delivery, type RetryPolicy, type WebhookEndpoint } from "./webhooks";

// The fake's moving parts behind the HTTP server: state, idempotency keys, faults, the
// request log, webhook delivery and the data file.

export interface RequestLogEntry {
  id: string;
  at: string;
  method: string;
  path: string;
  idempotency_key: string | null;
  stripe_version: string | null;
  params: RawParams;
  status: number;
  replayed: boolean;
  /** The injected fault that hit this request, if any. */
  fault: string | null;
  duration_ms: number;
  error: { type: string; code?: string; message: string } | null;
}

export interface CoreOptions {
  config: FakeConfig;
  dataFile?: string;
  endpoint: WebhookEndpoint | null;
  retry?: Partial<RetryPolicy>;
  clock: () => number;
  log: (line: string) => void;
}

const DATA_FORMAT = "steamlane-fake-stripe";
const LOG_LIMIT = 2000;

interface DataFile {
  format: typeof DATA_FORMAT;
  version: 1;
  api_version: string;
  saved_at: string;
  state: StateSnapshot;
  idempotency: ReturnType<IdempotencyStore["toJSON"]>;
}

export class FakeCore {
  state: FakeState;
  readonly idempotency: IdempotencyStore;
  readonly faults = new FaultBoard();
  readonly dispatcher: WebhookDispatcher;
  readonly requestLog: RequestLogEntry[] = [];
  endpoint: WebhookEndpoint | null;

  constructor(private readonly options: CoreOptions) {
    this.endpoint = options.endpoint;
    this.idempotency = new IdempotencyStore(options.clock);
    this.dispatcher = new WebhookDispatcher({ ...DEFAULT_RETRY, ...options.retry }, (eventId) => {
      const row = this.state.events.get(eventId);
      if (row) row.obj.pending_webhooks = 0;
    });
    this.state = this.load();
  }

  get config(): FakeConfig {
    return this.options.config;
  }

  log(line: string): void {
    this.options.log(line);
  }

  nowMs(): number {
    return this.options.clock();
  }

  ctx(request: RequestInfo): Ctx {
    return new Ctx(this.state, this.config, Math.floor(this.nowMs() / 1000), request);
  }

  /** After a request: saves the state and sends the events it recorded to the webhook endpoint. */
  commit(ctx: Ctx): void {
    this.persist();
    if (!this.endpoint) return;
    for (const event of ctx.emitted) void this.dispatcher.deliver(this.endpoint, event, JSON.stringify(event, null, 2));
  }

  /** Sends a stored event again, to the configured endpoint or another one. */
  redeliver(eventId: string, endpoint = this.endpoint): Promise<Delivery> | null {
    const row = this.state.events.get(eventId);
    if (!row || !endpoint) return null;
    return this.dispatcher.deliver(endpoint, row.obj, JSON.stringify(row.obj, null, 2));
  }

  record(entry: RequestLogEntry): void {
    this.requestLog.push(entry);
    if (this.requestLog.length > LOG_LIMIT) this.requestLog.splice(0, this.requestLog.length - LOG_LIMIT);
  }

  reset(): void {
    this.state = new FakeState();
    this.idempotency.clear();
    this.faults.clear();
    this.requestLog.length = 0;
    this.dispatcher.clearLog();
    this.persist();
  }

  private load(): FakeState {
    const file = this.options.dataFile;
    if (!file || !fs.existsSync(file)) return new FakeState();
    let data: DataFile;
    try {
      data = JSON.parse(fs.readFileSync(file, "utf8")) as DataFile;
    } catch (e) {
      throw new Error(`The fake Stripe data file ${file} is not valid JSON (${(e as Error).message}); fix or delete it.`);
    }
    if (data.format !== DATA_FORMAT || data.version !== 1) {
      throw new Error(`${file} is not a fake Stripe data file (format ${DATA_FORMAT}, version 1); pass another dataFile or delete it.`);
    }
    if (data.api_version !== this.config.apiVersion) {
      this.options.log(`fake stripe: ${file} was written for API version ${data.api_version}; objects are served as stored.`);
    }
    this.idempotency.restore(data.idempotency ?? []);
    return FakeState.fromJSON(data.state);
  }

  /** Writes the data file (when one is configured) atomically: a temporary file, then a rename. */
  persist(): void {
    const file = this.options.dataFile;
    if (!file) return;
    const data: DataFile = {
      format: DATA_FORMAT,
      version: 1,
      api_version: this.config.apiVersion,
      saved_at: new Date(this.nowMs()).toISOString(),
      state: this.state.toJSON(),
      idempotency: this.idempotency.toJSON(),
    };
    fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
    const tmp = `${file}.${process.pid}.tmp`;
    fs.writeFileSync(tmp, JSON.stringify(data));
    fs.renameSync(tmp, file);
  }
}
