/**
 * Validation of a (possibly half-filled) engine package.
 *
 * A field that is `undefined` or `null` is missing: results that need it are not
 * computed and the field is listed in `missing`. A field that is present but not a
 * usable number (NaN, ±Infinity, wrong sign, not a number at all) is an error.
 */
import type { ErrorResult, FieldError } from "./errors";
import {
  DEFAULT_THRESHOLD_VALUES,
  THRESHOLD_KEYS,
  ZERO_ALLOWED,
  type ThresholdInput,
  type Thresholds,
} from "./thresholds";

export type SpecField =
  | "boreMm"
  | "strokeMm"
  | "cylinders"
  | "chamberCc"
  | "gasketBoreMm"
  | "gasketThicknessMm"
  | "deckClearanceMm"
  | "pistonDomeCc"
  | "rodLengthMm"
  | "intakeClosesAbdcDeg"
  | "revLimitRpm"
  | "torqueNm";

/** One engine package as typed or dropped on the bench. Every field is optional. */
export interface SpecInput {
  /** Cylinder bore, mm. */
  boreMm?: number | null | undefined;
  /** Stroke, mm. */
  strokeMm?: number | null | undefined;
  /** Number of cylinders, a positive whole number; 2 when missing. */
  cylinders?: number | null | undefined;
  /** Head chamber volume, cc. */
  chamberCc?: number | null | undefined;
  /** Head gasket bore, mm (not smaller than the bore). */
  gasketBoreMm?: number | null | undefined;
  /** Head gasket compressed thickness, mm. */
  gasketThicknessMm?: number | null | undefined;
  /** Piston crown below the deck at TDC, mm (> 0 below, < 0 above). */
  deckClearanceMm?: number | null | undefined;
  /** Dome volume, cc (> 0 dome, < 0 dish or valve reliefs). */
  pistonDomeCc?: number | null | undefined;
  /** Rod length centre to centre, mm. */
  rodLengthMm?: number | null | undefined;
  /** Intake closing, degrees after BDC, from the cam card. */
  intakeClosesAbdcDeg?: number | null | undefined;
  /** Rev limit, rpm. */
  revLimitRpm?: number | null | undefined;
  /**
   * Degrees added to the card's intake closing to reach the basis the dynamic-compression
   * limit is on (e.g. +15° from a 0.050 in checking-lift angle to seat timing); default 0.
   */
  intakeClosesAddDeg?: number | null | undefined;
  /** What that basis and conversion are, for the worked step and the caution. */
  intakeClosesBasis?: string | null | undefined;
  /** Torque target or estimate, N·m (optional: it gives the BMEP the target implies). */
  torqueNm?: number | null | undefined;
  /** Limits for the cautions; missing keys take DEFAULT_THRESHOLDS. */
  thresholds?: ThresholdInput | null | undefined;
  /** Name of the fuel grade `thresholds.dynamicCrMax` is for (e.g. "pump 91"), for the caution's text. */
  fuelGrade?: string | null | undefined;
}

/** A validated package: every field a finite number or null (missing). */
export interface CheckedSpec {
  boreMm: number | null;
  strokeMm: number | null;
  cylinders: number;
  chamberCc: number | null;
  gasketBoreMm: number | null;
  gasketThicknessMm: number | null;
  deckClearanceMm: number | null;
  pistonDomeCc: number | null;
  rodLengthMm: number | null;
  intakeClosesAbdcDeg: number | null;
  revLimitRpm: number | null;
  torqueNm: number | null;
  intakeClosesAddDeg: number;
  intakeClosesBasis: string | null;
  thresholds: Thresholds;
  fuelGrade: string | null;
}

export interface ValidSpec {
  ok: true;
  spec: CheckedSpec;
  /** Fields, in SPEC_FIELDS order, that are missing and needed by some result. */
  missing: SpecField[];
}

/**
 * All input fields, in the order screens list them. `torqueNm` is optional and never
 * counted as missing: only the BMEP figure needs it.
 */
export const SPEC_FIELDS: readonly SpecField[] = [
  "boreMm",
  "strokeMm",
  "cylinders",
  "chamberCc",
  "gasketBoreMm",
  "gasketThicknessMm",
  "deckClearanceMm",
  "pistonDomeCc",
  "rodLengthMm",
  "intakeClosesAbdcDeg",
  "revLimitRpm",
];

/** Names of the input fields for screens and messages, with their units. */
export const FIELD_LABELS: { readonly [F in SpecField]: string } = {
  boreMm: "bore (mm)",
  strokeMm: "stroke (mm)",
  cylinders: "cylinders",
  chamberCc: "head chamber volume (cc)",
  gasketBoreMm: "head gasket bore (mm)",
  gasketThicknessMm: "head gasket compressed thickness (mm)",
  deckClearanceMm: "deck clearance (mm, + below the deck)",
  pistonDomeCc: "piston dome volume (cc, + dome, − dish)",
  rodLengthMm: "rod length (mm)",
  intakeClosesAbdcDeg: "intake closes (° after BDC, from the cam card)",
  revLimitRpm: "rev limit (rpm)",
  torqueNm: "torque (N·m)",
};

/** The fields that fix the clearance volume and static ratio (besides stroke). */
export const CLEARANCE_FIELDS: readonly SpecField[] = [
  "boreMm",
  "chamberCc",
  "gasketBoreMm",
  "gasketThicknessMm",
  "deckClearanceMm",
  "pistonDomeCc",
];

const POSITIVE = "must be a finite number greater than zero";
const FINITE = "must be a finite number";

export const DEFAULT_CYLINDERS = 2;

type Kind = "positive" | "finite" | "ivc";
const KIND: Record<Exclude<SpecField, "cylinders">, Kind> = {
  boreMm: "positive",
  strokeMm: "positive",
  chamberCc: "positive",
  gasketBoreMm: "positive",
  gasketThicknessMm: "positive",
  deckClearanceMm: "finite",
  pistonDomeCc: "finite",
  rodLengthMm: "positive",
  intakeClosesAbdcDeg: "ivc",
  revLimitRpm: "positive",
  torqueNm: "positive",
};

function readNumber(
  raw: unknown,
  field: SpecField,
  kind: Kind,
  errors: FieldError[],
): number | null {
  if (raw === undefined || raw === null) return null;
  if (typeof raw !== "number" || !Number.isFinite(raw)) {
    errors.push({ field, message: kind === "positive" ? POSITIVE : FINITE });
    return null;
  }
  if (kind === "positive" && !(raw > 0)) {
    errors.push({ field, message: POSITIVE });
    return null;
  }
  if (kind === "ivc" && !(raw >= 0 && raw < 180)) {
    errors.push({
      field,
      message: "must be at least 0 and less than 180 degrees after BDC",
    });
    return null;
  }
  return raw;
}

function readThresholds(raw: unknown, errors: FieldError[]): Thresholds {
  if (raw === undefined || raw === null) return DEFAULT_THRESHOLD_VALUES;
  if (typeof raw !== "object") {
    errors.push({ field: "thresholds", message: "must be an object of limits" });
    return DEFAULT_THRESHOLD_VALUES;
  }
  const src = raw as Record<string, unknown>;
  const out: Thresholds = { ...DEFAULT_THRESHOLD_VALUES };
  for (const key of THRESHOLD_KEYS) {
    const v = src[key];
    if (v === undefined || v === null) continue;
    const min0 = ZERO_ALLOWED.has(key);
    if (typeof v !== "number" || !Number.isFinite(v) || (min0 ? v < 0 : v <= 0)) {
      errors.push({
        field: `thresholds.${key}`,
        message: min0 ? "must be a finite number, zero or more" : POSITIVE,
      });
      continue;
    }
    out[key] = v;
  }
  if (out.quenchMinMm >= out.quenchMaxMm) {
    errors.push({
      field: "thresholds.quenchMinMm",
      message: "must be smaller than thresholds.quenchMaxMm",
    });
  }
  return out;
}

function hasControl(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 0x20 || c === 0x7f) return true;
  }
  return false;
}

/** π/4 · B² · h in cc. */
function cyl(d: number, h: number): number {
  return (0.7853981633974483 * d * d * h) / 1000;
}

/**
 * Checks a package. Never throws. Present fields must be usable numbers; cross-field
 * rules are checked when all the fields they involve are present:
 * gasket bore ≥ bore; rod longer than half the stroke; clearance volume > 0;
 * deck clearance + gasket thickness > 0 (the piston crown must not reach the head).
 *
 * `required` lists fields that must be present (an absent one is an error);
 * `ignore` lists fields to skip entirely (a solver's unknown).
 */
export function validateSpec(
  input: SpecInput,
  required?: readonly SpecField[],
  ignore?: readonly SpecField[],
): ValidSpec | ErrorResult {
  const errors: FieldError[] = [];
  if (input === null || typeof input !== "object") {
    return { ok: false, errors: [{ field: "spec", message: "must be an object" }] };
  }
  const src = input as Record<string, unknown>;
  const skip = ignore !== undefined && ignore.length > 0;
  const get = skip ? (f: SpecField): unknown => (ignore.includes(f) ? undefined : src[f]) : null;

  const boreMm = readNumber(
    get === null ? src.boreMm : get("boreMm"),
    "boreMm",
    KIND.boreMm,
    errors,
  );
  const strokeMm = readNumber(
    get === null ? src.strokeMm : get("strokeMm"),
    "strokeMm",
    KIND.strokeMm,
    errors,
  );
  const chamberCc = readNumber(
    get === null ? src.chamberCc : get("chamberCc"),
    "chamberCc",
    KIND.chamberCc,
    errors,
  );
  const gasketBoreMm = readNumber(
    get === null ? src.gasketBoreMm : get("gasketBoreMm"),
    "gasketBoreMm",
    KIND.gasketBoreMm,
    errors,
  );
  const gasketThicknessMm = readNumber(
    get === null ? src.gasketThicknessMm : get("gasketThicknessMm"),
    "gasketThicknessMm",
    KIND.gasketThicknessMm,
    errors,
  );
  const deckClearanceMm = readNumber(
    get === null ? src.deckClearanceMm : get("deckClearanceMm"),
    "deckClearanceMm",
    KIND.deckClearanceMm,
    errors,
  );
  const pistonDomeCc = readNumber(
    get === null ? src.pistonDomeCc : get("pistonDomeCc"),
    "pistonDomeCc",
    KIND.pistonDomeCc,
    errors,
  );
  const rodLengthMm = readNumber(
    get === null ? src.rodLengthMm : get("rodLengthMm"),
    "rodLengthMm",
    KIND.rodLengthMm,
    errors,
  );
  const intakeClosesAbdcDeg = readNumber(
    get === null ? src.intakeClosesAbdcDeg : get("intakeClosesAbdcDeg"),
    "intakeClosesAbdcDeg",
    KIND.intakeClosesAbdcDeg,
    errors,
  );
  const revLimitRpm = readNumber(
    get === null ? src.revLimitRpm : get("revLimitRpm"),
    "revLimitRpm",
    KIND.revLimitRpm,
    errors,
  );

  const torqueNm = readNumber(
    get === null ? src.torqueNm : get("torqueNm"),
    "torqueNm",
    KIND.torqueNm,
    errors,
  );

  let fuelGrade: string | null = null;
  const rawGrade = src.fuelGrade;
  if (rawGrade !== undefined && rawGrade !== null) {
    if (typeof rawGrade === "string" && rawGrade.length <= 40 && !hasControl(rawGrade)) {
      fuelGrade = rawGrade;
    } else {
      errors.push({ field: "fuelGrade", message: "must be a name of up to 40 characters" });
    }
  }

  let intakeClosesAddDeg = 0;
  const rawAdd = src.intakeClosesAddDeg;
  if (rawAdd !== undefined && rawAdd !== null) {
    if (typeof rawAdd === "number" && Number.isFinite(rawAdd) && Math.abs(rawAdd) <= 60) {
      intakeClosesAddDeg = rawAdd;
      if (
        intakeClosesAbdcDeg !== null &&
        !(intakeClosesAbdcDeg + rawAdd >= 0 && intakeClosesAbdcDeg + rawAdd < 180)
      ) {
        errors.push({
          field: "intakeClosesAddDeg",
          message: "puts the intake closing outside 0 to 180 degrees after BDC",
        });
      }
    } else {
      errors.push({
        field: "intakeClosesAddDeg",
        message: "must be a number of degrees between −60 and 60",
      });
    }
  }
  let intakeClosesBasis: string | null = null;
  const rawBasis = src.intakeClosesBasis;
  if (rawBasis !== undefined && rawBasis !== null) {
    if (typeof rawBasis === "string" && rawBasis.length <= 200 && !hasControl(rawBasis)) {
      intakeClosesBasis = rawBasis;
    } else {
      errors.push({ field: "intakeClosesBasis", message: "must be text of up to 200 characters" });
    }
  }

  let cylinders = DEFAULT_CYLINDERS;
  const rawCyl = get === null ? src.cylinders : get("cylinders");
  if (rawCyl !== undefined && rawCyl !== null) {
    if (typeof rawCyl === "number" && Number.isSafeInteger(rawCyl) && rawCyl > 0) {
      cylinders = rawCyl;
    } else {
      errors.push({ field: "cylinders", message: "must be a positive whole number" });
    }
  }

  const thresholds = readThresholds(src.thresholds, errors);

  const spec: CheckedSpec = {
    boreMm,
    strokeMm,
    cylinders,
    chamberCc,
    gasketBoreMm,
    gasketThicknessMm,
    deckClearanceMm,
    pistonDomeCc,
    rodLengthMm,
    intakeClosesAbdcDeg,
    revLimitRpm,
    torqueNm,
    intakeClosesAddDeg,
    intakeClosesBasis,
    thresholds,
    fuelGrade,
  };

  if (required !== undefined) {
    for (const f of required) {
      if (f !== "cylinders" && spec[f] === null && (src[f] === undefined || src[f] === null)) {
        errors.push({ field: f, message: "is required" });
      }
    }
  }

  // Cross-field rules.
  if (boreMm !== null && gasketBoreMm !== null && gasketBoreMm < boreMm) {
    errors.push({ field: "gasketBoreMm", message: "must not be smaller than the cylinder bore" });
  }
  if (strokeMm !== null && rodLengthMm !== null) {
    const lambda = strokeMm / 2 / rodLengthMm;
    if (!(lambda < 1 && 1 - lambda * lambda > 0)) {
      errors.push({ field: "rodLengthMm", message: "must be longer than half the stroke" });
    }
  }
  if (deckClearanceMm !== null && gasketThicknessMm !== null) {
    if (!(deckClearanceMm + gasketThicknessMm > 0)) {
      errors.push({
        field: "deckClearanceMm",
        message:
          "the piston crown would reach the head: deck clearance plus gasket thickness must be greater than zero",
      });
    }
  }
  if (
    boreMm !== null &&
    chamberCc !== null &&
    gasketBoreMm !== null &&
    gasketThicknessMm !== null &&
    deckClearanceMm !== null &&
    pistonDomeCc !== null
  ) {
    const vc =
      chamberCc +
      cyl(gasketBoreMm, gasketThicknessMm) +
      cyl(boreMm, deckClearanceMm) -
      pistonDomeCc;
    if (!(vc > 0 && Number.isFinite(vc))) {
      errors.push({
        field: "pistonDomeCc",
        message:
          "leaves no clearance volume: chamber, gasket and deck volume less the dome must be greater than zero",
      });
    }
  }

  if (errors.length > 0) return { ok: false, errors };

  const missing: SpecField[] = [];
  for (const f of SPEC_FIELDS) {
    if (f !== "cylinders" && spec[f] === null) missing.push(f);
  }
  return { ok: true, spec, missing };
}
