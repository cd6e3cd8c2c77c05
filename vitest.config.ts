import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";
import { testDatabaseUrl } from "./tests/support/db-url.ts";

export default defineConfig({
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  test: {
    include: [
      "calc/**/*.test.ts",
      "app/**/*.test.ts",
      "db/**/*.test.ts",
      "tests/integration/**/*.test.ts",
    ],
    globalSetup: ["tests/support/global-setup.ts"],
    setupFiles: ["tests/support/fail-on-console.ts"],
    env: {
      DATABASE_URL: testDatabaseUrl(),
      NODE_ENV: "test",
      DATABASE_POOL_MAX: "4",
    },
    testTimeout: 20_000,
    hookTimeout: 60_000,
    pool: "forks",
  },
});
