// The fit rules as one bench action needs them: which rule versions fire, as FindingRefs,
// in the order evaluateRules gives (conflicts, upgrades, cautions; within each, the rules
// that fired before those that could not be checked; then by name and id). The rules are
// compiled and put in that order once per set of active rules, so an action only tests
// each condition: no Finding objects, no values read back, no sort.
import { buildScope, RuleEvalError } from "../fit-rules/condition.server";
import { compileCondition, type RuleForEval } from "../fit-rules/rules.server";
import type { PackageSnapshot } from "../fit-rules/snapshot";
import type { FindingRef, RuleInfo, RuleKind } from "./spec";

const KINDS: RuleKind[] = ["conflict", "upgrade", "caution"];

type Prepared = {
  ref: FindingRef;
  key: string;
  info: RuleInfo;
  compiled: ReturnType<typeof compileCondition>;
};

export interface PreparedRules {
  /** per kind, in name and id order */
  byKind: Prepared[][];
  byKey: Map<string, Prepared>;
}

export function prepareRules(rules: readonly RuleForEval[]): PreparedRules {
  const sorted = [...rules].sort(
    (a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0) || a.id - b.id,
  );
  const byKind = KINDS.map((k) =>
    sorted
      .filter((r) => r.kind === k)
      .map((r) => ({
        ref: { ruleId: r.id, ruleVersion: r.version, kind: r.kind },
        key: `${r.id}@${r.version}`,
        info: {
          name: r.name,
          message: r.message,
          upgradeCategory: r.upgrade_category,
          suggestedPartId: r.suggested_part_id,
        },
        compiled: compileCondition(r),
      })),
  );
  return { byKind, byKey: new Map(byKind.flat().map((p) => [p.key, p])) };
}

/** The rule versions that fire on `snapshot` (and those that cannot be checked, with why). */
export function findingRefs(snapshot: PackageSnapshot, rules: PreparedRules): FindingRef[] {
  const ctx = buildScope(snapshot);
  const out: FindingRef[] = [];
  for (const list of rules.byKind) {
    let errors: FindingRef[] | null = null;
    for (const p of list) {
      const c = p.compiled;
      let error: string | null = null;
      if (!c.ok) error = `its condition is not valid (${c.message})`;
      else {
        try {
          if (c.compiled.test(ctx)) out.push(p.ref);
          continue;
        } catch (e) {
          error =
            e instanceof RuleEvalError
              ? e.message
              : `unexpected error: ${e instanceof Error ? e.message : String(e)}`;
        }
      }
      (errors ??= []).push({ ...p.ref, error });
    }
    if (errors) out.push(...errors);
  }
  return out;
}
