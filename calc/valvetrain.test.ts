import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  CalcInputError,
  DEFAULT_THRESHOLD_VALUES,
  clearanceCautions,
  coilBindMarginMm,
  inToMm,
  retainerToSealMm,
  springLoadN,
  valveLiftMm,
} from "./index";

const num = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

describe("valve lift", () => {
  it("hand-worked: a 0.390 in lobe on 1.625 rockers lifts the valve 0.63375 in", () => {
    // derived (lever): 0.390 × 1.625 = 0.63375 in = 16.09725 mm (1 in = 25.4 mm exactly)
    expect(valveLiftMm(inToMm(0.39), 1.625)).toBeCloseTo(16.09725, 10);
  });

  it("is monotonic in the rocker ratio", () => {
    // lobes of 0.01–15 mm, and now and then no lobe at all (lift stays 0 whatever the ratio)
    const lobeArb = fc.oneof(
      { arbitrary: num(0.01, 15), weight: 9 },
      { arbitrary: fc.constant(0), weight: 1 },
    );
    let rising = 0;
    let flat = 0;
    fc.assert(
      fc.property(lobeArb, num(1, 2), num(1, 2), (lobe, r1, r2) => {
        const [lo, hi] = r1 <= r2 ? [r1, r2] : [r2, r1];
        const a = valveLiftMm(lobe, lo);
        const b = valveLiftMm(lobe, hi);
        expect(b).toBeGreaterThanOrEqual(a);
        if (lobe > 0 && hi > lo) {
          rising++;
          expect(b).toBeGreaterThan(a);
        } else flat++;
      }),
      {
        numRuns: 300,
        examples: [
          [0, 1.5, 1.7],
          [5, 1.6, 1.6],
        ],
      },
    );
    // the strict branch is the one the property is about; the two examples reach the other
    expect(rising).toBeGreaterThan(250);
    expect(flat).toBeGreaterThanOrEqual(2);
  });

  it("refuses a zero ratio or a negative lobe", () => {
    expect(() => valveLiftMm(10, 0)).toThrow(CalcInputError);
    expect(() => valveLiftMm(-1, 1.6)).toThrow(/lobeLiftMm/);
  });
});

describe("springs", () => {
  it("hand-worked: 800 N seat + 60 N/mm × 16 mm = 1760 N open", () => {
    // derived (Hooke's law, linear rate)
    expect(springLoadN({ seatLoadN: 800, rateNPerMm: 60, compressionMm: 16 })).toBe(1760);
  });

  it("hand-worked coil-bind margin: 46.0 − 16.1 − 27.5 = 2.4 mm", () => {
    // derived
    expect(
      coilBindMarginMm({ installedHeightMm: 46, coilBindHeightMm: 27.5, valveLiftMm: 16.1 }),
    ).toBeCloseTo(2.4, 10);
  });

  it("hand-worked retainer-to-seal: 46.0 − 26.5 − 16.1 = 3.4 mm", () => {
    // derived
    expect(
      retainerToSealMm({ installedHeightMm: 46, sealTopHeightMm: 26.5, valveLiftMm: 16.1 }),
    ).toBeCloseTo(3.4, 10);
  });

  it("refuses a spring that is solid before it is fitted", () => {
    expect(() =>
      coilBindMarginMm({ installedHeightMm: 30, coilBindHeightMm: 30, valveLiftMm: 1 }),
    ).toThrow(/installed height/);
    expect(() =>
      retainerToSealMm({ installedHeightMm: 30, sealTopHeightMm: 31, valveLiftMm: 1 }),
    ).toThrow(/installed height/);
  });
});

describe("clearance cautions", () => {
  it("names the limit it crossed and by how much", () => {
    // common practice defaults: 0.060 in (1.524 mm) coil-bind margin
    const c = clearanceCautions({ coilBindMarginMm: 1.0, retainerToSealMm: 3.4 });
    expect(c).toHaveLength(1);
    expect(c[0]?.code).toBe("COIL_BIND_MARGIN_LOW");
    expect(c[0]?.limitKey).toBe("coilBindMarginMinMm");
    expect(c[0]?.limit).toBe(DEFAULT_THRESHOLD_VALUES.coilBindMarginMinMm);
    expect(c[0]?.by).toBeCloseTo(0.524, 10);
    expect(c[0]?.message).toBe(
      "Spring coil-bind margin at full lift is 1 mm (0.0394 in), below the minimum of 1.52 mm by 0.524 mm. " +
        "Check the installed height and the spring maker's solid height.",
    );
  });

  it("takes the shop's minimums", () => {
    const c = clearanceCautions(
      { pistonToValveIntakeMm: 2.2, pistonToValveExhaustMm: 2.2 },
      { pistonToValveIntakeMinMm: 2.5, pistonToValveExhaustMinMm: 2.0 },
    );
    expect(c.map((x) => x.code)).toEqual(["PISTON_TO_VALVE_INTAKE_LOW"]);
    expect(c[0]?.message).toContain("verify with clay or a checking spring");
  });
});
