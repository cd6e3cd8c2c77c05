import { describe, expect, it } from "vitest";
import {
  CalcInputError,
  HP_TORQUE_CONSTANT,
  KW_TORQUE_CONSTANT,
  SAE_J1349_REFERENCE,
  SAE_J1349_REVISION,
  dryAirPressureKPa,
  hpToKw,
  lbFtToNm,
  powerHp,
  powerKw,
  sae1349Factor,
  vaporPressureKPa,
} from "./index";

describe("power from torque", () => {
  it("120 lb·ft at 3000 rpm is 68.544 hp", () => {
    // derived: 120 × 3000 / 5252.113 (hp = T·rpm/(33000/2π))
    expect(powerHp(120, 3000)).toBeCloseTo(68.544, 3);
  });

  it("hp and lb·ft cross at 5252 rpm", () => {
    // derived: hp = T·rpm/5252.113 equals T when rpm = 33000/2π
    expect(HP_TORQUE_CONSTANT).toBeCloseTo(5252.113, 3);
    expect(Math.round(HP_TORQUE_CONSTANT)).toBe(5252);
    expect(powerHp(100, HP_TORQUE_CONSTANT)).toBeCloseTo(100, 10);
    expect(powerHp(100, 5000)).toBeLessThan(100);
    expect(powerHp(100, 5500)).toBeGreaterThan(100);
  });

  it("kW = T·2πN/60000", () => {
    // derived: 60000/2π = 9549.297
    expect(KW_TORQUE_CONSTANT).toBeCloseTo(9549.297, 3);
    expect(powerKw(100, 6000)).toBeCloseTo(62.831853, 6);
  });

  it("the two forms agree through the unit definitions", () => {
    // derived: NIST SP 811, 2008 edition, Appendix B.8, "foot pound-force" and "horsepower
    // (550 ft · lbf/s)"
    const hp = powerHp(95, 4800);
    expect(powerKw(lbFtToNm(95), 4800)).toBeCloseTo(hpToKw(hp), 10);
  });
});

describe("SAE J1349 correction (JUN1990 form)", () => {
  it("names its revision", () => {
    expect(SAE_J1349_REVISION).toBe("SAE J1349 JUN1990");
  });

  it("is 1 at the reference conditions, 25 °C and 99 kPa dry air", () => {
    // published: SAE J1349 JUN1990, Engine Power Test Code, reference conditions 25 °C and
    // 99 kPa dry air (section number not checked: from memory)
    expect(sae1349Factor(SAE_J1349_REFERENCE)).toBe(1);
    expect(sae1349Factor({ airTempC: 25, dryAirPressureKPa: 99 })).toBe(1);
  });

  it("a hot, low-pressure day corrects upwards", () => {
    // derived: the SAE J1349 JUN1990 correction CF = 1.18·(99/P_d)·√((T + 273)/298) − 0.18
    // (equation number not checked: from memory): 1.18·(99/95)·√(308/298) − 0.18 = 1.070146
    expect(sae1349Factor({ airTempC: 35, dryAirPressureKPa: 95 })).toBeCloseTo(1.070146, 6);
    expect(sae1349Factor({ airTempC: 10, dryAirPressureKPa: 101 })).toBeLessThan(1);
  });

  it("rejects impossible air", () => {
    expect(() => sae1349Factor({ airTempC: 25, dryAirPressureKPa: 0 })).toThrow(CalcInputError);
    expect(() => sae1349Factor({ airTempC: Number.NaN, dryAirPressureKPa: 99 })).toThrow(
      /airTempC/,
    );
    expect(() => sae1349Factor({ airTempC: -300, dryAirPressureKPa: 99 })).toThrow(/absolute zero/);
  });
});

describe("water vapour and dry air", () => {
  it("saturation pressure at 0 °C is the Magnus constant", () => {
    // published: Alduchov & Eskridge, "Improved Magnus Form Approximation of Saturation Vapor
    // Pressure", Journal of Applied Meteorology 35(4), 1996, eq. 21 (number from memory):
    // e_s = 6.1094·exp(17.625·T/(T + 243.04)) hPa, 6.1094 hPa = 0.61094 kPa at 0 °C
    expect(vaporPressureKPa(0)).toBe(0.61094);
  });

  it("saturation pressure at 20 °C is near the steam-table value", () => {
    // from memory: steam tables give about 2.339 kPa at 20 °C; the Magnus form gives 2.3334.
    // A tolerance of 0.5 % is allowed on purpose: the two are different approximations
    expect(Math.abs(vaporPressureKPa(20) - 2.339) / 2.339).toBeLessThan(0.005);
    // derived: 0.61094·exp(17.625·20/263.04) (the Alduchov & Eskridge form above)
    expect(vaporPressureKPa(20)).toBeCloseTo(2.333441, 6);
  });

  it("dry-air pressure is barometric less the vapour partial pressure", () => {
    // derived: 100 − 0.5 × 2.333441
    expect(dryAirPressureKPa(100, 20, 50)).toBeCloseTo(98.83328, 6);
    expect(dryAirPressureKPa(100, 20, 0)).toBe(100);
  });

  it("rejects humidity outside 0–100 % and impossible pressure", () => {
    expect(() => dryAirPressureKPa(100, 20, 101)).toThrow(/relHumidityPct/);
    expect(() => dryAirPressureKPa(100, 20, -1)).toThrow(/relHumidityPct/);
    expect(() => dryAirPressureKPa(-1, 20, 50)).toThrow(/baroKPa/);
    expect(() => dryAirPressureKPa(1, 40, 100)).toThrow(/vapour pressure/);
  });
});
