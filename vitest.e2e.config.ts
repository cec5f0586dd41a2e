// Browser (e2e) suite: one production server and one Chromium for the whole run, so test files
// run one after another. The server is started by tests/e2e/global-setup.ts.
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";
import { BaseSequencer, type TestSpecification } from "vitest/node";

/**
 * Files run in name order, always: they share one server and its demo data, and the chart checks
 * (calc) read the demo history before the safety test records a new Plover transfer.
 */
class ByName extends BaseSequencer {
  override async sort(files: TestSpecification[]): Promise<TestSpecification[]> {
    return [...files].sort((a, b) => a.moduleId.localeCompare(b.moduleId));
  }
}

export default defineConfig({
  resolve: {
    alias: { "@": fileURLToPath(new URL("./", import.meta.url)) },
  },
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    environment: "node",
    globalSetup: ["tests/e2e/global-setup.ts"],
    fileParallelism: false,
    sequence: { sequencer: ByName },
    maxWorkers: 1,
    pool: "forks",
    testTimeout: 90_000,
    hookTimeout: 120_000,
    teardownTimeout: 30_000,
  },
});
