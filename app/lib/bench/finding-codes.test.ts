// The short finding codes of a saved bench answer read back as the findings they encode.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { decodeFinding, encodeFinding } from "./finding-codes";
import type { FindingRef } from "./spec";

describe("finding codes", () => {
  it("encode a fired rule and one that could not be checked", () => {
    expect(encodeFinding({ ruleId: 12, ruleVersion: 3, kind: "conflict" })).toBe("c12@3");
    expect(
      encodeFinding({ ruleId: 40, ruleVersion: 1, kind: "caution", error: "needs power_hp!" }),
    ).toBe("a40@1!needs power_hp!");
    expect(decodeFinding("a40@1!needs power_hp!")).toEqual({
      ruleId: 40,
      ruleVersion: 1,
      kind: "caution",
      error: "needs power_hp!",
    });
  });

  it("read back every finding as it was", () => {
    let withError = 0;
    let without = 0;
    fc.assert(
      fc.property(
        fc.record(
          {
            ruleId: fc.integer({ min: 1, max: 2_147_483_647 }),
            ruleVersion: fc.integer({ min: 1, max: 100_000 }),
            kind: fc.constantFrom("conflict", "upgrade", "caution" as const),
            error: fc.string(),
          },
          { requiredKeys: ["ruleId", "ruleVersion", "kind"] },
        ),
        (f) => {
          if (f.error !== undefined) withError++;
          else without++;
          expect(decodeFinding(encodeFinding(f as FindingRef))).toEqual(f);
        },
      ),
      { numRuns: 300 },
    );
    // both branches are reached: with and without a reason
    expect(withError).toBeGreaterThan(30);
    expect(without).toBeGreaterThan(30);
  });
});
