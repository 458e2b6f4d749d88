// The hardening headers of every response. The Content Security Policy is per request, with a
// fresh nonce for each page: proxy.ts sets it (lib/http/csp.ts).
const securityHeaders = [
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
