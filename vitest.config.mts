import { defineConfig } from "vitest/config";

// Unit tests cover lib/ (pure domain code); integration tests call route
// handlers against a temporary SQLite file. End-to-end tests run separately
// (scripts/test-e2e.ts) because they need a built app and Chromium.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["tests/unit/**/*.test.ts"], environment: "node" },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          setupFiles: ["tests/integration/setup.ts"],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
