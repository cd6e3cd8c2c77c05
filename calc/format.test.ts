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

  // fmt works by integer arithmetic for 1e-6 ≤ |x| < 1e9 and 1–9 digits, and hands anything
  // else to toPrecision (the reference itself): the properties draw from the first region,
  // spread evenly over its decades, and count how many cases reach each branch.
  const inRange = (x: number, d: number) =>
    Math.abs(x) >= 1e-6 && Math.abs(x) < 1e9 && d >= 1 && d <= 9;
  const decade = fc
    .tuple(
      fc.double({ min: 1, max: 10, maxExcluded: true, noNaN: true }),
      fc.integer({ min: -6, max: 8 }),
      fc.boolean(),
    )
    .map(([m, e, neg]) => (neg ? -1 : 1) * m * 10 ** e)
    .filter((x) => Math.abs(x) >= 1e-6 && Math.abs(x) < 1e9);

  it("matches toPrecision by its own arithmetic over every decade it handles", () => {
    let arithmetic = 0;
    const decades = new Set<number>();
    fc.assert(
      fc.property(decade, fc.integer({ min: 1, max: 9 }), (x, d) => {
        if (inRange(x, d)) arithmetic += 1;
        decades.add(Math.floor(Math.log10(Math.abs(x))));
        expect(fmt(x, d)).toBe(reference(x, d));
      }),
      { numRuns: 5000 },
    );
    expect(arithmetic).toBe(5000);
    expect(decades.size).toBeGreaterThanOrEqual(15); // 1e-6 … 1e8 (log10 may round a decade down)
  });

  it("matches toPrecision where rounding carries into a new digit (9.99…)", () => {
    // x just below a power of ten, so that rounding to d digits gives 10^(e+1)
    let carries = 0;
    const nines = fc
      .tuple(
        fc.integer({ min: 1, max: 9 }),
        fc.integer({ min: -5, max: 7 }),
        fc.double({ min: 0.01, max: 0.49, noNaN: true }),
      )
      .map(([d, e, r]) => ({ d, x: (1 - r * 10 ** -d) * 10 ** (e + 1) }));
    fc.assert(
      fc.property(nines, ({ d, x }) => {
        const e = Math.floor(Math.log10(x));
        const k = d - 1 - e;
        if (k > 0 && Math.round(x * 10 ** k) >= 10 ** d) carries += 1;
        expect(fmt(x, d)).toBe(reference(x, d));
      }),
      { numRuns: 2000 },
    );
    expect(carries).toBeGreaterThan(1000);
  });

  it("outside that region gives toPrecision's answer, exponent notation included", () => {
    expect(fmt(1e9)).toBe("1000000000");
    expect(fmt(123456789012)).toBe("123457000000");
    expect(fmt(1.5e21)).toBe("1.5e+21");
    expect(fmt(-2.5e-7)).toBe("-2.5e-7");
    expect(fmt(3.14159, 12)).toBe("3.14159");
    expect(fmt(3.14159, 0)).toBe("3.14159"); // digits out of range: the default 6
  });

  it("prints NaN and infinities as JavaScript does (computeSpec rejects them before formatting)", () => {
    expect(fmt(Number.POSITIVE_INFINITY)).toBe("Infinity");
    expect(fmt(Number.NaN)).toBe("NaN");
  });
});
