import { describe, expect, it } from "vitest";
import {
  CalcInputError,
  STANDARD_ATMOSPHERE,
  STD_EARTH_RADIUS_M,
  geopotentialHeightM,
  standardPressureKPa,
} from "./index";

describe("standard pressure at altitude (U.S. Standard Atmosphere 1976)", () => {
  it("is 101.325 kPa at sea level", () => {
    // published: U.S. Standard Atmosphere 1976, Table 2 (sea-level values)
    expect(standardPressureKPa(0)).toBe(101.325);
  });

  it("is 22.632 kPa at the tropopause, 11 km geopotential", () => {
    // published: U.S. Standard Atmosphere 1976, Table 4, P_b = 22 632.06 Pa at H_b = 11 km
    const z = (STD_EARTH_RADIUS_M * 11000) / (STD_EARTH_RADIUS_M - 11000); // geometric, eq. 18 inverted
    expect(geopotentialHeightM(z)).toBeCloseTo(11000, 6);
    expect(Math.abs(standardPressureKPa(z) - 22.63206)).toBeLessThan(0.0001);
  });

  it("is about 89.876 kPa at 1000 m", () => {
    // from memory: the 1976 table lists 8.9876E+04 Pa at 1 km; tolerance 0.005 kPa
    expect(Math.abs(standardPressureKPa(1000) - 89.876)).toBeLessThan(0.005);
  });

  it("falls with altitude", () => {
    let last = standardPressureKPa(-500);
    for (let z = -400; z <= 11000; z += 100) {
      const p = standardPressureKPa(z);
      expect(p).toBeLessThan(last);
      last = p;
    }
  });

  it("refuses altitudes outside the troposphere", () => {
    expect(() => standardPressureKPa(12000)).toThrow(CalcInputError);
    expect(() => standardPressureKPa(-600)).toThrow(/altitudeM/);
    expect(() => standardPressureKPa(Number.NaN)).toThrow(/altitudeM/);
    expect(STANDARD_ATMOSPHERE).toBe("U.S. Standard Atmosphere 1976, troposphere");
  });
});
