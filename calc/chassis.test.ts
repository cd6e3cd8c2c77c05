import { describe, expect, it } from "vitest";
import {
  CalcInputError,
  caliperBracketOffsetMm,
  checkControlLines,
  controlExtensionMm,
  inToMm,
  pickExtensionMm,
  rotorFit,
} from "./index";

describe("rotor and caliper bracket", () => {
  it("hand-worked: 292 mm to 330 mm needs a 19 mm bracket offset", () => {
    // derived: the caliper sits on the rotor's edge, which moves out by (330 − 292)/2 = 19 mm
    expect(caliperBracketOffsetMm(292, 330)).toBe(19);
    expect(caliperBracketOffsetMm(330, 292)).toBe(-19);
  });

  it("checks the bracket fitted and the wheel", () => {
    expect(
      rotorFit({ stockRotorMm: 292, rotorMm: 330, bracketOffsetMm: 15, wheelMaxRotorMm: 320 }),
    ).toEqual({ offsetNeededMm: 19, offsetErrorMm: -4, fitsWheel: false });
    expect(
      rotorFit({ stockRotorMm: 292, rotorMm: 320, bracketOffsetMm: 14, wheelMaxRotorMm: null }),
    ).toEqual({ offsetNeededMm: 14, offsetErrorMm: 0, fitsWheel: null });
  });

  it("refuses a rotor of no size", () => {
    expect(() => caliperBracketOffsetMm(0, 300)).toThrow(CalcInputError);
  });
});

describe("bars and the controls", () => {
  const stock = { riserMm: inToMm(1), barRiseMm: inToMm(4), pullbackMm: inToMm(10) };

  it("hand-worked: 4 in risers and 12 in bars over 1 in and 4 in stock need 11 in more", () => {
    // derived (common practice sum): (4 − 1) + (12 − 4) + (10 − 10) = 11 in = 279.4 mm
    const need = controlExtensionMm({ ...stock, riserMm: inToMm(4), barRiseMm: inToMm(12) }, stock);
    expect(need).toBeCloseTo(279.4, 10);
    expect(pickExtensionMm(need, [inToMm(6), inToMm(10), inToMm(12), inToMm(14)])).toBeCloseTo(
      inToMm(12),
      10,
    );
    const lines = checkControlLines(need, [
      { name: "clutch cable", extensionMm: inToMm(12) },
      { name: "brake line", extensionMm: inToMm(10) },
      { name: "harness", extensionMm: 0 },
    ]);
    expect(lines.map((l) => [l.name, Math.round(l.shortMm * 10) / 10])).toEqual([
      ["clutch cable", -25.4],
      ["brake line", 25.4],
      ["harness", 279.4],
    ]);
  });

  it("lower or shorter bars need no extension, and none on offer is too short", () => {
    expect(controlExtensionMm({ ...stock, barRiseMm: inToMm(2) }, stock)).toBe(0);
    expect(pickExtensionMm(300, [100, 200])).toBeNull();
  });

  it("refuses a negative height", () => {
    expect(() => controlExtensionMm({ ...stock, riserMm: -1 }, stock)).toThrow(/riserMm/);
  });
});
