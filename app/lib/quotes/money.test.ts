import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  divRound,
  formatBasisPoints,
  MoneyError,
  parseHundredths,
  parsePercentBasisPoints,
  priceQuote,
  type Adjustment,
  type QuoteLineInput,
  type QuoteTerms,
} from "./money";

// A second, independent rounding: exact rationals in BigInt, half away from zero.
function refRound(n: bigint, d: bigint): bigint {
  const neg = n < 0n;
  const a = neg ? -n : n;
  const q = a / d;
  const r = a - q * d;
  const out = 2n * r >= d ? q + 1n : q;
  return neg ? -out : out;
}

const none: Adjustment = { kind: "none" };
const terms = (t: Partial<QuoteTerms> = {}): QuoteTerms => ({
  taxRateBasisPoints: 0,
  discount: none,
  deposit: none,
  suppliesBasisPoints: 0,
  ...t,
});
const line = (l: Partial<QuoteLineInput>): QuoteLineInput => ({
  kind: "part",
  description: "x",
  quantityHundredths: 100,
  unitCents: 0,
  taxable: true,
  ...l,
});

describe("worked examples (hand arithmetic, written out)", () => {
  it("two pistons, 3.25 h of labour, 8.25 % tax on parts only, 20 % deposit", () => {
    // parts: 2 × $389.95 = $779.90; labour: 3.25 × $125.00 = $406.25; subtotal $1,186.15
    // tax: 8.25 % of $779.90 = $64.341 75 → $64.34; total $1,186.15 + $64.34 = $1,250.49
    // deposit: 20 % of $1,250.49 = $250.098 → $250.10
    const q = priceQuote(
      [
        line({ quantityHundredths: 200, unitCents: 38995 }),
        line({ kind: "labour", quantityHundredths: 325, unitCents: 12500, taxable: false }),
      ],
      terms({ taxRateBasisPoints: 825, deposit: { kind: "percent", basisPoints: 2000 } }),
    );
    expect(q.lines.map((l) => l.amountCents)).toEqual([77990, 40625]);
    expect(q.subtotalCents).toBe(118615);
    expect(q.taxCents).toBe(6434);
    expect(q.totalCents).toBe(125049);
    expect(q.depositCents).toBe(25010);
  });

  it("a 10 % discount is shared over the taxable lines before tax", () => {
    // subtotal $1,000.00 (parts $600, labour $400); discount 10 % = $100.00
    // taxable share of the discount: $100 × 600/1000 = $60.00 → taxable $540.00
    // tax 7 % of $540.00 = $37.80; total $1,000 − $100 + $37.80 = $937.80
    const q = priceQuote(
      [line({ unitCents: 60000 }), line({ kind: "labour", unitCents: 40000, taxable: false })],
      terms({ taxRateBasisPoints: 700, discount: { kind: "percent", basisPoints: 1000 } }),
    );
    expect([q.discountCents, q.taxableCents, q.taxCents, q.totalCents]).toEqual([
      10000, 54000, 3780, 93780,
    ]);
  });

  it("half a cent rounds away from zero, once per line", () => {
    // 0.5 × $0.01 = $0.005 → $0.01; 1.5 × $0.03 = $0.045 → $0.05
    expect(
      priceQuote([line({ quantityHundredths: 50, unitCents: 1 })], terms()).subtotalCents,
    ).toBe(1);
    expect(
      priceQuote([line({ quantityHundredths: 150, unitCents: 3 })], terms()).subtotalCents,
    ).toBe(5);
  });

  it("shop supplies as a share of labour become their own taxable line", () => {
    // labour 10 h × $120 = $1,200.00; supplies 5 % = $60.00
    const q = priceQuote(
      [line({ kind: "labour", quantityHundredths: 1000, unitCents: 12000, taxable: false })],
      terms({ suppliesBasisPoints: 500, taxRateBasisPoints: 1000 }),
    );
    expect(q.supplies?.amountCents).toBe(6000);
    expect(q.supplies?.description).toBe("Shop supplies (5% of labour)");
    expect(q.taxCents).toBe(600);
    expect(q.totalCents).toBe(126600);
  });

  it("a fixed discount or deposit larger than the amount is capped at it", () => {
    const q = priceQuote(
      [line({ unitCents: 5000 })],
      terms({ discount: { kind: "fixed", cents: 9000 }, deposit: { kind: "fixed", cents: 1 } }),
    );
    expect([q.discountCents, q.totalCents, q.depositCents]).toEqual([5000, 0, 0]);
  });

  it("refuses what is not money, naming the field", () => {
    const bad = (l: Partial<QuoteLineInput>) => () => priceQuote([line(l)], terms());
    expect(bad({ unitCents: 12.5 })).toThrow(
      new MoneyError("The price must be a whole number of cents, 0 or more.", "lines.0.unit"),
    );
    expect(bad({ quantityHundredths: 0 })).toThrow(/^The quantity must be more than 0/);
    expect(() => priceQuote([], terms({ taxRateBasisPoints: 10001 }))).toThrow(
      "A percentage must be between 0 and 100.",
    );
  });
});

describe("typed amounts", () => {
  it("reads decimals into hundredths without floats", () => {
    expect(parseHundredths("1,290.5")).toBe(129050);
    expect(parseHundredths("$12")).toBe(1200);
    expect(parseHundredths(" 3.25 ")).toBe(325);
    expect(parseHundredths("0.1")).toBe(10);
    for (const bad of ["", "-1", "1.234", "1e3", "abc", "1,29.5", "Infinity"])
      expect(parseHundredths(bad)).toBeNull();
    expect(parsePercentBasisPoints("8.25")).toBe(825);
    expect(parsePercentBasisPoints("8.25%")).toBe(825);
    expect(parsePercentBasisPoints("100.01")).toBeNull();
    expect(formatBasisPoints(825)).toBe("8.25%");
    expect(formatBasisPoints(850)).toBe("8.5%");
    expect(formatBasisPoints(1000)).toBe("10%");
  });

  it("divRound matches exact rational rounding", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: -1e12, max: 1e12 }),
        fc.integer({ min: 1, max: 1e6 }),
        (n, d) => {
          expect(divRound(n, d)).toBe(Number(refRound(BigInt(n), BigInt(d))));
        },
      ),
      { numRuns: 2000 },
    );
  });
});

describe("totals are the sum of the rounded lines, for any quote", () => {
  const lineArb = fc.record({
    kind: fc.constantFrom("part", "labour", "machine", "other") as fc.Arbitrary<
      QuoteLineInput["kind"]
    >,
    description: fc.constant("line"),
    quantityHundredths: fc.integer({ min: 1, max: 1_000 }),
    unitCents: fc.integer({ min: 0, max: 200_000 }),
    taxable: fc.boolean(),
  });
  const adjArb: fc.Arbitrary<Adjustment> = fc.oneof(
    fc.constant(none),
    fc.record({
      kind: fc.constant("percent" as const),
      basisPoints: fc.integer({ min: 0, max: 10_000 }),
    }),
    fc.record({
      kind: fc.constant("fixed" as const),
      cents: fc.integer({ min: 0, max: 20_000_000 }),
    }),
  );
  const termsArb = fc.record({
    taxRateBasisPoints: fc.integer({ min: 0, max: 2_500 }),
    discount: adjArb,
    deposit: adjArb,
    suppliesBasisPoints: fc.oneof(fc.constant(0), fc.integer({ min: 1, max: 2_000 })),
  });

  it("holds with an independent BigInt computation, and every figure is a whole number of cents", () => {
    const reached = {
      percentDiscount: 0,
      cappedFixed: 0,
      supplies: 0,
      percentDeposit: 0,
      halfCent: 0,
    };
    const runs = 1000;
    fc.assert(
      fc.property(fc.array(lineArb, { minLength: 1, maxLength: 12 }), termsArb, (lines, t) => {
        const q = priceQuote(lines, t);
        const amounts = lines.map((l) =>
          refRound(BigInt(l.quantityHundredths) * BigInt(l.unitCents), 100n),
        );
        lines.forEach((l) => {
          if ((l.quantityHundredths * l.unitCents) % 100 === 50) reached.halfCent += 1;
        });
        expect(q.lines.map((l) => BigInt(l.amountCents))).toEqual(amounts);
        const labour = amounts
          .filter((_, i) => lines[i].kind === "labour")
          .reduce((s, a) => s + a, 0n);
        const supplies = refRound(labour * BigInt(t.suppliesBasisPoints), 10_000n);
        if (supplies > 0n) reached.supplies += 1;
        const shown = [...q.lines, ...(q.supplies ? [q.supplies] : [])];
        const subtotal = shown.reduce((s, l) => s + l.amountCents, 0);
        expect(BigInt(subtotal)).toBe(amounts.reduce((s, a) => s + a, 0n) + supplies);
        expect(q.subtotalCents).toBe(subtotal);
        if (t.discount.kind === "percent") reached.percentDiscount += 1;
        if (t.discount.kind === "fixed" && t.discount.cents > subtotal) reached.cappedFixed += 1;
        if (t.deposit.kind === "percent") reached.percentDeposit += 1;
        // the total printed is the sum of the printed lines, exactly
        expect(q.totalCents).toBe(subtotal - q.discountCents + q.taxCents);
        for (const v of [
          q.subtotalCents,
          q.discountCents,
          q.taxableCents,
          q.taxCents,
          q.totalCents,
          q.depositCents,
        ])
          expect(Number.isSafeInteger(v) && v >= 0).toBe(true);
        expect(q.discountCents).toBeLessThanOrEqual(q.subtotalCents);
        expect(q.depositCents).toBeLessThanOrEqual(q.totalCents);
        expect(BigInt(q.taxCents)).toBe(
          refRound(BigInt(q.taxableCents) * BigInt(t.taxRateBasisPoints), 10_000n),
        );
      }),
      { numRuns: runs },
    );
    // every branch the property is about is reached by a good share of the cases
    expect(reached.percentDiscount).toBeGreaterThan(runs / 5);
    expect(reached.cappedFixed).toBeGreaterThan(runs / 100);
    expect(reached.supplies).toBeGreaterThan(runs / 5);
    expect(reached.percentDeposit).toBeGreaterThan(runs / 5);
    expect(reached.halfCent).toBeGreaterThan(runs / 100);
  });
});
