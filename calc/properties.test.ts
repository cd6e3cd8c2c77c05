import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  ccToCi,
  clearanceVolumeCc,
  ciToCc,
  computeSpec,
  displacementCc,
  dynamicCompressionRatio,
  hpToKw,
  inToMm,
  kwToHp,
  lbFtToNm,
  mmToIn,
  msToFtMin,
  ftMinToMs,
  nmToLbFt,
  peakPistonSpeedMs,
  pistonSpeedMs,
  solveChamberCcForRatio,
  solveDomeCcForRatio,
  solveGasketThicknessForRatio,
  staticCompressionRatio,
  type StaticInputs,
} from "./index";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const num = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

/** Plausible engine geometry, every combination physical. */
const staticSpec: fc.Arbitrary<StaticInputs> = fc
  .record({
    boreMm: num(40, 130),
    strokeMm: num(30, 130),
    gasketOverMm: num(0, 3),
    chamberCc: num(20, 150),
    gasketThicknessMm: num(0.3, 3),
    deckClearanceMm: num(-0.2, 1.0),
    pistonDomeCc: num(-15, 15),
  })
  .map(({ gasketOverMm, ...s }) => ({ ...s, gasketBoreMm: s.boreMm + gasketOverMm }));

// intake closing: spread evenly over 0–179.9° (fc.double leans to the ends of its range),
// plus closings within a thousandth of a degree of BDC and BDC itself
const dynamicSpec = fc
  .tuple(
    staticSpec,
    num(1.0001, 6),
    fc.oneof(
      { arbitrary: fc.integer({ min: 0, max: 17990 }).map((i) => i / 100), weight: 3 },
      num(0, 179.9),
      num(0, 1e-3),
      fc.constant(0),
    ),
  )
  .map(([s, k, ivc]) => ({ ...s, rodLengthMm: (s.strokeMm / 2) * k, intakeClosesAbdcDeg: ivc }));

describe("properties", () => {
  it("displacement scales with bore² and with stroke", () => {
    fc.assert(
      fc.property(
        num(1, 200),
        num(1, 200),
        num(0.05, 20),
        fc.integer({ min: 1, max: 16 }),
        (B, L, k, n) => {
          const d = displacementCc(B, L, n);
          expect(rel(displacementCc(k * B, L, n), k * k * d)).toBeLessThan(1e-12);
          expect(rel(displacementCc(B, k * L, n), k * d)).toBeLessThan(1e-12);
          expect(rel(displacementCc(B, L, 2 * n), 2 * d)).toBeLessThan(1e-15);
        },
      ),
    );
  });

  it("the static ratio rises as the chamber shrinks, the dome grows or the gasket thins", () => {
    let thinnerChecked = 0;
    fc.assert(
      fc.property(staticSpec, num(0.01, 0.99), (s, f) => {
        const r = staticCompressionRatio(s);
        const vc = clearanceVolumeCc(s);
        // each change takes away less than the whole clearance volume, so the package stays physical
        const less = f * Math.min(s.chamberCc, vc);
        expect(staticCompressionRatio({ ...s, chamberCc: s.chamberCc - less })).toBeGreaterThan(r);
        expect(
          staticCompressionRatio({ ...s, pistonDomeCc: s.pistonDomeCc + f * vc }),
        ).toBeGreaterThan(r);
        const thinner = s.gasketThicknessMm * (1 - f);
        fc.pre(s.deckClearanceMm + thinner > 0);
        thinnerChecked += 1;
        expect(staticCompressionRatio({ ...s, gasketThicknessMm: thinner })).toBeGreaterThan(r);
      }),
      { numRuns: 500 },
    );
    // the thinner-gasket check runs for most cases, not only a few past the precondition
    expect(thinnerChecked).toBeGreaterThan(400);
  });

  it("each solver inverts the static ratio", () => {
    let solvedGasket = 0;
    let solvedChamber = 0;
    let unsolvedGasket = 0;
    let unsolvedChamber = 0;
    fc.assert(
      // usual targets, and high ones that a chamber cannot reach, so both answers are tried
      fc.property(staticSpec, fc.oneof(num(6, 16), num(16, 60)), (s, target) => {
        const dome = solveDomeCcForRatio(target, s);
        if (target <= 16) expect(dome.ok).toBe(true);
        if (dome.ok) {
          expect(
            rel(staticCompressionRatio({ ...s, pistonDomeCc: dome.value }), target),
          ).toBeLessThan(1e-9);
        }
        const gasket = solveGasketThicknessForRatio(target, s);
        if (gasket.ok) {
          solvedGasket++;
          expect(gasket.value).toBeGreaterThan(0);
          const r = staticCompressionRatio({ ...s, gasketThicknessMm: gasket.value });
          expect(rel(r, target)).toBeLessThan(1e-9);
        } else {
          // no answer only when the thickness needed is not positive or too thin for the deck
          const vc =
            s.chamberCc + (Math.PI / 4) * s.boreMm ** 2 * s.deckClearanceMm * 1e-3 - s.pistonDomeCc;
          const need = ((Math.PI / 4) * s.boreMm ** 2 * s.strokeMm * 1e-3) / (target - 1);
          unsolvedGasket++;
          const t = (need - vc) / ((Math.PI / 4) * s.gasketBoreMm ** 2 * 1e-3);
          expect(t <= 0 || s.deckClearanceMm + t <= 0).toBe(true);
        }
        const chamber = solveChamberCcForRatio(target, s);
        if (chamber.ok) {
          solvedChamber++;
          expect(chamber.value).toBeGreaterThan(0);
          expect(
            rel(staticCompressionRatio({ ...s, chamberCc: chamber.value }), target),
          ).toBeLessThan(1e-9);
        } else {
          unsolvedChamber++;
          expect(chamber.errors[0]?.field).toBe("chamberCc");
        }
      }),
      { numRuns: 300 },
    );
    // both the answer and the refusal of each solver are reached
    expect({ solvedGasket, unsolvedGasket, solvedChamber, unsolvedChamber }).toEqual({
      solvedGasket: expect.toSatisfy((n: number) => n >= 30),
      unsolvedGasket: expect.toSatisfy((n: number) => n >= 30),
      solvedChamber: expect.toSatisfy((n: number) => n >= 30),
      unsolvedChamber: expect.toSatisfy((n: number) => n >= 30),
    });
  });

  it("the dynamic ratio is below the static for any closing after BDC, equal at BDC", () => {
    let strict = 0;
    fc.assert(
      fc.property(dynamicSpec, (s) => {
        const scr = staticCompressionRatio(s);
        expect(rel(dynamicCompressionRatio({ ...s, intakeClosesAbdcDeg: 0 }), scr)).toBeLessThan(
          1e-12,
        );
        const dcr = dynamicCompressionRatio(s);
        expect(dcr).toBeLessThanOrEqual(scr);
        expect(dcr).toBeGreaterThanOrEqual(1);
        // strictly below once the closing is late enough for the difference to show in double precision
        if (s.intakeClosesAbdcDeg >= 0.1) {
          strict += 1;
          expect(dcr).toBeLessThan(scr);
        }
      }),
      { numRuns: 300 },
    );
    expect(strict).toBeGreaterThan(60);
  });

  it("peak piston speed is the largest speed over the stroke", () => {
    fc.assert(
      fc.property(num(30, 130), num(1.0001, 6), num(500, 12000), (L, k, rpm) => {
        const l = (L / 2) * k;
        const peak = peakPistonSpeedMs(L, l, rpm);
        for (let deg = 0; deg <= 180; deg += 0.5) {
          expect(pistonSpeedMs(L, l, rpm, deg)).toBeLessThanOrEqual(peak * (1 + 1e-12));
        }
      }),
      { numRuns: 50 },
    );
  });

  it("unit conversions round-trip", () => {
    fc.assert(
      fc.property(num(-1e12, 1e12), (x) => {
        const close = (y: number) =>
          expect(Math.abs(y - x)).toBeLessThanOrEqual(Math.abs(x) * 1e-15 + 1e-300);
        close(mmToIn(inToMm(x)));
        close(ccToCi(ciToCc(x)));
        close(nmToLbFt(lbFtToNm(x)));
        close(kwToHp(hpToKw(x)));
        close(ftMinToMs(msToFtMin(x)));
      }),
    );
  });

  const anyNumber = fc.oneof(
    fc.double(),
    num(-5, 200),
    fc.constantFrom(
      Number.NaN,
      Number.POSITIVE_INFINITY,
      Number.NEGATIVE_INFINITY,
      0,
      -0,
      1e308,
      5e-324,
    ),
  );
  const maybe = <T>(a: fc.Arbitrary<T>) => fc.option(a, { nil: undefined, freq: 4 });

  // a physical package with some of its numbers left out: computeSpec answers with figures
  const physicalWithGaps = fc
    .tuple(dynamicSpec, num(1000, 10000), fc.array(fc.boolean(), { minLength: 12, maxLength: 12 }))
    .map(([s, rpm, drop]) => {
      const full: Record<string, number> = { ...s, revLimitRpm: rpm, cylinders: 2 };
      const keys = Object.keys(full);
      return Object.fromEntries(
        keys.filter((_, i) => !drop[i % drop.length] || i < 2).map((k) => [k, full[k]!]),
      );
    });

  it("computeSpec never throws and never returns NaN", () => {
    const seen = { ok: 0, errors: 0 };
    fc.assert(
      fc.property(
        fc.oneof(
          physicalWithGaps,
          fc.record({
            boreMm: maybe(anyNumber),
            strokeMm: maybe(anyNumber),
            cylinders: maybe(fc.oneof(fc.integer({ min: -3, max: 12 }), fc.double())),
            chamberCc: maybe(anyNumber),
            gasketBoreMm: maybe(anyNumber),
            gasketThicknessMm: maybe(anyNumber),
            deckClearanceMm: maybe(anyNumber),
            pistonDomeCc: maybe(anyNumber),
            rodLengthMm: maybe(anyNumber),
            intakeClosesAbdcDeg: maybe(anyNumber),
            revLimitRpm: maybe(fc.oneof(fc.double(), num(100, 20000))),
            thresholds: maybe(
              fc.record({ staticCrMax: maybe(anyNumber), quenchMinMm: maybe(anyNumber) }),
            ),
          }),
        ),
        (spec) => {
          let r: ReturnType<typeof computeSpec> | undefined;
          expect(() => {
            r = computeSpec(spec);
          }).not.toThrow();
          if (r === undefined) return;
          seen[r.ok ? "ok" : "errors"] += 1;
          if (r.ok) {
            for (const v of Object.values(r.results)) {
              if (v !== null) expect(Number.isFinite(v)).toBe(true);
            }
            for (const s of r.steps) {
              if (s.result !== null) expect(Number.isFinite(s.result)).toBe(true);
              expect(s.substituted).not.toMatch(/NaN|Infinity/);
            }
            for (const c of r.cautions) {
              expect(c.message).not.toMatch(/NaN|undefined/);
              expect(Number.isFinite(c.value)).toBe(true);
              expect(Number.isFinite(c.limit)).toBe(true);
            }
          } else {
            expect(r.errors.length).toBeGreaterThan(0);
            for (const e of r.errors) {
              expect(typeof e.field).toBe("string");
              expect(e.message.length).toBeGreaterThan(0);
            }
          }
        },
      ),
      { numRuns: 2000 },
    );
    // both the figures and the named errors are checked often
    expect(seen.ok).toBeGreaterThan(500);
    expect(seen.errors).toBeGreaterThan(500);
  });

  it("computeSpec gives finite figures or named errors for complete packages of any magnitude", () => {
    const pos = fc.double({ min: Number.MIN_VALUE, max: Number.MAX_VALUE, noNaN: true });
    const magnitude = { ok: 0, errors: 0 };
    fc.assert(
      fc.property(
        fc.record({
          boreMm: pos,
          strokeMm: pos,
          chamberCc: pos,
          gasketBoreMm: pos,
          gasketThicknessMm: pos,
          deckClearanceMm: fc.double({ noNaN: true, noDefaultInfinity: true }),
          pistonDomeCc: fc.double({ noNaN: true, noDefaultInfinity: true }),
          rodLengthMm: pos,
          intakeClosesAbdcDeg: num(0, 179.999),
          revLimitRpm: pos,
        }),
        (spec) => {
          const r = computeSpec(spec);
          magnitude[r.ok ? "ok" : "errors"] += 1;
          if (r.ok) {
            for (const v of Object.values(r.results))
              expect(v === null || Number.isFinite(v)).toBe(true);
          } else {
            expect(r.errors.every((e) => e.field.length > 0 && e.message.length > 0)).toBe(true);
          }
        },
      ),
      { numRuns: 2000 },
    );
    expect(magnitude).toEqual({ ok: expect.any(Number), errors: expect.any(Number) });
    expect(magnitude.ok).toBeGreaterThan(0);
    expect(magnitude.errors).toBeGreaterThan(0);
  });

  it("computeSpec succeeds on every physical package", () => {
    fc.assert(
      fc.property(dynamicSpec, num(1000, 10000), (s, rpm) => {
        const r = computeSpec({ ...s, revLimitRpm: rpm });
        expect(r.ok).toBe(true);
        if (r.ok)
          expect(Object.values(r.results).every((v) => v !== null && Number.isFinite(v))).toBe(
            true,
          );
      }),
    );
  });
});
