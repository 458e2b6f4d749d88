import { defineConfig } from "vitest/config";

// Unit and integration suites. The end-to-end suite has its own config (vitest.e2e.config.mts).
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts", "fakes/**/*.test.ts"],
    environment: "node",
    server: { deps: { inline: ["kysely"] } },
    setupFiles: ["tests/setup/unit.ts"],
    testTimeout: 20_000,
    hookTimeout: 60_000,
  },
});
