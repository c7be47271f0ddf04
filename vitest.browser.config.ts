import path from "node:path";
import { BaseSequencer, type TestSpecification } from "vitest/node";
import { defineConfig } from "vitest/config";

/**
 * HALFLIGHT_FILE_ORDER=reverse runs the test files in reverse order of their paths (and `--sequence.shuffle.files`
 * in a random one): each file stands alone, so any order passes.
 */
class FileOrder extends BaseSequencer {
  override async sort(files: TestSpecification[]): Promise<TestSpecification[]> {
    if (process.env.HALFLIGHT_FILE_ORDER !== "reverse") return super.sort(files);
    return [...files].sort((a, b) => b.moduleId.localeCompare(a.moduleId));
  }
}

// Browser tests: a production build, served for each test file on a database of its own, driven by playwright-core in
// Debian's Chromium.
export default defineConfig({
  resolve: { alias: { "@": path.resolve(__dirname) } },
  test: {
    include: ["tests/browser/**/*.e2e.ts"],
    environment: "node",
    globalSetup: ["tests/browser/global-setup.ts"],
    setupFiles: ["tests/browser/per-file-server.ts"],
    fileParallelism: false,
    sequence: { sequencer: FileOrder },
    testTimeout: 120_000,
    hookTimeout: 600_000,
  },
});
