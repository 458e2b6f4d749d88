const isDev = process.env.NODE_ENV === "development";

// Pages load only what the app itself serves. Next.js bootstraps with inline scripts, so scripts
// need 'unsafe-inline': a nonce-based policy needs a fresh nonce per request, set by a proxy.ts
// at the project's top level, and the project's top level is fixed (app, components, lib, db,
// migrations, fakes, public, tests and config files). What still holds without a nonce: scripts
// come only from this origin or inline, never eval in production, no plugins (object-src), no
// foreign frames of our pages (frame-ancestors), no <base> hijack, forms post only here, and
// fetches go only here (connect-src). Everything users type is escaped by React, so an injected
// inline script would first need an HTML injection. The development server also evaluates code
// for fast refresh ('unsafe-eval' in development only). tests/e2e/security.e2e.ts checks the
// headers on the production server and that pages load with no CSP violation in Chromium.
const contentSecurityPolicy = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isDev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "frame-ancestors 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "object-src 'none'",
].join("; ");

const securityHeaders = [
  { key: "Content-Security-Policy", value: contentSecurityPolicy },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Referrer-Policy", value: "same-origin" },
  { key: "Permissions-Policy", value: "camera=(self), microphone=(), geolocation=(), payment=()" },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  // A second build folder lets two checkouts' end-to-end runs build side by side on one machine.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  serverExternalPackages: ["better-sqlite3", "pdfkit", "@node-rs/argon2", "bwip-js"],
  poweredByHeader: false,
  // The type check runs as its own step (`npm run typecheck`) in CI, over the whole project.
  typescript: { ignoreBuildErrors: true },
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders }];
  },
};

export default nextConfig;
