// The fault tests (tests/faults): real processes — a PostgreSQL cluster of their own, the
// built server — stopped, killed and started again. They run after the build, one file
// at a time, apart from the main suite and its databases (scripts/test.sh).
import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

export default defineConfig({
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  test: {
    include: ["tests/faults/**/*.test.ts"],
    globalSetup: ["tests/faults/global-setup.ts"],
    setupFiles: ["tests/support/fail-on-console.ts"],
    env: {
      NODE_ENV: "test",
      // each test makes its own cluster and names its database; nothing uses this one
      DATABASE_URL: "postgres://postgres@127.0.0.1:1/torquewright_faults_none",
    },
    testTimeout: 90_000,
    hookTimeout: 120_000,
    pool: "forks",
    fileParallelism: false,
  },
});
