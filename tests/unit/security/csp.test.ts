import { describe, expect, it } from "vitest";
import { contentSecurityPolicy, newNonce } from "@/lib/http/csp";

describe("the Content Security Policy", () => {
  it("makes a fresh 128-bit nonce each time", () => {
    const nonces = new Set(Array.from({ length: 200 }, newNonce));
    expect(nonces.size).toBe(200);
    for (const n of nonces) expect(Buffer.from(n, "base64")).toHaveLength(16);
  });

  it("lets scripts run only with the nonce in production, and adds eval only in development", () => {
    const production = contentSecurityPolicy("abc", { development: false });
    const script = production.split("; ").find((d) => d.startsWith("script-src "));
    expect(script).toBe("script-src 'self' 'nonce-abc' 'strict-dynamic'");
    expect(production).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    expect(production).toContain("object-src 'none'");
    expect(production).toContain("frame-ancestors 'none'");
    expect(contentSecurityPolicy("abc", { development: true })).toContain("'strict-dynamic' 'unsafe-eval'");
  });
});
