/**
 * "What gets me to X:1?" — each solver finds the one clearance term that gives a
 * target static compression ratio, in closed form:
 * V_c needed = V_d / (target − 1), then the term is solved from
 * V_c = V_chamber + (π/4)·B_g²·t + (π/4)·B²·h_deck − V_dome.
 */
import type { ErrorResult, FieldError } from "./errors";
import { cylinderCcRaw } from "./geometry";
import { validateSpec, type SpecField, type SpecInput } from "./validate";

export interface SolveOk {
  ok: true;
  /** The value of the solved field. */
  value: number;
  /** The field that was solved. */
  field: "pistonDomeCc" | "gasketThicknessMm" | "chamberCc";
  unit: "cc" | "mm";
  /** Clearance volume the target needs, cc. */
  clearanceVolumeCc: number;
}

export type SolveResult = SolveOk | ErrorResult;

/** Input of a solver: the static inputs; the solved field may be left out and is ignored. */
export type SolveInput = Pick<
  SpecInput,
  | "boreMm"
  | "strokeMm"
  | "chamberCc"
  | "gasketBoreMm"
  | "gasketThicknessMm"
  | "deckClearanceMm"
  | "pistonDomeCc"
>;

const STATIC: readonly SpecField[] = [
  "boreMm",
  "strokeMm",
  "chamberCc",
  "gasketBoreMm",
  "gasketThicknessMm",
  "deckClearanceMm",
  "pistonDomeCc",
];

interface Known {
  B: number;
  vd: number;
  vcNeeded: number;
  chamber: number;
  gasketBore: number;
  thickness: number;
  deck: number;
  dome: number;
}

function prepare(target: number, s: SolveInput, unknown: SpecField): Known | ErrorResult {
  const errors: FieldError[] = [];
  if (!(typeof target === "number" && Number.isFinite(target) && target > 1)) {
    errors.push({ field: "target", message: "must be a finite ratio greater than 1" });
  }
  const required = STATIC.filter((f) => f !== unknown);
  const v = validateSpec((s ?? {}) as SpecInput, required, [unknown]);
  if (!v.ok) errors.push(...v.errors);
  if (errors.length > 0 || !v.ok) return { ok: false, errors };
  const c = v.spec;
  const B = c.boreMm as number;
  const vd = cylinderCcRaw(B, c.strokeMm as number);
  const vcNeeded = vd / (target - 1);
  if (!(Number.isFinite(vd) && Number.isFinite(vcNeeded) && vcNeeded > 0)) {
    return {
      ok: false,
      errors: [
        { field: "target", message: "gives a clearance volume too small or too large to compute" },
      ],
    };
  }
  return {
    B,
    vd,
    vcNeeded,
    chamber: c.chamberCc ?? 0,
    gasketBore: c.gasketBoreMm ?? 0,
    thickness: c.gasketThicknessMm ?? 0,
    deck: c.deckClearanceMm ?? 0,
    dome: c.pistonDomeCc ?? 0,
  };
}

function isError(k: Known | ErrorResult): k is ErrorResult {
  return (k as ErrorResult).ok === false;
}

/**
 * Dome volume (cc; negative = dish) that gives the target static ratio.
 * V_dome = V_chamber + V_gasket + V_deck − V_d/(target − 1).
 */
export function solveDomeCcForRatio(target: number, s: SolveInput): SolveResult {
  const k = prepare(target, s, "pistonDomeCc");
  if (isError(k)) return k;
  const value =
    k.chamber + cylinderCcRaw(k.gasketBore, k.thickness) + cylinderCcRaw(k.B, k.deck) - k.vcNeeded;
  if (!Number.isFinite(value)) {
    return { ok: false, errors: [{ field: "pistonDomeCc", message: "has no finite answer" }] };
  }
  return { ok: true, value, field: "pistonDomeCc", unit: "cc", clearanceVolumeCc: k.vcNeeded };
}

/**
 * Compressed gasket thickness (mm) that gives the target static ratio.
 * t = (V_d/(target − 1) − V_chamber − V_deck + V_dome) / ((π/4)·B_g²).
 * No answer when t would be zero or less, or the piston would reach the head.
 */
export function solveGasketThicknessForRatio(target: number, s: SolveInput): SolveResult {
  const k = prepare(target, s, "gasketThicknessMm");
  if (isError(k)) return k;
  const value =
    (k.vcNeeded - k.chamber - cylinderCcRaw(k.B, k.deck) + k.dome) / cylinderCcRaw(k.gasketBore, 1);
  if (!(Number.isFinite(value) && value > 0)) {
    return {
      ok: false,
      errors: [
        {
          field: "gasketThicknessMm",
          message: "no gasket thickness reaches this ratio: it would have to be zero or less",
        },
      ],
    };
  }
  if (!(k.deck + value > 0)) {
    return {
      ok: false,
      errors: [
        {
          field: "gasketThicknessMm",
          message: "the gasket this ratio needs would let the piston crown reach the head",
        },
      ],
    };
  }
  return { ok: true, value, field: "gasketThicknessMm", unit: "mm", clearanceVolumeCc: k.vcNeeded };
}

/**
 * Head chamber volume (cc) that gives the target static ratio.
 * V_chamber = V_d/(target − 1) − V_gasket − V_deck + V_dome. No answer when it would be
 * zero or less.
 */
export function solveChamberCcForRatio(target: number, s: SolveInput): SolveResult {
  const k = prepare(target, s, "chamberCc");
  if (isError(k)) return k;
  const value =
    k.vcNeeded - cylinderCcRaw(k.gasketBore, k.thickness) - cylinderCcRaw(k.B, k.deck) + k.dome;
  if (!(Number.isFinite(value) && value > 0)) {
    return {
      ok: false,
      errors: [
        {
          field: "chamberCc",
          message: "no chamber reaches this ratio: its volume would have to be zero or less",
        },
      ],
    };
  }
  return { ok: true, value, field: "chamberCc", unit: "cc", clearanceVolumeCc: k.vcNeeded };
}
