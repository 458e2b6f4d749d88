// Stripe's idempotency layer: the first answer for an Idempotency-Key is kept and replayed
// for 24 hours; the same key with other parameters (or another endpoint) is refused.

export interface StoredAnswer {
  status: number;
  body: string;
}

interface Entry {
  key: string;
  fingerprint: string;
  /** Milliseconds since the epoch, by the fake's clock. */
  storedAt: number;
  answer: StoredAnswer;
}

export type Lookup =
  | { kind: "new" }
  | { kind: "replay"; answer: StoredAnswer }
  | { kind: "mismatch" }
  | { kind: "in_flight" };

export const DAY_MS = 24 * 60 * 60 * 1000;

export class IdempotencyStore {
  private readonly entries = new Map<string, Entry>();
  private readonly running = new Map<string, string>();

  constructor(
    private readonly now: () => number,
    private readonly ttlMs = DAY_MS,
  ) {}

  /** What to do with a request carrying `key`; `fingerprint` stands for its method, path and parameters. */
  lookup(key: string, fingerprint: string): Lookup {
    this.prune();
    const entry = this.entries.get(key);
    if (entry) return entry.fingerprint === fingerprint ? { kind: "replay", answer: entry.answer } : { kind: "mismatch" };
    const running = this.running.get(key);
    if (running !== undefined) return running === fingerprint ? { kind: "in_flight" } : { kind: "mismatch" };
    return { kind: "new" };
  }

  begin(key: string, fingerprint: string): void {
    this.running.set(key, fingerprint);
  }

  /** Ends a request; its answer is kept unless null (requests refused before they ran). */
  finish(key: string, fingerprint: string, answer: StoredAnswer | null): void {
    this.running.delete(key);
    if (answer) this.entries.set(key, { key, fingerprint, storedAt: this.now(), answer });
  }

  prune(): void {
    const cutoff = this.now() - this.ttlMs;
    for (const [key, entry] of this.entries) if (entry.storedAt <= cutoff) this.entries.delete(key);
  }

  clear(): void {
    this.entries.clear();
    this.running.clear();
  }

  get size(): number {
    return this.entries.size;
  }

  toJSON(): Entry[] {
    this.prune();
    return [...this.entries.values()];
  }

  restore(entries: Entry[]): void {
    for (const e of entries) this.entries.set(e.key, e);
    this.prune();
  }
}

// Method, path and parameters with keys in a fixed order: equal requests give equal strings.
export function fingerprintOf(method: string, path: string, params: unknown): string {
  return `${method} ${path} ${canonical(params)}`;
}

function canonical(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonical).join(",")}]`;
  if (v !== null && typeof v === "object") {
    const o = v as Record<string, unknown>;
    return `{${Object.keys(o)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical(o[k])}`)
      .join(",")}}`;
  }
  return JSON.stringify(v) ?? "null";
}
