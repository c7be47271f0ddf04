import path from "node:path";
import { defineConfig } from "vitest/config";

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
    testTimeout: 120_000,
    hookTimeout: 600_000,
  },
});
