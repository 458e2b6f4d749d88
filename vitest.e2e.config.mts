import { BaseSequencer, type TestSpecification } from "vitest/node";
import { defineConfig } from "vitest/config";

// Files share one seeded demo database, so they run one at a time in a fixed order (by name):
// the same run every time, wherever a failure shows up. (The dispatcher's planning file, for one,
// plans today's stops before the driver's file serves a stop on today's plan.)
class ByName extends BaseSequencer {
  override async sort(files: TestSpecification[]): Promise<TestSpecification[]> {
    return [...files].sort((a, b) => a.moduleId.localeCompare(b.moduleId));
  }
}

// The end-to-end suite: a production build served with its local stand-ins, driven in Chromium.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    globalSetup: ["tests/e2e/global-setup.ts"],
    fileParallelism: false,
    sequence: { sequencer: ByName },
    testTimeout: 90_000,
    hookTimeout: 240_000,
  },
});
