import { defineConfig } from "vitest/config";

// Unit and integration suites. The end-to-end suite has its own config (vitest.e2e.config.mts).
// TEST_DATABASE=postgres (`npm run test:pg`) runs the integration suite alone, each file on a new
// database of the PostgreSQL server at TEST_PG_URL (tests/support/db.ts).
const onPostgres = process.env.TEST_DATABASE === "postgres";

export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: onPostgres
      ? ["tests/integration/**/*.test.ts"]
      : ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts", "fakes/**/*.test.ts"],
    environment: "node",
    server: { deps: { inline: ["kysely"] } },
    setupFiles: ["tests/setup/unit.ts"],
    testTimeout: 20_000,
    // Seeding the demo takes several times longer through a server than in-process SQLite.
    hookTimeout: onPostgres ? 180_000 : 60_000,
  },
});
