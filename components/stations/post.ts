import type { ErrorBody, FieldErrors } from "@/lib/errors";

// Talking to the station routes from a station screen: JSON in and out, the server's message and
// field errors kept for the screen. A dropped connection is tried again with the same body — and
// so the same clientEventId, which the server records once.

export type Posted<T> = { ok: true; data: T } | { ok: false; status: number; message: string; fields: FieldErrors };

export async function postJson<T>(url: string, body: unknown = {}): Promise<Posted<T>> {
  for (let attempt = 1; ; attempt++) {
    try {
      const res = await fetch(url, {
        method: "POST",
        headers: { "content-type": "application/json", accept: "application/json" },
        body: JSON.stringify(body),
      });
      const json = (await res.json().catch(() => null)) as (T & Partial<ErrorBody>) | null;
      if (res.ok && json) return { ok: true, data: json };
      return {
        ok: false,
        status: res.status,
        message: json?.error?.message ?? `The server answered ${res.status}. Try again.`,
        fields: json?.error?.fields ?? {},
      };
    } catch {
      if (attempt >= 3) {
        return { ok: false, status: 0, message: "The station cannot reach the server. Check the network, then try again.", fields: {} };
      }
      await new Promise((resolve) => setTimeout(resolve, 400 * attempt));
    }
  }
}

/** A v4 UUID for one request, also where crypto.randomUUID is missing (a page served over plain http). */
export function newClientEventId(): string {
  if (typeof crypto.randomUUID === "function") return crypto.randomUUID();
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  bytes[6] = (bytes[6]! & 0x0f) | 0x40;
  bytes[8] = (bytes[8]! & 0x3f) | 0x80;
  const hex = [...bytes].map((b) => b.toString(16).padStart(2, "0")).join("");
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
}
