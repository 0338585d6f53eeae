import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: { tsconfigPaths: true },
  define: { __APP_VERSION__: JSON.stringify("test") },
  test: {
    environment: "node",
    setupFiles: ["tests/setup/fail-on-console-error.ts"],
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: "forks",
    projects: [
      {
        extends: true,
        test: {
          name: "unit",
          include: ["tests/**/*.test.ts", "models/**/*.test.ts"],
          exclude: ["tests/integration/**", "tests/e2e/**", "node_modules/**"],
        },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          // A fresh SQLite file and mail folder for every test file (see the setup file).
          setupFiles: ["tests/support/integration-env.ts", "tests/support/queue-worker.ts"],
        },
      },
      {
        extends: true,
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.e2e.test.ts"],
          // One built server and one database for the whole run: files go one after another.
          globalSetup: ["tests/e2e/support/global-setup.ts"],
          fileParallelism: false,
          testTimeout: 60_000,
        },
      },
    ],
  },
});
