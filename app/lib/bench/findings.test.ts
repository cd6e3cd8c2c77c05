// The bench action's lean rule check gives exactly the findings evaluateRules gives, by
// rule version and in the same order, for generated rules (some firing, some not, some
// that cannot be checked) on varied package snapshots.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { evaluateRules, type RuleForEval } from "../fit-rules/rules.server";
import { buildRuleSnapshot } from "../fit-rules/snapshot";
import { GENERATED_CONDITIONS } from "../../../scripts/lib/generated-rules";
import { findingRefs, prepareRules } from "./findings.server";
import { toFindingRef } from "./spec";

const KINDS = ["conflict", "upgrade", "caution"] as const;
const rules: RuleForEval[] = Array.from({ length: 70 }, (_, i) => ({
  id: 1000 + ((i * 37) % 70),
  version: 1 + (i % 3),
  // names repeat so that the order by id among equal names is checked too
  name: `Rule ${String.fromCharCode(65 + (i % 9))}`,
  kind: KINDS[i % 3]!,
  condition: i === 5 ? "power_hp >" : GENERATED_CONDITIONS[i % GENERATED_CONDITIONS.length]!(i),
  message: `Message ${i}`,
  upgrade_category: null,
  suggested_part_id: null,
}));

describe("findingRefs", () => {
  it("matches evaluateRules on every snapshot", () => {
    const prepared = prepareRules(rules);
    let withErrors = 0;
    let fired = 0;
    fc.assert(
      fc.property(
        fc.record({
          power: fc.option(fc.integer({ min: 80, max: 200 }), { nil: null }),
          bore: fc.option(fc.double({ min: 90, max: 110, noNaN: true }), { nil: null }),
          stroke: fc.double({ min: 100, max: 130, noNaN: true }),
          rpm: fc.option(fc.integer({ min: 4000, max: 7000 }), { nil: null }),
          cr: fc.option(fc.double({ min: 8, max: 13, noNaN: true }), { nil: null }),
        }),
        (v) => {
          const snapshot = buildRuleSnapshot({
            numbers: {
              power_hp: v.power,
              rev_limit_rpm: v.rpm,
              bore_mm: v.bore,
              stroke_mm: v.stroke,
              cr_static: v.cr,
            },
            parts: [],
          });
          const expected = evaluateRules(snapshot, rules).map(toFindingRef);
          const got = findingRefs(snapshot, prepared);
          expect(got).toEqual(expected);
          if (got.some((f) => f.error)) withErrors++;
          if (got.some((f) => !f.error)) fired++;
        },
      ),
      { numRuns: 200 },
    );
    // both branches are reached on most snapshots: rules that fire and rules that cannot be checked
    expect(withErrors).toBeGreaterThan(150);
    expect(fired).toBeGreaterThan(50);
  });
});
