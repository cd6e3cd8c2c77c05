// Sums Vitest's and Playwright's JSON reports into one line:
// "N passed, N failed, N flaky, N skipped".
// A flaky test (failed, then passed on a retry) and a skipped test show in the line. A test
// may be skipped only on purpose, with a reason: Playwright's `test.skip(condition, "reason")`
// (or `test.fixme(…, "reason")`) records the reason as an annotation. Any other skip — an
// `it.skip`, a `.todo`, a skip without a reason — is listed on stderr and the script exits
// with status 3, so CI fails on it.
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";

const dir = process.argv[2] ?? ".data/test-results";
let passed = 0;
let failed = 0;
let flaky = 0;
let skipped = 0;
/** skipped tests with no recorded reason: "file › title" */
const unexplained = [];

const vitestFile = path.join(dir, "vitest.json");
if (existsSync(vitestFile)) {
  const v = JSON.parse(readFileSync(vitestFile, "utf8"));
  passed += v.numPassedTests ?? 0;
  failed += v.numFailedTests ?? 0;
  // a file that failed to load has no tests to count; it still counts as a failure
  if ((v.numFailedTestSuites ?? 0) > 0 && (v.numFailedTests ?? 0) === 0)
    failed += v.numFailedTestSuites;
  for (const file of v.testResults ?? []) {
    for (const t of file.assertionResults ?? []) {
      if (t.status === "skipped" || t.status === "pending" || t.status === "todo") {
        skipped += 1;
        // Vitest records no reason for a skip: none is on purpose
        unexplained.push(`${path.relative(process.cwd(), file.name)} › ${t.fullName ?? t.title}`);
      }
    }
  }
}

const pwFile = path.join(dir, "playwright.json");
if (existsSync(pwFile)) {
  const p = JSON.parse(readFileSync(pwFile, "utf8"));
  passed += p.stats?.expected ?? 0;
  flaky += p.stats?.flaky ?? 0;
  failed += p.stats?.unexpected ?? 0;
  skipped += p.stats?.skipped ?? 0;
  if ((p.errors ?? []).length > 0 && (p.stats?.unexpected ?? 0) === 0) failed += p.errors.length;
  const walk = (suite, trail) => {
    for (const spec of suite.specs ?? []) {
      for (const t of spec.tests ?? []) {
        const wasSkipped =
          t.status === "skipped" || (t.results ?? []).some((r) => r.status === "skipped");
        if (!wasSkipped) continue;
        const annotations = [
          ...(t.annotations ?? []),
          ...(t.results ?? []).flatMap((r) => r.annotations ?? []),
        ];
        const reason = annotations.find(
          (a) => (a.type === "skip" || a.type === "fixme") && String(a.description ?? "").trim(),
        );
        if (!reason) unexplained.push([...trail, spec.title].join(" › "));
      }
    }
    for (const child of suite.suites ?? []) walk(child, [...trail, child.title]);
  };
  for (const s of p.suites ?? []) walk(s, [s.title]);
}

for (const u of unexplained) console.error(`skipped without a reason: ${u}`);
console.log(`${passed} passed, ${failed} failed, ${flaky} flaky, ${skipped} skipped`);
process.exit(unexplained.length > 0 ? 3 : 0);
