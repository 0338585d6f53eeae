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
    reporters: process.env.CI ? ["default", ["json", { outputFile: "test-results/vitest.json" }]] : ["default"],
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
          setupFiles: ["tests/support/integration-env.ts"],
        },
      },
    ],
  },
});
