/** @type {import('next').NextConfig} */
const nextConfig = {
  serverExternalPackages: ["better-sqlite3", "pdfkit", "@node-rs/argon2", "bwip-js"],
  poweredByHeader: false,
  // The type check runs as its own step (`npm run typecheck`) in CI, over the whole project.
  typescript: { ignoreBuildErrors: true },
};

export default nextConfig;
