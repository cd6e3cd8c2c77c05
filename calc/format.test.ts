import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { fmt } from "./format";

// The reference: ECMAScript Number.prototype.toPrecision, trailing zeros dropped.
const reference = (x: number, d: number) => String(Number(x.toPrecision(d)));

describe("number formatting for worked steps", () => {
  it("rounds to significant figures and drops trailing zeros", () => {
    expect(fmt(926.6666377735038)).toBe("926.667");
    expect(fmt(101.6)).toBe("101.6");
    expect(fmt(0.25)).toBe("0.25");
    expect(fmt(5800)).toBe("5800");
    expect(fmt(-3)).toBe("-3");
    expect(fmt(0)).toBe("0");
    expect(fmt(9.9999996)).toBe("10");
    expect(fmt(0.000999)).toBe("0.000999");
    expect(fmt(1234567.8)).toBe("1234570");
    expect(fmt(11.031260201695199, 4)).toBe("11.03");
  });

  it("matches toPrecision for any finite number and 1–9 digits", () => {
    fc.assert(
      fc.property(
        fc.double({ noNaN: true, noDefaultInfinity: true }),
        fc.integer({ min: 1, max: 9 }),
        (x, d) => {
          expect(fmt(x, d)).toBe(reference(x, d));
        },
      ),
      { numRuns: 5000 },
    );
    fc.assert(
      fc.property(
        fc.double({ min: -1e7, max: 1e7, noNaN: true }),
        fc.integer({ min: 1, max: 9 }),
        (x, d) => {
          expect(fmt(x, d)).toBe(reference(x, d));
        },
      ),
      { numRuns: 5000 },
    );
  });

  it("prints NaN and infinities as JavaScript does (computeSpec rejects them before formatting)", () => {
    expect(fmt(Number.POSITIVE_INFINITY)).toBe("Infinity");
    expect(fmt(Number.NaN)).toBe("NaN");
  });
});
