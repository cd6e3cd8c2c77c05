/**
 * Limits above (or outside) which computeSpec raises a caution. Every value is an
 * input: a shop, or a part's published rating, replaces the default.
 */
import { inToMm } from "./units";

export interface Thresholds {
  /** Highest static compression ratio taken as safe on pump fuel, :1. */
  staticCrMax: number;
  /** Highest dynamic compression ratio taken as safe on pump fuel, :1. */
  dynamicCrMax: number;
  /** Highest mean piston speed at the rev limit, m/s. */
  meanPistonSpeedMaxMs: number;
  /** Highest peak piston speed at the rev limit, m/s. */
  peakPistonSpeedMaxMs: number;
  /** Tightest quench before contact risk, mm. */
  quenchMinMm: number;
  /** Widest quench that still gives a working squish band, mm. */
  quenchMaxMm: number;
  /** Shortest rod for its stroke, as the trade's rod ratio l/L. */
  rodRatioMin: number;
  /** Highest brake mean effective pressure a target may imply, kPa. */
  bmepMaxKPa: number;
  /** Smallest spring coil-bind margin at full lift, mm. */
  coilBindMarginMinMm: number;
  /** Smallest retainer-to-seal clearance at full lift, mm. */
  retainerToSealMinMm: number;
  /** Smallest intake piston-to-valve clearance, mm. */
  pistonToValveIntakeMinMm: number;
  /** Smallest exhaust piston-to-valve clearance, mm. */
  pistonToValveExhaustMinMm: number;
}

export type ThresholdKey = keyof Thresholds;

/** Limits as given to computeSpec: any subset; a missing or null key takes the default. */
export type ThresholdInput = { [K in ThresholdKey]?: number | null | undefined };

/** How a default value is backed. */
export type SourceBasis = "published" | "derived" | "common practice" | "from memory";

export interface ThresholdDefault {
  value: number;
  unit: string;
  basis: SourceBasis;
  source: string;
}

/** The defaults, each with its unit and where it comes from. */
export const DEFAULT_THRESHOLDS: { readonly [K in ThresholdKey]: ThresholdDefault } = {
  staticCrMax: {
    value: 10.5,
    unit: ":1",
    basis: "common practice",
    source: "common practice: about 10.5:1 static for an air-cooled big twin on pump fuel",
  },
  dynamicCrMax: {
    value: 8.5,
    unit: ":1",
    basis: "common practice",
    source: "common practice: about 8.5:1 dynamic on pump fuel",
  },
  meanPistonSpeedMaxMs: {
    value: 22.9,
    unit: "m/s",
    basis: "common practice",
    source:
      'common practice: about 4500 ft/min (22.9 m/s) mean for quality forged street pistons, rods and crank; Wikipedia, "Mean piston speed", puts high-speed petrol and motorcycle engines near 20–25 m/s',
  },
  peakPistonSpeedMaxMs: {
    value: 37.5,
    unit: "m/s",
    basis: "from memory",
    source:
      "from memory: the mean-speed limit × 1.64, the peak-to-mean ratio of a rod ratio near 1.65",
  },
  quenchMinMm: {
    value: inToMm(0.03),
    unit: "mm",
    basis: "common practice",
    source: "common practice: quench of 0.030–0.050 in (0.76–1.27 mm)",
  },
  quenchMaxMm: {
    value: inToMm(0.05),
    unit: "mm",
    basis: "common practice",
    source: "common practice: quench of 0.030–0.050 in (0.76–1.27 mm)",
  },
  rodRatioMin: {
    value: 1.5,
    unit: "",
    basis: "common practice",
    source:
      "common practice: below about 1.5 (rod length / stroke) piston side load and skirt wear rise",
  },
  bmepMaxKPa: {
    value: 1100,
    unit: "kPa",
    basis: "from memory",
    source:
      "from memory: Heywood (1988) gives about 850–1050 kPa at maximum torque for naturally aspirated spark-ignition engines; a little above that for a well-developed build",
  },
  coilBindMarginMinMm: {
    value: inToMm(0.06),
    unit: "mm",
    basis: "common practice",
    source: "common practice: at least 0.060 in (1.5 mm) between coils at full lift",
  },
  retainerToSealMinMm: {
    value: inToMm(0.06),
    unit: "mm",
    basis: "common practice",
    source:
      "common practice: at least 0.060 in (1.5 mm) from the retainer to the seal at full lift",
  },
  pistonToValveIntakeMinMm: {
    value: inToMm(0.08),
    unit: "mm",
    basis: "common practice",
    source: "common practice: about 0.080 in (2.0 mm) intake piston-to-valve",
  },
  pistonToValveExhaustMinMm: {
    value: inToMm(0.1),
    unit: "mm",
    basis: "common practice",
    source:
      "common practice: about 0.100 in (2.5 mm) exhaust piston-to-valve (the exhaust valve grows hot)",
  },
};

export const THRESHOLD_KEYS: readonly ThresholdKey[] = [
  "staticCrMax",
  "dynamicCrMax",
  "meanPistonSpeedMaxMs",
  "peakPistonSpeedMaxMs",
  "quenchMinMm",
  "quenchMaxMm",
  "rodRatioMin",
  "bmepMaxKPa",
  "coilBindMarginMinMm",
  "retainerToSealMinMm",
  "pistonToValveIntakeMinMm",
  "pistonToValveExhaustMinMm",
];

/** Limits that may be zero (minimum clearances); the others must be greater than zero. */
export const ZERO_ALLOWED: ReadonlySet<ThresholdKey> = new Set<ThresholdKey>([
  "quenchMinMm",
  "coilBindMarginMinMm",
  "retainerToSealMinMm",
  "pistonToValveIntakeMinMm",
  "pistonToValveExhaustMinMm",
]);

/** The default values alone. */
export const DEFAULT_THRESHOLD_VALUES: Readonly<Thresholds> = Object.freeze({
  staticCrMax: DEFAULT_THRESHOLDS.staticCrMax.value,
  dynamicCrMax: DEFAULT_THRESHOLDS.dynamicCrMax.value,
  meanPistonSpeedMaxMs: DEFAULT_THRESHOLDS.meanPistonSpeedMaxMs.value,
  peakPistonSpeedMaxMs: DEFAULT_THRESHOLDS.peakPistonSpeedMaxMs.value,
  quenchMinMm: DEFAULT_THRESHOLDS.quenchMinMm.value,
  quenchMaxMm: DEFAULT_THRESHOLDS.quenchMaxMm.value,
  rodRatioMin: DEFAULT_THRESHOLDS.rodRatioMin.value,
  bmepMaxKPa: DEFAULT_THRESHOLDS.bmepMaxKPa.value,
  coilBindMarginMinMm: DEFAULT_THRESHOLDS.coilBindMarginMinMm.value,
  retainerToSealMinMm: DEFAULT_THRESHOLDS.retainerToSealMinMm.value,
  pistonToValveIntakeMinMm: DEFAULT_THRESHOLDS.pistonToValveIntakeMinMm.value,
  pistonToValveExhaustMinMm: DEFAULT_THRESHOLDS.pistonToValveExhaustMinMm.value,
});
