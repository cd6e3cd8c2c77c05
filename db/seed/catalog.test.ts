// One source per check: no demo fit rule repeats a caution calc/ raises from the shop's
// caution limits.
import { describe, expect, it } from "vitest";
import { demoRules } from "./catalog";

// The figures calc/ cautions on (computeSpec's cautions, limits from /settings/limits),
// by their names in rule conditions.
const CALC_CAUTIONED = [
  "cr_static",
  "cr_dynamic",
  "piston_speed_mean_ms",
  "piston_speed_peak_ms",
  "quench_mm",
  "rod_ratio",
];

// Rules that read a calc-cautioned figure for a concern calc does not check, and that concern.
const OWN_CONCERN: Record<string, string> = {
  "High static compression without a compression release": "the starter, not the fuel grade",
};

describe("demo fit rules", () => {
  const rules = demoRules(1, 2, 3);

  it("repeat none of calc's cautions", () => {
    const reading = rules
      .filter((r) => CALC_CAUTIONED.some((n) => new RegExp(`\\b${n}\\b`).test(r.condition)))
      .map((r) => r.name);
    expect(reading).toEqual(Object.keys(OWN_CONCERN));
    // and that one is about something calc's caution is not: it needs the part's tag too
    const own = rules.find((r) => r.name in OWN_CONCERN)!;
    expect(own.condition).toContain('not has("compression-release")');
  });

  it("no longer carry the wide-quench rule: calc's QUENCH_WIDE caution is the one source", () => {
    expect(rules.map((r) => r.name)).not.toContain("Wide quench");
    expect(rules.some((r) => r.condition.includes("quench_mm"))).toBe(false);
  });
});
