// Runs the computation library's tests alone (no database, no app):
//   npx vitest run --config calc/vitest.config.ts
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  root: fileURLToPath(new URL("..", import.meta.url)),
  test: {
    include: ["calc/**/*.test.ts"],
  },
});
