// What the measured figure changes: the package's fit-rule findings with the spec's own
// power (target or estimate) against those with the measured one.
import type { Db } from "../db.server";
import { evaluateSpec } from "../packages/store.server";
import { ruleKey } from "../bench/spec";
import type { Finding } from "../fit-rules/rules.server";
import type { MeasuredFigure } from "./measured";

export interface FindingChange {
  change: "applies" | "no longer applies";
  ruleName: string;
  kind: Finding["kind"];
  message: string;
}

export interface MeasuredEffect {
  specPowerHp: number | null;
  specBasis: string | null;
  changes: FindingChange[];
}

export async function measuredEffect(
  db: Db,
  packageId: number,
  measured: MeasuredFigure | null,
): Promise<MeasuredEffect | null> {
  const row = await db
    .selectFrom("packages")
    .select("spec")
    .where("id", "=", packageId)
    .executeTakeFirst();
  if (!row) return null;
  const [without, withIt] = await Promise.all([
    evaluateSpec(db, row.spec, false, undefined, undefined, null),
    measured ? evaluateSpec(db, row.spec, false, undefined, undefined, measured) : null,
  ]);
  const changes: FindingChange[] = [];
  if (withIt) {
    const before = new Set(without.findings.filter((f) => !f.error).map(ruleKey));
    const after = new Set(withIt.findings.filter((f) => !f.error).map(ruleKey));
    for (const f of withIt.findings)
      if (!f.error && !before.has(ruleKey(f)))
        changes.push({ change: "applies", ruleName: f.ruleName, kind: f.kind, message: f.message });
    for (const f of without.findings)
      if (!f.error && !after.has(ruleKey(f)))
        changes.push({
          change: "no longer applies",
          ruleName: f.ruleName,
          kind: f.kind,
          message: f.message,
        });
  }
  return { specPowerHp: without.spec.powerHp, specBasis: without.spec.powerBasis, changes };
}
