import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";
import { testDatabaseUrl } from "./tests/support/db-url.ts";

// Two projects: pure unit tests (calc/, app/**) need no database and run without resetting
// it; the database-backed tests (tests/integration, db/) get a fresh, migrated test
// database once per run (global setup). A focused run of unit tests only resets nothing.
export default defineConfig({
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  test: {
    setupFiles: ["tests/support/fail-on-console.ts"],
    env: {
      DATABASE_URL: testDatabaseUrl(),
      NODE_ENV: "test",
      DATABASE_POOL_MAX: "4",
    },
    testTimeout: 20_000,
    hookTimeout: 60_000,
    pool: "forks",
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["calc/**/*.test.ts", "app/**/*.test.ts"] },
      },
      {
        extends: true,
        test: {
          name: "db",
          // tests/faults run on their own after the build (vitest.faults.config.ts)
          include: ["db/**/*.test.ts", "tests/integration/**/*.test.ts"],
          globalSetup: ["tests/support/global-setup.ts"],
        },
      },
    ],
  },
});
