import { defineConfig } from "vitest/config";

// Three suites with different costs: pure unit tests run in parallel, the
// integration and browser suites share one PostgreSQL test database and the
// one server they start, so they run file by file.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: "unit",
          include: ["app/**/*.test.ts", "tests/unit/**/*.test.ts"],
        },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 120_000,
          globalSetup: ["tests/support/global-setup.ts"],
        },
      },
      {
        extends: true,
        test: {
          name: "browser",
          include: ["tests/browser/**/*.test.ts"],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 180_000,
          globalSetup: ["tests/support/global-setup.ts"],
        },
      },
    ],
  },
});
