// The driver's outbox: scans and stop completions made on the phone wait here until the server
// has them. Each item carries a client-made id (sent as `clientEventId`), so a request that
// reached the server but whose answer was lost is recorded once when it is sent again. Items are
// sent one at a time in the order they were made; the first that cannot be sent (no network, a
// server fault) stops the round, so a stop's completion never overtakes its scans. An item the
// server refuses (the set does not belong here, the stop is already closed) leaves the queue with
// the server's reason: sending it again would be refused again.
//
// No React and no browser globals here, so the logic is tested directly; `localStorageStore` and
// `sendJson` are the browser's pieces.

export interface OutboxItem {
  /** The client-made id; also the `clientEventId` in the body. */
  id: string;
  url: string;
  body: Record<string, unknown>;
  /** What the driver sees in the waiting list, e.g. "Scan SL-00042". */
  label: string;
  /** Which screen it belongs to (e.g. "stop:12"), to show that screen's waiting items. */
  group: string;
  createdAt: string;
  attempts: number;
  lastError: string | null;
}

export type SendResult =
  | { kind: "sent"; data: unknown }
  | { kind: "refused"; status: number; message: string }
  | { kind: "retry"; message: string };

export type Sender = (item: OutboxItem) => Promise<SendResult>;

/** Where the queue is kept between page loads. */
export interface OutboxStore {
  load(): OutboxItem[];
  save(items: OutboxItem[]): void;
}

export interface Settled {
  item: OutboxItem;
  result: Exclude<SendResult, { kind: "retry" }>;
}

export interface FlushReport {
  sent: number;
  refused: number;
  /** Items still waiting after this round. */
  waiting: number;
  /** Why the round stopped early, when it did. */
  stoppedBy: string | null;
}

export interface OutboxOptions {
  /** Called once for every item that left the queue: sent, or refused by the server. */
  onSettled?: (settled: Settled) => void;
  /** Called whenever the waiting list changes. */
  onChange?: (items: OutboxItem[]) => void;
  now?: () => Date;
}

export class Outbox {
  private flushing: Promise<FlushReport> | null = null;

  constructor(
    private readonly store: OutboxStore,
    private readonly send: Sender,
    private readonly options: OutboxOptions = {},
  ) {}

  /** The items waiting to be sent, oldest first. */
  items(): OutboxItem[] {
    return this.store.load();
  }

  /** Adds an item; an item with an id already waiting is ignored (returns false). */
  enqueue(item: Pick<OutboxItem, "id" | "url" | "body" | "label" | "group">): boolean {
    const items = this.store.load();
    if (items.some((i) => i.id === item.id)) return false;
    const now = (this.options.now ?? (() => new Date()))();
    items.push({ ...item, body: { ...item.body, clientEventId: item.id }, createdAt: now.toISOString(), attempts: 0, lastError: null });
    this.save(items);
    return true;
  }

  /**
   * Sends what is waiting, in order. Only one round runs at a time: a call while a round is
   * running gets that round's report, so no item is ever sent twice at once.
   */
  flush(): Promise<FlushReport> {
    if (!this.flushing) {
      this.flushing = this.round().finally(() => {
        this.flushing = null;
      });
    }
    return this.flushing;
  }

  private async round(): Promise<FlushReport> {
    let sent = 0;
    let refused = 0;
    const tried = new Set<string>();
    for (;;) {
      const next = this.store.load().find((i) => !tried.has(i.id));
      if (!next) return { sent, refused, waiting: this.store.load().length, stoppedBy: null };
      tried.add(next.id);
      let result: SendResult;
      try {
        result = await this.send(next);
      } catch (error) {
        result = { kind: "retry", message: error instanceof Error ? error.message : "The request failed." };
      }
      // Re-read: another screen may have added items while this one was on its way.
      const items = this.store.load();
      if (result.kind === "retry") {
        this.save(items.map((i) => (i.id === next.id ? { ...i, attempts: i.attempts + 1, lastError: result.message } : i)));
        return { sent, refused, waiting: items.length, stoppedBy: result.message };
      }
      this.save(items.filter((i) => i.id !== next.id));
      if (result.kind === "sent") sent++;
      else refused++;
      this.options.onSettled?.({ item: next, result });
    }
  }

  private save(items: OutboxItem[]): void {
    this.store.save(items);
    this.options.onChange?.(items);
  }
}

/** A queue kept in memory only (tests, and a browser where storage is blocked). */
export function memoryStore(initial: OutboxItem[] = []): OutboxStore {
  let items = initial.map((i) => ({ ...i }));
  return {
    load: () => items.map((i) => ({ ...i })),
    save: (next) => {
      items = next.map((i) => ({ ...i }));
    },
  };
}

/** The shape of what a store holds, checked when read back. */
function isItem(value: unknown): value is OutboxItem {
  if (!value || typeof value !== "object") return false;
  const v = value as Record<string, unknown>;
  return (
    typeof v.id === "string" &&
    typeof v.url === "string" &&
    typeof v.label === "string" &&
    typeof v.group === "string" &&
    typeof v.createdAt === "string" &&
    typeof v.attempts === "number" &&
    !!v.body &&
    typeof v.body === "object"
  );
}

/** Reads a stored queue; anything unreadable is kept aside under `<key>.unreadable`, never silently dropped. */
export function parseStored(raw: string | null): { items: OutboxItem[]; unreadable: boolean } {
  if (!raw) return { items: [], unreadable: false };
  try {
    const parsed: unknown = JSON.parse(raw);
    if (!Array.isArray(parsed)) return { items: [], unreadable: true };
    const items = parsed.filter(isItem);
    return { items, unreadable: items.length !== parsed.length };
  } catch {
    return { items: [], unreadable: true };
  }
}

/** A queue in the browser's localStorage, which survives a reload and a phone that sleeps. */
export function localStorageStore(storage: Pick<Storage, "getItem" | "setItem">, key: string): OutboxStore {
  return {
    load() {
      const raw = storage.getItem(key);
      const { items, unreadable } = parseStored(raw);
      if (unreadable && raw) storage.setItem(`${key}.unreadable`, raw);
      return items;
    },
    save(items) {
      storage.setItem(key, JSON.stringify(items));
    },
  };
}

/** Statuses worth trying again later: the server or the way to it had a problem, or the session ran out. */
const RETRY_STATUSES = new Set([401, 408, 425, 429, 500, 502, 503, 504]);

/** Sends an item as a JSON POST and sorts the answer into sent, refused or try again. */
export function sendJson(fetcher: typeof fetch): Sender {
  return async (item) => {
    let res: Response;
    try {
      res = await fetcher(item.url, {
        method: "POST",
        headers: { "content-type": "application/json", accept: "application/json" },
        body: JSON.stringify(item.body),
      });
    } catch {
      return { kind: "retry", message: "No connection to the server." };
    }
    const json = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
    if (res.ok) return { kind: "sent", data: json };
    const message = json?.error?.message ?? `The server answered ${res.status}.`;
    if (res.status === 401) return { kind: "retry", message: "Your session has ended: sign in again, then it is sent." };
    if (RETRY_STATUSES.has(res.status) || res.status >= 500) return { kind: "retry", message };
    return { kind: "refused", status: res.status, message };
  };
}
