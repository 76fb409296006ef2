import { fileURLToPath } from "node:url";

import { defineConfig } from "vitest/config";

const empty = fileURLToPath(new URL("./tests/support/empty.ts", import.meta.url));

// Unit tests cover lib/ (pure domain code); integration tests call route
// handlers against a temporary SQLite file; end-to-end tests drive Debian's
// Chromium against a built app (started by tests/e2e/global-setup.ts).
export default defineConfig({
  resolve: {
    tsconfigPaths: true,
    // "server-only" throws outside Next's server bundle; tests are server code.
    alias: { "server-only": empty },
  },
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
      {
        extends: true,
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/e2e/global-setup.ts"],
          testTimeout: 120_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
