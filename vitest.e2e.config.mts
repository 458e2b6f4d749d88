import { defineConfig } from "vitest/config";

// The end-to-end suite: a production build served with its local stand-ins, driven in Chromium.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    globalSetup: ["tests/e2e/global-setup.ts"],
    fileParallelism: false,
    testTimeout: 90_000,
    hookTimeout: 240_000,
  },
});
