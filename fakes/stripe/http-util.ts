import type { IncomingMessage, ServerResponse } from "node:http";
import qs from "qs";

// Small HTTP helpers shared by the API, the hosted pages and the control routes.

export const BODY_LIMIT = 1024 * 1024;

export class BodyTooLarge extends Error {}

export function readBody(req: IncomingMessage, limit = BODY_LIMIT): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > limit) {
        reject(new BodyTooLarge(`request body over ${limit} bytes`));
        req.destroy();
        return;
      }
      chunks.push(chunk);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

/** Form bodies and query strings with Stripe's nested, indexed keys (`lines[0][amount]`). */
export function parseForm(text: string): Record<string, unknown> {
  return qs.parse(text, { arrayLimit: 1000, depth: 10, parameterLimit: 10_000 }) as Record<string, unknown>;
}

// A control-route body: JSON when sent as JSON, a form otherwise.
export function parseControlBody(text: string, contentType: string | undefined): Record<string, unknown> {
  if (text.trim() === "") return {};
  if (contentType?.includes("application/json")) {
    const parsed: unknown = JSON.parse(text);
    if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) throw new SyntaxError("expected a JSON object");
    return parsed as Record<string, unknown>;
  }
  return parseForm(text);
}

export function sendJson(res: ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}): void {
  sendText(res, status, typeof body === "string" ? body : JSON.stringify(body, null, 2), "application/json", headers);
}

export function sendText(res: ServerResponse, status: number, text: string, type: string, headers: Record<string, string> = {}): void {
  if (res.headersSent) return;
  const buf = Buffer.from(text, "utf8");
  res.writeHead(status, {
    "content-type": `${type}; charset=utf-8`,
    "content-length": String(buf.length),
    "cache-control": "no-cache, no-store",
    ...headers,
  });
  res.end(buf);
}

export function sendBytes(res: ServerResponse, status: number, bytes: Buffer, type: string, headers: Record<string, string> = {}): void {
  if (res.headersSent) return;
  res.writeHead(status, { "content-type": type, "content-length": String(bytes.length), "cache-control": "no-cache, no-store", ...headers });
  res.end(bytes);
}

export function header(req: IncomingMessage, name: string): string | null {
  const v = req.headers[name.toLowerCase()];
  if (v === undefined) return null;
  return Array.isArray(v) ? (v[0] ?? null) : v;
}

// HTML-escapes text for the hosted pages.
export function esc(text: string | number | null | undefined): string {
  return String(text ?? "")
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}
