import { newId, type EventObject, type FakeState } from "./state";

// What one request (an API call, a hosted-page payment or a control route) works with.

export interface FakeConfig {
  /** The API version the installed SDK pins; every object and event is rendered in it. */
  apiVersion: string;
  /** Base of the links the fake hands out (hosted pages, PDFs), without a trailing slash. */
  publicUrl: string;
  accountName: string;
  /** Currency of invoices and items whose customer has none yet. */
  defaultCurrency: string;
  /** Whether a webhook endpoint is configured (sets `pending_webhooks` on new events). */
  webhooksEnabled: () => boolean;
}

export interface RequestInfo {
  id: string | null;
  idempotency_key: string | null;
}

export class Ctx {
  readonly emitted: EventObject[] = [];

  constructor(
    readonly state: FakeState,
    readonly config: FakeConfig,
    /** Unix seconds, fixed for the whole request. */
    readonly now: number,
    readonly request: RequestInfo,
  ) {}

  /** Records an event with a snapshot of the object as it is now. */
  emit(type: string, object: object, previous?: Record<string, unknown>): EventObject {
    const event: EventObject = {
      id: newId("evt"),
      object: "event",
      api_version: this.config.apiVersion,
      created: this.now,
      data: previous && Object.keys(previous).length > 0
        ? { object: structuredClone(object) as Record<string, unknown>, previous_attributes: structuredClone(previous) }
        : { object: structuredClone(object) as Record<string, unknown> },
      livemode: false,
      pending_webhooks: this.config.webhooksEnabled() ? 1 : 0,
      request: { ...this.request },
      type,
    };
    this.state.add(this.state.events, { obj: event });
    this.emitted.push(event);
    return event;
  }

  link(path: string): string {
    return `${this.config.publicUrl}${path}`;
  }
}

// The earlier values of the top-level fields that differ: an event's `previous_attributes`.
export function previousAttributes(before: object, after: object): Record<string, unknown> {
  const b = before as Record<string, unknown>;
  const a = after as Record<string, unknown>;
  const out: Record<string, unknown> = {};
  for (const key of new Set([...Object.keys(b), ...Object.keys(a)])) {
    if (JSON.stringify(b[key]) !== JSON.stringify(a[key])) out[key] = b[key] === undefined ? null : b[key];
  }
  return out;
}
