// The Content Security Policy of every response, built per request by proxy.ts so that each page
// gets a fresh nonce. Scripts run only when they carry the nonce (Next.js puts it on its own
// bootstrap and chunk scripts when it finds it in the request's policy), or when a script that
// carries it loads them ('strict-dynamic'); never inline scripts without it, never eval in
// production. Styles stay 'unsafe-inline': React style attributes and the charts' inline styles
// need it, and a style cannot run code. The development server also evaluates code for fast
// refresh ('unsafe-eval' in development only). tests/e2e/security.e2e.ts checks the header on the
// production server and that pages load in Chromium with no violation.

/** A fresh nonce: 128 random bits, base64. */
export function newNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}

export function contentSecurityPolicy(nonce: string, options: { development: boolean }): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${options.development ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "frame-ancestors 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "object-src 'none'",
  ].join("; ");
}
