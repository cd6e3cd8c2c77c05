// Sums Vitest's and Playwright's JSON reports into one line: "N passed, N failed".
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";

const dir = process.argv[2] ?? ".data/test-results";
let passed = 0;
let failed = 0;

for (const vitestFile of ["vitest.json", "vitest-faults.json"].map((f) => path.join(dir, f))) {
  if (!existsSync(vitestFile)) continue;
  const v = JSON.parse(readFileSync(vitestFile, "utf8"));
  passed += v.numPassedTests ?? 0;
  failed += v.numFailedTests ?? 0;
  // a file that failed to load has no tests to count; it still counts as a failure
  if ((v.numFailedTestSuites ?? 0) > 0 && (v.numFailedTests ?? 0) === 0)
    failed += v.numFailedTestSuites;
}
const pwFile = path.join(dir, "playwright.json");
if (existsSync(pwFile)) {
  const p = JSON.parse(readFileSync(pwFile, "utf8"));
  passed += (p.stats?.expected ?? 0) + (p.stats?.flaky ?? 0);
  failed += p.stats?.unexpected ?? 0;
  if ((p.errors ?? []).length > 0 && (p.stats?.unexpected ?? 0) === 0) failed += p.errors.length;
}
console.log(`${passed} passed, ${failed} failed`);
