import { type NextRequest, NextResponse } from "next/server";
import { contentSecurityPolicy, newNonce } from "@/lib/http/csp";

// Runs before every page and route handler: gives the request a fresh nonce and its Content
// Security Policy (lib/http/csp.ts). Next.js reads the policy from the request and puts the nonce
// on the scripts it renders; the response carries the same policy. The other hardening headers
// are static (next.config.mjs). Static build files and fonts skip this.

export function proxy(request: NextRequest) {
  const policy = contentSecurityPolicy(newNonce(), { development: process.env.NODE_ENV === "development" });
  const headers = new Headers(request.headers);
  headers.set("content-security-policy", policy);
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("content-security-policy", policy);
  return response;
}

export const config = {
  matcher: [{ source: "/((?!_next/static|_next/image|favicon.ico).*)" }],
};
