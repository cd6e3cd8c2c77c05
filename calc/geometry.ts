/**
 * Cylinder geometry: swept and clearance volume, compression ratios, slider-crank
 * piston motion.
 *
 * Lengths in mm, volumes in cc (cm³), angles in degrees of crank rotation, speeds in
 * m/s. Formulas: Heywood, Internal Combustion Engine Fundamentals (McGraw-Hill 1988),
 * §2.2; the clearance-volume sum is plain geometry.
 *
 * The functions ending in `Raw` do no checking and are used by computeSpec after
 * validateSpec has passed; the others check their arguments and throw CalcInputError.
 */
import { CalcInputError, requireFinite, requirePositive } from "./errors";

const QUARTER_PI = Math.PI / 4;
const DEG = Math.PI / 180;

/** The inputs that fix the clearance volume and the static compression ratio. */
export interface StaticInputs {
  /** Cylinder bore, mm. */
  boreMm: number;
  /** Stroke, mm (twice the crank throw). */
  strokeMm: number;
  /** Combustion chamber volume in the head, cc. */
  chamberCc: number;
  /** Head gasket bore, mm (not smaller than the cylinder bore). */
  gasketBoreMm: number;
  /** Head gasket compressed thickness, mm. */
  gasketThicknessMm: number;
  /** Piston crown below the deck at TDC, mm: > 0 below (adds volume), < 0 above. */
  deckClearanceMm: number;
  /** Dome volume, cc: > 0 a dome (takes volume away), < 0 a dish or valve reliefs. */
  pistonDomeCc: number;
}

/** The inputs of the dynamic compression ratio. */
export interface DynamicInputs extends StaticInputs {
  /** Connecting rod length, centre to centre, mm. */
  rodLengthMm: number;
  /** Intake closing, degrees after BDC, as read from the cam card. */
  intakeClosesAbdcDeg: number;
}

// ---------------------------------------------------------------- raw (unchecked)

/** (π/4)·B²·h in cc, for B and h in mm. */
export function cylinderCcRaw(diameterMm: number, heightMm: number): number {
  return (QUARTER_PI * diameterMm * diameterMm * heightMm) / 1000;
}

export function clearanceVolumeCcRaw(s: StaticInputs): number {
  return (
    s.chamberCc +
    cylinderCcRaw(s.gasketBoreMm, s.gasketThicknessMm) +
    cylinderCcRaw(s.boreMm, s.deckClearanceMm) -
    s.pistonDomeCc
  );
}

/** Piston below TDC (mm) at crank angle θ (radians) for crank radius a and rod l. */
export function pistonPositionRaw(a: number, l: number, theta: number): number {
  const sn = Math.sin(theta);
  const c = Math.cos(theta);
  return l + a - (a * c + Math.sqrt(l * l - a * a * sn * sn));
}

/** dy/dθ in mm per radian. */
export function pistonVelocityRaw(a: number, l: number, theta: number): number {
  const sn = Math.sin(theta);
  const c = Math.cos(theta);
  return a * sn + (a * a * sn * c) / Math.sqrt(l * l - a * a * sn * sn);
}

/**
 * Crank angle (radians, in (0, π/2)) of peak piston speed for λ = a/l in (0, 1).
 *
 * Peak speed is where the piston acceleration d²y/dθ² is zero. With
 * q = √(1 − λ² sin²θ), (1/a)·d²y/dθ² = cos θ + λ cos 2θ / q + λ³ sin²θ cos²θ / q³,
 * positive at θ = 0 and negative at θ = π/2, with one root between. Newton's method on
 * the exact expression (analytic derivative), kept inside a shrinking bracket with a
 * bisection fallback; converges to about 1e-15 rad in a handful of steps.
 */
export function peakSpeedAngleRaw(lambda: number): number {
  const l2 = lambda * lambda;
  const l3 = l2 * lambda;
  let lo = 0;
  let hi = Math.PI / 2;
  // Starting point from the first-order root cos²θ ≈ λ²/(1 − λ²).
  let x = Math.acos(Math.min(1, Math.sqrt(l2 / (1 - l2))));
  if (!(x > lo && x < hi)) x = Math.PI / 4;
  for (let i = 0; i < 60; i++) {
    const sn = Math.sin(x);
    const c = Math.cos(x);
    const s2 = 2 * sn * c;
    const c2 = c * c - sn * sn;
    const q2 = 1 - l2 * sn * sn;
    const q = Math.sqrt(q2);
    const q3 = q2 * q;
    const q5 = q3 * q2;
    const f = c + (lambda * c2) / q + (l3 * sn * sn * c * c) / q3;
    if (f > 0) lo = x;
    else if (f < 0) hi = x;
    else return x;
    const df =
      -sn +
      lambda * ((-2 * s2) / q + (l2 * sn * c * c2) / q3) +
      l3 * ((s2 * c2) / q3 + (3 * l2 * sn * sn * sn * c * c * c) / q5);
    const step = f / df;
    let next = x - step;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    else if (Math.abs(step) < 1e-11) return next; // quadratic convergence: error now ~1e-22
    if (hi - lo < 1e-15) return next;
    x = next;
  }
  return x;
}

// ---------------------------------------------------------------- checked

function requireRod(strokeMm: number, rodLengthMm: number): void {
  requirePositive(strokeMm, "strokeMm");
  requirePositive(rodLengthMm, "rodLengthMm");
  const lambda = strokeMm / 2 / rodLengthMm;
  if (!(lambda < 1 && 1 - lambda * lambda > 0)) {
    throw new CalcInputError("rodLengthMm", "must be longer than half the stroke");
  }
}

/** Swept volume of one cylinder, cc: (π/4)·B²·L (Heywood §2.2). */
export function sweptVolumeCc(boreMm: number, strokeMm: number): number {
  requirePositive(boreMm, "boreMm");
  requirePositive(strokeMm, "strokeMm");
  return cylinderCcRaw(boreMm, strokeMm);
}

/** Engine displacement, cc: cylinders × (π/4)·B²·L. */
export function displacementCc(boreMm: number, strokeMm: number, cylinders: number): number {
  if (!(Number.isSafeInteger(cylinders) && cylinders > 0)) {
    throw new CalcInputError("cylinders", "must be a positive whole number");
  }
  return cylinders * sweptVolumeCc(boreMm, strokeMm);
}

/**
 * Clearance volume at TDC, cc: chamber + gasket cylinder (π/4)·Bg²·t + deck cylinder
 * (π/4)·B²·h − dome. Throws if the result is not greater than zero.
 */
export function clearanceVolumeCc(s: StaticInputs): number {
  requirePositive(s.boreMm, "boreMm");
  requirePositive(s.strokeMm, "strokeMm");
  requirePositive(s.chamberCc, "chamberCc");
  requirePositive(s.gasketBoreMm, "gasketBoreMm");
  requirePositive(s.gasketThicknessMm, "gasketThicknessMm");
  requireFinite(s.deckClearanceMm, "deckClearanceMm");
  requireFinite(s.pistonDomeCc, "pistonDomeCc");
  if (s.gasketBoreMm < s.boreMm) {
    throw new CalcInputError("gasketBoreMm", "must not be smaller than the cylinder bore");
  }
  const vc = clearanceVolumeCcRaw(s);
  if (!(vc > 0 && Number.isFinite(vc))) {
    throw new CalcInputError("pistonDomeCc", "clearance volume must be greater than zero");
  }
  return vc;
}

/** Static compression ratio (V_d + V_c)/V_c (Heywood §2.2); 10.5 means 10.5:1. */
export function staticCompressionRatio(s: StaticInputs): number {
  const vc = clearanceVolumeCc(s);
  return (cylinderCcRaw(s.boreMm, s.strokeMm) + vc) / vc;
}

/**
 * Distance of the piston below TDC, mm, at a crank angle after TDC (exact
 * slider-crank: y = l + a − (a cos θ + √(l² − a² sin² θ)), a = L/2).
 */
export function pistonPositionMm(strokeMm: number, rodLengthMm: number, crankDeg: number): number {
  requireRod(strokeMm, rodLengthMm);
  requireFinite(crankDeg, "crankDeg");
  return pistonPositionRaw(strokeMm / 2, rodLengthMm, crankDeg * DEG);
}

/** Instantaneous piston speed, m/s, at a crank angle after TDC (exact slider-crank). */
export function pistonSpeedMs(
  strokeMm: number,
  rodLengthMm: number,
  rpm: number,
  crankDeg: number,
): number {
  requireRod(strokeMm, rodLengthMm);
  requirePositive(rpm, "rpm");
  requireFinite(crankDeg, "crankDeg");
  const omega = (rpm * 2 * Math.PI) / 60;
  return (pistonVelocityRaw(strokeMm / 2, rodLengthMm, crankDeg * DEG) * omega) / 1000;
}

/** Mean piston speed, m/s: 2·L·N (Heywood §2.2). */
export function meanPistonSpeedMs(strokeMm: number, rpm: number): number {
  requirePositive(strokeMm, "strokeMm");
  requirePositive(rpm, "rpm");
  return (2 * strokeMm * rpm) / 60000;
}

/** Crank angle after TDC, degrees, at which piston speed peaks (between 0° and 90°). */
export function peakPistonSpeedCrankDeg(strokeMm: number, rodLengthMm: number): number {
  requireRod(strokeMm, rodLengthMm);
  return peakSpeedAngleRaw(strokeMm / 2 / rodLengthMm) / DEG;
}

/** Peak instantaneous piston speed, m/s, at the given rpm (exact slider-crank). */
export function peakPistonSpeedMs(strokeMm: number, rodLengthMm: number, rpm: number): number {
  requireRod(strokeMm, rodLengthMm);
  requirePositive(rpm, "rpm");
  const a = strokeMm / 2;
  const theta = peakSpeedAngleRaw(a / rodLengthMm);
  return (pistonVelocityRaw(a, rodLengthMm, theta) * rpm * 2 * Math.PI) / 60000;
}

/**
 * Text for screens that show the dynamic compression ratio.
 */
export const DCR_NOTE =
  "Dynamic compression is computed from the intake closing angle as read from the cam card, " +
  "in degrees after bottom dead centre. A cam card states the lift at which its timing figures " +
  "are taken (for example 0.053 in, 0.050 in or 1 mm); figures taken at a different lift give a " +
  "different closing angle and a different ratio. Use the figure from the card for this cam.";

/**
 * Dynamic compression ratio: V(θ_IVC)/V_c with θ_IVC = 180° + IVC after TDC and
 * V(θ) = V_c + (π/4)·B²·y(θ) (exact slider-crank).
 *
 * `intakeClosesAbdcDeg` is the intake closing angle as read from the cam card, in
 * degrees after BDC, from 0 (closes at BDC: equals the static ratio) up to but not
 * including 180. The card states at which lift (e.g. 0.053 in / 0.050 in or 1 mm) its
 * timing figures are taken; the user's card decides. See DCR_NOTE.
 */
export function dynamicCompressionRatio(s: DynamicInputs): number {
  const vc = clearanceVolumeCc(s);
  requireRod(s.strokeMm, s.rodLengthMm);
  requireIvc(s.intakeClosesAbdcDeg);
  return dynamicRatioRaw(s.boreMm, s.strokeMm / 2, s.rodLengthMm, s.intakeClosesAbdcDeg, vc);
}

export function requireIvc(ivc: number): void {
  if (!(typeof ivc === "number" && Number.isFinite(ivc) && ivc >= 0 && ivc < 180)) {
    throw new CalcInputError(
      "intakeClosesAbdcDeg",
      "must be at least 0 and less than 180 degrees after BDC",
    );
  }
}

/**
 * Piston height above BDC (mm) when the intake closes `ivcAbdcDeg` after BDC, i.e.
 * L − y(180° + IVC), in a form without cancellation near BDC:
 * d = 2a·sin²φ·(1 − 2a·cos²φ/(w + l)), φ = IVC/2, w = √(l² − a²·sin² IVC).
 * (From y = l + a − a cos θ − w with θ = 180° + IVC.) Never negative.
 */
export function heightAboveBdcRaw(a: number, l: number, ivcAbdcDeg: number): number {
  const phi = (ivcAbdcDeg * DEG) / 2;
  const sp = Math.sin(phi);
  const cp = Math.cos(phi);
  const si = 2 * sp * cp; // sin IVC
  const w = Math.sqrt(l * l - a * a * si * si);
  const bracket = 1 - (2 * a * cp * cp) / (w + l);
  return 2 * a * sp * sp * (bracket > 0 ? bracket : 0);
}

/** DCR from validated inputs; a = stroke/2, vc the clearance volume. Never above the static ratio. */
export function dynamicRatioRaw(
  boreMm: number,
  a: number,
  l: number,
  ivcAbdcDeg: number,
  vc: number,
): number {
  const vd = cylinderCcRaw(boreMm, 2 * a);
  return (vd + vc - cylinderCcRaw(boreMm, heightAboveBdcRaw(a, l, ivcAbdcDeg))) / vc;
}

/** Quench (squish) distance, mm: deck clearance + compressed gasket thickness. */
export function quenchMm(deckClearanceMm: number, gasketThicknessMm: number): number {
  requireFinite(deckClearanceMm, "deckClearanceMm");
  requirePositive(gasketThicknessMm, "gasketThicknessMm");
  return deckClearanceMm + gasketThicknessMm;
}

/**
 * Rod ratio as the trade uses it: rod length over stroke, l/L. (Heywood's R = l/a is
 * twice this.)
 */
export function rodRatio(rodLengthMm: number, strokeMm: number): number {
  requirePositive(rodLengthMm, "rodLengthMm");
  requirePositive(strokeMm, "strokeMm");
  return rodLengthMm / strokeMm;
}

/** Bore over stroke, B/L (> 1 oversquare, < 1 undersquare). */
export function boreStrokeRatio(boreMm: number, strokeMm: number): number {
  requirePositive(boreMm, "boreMm");
  requirePositive(strokeMm, "strokeMm");
  return boreMm / strokeMm;
}
