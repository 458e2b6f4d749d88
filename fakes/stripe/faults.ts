import { randomUUID } from "node:crypto";
import { z } from "zod";

// Faults injected by tests through POST /_fake/faults: the next N requests (optionally only
// those matching a method and a path) answer an error status, are delayed, or lose their
// connection. `phase: "after"` lets the request run first, so its answer is stored for
// idempotent replay and only the response is lost, as when a network drops mid-reply.

export const faultSchema = z
  .object({
    mode: z.enum(["error", "delay", "drop"]),
    /** How many matching requests the fault applies to. */
    count: z.coerce.number().int().min(1).max(1000).default(1),
    /** Exact path, a path prefix ending at a "/" boundary, or a pattern with * for one segment. */
    path: z.string().startsWith("/").optional(),
    method: z.enum(["GET", "POST", "DELETE"]).optional(),
    status: z.coerce.number().int().min(400).max(599).default(500),
    delay_ms: z.coerce.number().int().min(0).max(120_000).default(0),
    phase: z.enum(["before", "after"]).default("before"),
    message: z.string().max(500).optional(),
  })
  .refine((f) => f.mode !== "delay" || f.delay_ms > 0, { message: "a delay fault needs delay_ms > 0", path: ["delay_ms"] });

export type FaultInput = z.input<typeof faultSchema>;
export type Fault = z.output<typeof faultSchema> & { id: string; remaining: number; hits: number };

export class FaultBoard {
  private faults: Fault[] = [];

  /** Adds a fault; throws a ZodError naming the bad field. */
  add(input: unknown): Fault {
    const parsed = faultSchema.parse(input);
    const fault: Fault = { ...parsed, id: `fault_${randomUUID().slice(0, 8)}`, remaining: parsed.count, hits: 0 };
    this.faults.push(fault);
    return fault;
  }

  /** The first fault matching this request, used up by one; undefined when none matches. */
  take(method: string, path: string): Fault | undefined {
    const fault = this.faults.find((f) => f.remaining > 0 && (!f.method || f.method === method) && pathMatches(f.path, path));
    if (!fault) return undefined;
    fault.remaining -= 1;
    fault.hits += 1;
    if (fault.remaining === 0) this.faults = this.faults.filter((f) => f !== fault);
    return { ...fault };
  }

  list(): Fault[] {
    return this.faults.map((f) => ({ ...f }));
  }

  clear(): void {
    this.faults = [];
  }
}

export function pathMatches(pattern: string | undefined, path: string): boolean {
  if (!pattern) return true;
  if (pattern.includes("*")) {
    const re = new RegExp(`^${pattern.split("*").map(escapeRegExp).join("[^/]+")}$`);
    return re.test(path);
  }
  const p = pattern.endsWith("/") ? pattern.slice(0, -1) : pattern;
  return path === p || path.startsWith(`${p}/`);
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
}

// The body of an injected error, in Stripe's shape for its status.
export function faultBody(fault: Fault): { error: Record<string, string> } {
  const message = fault.message ?? `Injected fault (${fault.id}): the fake answers ${fault.status} as asked.`;
  if (fault.status === 429) return { error: { type: "invalid_request_error", code: "rate_limit", message } };
  if (fault.status >= 500) return { error: { type: "api_error", message } };
  return { error: { type: "invalid_request_error", message } };
}
