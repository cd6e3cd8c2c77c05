import { describe, expect, it } from "vitest";
import {
  solveChamberCcForRatio,
  solveDomeCcForRatio,
  solveGasketThicknessForRatio,
  staticCompressionRatio,
  sweptVolumeCc,
  type StaticInputs,
} from "./index";

// A big twin with a 4.000 in bore and a 4.500 in stroke (demo values).
const s: StaticInputs = {
  boreMm: 101.6,
  strokeMm: 114.3,
  chamberCc: 85,
  gasketBoreMm: 102.1,
  gasketThicknessMm: 1.02,
  deckClearanceMm: 0.25,
  pistonDomeCc: 3,
};

describe("solvers for a target static ratio", () => {
  it("dome: V_dome = V_chamber + V_gasket + V_deck − V_d/(r − 1)", () => {
    const r = solveDomeCcForRatio(10, s);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // derived: V_c = 926.667/9 = 102.963 cc; dome = 85 + 8.351 + 2.027 − 102.963 = −7.585 cc (a dish)
    expect(r.clearanceVolumeCc).toBeCloseTo(sweptVolumeCc(101.6, 114.3) / 9, 10);
    expect(r.value).toBeCloseTo(-7.5852, 3);
    expect(staticCompressionRatio({ ...s, pistonDomeCc: r.value })).toBeCloseTo(10, 10);
  });

  it("gasket thickness", () => {
    const r = solveGasketThicknessForRatio(10.5, s);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.field).toBe("gasketThicknessMm");
    expect(r.unit).toBe("mm");
    expect(staticCompressionRatio({ ...s, gasketThicknessMm: r.value })).toBeCloseTo(10.5, 10);
  });

  it("chamber", () => {
    const r = solveChamberCcForRatio(9.8, s);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(staticCompressionRatio({ ...s, chamberCc: r.value })).toBeCloseTo(9.8, 10);
  });

  it("the solved field may be left out", () => {
    const { pistonDomeCc: _unused, ...rest } = s;
    void _unused;
    const r = solveDomeCcForRatio(10, rest);
    expect(r.ok).toBe(true);
  });

  it("a target of 1:1 or less has no answer", () => {
    for (const t of [1, 0.5, -3, Number.NaN, Number.POSITIVE_INFINITY]) {
      const r = solveDomeCcForRatio(t, s);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.errors[0]?.field).toBe("target");
    }
  });

  it("a gasket of zero or negative thickness is no answer", () => {
    // derived: at 14:1 the clearance volume needed (71.3 cc) is less than the chamber alone
    const r = solveGasketThicknessForRatio(14, s);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]?.field).toBe("gasketThicknessMm");
  });

  it("a gasket that lets the piston reach the head is no answer", () => {
    // derived: crown 1.5 mm above the deck; 10:1 needs t = (102.963 − 110 + 12.161 + 3)/8.187 = 0.99 mm, less than 1.5
    const proud = { ...s, deckClearanceMm: -1.5, chamberCc: 110 };
    const r = solveGasketThicknessForRatio(10, proud);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]?.message).toMatch(/reach the head/);
  });

  it("a chamber of zero or negative volume is no answer", () => {
    // derived: 200:1 needs V_c = 4.66 cc, less than gasket and deck volume less the dome (7.38 cc)
    const r = solveChamberCcForRatio(200, s);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]?.field).toBe("chamberCc");
  });

  it("invalid known inputs are named", () => {
    const r = solveDomeCcForRatio(10, { ...s, gasketBoreMm: 100 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.field)).toContain("gasketBoreMm");
    const m = solveChamberCcForRatio(10, { ...s, boreMm: undefined as unknown as number });
    expect(m.ok).toBe(false);
    if (!m.ok) expect(m.errors).toContainEqual({ field: "boreMm", message: "is required" });
  });
});
