import { describe, expect, it } from "vitest";
import {
  DEFAULT_THRESHOLDS,
  DEFAULT_THRESHOLD_VALUES,
  FIELD_LABELS,
  RESULT_INPUTS,
  SPEC_FIELDS,
  computeSpec,
  displacementCc,
  dynamicCompressionRatio,
  meanPistonSpeedMs,
  peakPistonSpeedMs,
  staticCompressionRatio,
  validateSpec,
  type SpecInput,
  type SpecOutcome,
  type SpecOk,
} from "./index";

// A big twin with a 4.000 in bore, 4.500 in stroke and 7.500 in rods (demo values).
const full = {
  boreMm: 101.6,
  strokeMm: 114.3,
  cylinders: 2,
  chamberCc: 85,
  gasketBoreMm: 102.1,
  gasketThicknessMm: 1.02,
  deckClearanceMm: 0.25,
  pistonDomeCc: 3,
  rodLengthMm: 190.5,
  intakeClosesAbdcDeg: 35,
  revLimitRpm: 5800,
} satisfies SpecInput;

function ok(r: SpecOutcome): SpecOk {
  if (!r.ok) throw new Error("expected ok, got " + JSON.stringify(r.errors));
  return r;
}

function errorFields(input: SpecInput): string[] {
  const r = computeSpec(input);
  expect(r.ok).toBe(false);
  return r.ok ? [] : r.errors.map((e) => e.field);
}

describe("computeSpec on a full package", () => {
  const r = ok(computeSpec(full));

  it("agrees with the single-value functions", () => {
    expect(r.results.displacementCc).toBe(displacementCc(101.6, 114.3, 2));
    expect(r.results.staticCr).toBeCloseTo(staticCompressionRatio(full), 12);
    expect(r.results.dynamicCr).toBeCloseTo(dynamicCompressionRatio(full), 12);
    expect(r.results.meanPistonSpeedMs).toBeCloseTo(meanPistonSpeedMs(114.3, 5800), 12);
    expect(r.results.peakPistonSpeedMs).toBeCloseTo(peakPistonSpeedMs(114.3, 190.5, 5800), 12);
    expect(r.results.quenchMm).toBeCloseTo(1.27, 12);
    expect(r.results.rodRatio).toBeCloseTo(190.5 / 114.3, 12);
    expect(r.results.boreStrokeRatio).toBeCloseTo(101.6 / 114.3, 12);
    expect(r.missing).toEqual([]);
  });

  it("a 4.000 × 4.500 in twin is 113 ci", () => {
    // derived: (π/4)·4²·4.5·2 = 113.097 in³
    expect(r.results.displacementCi).toBeCloseTo(113.097, 3);
  });

  it("shows the work for every figure", () => {
    const ids = r.steps.map((s) => s.id);
    expect(ids).toEqual([
      "sweptVolume",
      "displacement",
      "displacementCi",
      "boreStrokeRatio",
      "clearanceVolume",
      "staticCr",
      "pistonAtIvc",
      "dynamicCr",
      "quench",
      "rodRatio",
      "peakPistonSpeedCrankDeg",
      "meanPistonSpeed",
      "peakPistonSpeed",
    ]);
    for (const s of r.steps) {
      expect(typeof s.label).toBe("string");
      expect(s.formula.length).toBeGreaterThan(2);
      expect(Number.isFinite(s.result)).toBe(true);
      expect(s.substituted).not.toMatch(/NaN|undefined|null/);
    }
    const swept = r.steps.find((s) => s.id === "sweptVolume");
    expect(swept?.substituted).toBe("(π/4) × (101.6 mm)² × 114.3 mm ÷ 1000");
    const scr = r.steps.find((s) => s.id === "staticCr");
    expect(scr?.substituted).toMatch(/^\(926\.667 cc \+ 92\.3779 cc\) ÷ 92\.3779 cc$/);
    expect(scr?.result).toBe(r.results.staticCr);
  });

  it("cautions on compression and piston speed past the defaults, deferring to the makers", () => {
    const codes = r.cautions.map((c) => c.code);
    expect(codes).toEqual([
      "STATIC_CR_HIGH",
      "DYNAMIC_CR_HIGH",
      "MEAN_PISTON_SPEED_HIGH",
      "PEAK_PISTON_SPEED_HIGH",
    ]);
    for (const c of r.cautions) {
      expect(c.severity).toBe("caution");
      expect(c.value).toBeGreaterThan(c.limit);
      expect(c.message).toMatch(/maker/);
      expect(r.results[c.field]).toBe(c.value);
    }
    expect(r.cautions[0]?.message).toMatch(/pump fuel/);
    expect(r.cautions[0]?.message).toMatch(/tuner/);
  });

  it("a shop's or a part's own limits replace the defaults", () => {
    const relaxed = ok(
      computeSpec({
        ...full,
        thresholds: {
          staticCrMax: 11.5,
          dynamicCrMax: 11,
          meanPistonSpeedMaxMs: 25,
          peakPistonSpeedMaxMs: 40,
        },
      }),
    );
    expect(relaxed.cautions).toEqual([]);
    const strict = ok(computeSpec({ ...full, thresholds: { meanPistonSpeedMaxMs: 22 } }));
    const mean = strict.cautions.find((c) => c.code === "MEAN_PISTON_SPEED_HIGH");
    expect(mean?.limit).toBe(22);
  });
});

describe("figures without the worked steps", () => {
  it("gives the same figures and cautions, and no steps", () => {
    const a = ok(computeSpec(full));
    const b = ok(computeSpec(full, { steps: false }));
    expect(b.results).toEqual(a.results);
    expect(b.cautions).toEqual(a.cautions);
    expect(b.missing).toEqual(a.missing);
    expect(b.steps).toEqual([]);
    expect(ok(computeSpec(full, { steps: true })).steps).toHaveLength(a.steps.length);
  });
});

describe("quench cautions", () => {
  it("too tight", () => {
    // common practice: below 0.030 in (0.762 mm) risks contact
    const r = ok(computeSpec({ ...full, deckClearanceMm: -0.4 }));
    const c = r.cautions.find((x) => x.code === "QUENCH_TIGHT");
    expect(c?.value).toBeCloseTo(0.62, 12);
    expect(c?.limit).toBeCloseTo(0.762, 12);
    expect(c?.message).toMatch(/contact/);
    expect(c?.message).toMatch(/piston maker/);
  });

  it("too wide", () => {
    // common practice: above 0.050 in (1.27 mm) the squish band does little
    const r = ok(computeSpec({ ...full, deckClearanceMm: 0.5 }));
    expect(r.cautions.map((x) => x.code)).toContain("QUENCH_WIDE");
  });

  it("inside the band, no quench caution", () => {
    const r = ok(computeSpec({ ...full, deckClearanceMm: 0 }));
    expect(r.cautions.some((x) => x.code.startsWith("QUENCH"))).toBe(false);
  });
});

describe("defaults name their sources", () => {
  it("every default has a value, unit and source", () => {
    for (const [key, d] of Object.entries(DEFAULT_THRESHOLDS)) {
      expect(d.source.length).toBeGreaterThan(10);
      expect(["published", "derived", "common practice", "from memory"]).toContain(d.basis);
      expect(DEFAULT_THRESHOLD_VALUES[key as keyof typeof DEFAULT_THRESHOLD_VALUES]).toBe(d.value);
    }
    expect(DEFAULT_THRESHOLDS.staticCrMax.value).toBe(10.5);
    expect(DEFAULT_THRESHOLDS.dynamicCrMax.value).toBe(8.5);
    expect(DEFAULT_THRESHOLDS.meanPistonSpeedMaxMs.value).toBe(20);
    expect(DEFAULT_THRESHOLDS.meanPistonSpeedMaxMs.source).toMatch(/Mean piston speed/);
    expect(DEFAULT_THRESHOLDS.quenchMinMm.value).toBeCloseTo(0.762, 12);
    expect(DEFAULT_THRESHOLDS.quenchMaxMm.value).toBeCloseTo(1.27, 12);
  });
});

describe("half-filled packages", () => {
  it("bore and stroke alone give displacement and nothing that needs more", () => {
    const r = ok(computeSpec({ boreMm: 101.6, strokeMm: 114.3 }));
    expect(r.results.displacementCc).toBeCloseTo(1853.333, 3); // derived: 2 cylinders by default
    expect(r.results.boreStrokeRatio).not.toBeNull();
    expect(r.results.staticCr).toBeNull();
    expect(r.results.clearanceVolumeCc).toBeNull();
    expect(r.results.dynamicCr).toBeNull();
    expect(r.results.meanPistonSpeedMs).toBeNull();
    expect(r.results.peakPistonSpeedCrankDeg).toBeNull();
    expect(r.results.quenchMm).toBeNull();
    expect(r.missing).toEqual([
      "chamberCc",
      "gasketBoreMm",
      "gasketThicknessMm",
      "deckClearanceMm",
      "pistonDomeCc",
      "rodLengthMm",
      "intakeClosesAbdcDeg",
      "revLimitRpm",
    ]);
    const scr = r.steps.find((s) => s.id === "staticCr");
    expect(scr?.result).toBeNull();
    expect(scr?.substituted).toBe(
      "not computed: needs chamberCc, gasketBoreMm, gasketThicknessMm, deckClearanceMm, pistonDomeCc",
    );
    expect(r.cautions).toEqual([]);
  });

  it("an empty package is not an error", () => {
    const r = ok(computeSpec({}));
    expect(Object.values(r.results).every((v) => v === null)).toBe(true);
    expect(r.missing).toEqual(SPEC_FIELDS.filter((f) => f !== "cylinders"));
    expect(r.steps.every((s) => s.substituted.startsWith("not computed: needs"))).toBe(true);
  });

  it("every input field has a label for screens", () => {
    for (const f of SPEC_FIELDS) expect(FIELD_LABELS[f].length).toBeGreaterThan(3);
  });

  it("null counts as missing", () => {
    const r = ok(computeSpec({ ...full, rodLengthMm: null }));
    expect(r.results.dynamicCr).toBeNull();
    expect(r.results.peakPistonSpeedMs).toBeNull();
    expect(r.results.rodRatio).toBeNull();
    expect(r.results.staticCr).not.toBeNull();
    expect(r.results.meanPistonSpeedMs).not.toBeNull();
    expect(r.missing).toEqual(["rodLengthMm"]);
    expect(r.steps.find((s) => s.id === "dynamicCr")?.substituted).toBe(
      "not computed: needs rodLengthMm",
    );
  });

  it("each result is computed exactly when its inputs are there", () => {
    for (const [key, needs] of Object.entries(RESULT_INPUTS)) {
      const only: Record<string, number> = {};
      for (const f of needs) if (f !== "cylinders") only[f] = full[f];
      const r = ok(computeSpec(only));
      expect(r.results[key as keyof typeof r.results], key).not.toBeNull();
      for (const f of needs) {
        if (f === "cylinders") continue;
        const less = { ...only };
        delete less[f];
        const r2 = ok(computeSpec(less));
        expect(r2.results[key as keyof typeof r2.results], `${key} without ${f}`).toBeNull();
      }
    }
  });

  it("cylinders default to 2", () => {
    const r = ok(computeSpec({ boreMm: 100, strokeMm: 100 }));
    expect(r.results.displacementCc).toBeCloseTo(2 * 785.398163, 5); // derived
  });
});

describe("invalid input is named, never NaN, never thrown", () => {
  it("zero, negative, NaN and infinite lengths", () => {
    expect(errorFields({ ...full, boreMm: 0 })).toEqual(["boreMm"]);
    expect(errorFields({ ...full, strokeMm: -114.3 })).toEqual(["strokeMm"]);
    expect(errorFields({ ...full, chamberCc: Number.NaN })).toEqual(["chamberCc"]);
    expect(errorFields({ ...full, gasketThicknessMm: 0 })).toEqual(["gasketThicknessMm"]);
    expect(errorFields({ ...full, rodLengthMm: Number.POSITIVE_INFINITY })).toEqual([
      "rodLengthMm",
    ]);
    expect(errorFields({ ...full, deckClearanceMm: Number.NEGATIVE_INFINITY })).toEqual([
      "deckClearanceMm",
    ]);
    expect(errorFields({ ...full, pistonDomeCc: Number.NaN })).toEqual(["pistonDomeCc"]);
    expect(errorFields({ ...full, revLimitRpm: 0 })).toEqual(["revLimitRpm"]);
  });

  it("values that are not numbers", () => {
    expect(errorFields({ ...full, boreMm: "101.6" as unknown as number })).toEqual(["boreMm"]);
    expect(errorFields(null as unknown as SpecInput)).toEqual(["spec"]);
    expect(errorFields("bore" as unknown as SpecInput)).toEqual(["spec"]);
  });

  it("a gasket bore smaller than the cylinder bore", () => {
    const r = computeSpec({ ...full, gasketBoreMm: 101 });
    expect(r).toEqual({
      ok: false,
      errors: [{ field: "gasketBoreMm", message: "must not be smaller than the cylinder bore" }],
    });
  });

  it("a clearance volume of zero or less", () => {
    expect(errorFields({ ...full, pistonDomeCc: 100 })).toEqual(["pistonDomeCc"]);
  });

  it("a rod not longer than half the stroke", () => {
    expect(errorFields({ ...full, rodLengthMm: 57.15 })).toEqual(["rodLengthMm"]);
    expect(errorFields({ ...full, rodLengthMm: 40 })).toEqual(["rodLengthMm"]);
  });

  it("cylinders not a positive whole number", () => {
    expect(errorFields({ ...full, cylinders: 0 })).toEqual(["cylinders"]);
    expect(errorFields({ ...full, cylinders: -2 })).toEqual(["cylinders"]);
    expect(errorFields({ ...full, cylinders: 2.5 })).toEqual(["cylinders"]);
    expect(errorFields({ ...full, cylinders: Number.NaN })).toEqual(["cylinders"]);
  });

  it("an intake closing outside 0–180° after BDC", () => {
    expect(errorFields({ ...full, intakeClosesAbdcDeg: -1 })).toEqual(["intakeClosesAbdcDeg"]);
    expect(errorFields({ ...full, intakeClosesAbdcDeg: 180 })).toEqual(["intakeClosesAbdcDeg"]);
  });

  it("a piston crown that would reach the head", () => {
    expect(errorFields({ ...full, deckClearanceMm: -1.02 })).toEqual(["deckClearanceMm"]);
  });

  it("bad thresholds", () => {
    expect(errorFields({ ...full, thresholds: { staticCrMax: -1 } })).toEqual([
      "thresholds.staticCrMax",
    ]);
    expect(errorFields({ ...full, thresholds: { quenchMinMm: 2 } })).toEqual([
      "thresholds.quenchMinMm",
    ]);
    expect(errorFields({ ...full, thresholds: 5 as unknown as SpecInput["thresholds"] })).toEqual([
      "thresholds",
    ]);
  });

  it("several problems are all listed", () => {
    expect(errorFields({ ...full, boreMm: -1, strokeMm: Number.NaN, cylinders: 0 })).toEqual([
      "boreMm",
      "strokeMm",
      "cylinders",
    ]);
  });

  it("figures too large to compute are an error, not Infinity", () => {
    expect(errorFields({ boreMm: 1e200, strokeMm: 1e200 })).toEqual(["boreMm"]);
    expect(errorFields({ deckClearanceMm: 1e308, gasketThicknessMm: 1e308 })).toEqual([
      "gasketThicknessMm",
    ]);
    expect(errorFields({ strokeMm: 1e308, revLimitRpm: 1e308 })).toEqual(["revLimitRpm"]);
  });
});

describe("validateSpec", () => {
  it("returns the checked package and what is missing", () => {
    const v = validateSpec({ boreMm: 100 });
    expect(v.ok).toBe(true);
    if (v.ok) {
      expect(v.spec.boreMm).toBe(100);
      expect(v.spec.cylinders).toBe(2);
      expect(v.spec.thresholds).toEqual(DEFAULT_THRESHOLD_VALUES);
      expect(v.missing).not.toContain("boreMm");
      expect(v.missing).toContain("strokeMm");
    }
  });

  it("can require fields", () => {
    const v = validateSpec({ boreMm: 100 }, ["boreMm", "strokeMm"]);
    expect(v).toEqual({ ok: false, errors: [{ field: "strokeMm", message: "is required" }] });
  });
});

describe("worked steps show inputs without a floating-point tail", () => {
  it("a bore entered in inches reads as millimetres to 9 significant figures", () => {
    // 4.31 in × 25.4 = 109.474 mm exactly (1 in = 25.4 mm: "Refinement of Values for the Yard and
    // the Pound", Federal Register notice of 1 July 1959, F.R. Doc. 59-5442); in binary
    // floating point the product is 109.47399999999999.
    const r = computeSpec({ boreMm: 4.31 * 25.4, strokeMm: 114.3 });
    if (!r.ok) throw new Error("expected ok");
    const swept = r.steps.find((s) => s.id === "sweptVolume");
    expect(swept?.substituted).toContain("(109.474 mm)²");
    expect(swept?.substituted).not.toContain("99999");
  });
});
