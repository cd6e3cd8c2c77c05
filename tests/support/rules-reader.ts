// A second app server's view of the fit rules, for tests: run under tsx, it answers each
// line on stdin with one JSON line of the active rules as its own per-process cache sees
// them (loadActiveRules), so a test can check that a change made elsewhere shows at once.
import { createInterface } from "node:readline";
import { getDb } from "~/lib/db.server";
import { loadActiveRules } from "~/lib/fit-rules/rules.server";

const db = getDb();
const lines = createInterface({ input: process.stdin });
for await (const line of lines) {
  if (line.trim() === "") continue;
  const rules = await loadActiveRules(db);
  process.stdout.write(
    JSON.stringify(rules.map((r) => ({ id: r.id, version: r.version, name: r.name }))) + "\n",
  );
}
await db.destroy();
