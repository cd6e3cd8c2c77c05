import { describe, expect, it } from "vitest";
import {
  CalcInputError,
  DCR_NOTE,
  boreStrokeRatio,
  ccToCi,
  clearanceVolumeCc,
  displacementCc,
  dynamicCompressionRatio,
  inToMm,
  meanPistonSpeedMs,
  msToFtMin,
  peakPistonSpeedCrankDeg,
  peakPistonSpeedMs,
  pistonPositionMm,
  pistonSpeedMs,
  quenchMm,
  rodRatio,
  staticCompressionRatio,
  sweptVolumeCc,
  type StaticInputs,
} from "./index";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

// Heywood, Internal Combustion Engine Fundamentals, McGraw-Hill, 1st edition 1988, §2.2
// "Geometrical properties of reciprocating engines"; equation numbers below are from memory.
describe("displacement (Heywood 1988, §2.2, eq. 2.3 from memory: V_d = (π/4)·B²·L)", () => {
  it("3.5 in × 3.0 in × 6 cylinders is 173.18 in³", () => {
    // derived from the formula (inputs and the name "173 cubic inch" are common practice)
    const ci = ccToCi(displacementCc(inToMm(3.5), inToMm(3.0), 6));
    expect(ci).toBeCloseTo(173.18, 2);
    expect(Math.round(ci)).toBe(173);
  });

  it("81.0 × 62.6 mm, 2 cylinders is 645 cc", () => {
    // published inputs and figure: motorcycle.com, the specification of a 645 cc V-twin road
    // bike (page title and date not recorded: from memory)
    expect(Math.round(displacementCc(81.0, 62.6, 2))).toBe(645);
  });

  it("100 × 83 mm, 1 cylinder is 651 cc", () => {
    // published: howmotorcycleswork.com gives 651 cc (page title and date not recorded: from
    // memory); the formula gives 651.9. The figure is truncated, not rounded, so the check
    // is widened on purpose from "rounds to 651" to "651 ≤ cc < 652"
    const cc = displacementCc(100, 83, 1);
    expect(cc).toBeGreaterThanOrEqual(651);
    expect(cc).toBeLessThan(652);
  });

  it("65.5 × 44.5 mm, 4 cylinders is 600 cc", () => {
    // published: howmotorcycleswork.com (page title and date not recorded: from memory)
    expect(Math.round(displacementCc(65.5, 44.5, 4))).toBe(600);
  });

  it("101 × 113 mm, 2 cylinders is 1811 cc (111 ci)", () => {
    // published: Cycle World, 2013, road test of a 111 ci V-twin (issue and page not recorded:
    // from memory)
    const cc = displacementCc(101, 113, 2);
    expect(Math.round(cc)).toBe(1811);
    expect(Math.round(ccToCi(cc))).toBe(110); // derived: 1810.7 cc is 110.5 ci, sold as "111"
  });

  it("a misprinted 101 × 103 mm computes to 1650 cc, not 1811", () => {
    // derived: the same engine with the stroke misprinted
    const cc = displacementCc(101, 103, 2);
    expect(Math.round(cc)).toBe(1650);
    expect(Math.abs(cc - 1811)).toBeGreaterThan(100);
  });

  it("a 4.5 in stroke with a bore near 4.31 in makes a V-twin of about 131 ci", () => {
    // derived: 2 × (π/4) × 4.31² × 4.5 in³ = 131.3 in³ (the pairing is common practice)
    expect(Math.round(ccToCi(displacementCc(inToMm(4.31), inToMm(4.5), 2)))).toBe(131);
  });

  it("one cylinder is the swept volume", () => {
    // derived: (π/4)·100²·100 mm³ = 785.398 cc
    expect(sweptVolumeCc(100, 100)).toBeCloseTo(785.398163, 5);
    expect(displacementCc(100, 100, 2)).toBeCloseTo(2 * 785.398163, 5);
  });
});

const base: StaticInputs = {
  boreMm: 100,
  strokeMm: 100,
  chamberCc: 70,
  gasketBoreMm: 100,
  gasketThicknessMm: 1,
  deckClearanceMm: 0,
  pistonDomeCc: 0,
};

describe("compression ratio (Heywood 1988, §2.2, eq. 2.4 from memory: r_c = (V_d + V_c)/V_c)", () => {
  it("a worked example", () => {
    // derived: V_d = 785.398 cc; V_c = 70 + (π/4)·100²·1/1000 = 77.854 cc; r_c = 863.252/77.854 = 11.0881
    expect(clearanceVolumeCc(base)).toBeCloseTo(77.853982, 5);
    expect(staticCompressionRatio(base)).toBeCloseTo(11.088092, 5);
  });

  it("a clearance volume of V_d/9 gives 10:1", () => {
    // derived from the definition
    const vd = sweptVolumeCc(100, 100);
    const s = { ...base, chamberCc: vd / 9 - (Math.PI / 4) * 100 * 100 * 1e-3 };
    expect(staticCompressionRatio(s)).toBeCloseTo(10, 12);
  });

  it("sign conventions: deck below the deck adds volume, a dome takes it away, a dish adds it", () => {
    // derived: each term of the clearance-volume sum
    const r0 = staticCompressionRatio(base);
    const deckCc = (Math.PI / 4) * 100 * 100 * 0.5e-3;
    expect(clearanceVolumeCc({ ...base, deckClearanceMm: 0.5 })).toBeCloseTo(77.853982 + deckCc, 6);
    expect(staticCompressionRatio({ ...base, deckClearanceMm: 0.5 })).toBeLessThan(r0);
    expect(staticCompressionRatio({ ...base, deckClearanceMm: -0.5 })).toBeGreaterThan(r0);
    expect(clearanceVolumeCc({ ...base, pistonDomeCc: 5 })).toBeCloseTo(72.853982, 5);
    expect(staticCompressionRatio({ ...base, pistonDomeCc: 5 })).toBeGreaterThan(r0);
    expect(staticCompressionRatio({ ...base, pistonDomeCc: -5 })).toBeLessThan(r0);
  });

  it("a wider gasket bore adds volume", () => {
    // derived: gasket cylinder (π/4)·B_g²·t
    const wide = clearanceVolumeCc({ ...base, gasketBoreMm: 102 });
    expect(wide - clearanceVolumeCc(base)).toBeCloseTo(
      (Math.PI / 4) * (102 * 102 - 100 * 100) * 1e-3,
      9,
    );
  });

  it("rejects impossible inputs", () => {
    expect(() => clearanceVolumeCc({ ...base, gasketBoreMm: 99 })).toThrow(CalcInputError);
    expect(() => clearanceVolumeCc({ ...base, pistonDomeCc: 200 })).toThrow(/clearance volume/);
    expect(() => staticCompressionRatio({ ...base, boreMm: Number.NaN })).toThrow(CalcInputError);
    expect(() => sweptVolumeCc(0, 100)).toThrow(/boreMm/);
    expect(() => sweptVolumeCc(100, -1)).toThrow(/strokeMm/);
    expect(() => displacementCc(100, 100, 1.5)).toThrow(/cylinders/);
    expect(() => displacementCc(100, 100, 0)).toThrow(/cylinders/);
  });
});

describe("slider-crank piston motion (Heywood 1988, §2.2, eqs. 2.5–2.6 from memory)", () => {
  const L = 100;
  const l = 150;
  const a = L / 2;

  it("is at TDC at 0° and at BDC (one stroke down) at 180°", () => {
    // derived: y = l + a − (a cos θ + √(l² − a² sin² θ))
    expect(pistonPositionMm(L, l, 0)).toBe(0);
    expect(pistonPositionMm(L, l, 180)).toBeCloseTo(L, 12);
    expect(pistonPositionMm(L, l, 360)).toBeCloseTo(0, 12);
  });

  it("is past half stroke at 90° by the rod's angularity", () => {
    // derived: y(90°) = l + a − √(l² − a²) = 58.5786 mm for a = 50, l = 150
    expect(pistonPositionMm(L, l, 90)).toBeCloseTo(58.578644, 5);
    expect(pistonPositionMm(L, l, 90)).toBeGreaterThan(L / 2);
  });

  it("moves at a·ω exactly at 90°", () => {
    // derived from Heywood 1988, §2.2, eq. 2.10 (number from memory): at θ = 90° the bracket
    // is 1, so S_p = (π/2)·S̄_p = (π/2)·2LN = a·ω
    const rpm = 6000;
    const omega = (rpm * 2 * Math.PI) / 60;
    expect(rel(pistonSpeedMs(L, l, rpm, 90), (a * omega) / 1000)).toBeLessThan(1e-14);
  });

  it("speed matches Heywood's ratio S_p/S̄_p = (π/2)·sin θ·[1 + cos θ/√(R² − sin² θ)]", () => {
    // published: Heywood 1988, §2.2, eq. 2.10 (number from memory), with R = l/a
    const R = l / a;
    const rpm = 4000;
    for (const deg of [10, 30, 60, 75, 120, 150]) {
      const t = (deg * Math.PI) / 180;
      const ratio =
        (Math.PI / 2) * Math.sin(t) * (1 + Math.cos(t) / Math.sqrt(R * R - Math.sin(t) ** 2));
      expect(rel(pistonSpeedMs(L, l, rpm, deg), ratio * meanPistonSpeedMs(L, rpm))).toBeLessThan(
        1e-12,
      );
    }
  });

  it("speed is the numeric derivative of position", () => {
    // derived: central difference of y(θ) over h = 1e-4°
    const rpm = 5000;
    const omega = (rpm * 2 * Math.PI) / 60;
    const h = 1e-4;
    for (const deg of [5, 33, 64, 90, 111, 170, 250, 300]) {
      const dy =
        (pistonPositionMm(L, l, deg + h) - pistonPositionMm(L, l, deg - h)) /
        ((2 * h * Math.PI) / 180);
      const numeric = (dy * omega) / 1000;
      expect(Math.abs(pistonSpeedMs(L, l, rpm, deg) - numeric)).toBeLessThan(1e-6);
    }
  });

  it("mean piston speed 2·L·N: 90 mm at 3000 rpm is 9 m/s", () => {
    // published: Heywood 1988, §2.2, eq. 2.9 (number from memory): S̄_p = 2LN; the same worked
    // example (90 mm, 3000 rpm, 9 m/s) is in Wikipedia, "Mean piston speed" (revision date
    // not recorded)
    expect(meanPistonSpeedMs(90, 3000)).toBeCloseTo(9, 12);
  });

  it("a 4.5 in stroke at 6000 rpm is 4500 ft/min", () => {
    // derived: 2 × 4.5 in × 6000 /min ÷ 12 in/ft = 4500 ft/min
    expect(msToFtMin(meanPistonSpeedMs(inToMm(4.5), 6000))).toBeCloseTo(4500, 9);
  });
});

describe("peak piston speed (exact slider-crank)", () => {
  function goldenMax(L: number, l: number): { deg: number; v: number } {
    let lo = 0;
    let hi = 90;
    const g = (d: number) => pistonSpeedMs(L, l, 1000, d);
    for (let i = 0; i < 200; i++) {
      const m1 = lo + (hi - lo) * 0.3819660112501051;
      const m2 = hi - (hi - lo) * 0.3819660112501051;
      if (g(m1) < g(m2)) lo = m1;
      else hi = m2;
    }
    return { deg: (lo + hi) / 2, v: g((lo + hi) / 2) };
  }

  it("agrees with a golden-section search and with zero acceleration", () => {
    // derived: peak of dy/dθ where d²y/dθ² = 0
    for (const [L, l] of [
      [100, 150],
      [114.3, 190.5],
      [62.6, 110],
      [100, 50.5],
      [100, 1e4],
    ] as const) {
      const deg = peakPistonSpeedCrankDeg(L, l);
      const peak = peakPistonSpeedMs(L, l, 1000);
      const g = goldenMax(L, l);
      expect(rel(peak, g.v)).toBeLessThan(1e-12);
      expect(Math.abs(deg - g.deg)).toBeLessThan(1e-4);
      expect(rel(peak, pistonSpeedMs(L, l, 1000, deg))).toBeLessThan(1e-15);
      // acceleration by central difference of the speed
      const h = 1e-3;
      const acc =
        (pistonSpeedMs(L, l, 1000, deg + h) - pistonSpeedMs(L, l, 1000, deg - h)) / (2 * h);
      const scale = peak / 90;
      expect(Math.abs(acc) / scale).toBeLessThan(1e-6);
    }
  });

  it("comes before 90° and is above a·ω", () => {
    // derived: the rod's angularity makes the piston fastest before 90° for any finite rod
    const deg = peakPistonSpeedCrankDeg(114.3, 190.5);
    expect(deg).toBeGreaterThan(70);
    expect(deg).toBeLessThan(80);
    expect(peakPistonSpeedMs(114.3, 190.5, 5800)).toBeGreaterThan(
      pistonSpeedMs(114.3, 190.5, 5800, 90),
    );
  });

  it("tends to 90° and π/2 × the mean speed for a very long rod", () => {
    // derived: with l → ∞ the motion is simple harmonic, peak a·ω = (π/2)·S̄_p at 90°
    expect(peakPistonSpeedCrankDeg(100, 1e7)).toBeCloseTo(90, 3);
    expect(peakPistonSpeedMs(100, 1e7, 6000) / meanPistonSpeedMs(100, 6000)).toBeCloseTo(
      Math.PI / 2,
      6,
    );
  });

  it("rejects a rod not longer than half the stroke", () => {
    expect(() => peakPistonSpeedMs(100, 50, 6000)).toThrow(/rodLengthMm/);
    expect(() => peakPistonSpeedCrankDeg(100, 49)).toThrow(/half the stroke/);
    expect(() => pistonPositionMm(100, 40, 90)).toThrow(CalcInputError);
  });
});

describe("dynamic compression (derived: V(180° + IVC)/V_c)", () => {
  const dyn = { ...base, rodLengthMm: 150, intakeClosesAbdcDeg: 0 };

  it("equals the static ratio when the intake closes at BDC", () => {
    // derived: y(180°) = L
    expect(dynamicCompressionRatio(dyn)).toBeCloseTo(staticCompressionRatio(base), 12);
  });

  it("a worked example at 90° after BDC", () => {
    // derived: θ = 270°, y = l + a − √(l² − a²) = 58.5786 mm; V = 77.854 + (π/4)·100²·58.5786/1000 = 537.93 cc
    const v = 77.853982 + (Math.PI / 4) * 100 * 100 * 58.578644e-3;
    expect(dynamicCompressionRatio({ ...dyn, intakeClosesAbdcDeg: 90 })).toBeCloseTo(
      v / 77.853982,
      5,
    );
  });

  it("agrees with V_c + (π/4)·B²·y(180° + IVC) from the piston position", () => {
    // derived: the definition, evaluated through pistonPositionMm
    const vc = clearanceVolumeCc(base);
    for (const ivc of [0.5, 20, 45, 63, 100, 150]) {
      const y = pistonPositionMm(100, 150, 180 + ivc);
      const expected = (vc + (Math.PI / 4) * 100 * 100 * y * 1e-3) / vc;
      expect(
        rel(dynamicCompressionRatio({ ...dyn, intakeClosesAbdcDeg: ivc }), expected),
      ).toBeLessThan(1e-12);
    }
  });

  it("falls as the intake closes later", () => {
    // derived: the piston rises from BDC to TDC
    let prev = dynamicCompressionRatio(dyn);
    for (const ivc of [10, 30, 50, 70, 90, 120, 179]) {
      const r = dynamicCompressionRatio({ ...dyn, intakeClosesAbdcDeg: ivc });
      expect(r).toBeLessThan(prev);
      prev = r;
    }
  });

  it("rejects closing angles outside 0–180° after BDC", () => {
    expect(() => dynamicCompressionRatio({ ...dyn, intakeClosesAbdcDeg: -5 })).toThrow(
      /intakeClosesAbdcDeg/,
    );
    expect(() => dynamicCompressionRatio({ ...dyn, intakeClosesAbdcDeg: 180 })).toThrow(
      /intakeClosesAbdcDeg/,
    );
  });

  it("the note for screens says the cam card's lift decides", () => {
    expect(DCR_NOTE).toMatch(/cam card/);
    expect(DCR_NOTE).toMatch(/0\.050 in/);
    expect(DCR_NOTE).toMatch(/lift/);
  });
});

describe("ratios and quench", () => {
  it("quench is deck clearance plus gasket thickness", () => {
    // derived: distance from piston crown to head face at TDC
    expect(quenchMm(0.25, 1.02)).toBeCloseTo(1.27, 12);
    expect(quenchMm(-0.2, 1.0)).toBeCloseTo(0.8, 12);
  });

  it("rod ratio is the trade's l/L, half of Heywood's R = l/a", () => {
    // derived: R = l/a = 2·l/L
    expect(rodRatio(190.5, 114.3)).toBeCloseTo(1.6667, 4);
    expect(rodRatio(150, 100)).toBe(1.5);
  });

  it("bore/stroke ratio", () => {
    // derived: B/L
    expect(boreStrokeRatio(101.6, 114.3)).toBeCloseTo(0.8889, 4);
    expect(() => boreStrokeRatio(Number.POSITIVE_INFINITY, 1)).toThrow(CalcInputError);
  });
});
