/**
 * The deck-height stack (where the piston crown stands at TDC, from the parts that set
 * it) and the piston-to-valve estimate.
 *
 * Lengths in mm. Plain geometry (derived): the crown height above the crank axis at TDC
 * is rod + stroke/2 + compression height; the deck above the crank axis is the case
 * deck height + base gasket + cylinder height.
 */
import { CalcInputError, requireFinite, requirePositive } from "./errors";

export interface DeckStackInputs {
  /** Crank axis to the case's cylinder-base face, mm. */
  caseDeckMm: number;
  /** Base gasket compressed thickness, mm (0 for none). */
  baseGasketMm: number;
  /** Cylinder height, base face to head face, mm. */
  cylinderHeightMm: number;
  /** Rod length centre to centre, mm. */
  rodLengthMm: number;
  /** Stroke, mm. */
  strokeMm: number;
  /** Piston compression height, pin centre to crown edge, mm. */
  compressionHeightMm: number;
}

function requireNonNegative(x: number, field: string): void {
  if (!(typeof x === "number" && Number.isFinite(x) && x >= 0)) {
    throw new CalcInputError(field, "must be a finite number, zero or more");
  }
}

/**
 * Deck clearance from the stack, mm: positive when the crown is below the deck at TDC.
 * caseDeck + baseGasket + cylinderHeight − (rod + stroke/2 + compressionHeight).
 */
export function deckClearanceFromStack(s: DeckStackInputs): number {
  requirePositive(s.caseDeckMm, "caseDeckMm");
  requireNonNegative(s.baseGasketMm, "baseGasketMm");
  requirePositive(s.cylinderHeightMm, "cylinderHeightMm");
  requirePositive(s.rodLengthMm, "rodLengthMm");
  requirePositive(s.strokeMm, "strokeMm");
  requirePositive(s.compressionHeightMm, "compressionHeightMm");
  if (!(s.rodLengthMm > s.strokeMm / 2)) {
    throw new CalcInputError("rodLengthMm", "must be longer than half the stroke");
  }
  const deck = s.caseDeckMm + s.baseGasketMm + s.cylinderHeightMm;
  const crown = s.rodLengthMm + s.strokeMm / 2 + s.compressionHeightMm;
  return deck - crown;
}

/** Shown beside every piston-to-valve figure. */
export const PISTON_TO_VALVE_NOTE =
  "An estimate from the cam card: verify with clay or a checking spring on the assembled " +
  "engine, and hold to the cam and piston makers' minimums.";

export interface PistonToValveInputs {
  /** Piston crown below the deck at TDC, mm (> 0 below, < 0 above). */
  deckClearanceMm: number;
  /** Head gasket compressed thickness, mm. */
  gasketThicknessMm: number;
  /** Intake valve lift at TDC (overlap), from the cam card, at the valve, mm. */
  intakeLiftAtTdcMm: number;
  /** Exhaust valve lift at TDC, from the cam card, at the valve, mm. */
  exhaustLiftAtTdcMm: number;
  /** Depth of the intake valve relief in the crown, mm (0 for none). */
  intakeReliefDepthMm: number;
  /** Depth of the exhaust valve relief in the crown, mm (0 for none). */
  exhaustReliefDepthMm: number;
  /** How far the closed valve face sits up inside the chamber from the gasket face, mm (default 0). */
  valveRecessMm?: number | undefined;
}

export interface PistonToValveEstimate {
  intakeMm: number;
  exhaustMm: number;
}

/**
 * Piston-to-valve clearance at TDC, estimated along the bore axis (derived):
 * deck clearance + gasket + relief depth + valve recess − valve lift at TDC. It treats
 * the valve as moving parallel to the bore and ignores the rest of the overlap period,
 * where the tightest point of a real engine can fall: an estimate, never a measurement.
 */
export function pistonToValveEstimateMm(p: PistonToValveInputs): PistonToValveEstimate {
  requireFinite(p.deckClearanceMm, "deckClearanceMm");
  requirePositive(p.gasketThicknessMm, "gasketThicknessMm");
  requireNonNegative(p.intakeLiftAtTdcMm, "intakeLiftAtTdcMm");
  requireNonNegative(p.exhaustLiftAtTdcMm, "exhaustLiftAtTdcMm");
  requireNonNegative(p.intakeReliefDepthMm, "intakeReliefDepthMm");
  requireNonNegative(p.exhaustReliefDepthMm, "exhaustReliefDepthMm");
  const recess = p.valveRecessMm ?? 0;
  requireNonNegative(recess, "valveRecessMm");
  const gap = p.deckClearanceMm + p.gasketThicknessMm + recess;
  return {
    intakeMm: gap + p.intakeReliefDepthMm - p.intakeLiftAtTdcMm,
    exhaustMm: gap + p.exhaustReliefDepthMm - p.exhaustLiftAtTdcMm,
  };
}
