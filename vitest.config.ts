import path from "node:path";
import { defineConfig } from "vitest/config";

// Unit and integration tests: pure modules and services against a fresh migrated in-memory SQLite per test.
export default defineConfig({
  resolve: { alias: { "@": path.resolve(__dirname) } },
  test: {
    include: ["tests/unit/**/*.test.ts", "lib/**/*.test.ts", "parsers/**/*.test.ts", "db/**/*.test.ts"],
    environment: "node",
    globalSetup: ["tests/setup/jobs-worker.ts"],
    pool: "forks",
    testTimeout: 60_000,
    reporters: ["default"],
  },
});
