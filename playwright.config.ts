import { defineConfig } from "@playwright/test";
import { e2eDatabaseUrl } from "./tests/support/db-url.ts";

const PORT = Number(process.env.E2E_PORT ?? 3100);
export const E2E_BASE_URL = `http://127.0.0.1:${PORT}`;

export default defineConfig({
  testDir: "tests/e2e",
  outputDir: ".data/test-results/e2e",
  timeout: 30_000,
  expect: { timeout: 7_000 },
  workers: 2,
  // one retry on CI, reported as flaky in the JSON report rather than hidden
  retries: process.env.CI ? 1 : 0,
  reporter: [["list"], ["json", { outputFile: ".data/test-results/playwright.json" }]],
  use: {
    baseURL: E2E_BASE_URL,
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-first-run",
      ],
    },
  },
  webServer: {
    command: "node scripts/serve.mjs build/server/index.js",
    url: `${E2E_BASE_URL}/healthz`,
    reuseExistingServer: false,
    timeout: 60_000,
    env: {
      ...(process.env as Record<string, string>),
      PORT: String(PORT),
      HOST: "127.0.0.1",
      NODE_ENV: "production",
      APP_URL: E2E_BASE_URL,
      DATABASE_URL: e2eDatabaseUrl(),
    },
  },
});
