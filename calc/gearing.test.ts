import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  CalcInputError,
  KM_PER_MILE,
  engineRpmAt,
  kmhToMph,
  mphToKmh,
  roadSpeedKmhAt,
  toothRatio,
} from "./index";

// Invented demo drive: 1.45 primary, 0.79 top gear, 66/30 belt, 2040 mm rear tyre.
const drive = {
  tyreCircumferenceMm: 2040,
  primaryRatio: 1.45,
  gearRatio: 0.79,
  finalRatio: toothRatio(66, 30),
};

const num = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

describe("gearing", () => {
  it("a mile is 1.609344 km", () => {
    // published: the 1959 international yard and pound agreement (NBS 1960 notice)
    expect(KM_PER_MILE).toBe(1.609344);
    expect(mphToKmh(70)).toBeCloseTo(112.65408, 10);
  });

  it("hand-worked: 70 mph in top gear is 2319.44 rpm", () => {
    // derived: 112.65408 km/h = 1877.568 m/min; ÷ 2.040 m = 920.37647 wheel rpm;
    // × 1.45 × 0.79 × 2.2 (= 2.52010) = 2319.4407 rpm; tolerance 0.001 rpm
    expect(toothRatio(66, 30)).toBeCloseTo(2.2, 12);
    expect(Math.abs(engineRpmAt({ ...drive, speedKmh: mphToKmh(70) }) - 2319.4407)).toBeLessThan(
      0.001,
    );
  });

  it("hand-worked: 5500 rpm in top gear is 267.13 km/h", () => {
    // derived: 5500 ÷ 2.52010 = 2182.45 wheel rpm × 2.040 m × 60 ÷ 1000 = 267.132 km/h
    const v = roadSpeedKmhAt({ ...drive, rpm: 5500 });
    expect(Math.abs(v - 267.1323)).toBeLessThan(0.001);
    expect(kmhToMph(v)).toBeCloseTo(v / 1.609344, 12);
  });

  it("round-trips: speed → rpm → speed and rpm → speed → rpm", () => {
    let cruise = 0;
    fc.assert(
      fc.property(
        num(1, 300),
        num(1500, 2300),
        num(1.2, 2),
        num(0.6, 3.5),
        num(1.8, 3.5),
        (speedKmh, circ, p, g, f) => {
          const d = { tyreCircumferenceMm: circ, primaryRatio: p, gearRatio: g, finalRatio: f };
          const rpm = engineRpmAt({ ...d, speedKmh });
          const back = roadSpeedKmhAt({ ...d, rpm });
          expect(Math.abs(back - speedKmh) / speedKmh).toBeLessThan(1e-12);
          const again = engineRpmAt({ ...d, speedKmh: back });
          expect(Math.abs(again - rpm) / rpm).toBeLessThan(1e-12);
          if (rpm >= 1000 && rpm <= 7000) cruise++;
        },
      ),
      { numRuns: 500 },
    );
    // the engine speeds a bike is really ridden at are well represented
    expect(cruise).toBeGreaterThan(100);
  });

  it("refuses a zero ratio or a stopped engine", () => {
    expect(() => engineRpmAt({ ...drive, primaryRatio: 0, speedKmh: 100 })).toThrow(CalcInputError);
    expect(() => roadSpeedKmhAt({ ...drive, rpm: 0 })).toThrow(/rpm/);
    expect(() => engineRpmAt({ ...drive, speedKmh: -5 })).toThrow(/speedKmh/);
  });
});
