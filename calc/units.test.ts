import { describe, expect, it } from "vitest";
import {
  CC_PER_CI,
  KPA_PER_INHG,
  KPA_PER_INHG_CONVENTIONAL,
  NM_PER_LBFT,
  N_PER_LBF,
  W_PER_HP,
  ccToCi,
  ciToCc,
  cToF,
  fToC,
  ftMinToMs,
  hpToKw,
  inHgToKPa,
  inToMm,
  kwToHp,
  lbFtToNm,
  mmToIn,
  msToFtMin,
  nmToLbFt,
} from "./index";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("unit definitions", () => {
  it("1 in is 25.4 mm exactly", () => {
    // published: "Refinement of Values for the Yard and the Pound", National Bureau of
    // Standards notice, Federal Register, 1 July 1959 (F.R. Doc. 59-5442; page number not
    // checked): 1 yard = 0.9144 m exactly, so 1 in = 0.9144 m / 36 = 25.4 mm
    expect(inToMm(1)).toBe(25.4);
    expect(mmToIn(25.4)).toBe(1);
    // derived: 12 in = 304.8 mm
    expect(inToMm(12)).toBeCloseTo(304.8, 12);
  });

  it("1 in³ is 16.387064 cm³ exactly", () => {
    // derived: 2.54³ cm³ from 1 in = 2.54 cm (Federal Register notice of 1 July 1959, above)
    expect(CC_PER_CI).toBe(16.387064);
    expect(rel(2.54 ** 3, CC_PER_CI)).toBeLessThan(1e-15);
    expect(ciToCc(1)).toBe(16.387064);
    expect(ccToCi(16.387064)).toBe(1);
  });

  it("1 lbf is 4.4482216152605 N", () => {
    // derived: 0.45359237 kg (1 lb, Federal Register notice of 1 July 1959, F.R. Doc.
    // 59-5442) × 9.80665 m/s² (standard gravity, 3rd CGPM 1901, declaration on the unit of
    // mass and the definition of weight)
    expect(rel(N_PER_LBF, 4.4482216152605)).toBeLessThan(1e-15);
  });

  it("1 lbf·ft is 1.355818 N·m", () => {
    // published: NIST SP 811, Guide for the Use of the International System of Units (SI),
    // 2008 edition, Appendix B.8 (factors in alphabetical order), "foot pound-force
    // (ft · lbf)": 1.355 818 E+00 N·m
    expect(lbFtToNm(1)).toBeCloseTo(1.355818, 6);
    // derived: 4.4482216152605 N × 0.3048 m = 1.3558179483314004 N·m
    expect(rel(NM_PER_LBFT, 1.3558179483314003)).toBeLessThan(1e-15);
    expect(nmToLbFt(1.3558179483314003)).toBeCloseTo(1, 14);
  });

  it("1 mechanical hp is 745.6999 W", () => {
    // published: NIST SP 811, 2008 edition, Appendix B.8, "horsepower (550 ft · lbf/s)":
    // 7.456 999 E+02 W
    expect(W_PER_HP).toBeCloseTo(745.6999, 4);
    // derived: 550 × 1.3558179483314004 = 745.69987158227022 W
    expect(rel(W_PER_HP, 745.6998715822702)).toBeLessThan(1e-15);
    expect(hpToKw(1)).toBeCloseTo(0.7456999, 7);
    expect(kwToHp(0.7456998715822702)).toBeCloseTo(1, 14);
  });

  it("1 conventional inHg is 3.386389 kPa (not the inch of mercury at 32 °F)", () => {
    // published: NIST SP 811, 2008 edition, Appendix B.8, "inch of mercury, conventional
    // (inHg)": 3.386 389 E+03 Pa; the same table lists "inch of mercury (32 °F)" apart,
    // as 3.386 38 E+03 Pa
    expect(KPA_PER_INHG_CONVENTIONAL).toBe(3.386389);
    expect(KPA_PER_INHG).toBe(KPA_PER_INHG_CONVENTIONAL);
    // the two entries differ in the sixth figure; ours is the conventional one
    expect(Math.abs(KPA_PER_INHG_CONVENTIONAL - 3.38638)).toBeGreaterThan(5e-6);
    // derived (from memory: the conventional inch of mercury is defined through a mercury
    // density of 13 595.1 kg/m³ and standard gravity): 13595.1 × 9.80665 × 0.0254 Pa
    expect(13595.1 * 9.80665 * 0.0254).toBeCloseTo(KPA_PER_INHG_CONVENTIONAL * 1000, 3);
    expect(inHgToKPa(29.92)).toBeCloseTo(101.3207, 3); // derived: 29.92 × 3.386389
  });

  it("piston speed in feet per minute", () => {
    // derived: 1 m/s = 60 / 0.3048 ft/min = 196.850393… ft/min
    expect(msToFtMin(1)).toBeCloseTo(196.8503937, 6);
    expect(ftMinToMs(196.8503937007874)).toBeCloseTo(1, 12);
  });

  it("temperature scales", () => {
    // published: NIST SP 811, 2008 edition, Appendix B.8, "degree Fahrenheit (°F)":
    // t/°C = (t/°F − 32)/1.8, so 0 °C = 32 °F and 100 °C = 212 °F
    expect(cToF(0)).toBe(32);
    expect(cToF(100)).toBe(212);
    expect(fToC(77)).toBe(25);
  });
});
