import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  CalcInputError,
  PISTON_TO_VALVE_NOTE,
  deckClearanceFromStack,
  pistonToValveEstimateMm,
  type DeckStackInputs,
} from "./index";

// Invented demo-like stack: 7.500 in rods (190.5 mm), 4.500 in stroke (114.3 mm).
const stack: DeckStackInputs = {
  caseDeckMm: 140.5,
  baseGasketMm: 0.4,
  cylinderHeightMm: 140.0,
  rodLengthMm: 190.5,
  strokeMm: 114.3,
  compressionHeightMm: 33.0,
};

const num = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

describe("deck clearance from the stack", () => {
  it("hand-worked: 140.5 + 0.4 + 140.0 − (190.5 + 57.15 + 33.0) = 0.25 mm below the deck", () => {
    // derived (plain geometry): deck 280.9 mm above the crank axis, crown 280.65 mm
    expect(deckClearanceFromStack(stack)).toBeCloseTo(0.25, 10);
  });

  it("a crown standing above the deck comes out negative", () => {
    // derived: a 0.5 mm taller compression height puts the crown 0.25 mm above the deck
    expect(deckClearanceFromStack({ ...stack, compressionHeightMm: 33.5 })).toBeCloseTo(-0.25, 10);
  });

  it("refuses parts that cannot be", () => {
    expect(() => deckClearanceFromStack({ ...stack, baseGasketMm: -0.1 })).toThrow(CalcInputError);
    expect(() => deckClearanceFromStack({ ...stack, cylinderHeightMm: 0 })).toThrow(
      /cylinderHeightMm/,
    );
    expect(() => deckClearanceFromStack({ ...stack, rodLengthMm: 50 })).toThrow(/half the stroke/);
    expect(() => deckClearanceFromStack({ ...stack, caseDeckMm: Number.NaN })).toThrow(
      /caseDeckMm/,
    );
  });

  it("a thicker base gasket raises deck clearance by exactly its thickness", () => {
    let below = 0;
    let above = 0;
    fc.assert(
      fc.property(
        num(100, 200),
        num(0, 1.5),
        num(0.01, 2),
        num(100, 180),
        num(140, 220),
        num(80, 130),
        num(25, 45),
        (caseDeckMm, baseGasketMm, extra, cylinderHeightMm, rodLengthMm, strokeMm, ch) => {
          const s = {
            caseDeckMm,
            baseGasketMm,
            cylinderHeightMm,
            rodLengthMm,
            strokeMm,
            compressionHeightMm: ch,
          };
          const d = deckClearanceFromStack(s);
          if (d >= 0) below++;
          else above++;
          const d2 = deckClearanceFromStack({ ...s, baseGasketMm: baseGasketMm + extra });
          // both sides are sums of about 300 mm: allow a few ulps of that
          expect(Math.abs(d2 - d - extra)).toBeLessThan(1e-12 * 300);
        },
      ),
      { numRuns: 400 },
    );
    // the stack both leaves the crown below the deck and puts it above, in enough cases
    expect(below).toBeGreaterThan(20);
    expect(above).toBeGreaterThan(20);
  });
});

describe("piston-to-valve estimate", () => {
  const base = {
    deckClearanceMm: 0.25,
    gasketThicknessMm: 1.02,
    intakeLiftAtTdcMm: 3.05,
    exhaustLiftAtTdcMm: 2.7,
    intakeReliefDepthMm: 2.0,
    exhaustReliefDepthMm: 1.5,
  };

  it("hand-worked: deck + gasket + relief − lift at TDC", () => {
    // derived: intake 0.25 + 1.02 + 2.0 − 3.05 = 0.22 mm; exhaust 0.25 + 1.02 + 1.5 − 2.7 = 0.07 mm
    const e = pistonToValveEstimateMm(base);
    expect(e.intakeMm).toBeCloseTo(0.22, 10);
    expect(e.exhaustMm).toBeCloseTo(0.07, 10);
  });

  it("a valve recessed into the chamber adds its recess", () => {
    // derived: 0.5 mm recess adds 0.5 mm to both
    const e = pistonToValveEstimateMm({ ...base, valveRecessMm: 0.5 });
    expect(e.intakeMm).toBeCloseTo(0.72, 10);
    expect(e.exhaustMm).toBeCloseTo(0.57, 10);
  });

  it("says it is an estimate to verify", () => {
    expect(PISTON_TO_VALVE_NOTE).toContain("verify with clay or a checking spring");
  });

  it("refuses a negative lift or relief", () => {
    expect(() => pistonToValveEstimateMm({ ...base, intakeLiftAtTdcMm: -1 })).toThrow(
      /intakeLiftAtTdcMm/,
    );
    expect(() => pistonToValveEstimateMm({ ...base, exhaustReliefDepthMm: -0.1 })).toThrow(
      CalcInputError,
    );
  });
});
