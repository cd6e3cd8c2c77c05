import { execFileSync } from "node:child_process";
import { testDatabaseUrl } from "./db-url";

// A fresh, migrated test database for every Vitest run. The migrations run under tsx
// (Kysely's file provider imports .ts files, which plain Node inside Vitest cannot).
export default function setup() {
  const url = testDatabaseUrl();
  const name = new URL(url).pathname.slice(1);
  if (name === "torquewright") throw new Error("tests refuse to run against the demo database");
  execFileSync("npx", ["tsx", "db/reset.ts"], {
    env: { ...process.env, DATABASE_URL: url },
    stdio: "inherit",
  });
}
