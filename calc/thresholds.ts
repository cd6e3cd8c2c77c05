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
    value: 20,
    unit: "m/s",
    basis: "published",
    source:
      'Wikipedia, "Mean piston speed": high-speed petrol and motorcycle engines near 20–25 m/s; the lower end is used',
  },
  peakPistonSpeedMaxMs: {
    value: 33,
    unit: "m/s",
    basis: "from memory",
    source:
      "from memory: the mean-speed default × 1.64, the peak-to-mean ratio at a rod ratio near 1.67",
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
};

export const THRESHOLD_KEYS: readonly ThresholdKey[] = [
  "staticCrMax",
  "dynamicCrMax",
  "meanPistonSpeedMaxMs",
  "peakPistonSpeedMaxMs",
  "quenchMinMm",
  "quenchMaxMm",
];

/** The default values alone. */
export const DEFAULT_THRESHOLD_VALUES: Readonly<Thresholds> = Object.freeze({
  staticCrMax: DEFAULT_THRESHOLDS.staticCrMax.value,
  dynamicCrMax: DEFAULT_THRESHOLDS.dynamicCrMax.value,
  meanPistonSpeedMaxMs: DEFAULT_THRESHOLDS.meanPistonSpeedMaxMs.value,
  peakPistonSpeedMaxMs: DEFAULT_THRESHOLDS.peakPistonSpeedMaxMs.value,
  quenchMinMm: DEFAULT_THRESHOLDS.quenchMinMm.value,
  quenchMaxMm: DEFAULT_THRESHOLDS.quenchMaxMm.value,
});
