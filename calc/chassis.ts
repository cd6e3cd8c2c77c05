/**
 * Chassis arithmetic where the parts carry the numbers: the caliper bracket a larger
 * rotor needs, and how much longer the cables, lines and harness must be for taller or
 * pulled-back bars. Lengths in mm.
 */
import { CalcInputError, requireFinite, requirePositive } from "./errors";

/**
 * Radial bracket offset a rotor change needs, mm (derived: the caliper sits on the
 * rotor's edge, which moves out by half the diameter change). Negative for a smaller rotor.
 */
export function caliperBracketOffsetMm(stockRotorMm: number, rotorMm: number): number {
  requirePositive(stockRotorMm, "stockRotorMm");
  requirePositive(rotorMm, "rotorMm");
  return (rotorMm - stockRotorMm) / 2;
}

export interface RotorFitInputs {
  stockRotorMm: number;
  rotorMm: number;
  /** Offset of the caliper bracket fitted (0 for the stock one), mm. */
  bracketOffsetMm: number;
  /** Largest rotor the wheel's hub and spokes clear, mm (null when not known). */
  wheelMaxRotorMm: number | null;
}

export interface RotorFit {
  /** Offset the rotor needs, mm. */
  offsetNeededMm: number;
  /** Bracket offset fitted minus needed, mm (0 when they match). */
  offsetErrorMm: number;
  /** Whether the wheel takes the rotor; null when the wheel's limit is not known. */
  fitsWheel: boolean | null;
}

/** A rotor against the caliper bracket fitted and the wheel. */
export function rotorFit(r: RotorFitInputs): RotorFit {
  const need = caliperBracketOffsetMm(r.stockRotorMm, r.rotorMm);
  requireFinite(r.bracketOffsetMm, "bracketOffsetMm");
  if (r.wheelMaxRotorMm !== null) requirePositive(r.wheelMaxRotorMm, "wheelMaxRotorMm");
  return {
    offsetNeededMm: need,
    offsetErrorMm: r.bracketOffsetMm - need,
    fitsWheel: r.wheelMaxRotorMm === null ? null : r.rotorMm <= r.wheelMaxRotorMm,
  };
}

export interface BarSetup {
  /** Riser height, mm (0 without risers). */
  riserMm: number;
  /** Bar rise, mm. */
  barRiseMm: number;
  /** Bar pullback, mm. */
  pullbackMm: number;
}

function requireNonNegative(x: number, field: string): void {
  if (!(typeof x === "number" && Number.isFinite(x) && x >= 0)) {
    throw new CalcInputError(field, "must be a finite number, zero or more");
  }
}

/**
 * Extra length the controls need, mm: the change in riser height + bar rise + pullback
 * from the stock set-up (common practice: a cable routed up the bar and back along it
 * lengthens by about the sum; route and measure before ordering). Never below zero.
 */
export function controlExtensionMm(bars: BarSetup, stock: BarSetup): number {
  for (const [k, v] of Object.entries(bars)) requireNonNegative(v, k);
  for (const [k, v] of Object.entries(stock)) requireNonNegative(v, `stock.${k}`);
  const grow =
    bars.riserMm -
    stock.riserMm +
    (bars.barRiseMm - stock.barRiseMm) +
    (bars.pullbackMm - stock.pullbackMm);
  return grow > 0 ? grow : 0;
}

export interface ControlLine {
  /** What it is: "clutch cable", "brake line", "harness"… */
  name: string;
  /** Extension the fitted part gives over stock, mm (0 for stock length). */
  extensionMm: number;
}

export interface ControlLineCheck extends ControlLine {
  /** Needed minus given, mm; > 0 means the line is short by that much. */
  shortMm: number;
}

/** Each cable, line and harness against the extension needed. */
export function checkControlLines(
  neededMm: number,
  lines: readonly ControlLine[],
): ControlLineCheck[] {
  requireNonNegative(neededMm, "neededMm");
  return lines.map((l) => {
    requireFinite(l.extensionMm, `${l.name}.extensionMm`);
    return { ...l, shortMm: neededMm - l.extensionMm };
  });
}

/** The shortest extension on offer that covers the need, or null when none does. */
export function pickExtensionMm(neededMm: number, offeredMm: readonly number[]): number | null {
  requireNonNegative(neededMm, "neededMm");
  let best: number | null = null;
  for (const o of offeredMm) {
    if (Number.isFinite(o) && o >= neededMm && (best === null || o < best)) best = o;
  }
  return best;
}
