/**
 * Valvetrain: valve lift from the lobe, spring load, coil-bind margin and
 * retainer-to-seal clearance. Lengths in mm, loads in N.
 *
 * Heights are measured from the spring seat on the head; the spring's installed height
 * is its length with the valve closed. Plain lever and Hooke's-law arithmetic (derived).
 */
import { CalcInputError, requireFinite, requirePositive } from "./errors";
import { fmt } from "./format";
import { DEFAULT_THRESHOLD_VALUES, type ThresholdInput, type ThresholdKey } from "./thresholds";
import { mmToIn } from "./units";

const PISTON_TO_VALVE_NOTE_SHORT =
  "An estimate: verify with clay or a checking spring, and hold to the cam and piston makers' minimums.";

function requireNonNegative(x: number, field: string): void {
  if (!(typeof x === "number" && Number.isFinite(x) && x >= 0)) {
    throw new CalcInputError(field, "must be a finite number, zero or more");
  }
}

/** Valve lift, mm: lobe lift × rocker ratio (lash not taken off). */
export function valveLiftMm(lobeLiftMm: number, rockerRatio: number): number {
  requireNonNegative(lobeLiftMm, "lobeLiftMm");
  requirePositive(rockerRatio, "rockerRatio");
  return lobeLiftMm * rockerRatio;
}

export interface SpringLoadInputs {
  /** Load at the installed height (valve closed), N. */
  seatLoadN: number;
  /** Spring rate, N/mm. */
  rateNPerMm: number;
  /** Compression beyond the installed height (the valve lift at full lift), mm. */
  compressionMm: number;
}

/** Spring load, N: seat load + rate × compression (a linear-rate spring). */
export function springLoadN(s: SpringLoadInputs): number {
  requireNonNegative(s.seatLoadN, "seatLoadN");
  requirePositive(s.rateNPerMm, "rateNPerMm");
  requireNonNegative(s.compressionMm, "compressionMm");
  return s.seatLoadN + s.rateNPerMm * s.compressionMm;
}

export interface CoilBindInputs {
  /** Installed height, mm. */
  installedHeightMm: number;
  /** Solid (coil-bind) height of the spring, mm. */
  coilBindHeightMm: number;
  /** Valve lift, mm. */
  valveLiftMm: number;
}

/** Coil-bind margin at full lift, mm: installed − lift − coil-bind height (< 0: binds). */
export function coilBindMarginMm(s: CoilBindInputs): number {
  requirePositive(s.installedHeightMm, "installedHeightMm");
  requirePositive(s.coilBindHeightMm, "coilBindHeightMm");
  requireNonNegative(s.valveLiftMm, "valveLiftMm");
  if (!(s.coilBindHeightMm < s.installedHeightMm)) {
    throw new CalcInputError("coilBindHeightMm", "must be less than the installed height");
  }
  return s.installedHeightMm - s.valveLiftMm - s.coilBindHeightMm;
}

export interface RetainerToSealInputs {
  /** Installed height (spring seat to retainer underside), mm. */
  installedHeightMm: number;
  /** Top of the valve-stem seal above the spring seat, mm. */
  sealTopHeightMm: number;
  /** Valve lift, mm. */
  valveLiftMm: number;
}

/** Retainer-to-seal clearance at full lift, mm: installed − seal height − lift (< 0: hits). */
export function retainerToSealMm(s: RetainerToSealInputs): number {
  requirePositive(s.installedHeightMm, "installedHeightMm");
  requireNonNegative(s.sealTopHeightMm, "sealTopHeightMm");
  requireNonNegative(s.valveLiftMm, "valveLiftMm");
  if (!(s.sealTopHeightMm < s.installedHeightMm)) {
    throw new CalcInputError("sealTopHeightMm", "must be less than the installed height");
  }
  return s.installedHeightMm - s.sealTopHeightMm - s.valveLiftMm;
}

export type ClearanceCode =
  | "COIL_BIND_MARGIN_LOW"
  | "RETAINER_TO_SEAL_LOW"
  | "PISTON_TO_VALVE_INTAKE_LOW"
  | "PISTON_TO_VALVE_EXHAUST_LOW";

/** A clearance below the shop's minimum (the valvetrain figures are not computeSpec results). */
export interface ClearanceCaution {
  code: ClearanceCode;
  severity: "caution";
  value: number;
  limit: number;
  limitKey: ThresholdKey;
  /** How far below the minimum, mm (> 0). */
  by: number;
  message: string;
}

export interface ClearanceFigures {
  coilBindMarginMm?: number | null | undefined;
  retainerToSealMm?: number | null | undefined;
  pistonToValveIntakeMm?: number | null | undefined;
  pistonToValveExhaustMm?: number | null | undefined;
}

const CLEARANCE_CHECKS: readonly {
  key: keyof ClearanceFigures;
  code: ClearanceCode;
  limitKey: ThresholdKey;
  what: string;
  advice: string;
}[] = [
  {
    key: "coilBindMarginMm",
    code: "COIL_BIND_MARGIN_LOW",
    limitKey: "coilBindMarginMinMm",
    what: "Spring coil-bind margin at full lift",
    advice: "Check the installed height and the spring maker's solid height.",
  },
  {
    key: "retainerToSealMm",
    code: "RETAINER_TO_SEAL_LOW",
    limitKey: "retainerToSealMinMm",
    what: "Retainer-to-seal clearance at full lift",
    advice: "Check with the seal fitted; the head or cam maker's instructions decide.",
  },
  {
    key: "pistonToValveIntakeMm",
    code: "PISTON_TO_VALVE_INTAKE_LOW",
    limitKey: "pistonToValveIntakeMinMm",
    what: "Estimated intake piston-to-valve clearance",
    advice: PISTON_TO_VALVE_NOTE_SHORT,
  },
  {
    key: "pistonToValveExhaustMm",
    code: "PISTON_TO_VALVE_EXHAUST_LOW",
    limitKey: "pistonToValveExhaustMinMm",
    what: "Estimated exhaust piston-to-valve clearance",
    advice: PISTON_TO_VALVE_NOTE_SHORT,
  },
];

/** Each given clearance against its minimum; figures left out are not checked. */
export function clearanceCautions(
  f: ClearanceFigures,
  thresholds?: ThresholdInput | null,
): ClearanceCaution[] {
  const out: ClearanceCaution[] = [];
  for (const c of CLEARANCE_CHECKS) {
    const v = f[c.key];
    if (v === undefined || v === null) continue;
    requireFinite(v, c.key);
    const given = thresholds?.[c.limitKey];
    const limit =
      typeof given === "number" && Number.isFinite(given)
        ? given
        : DEFAULT_THRESHOLD_VALUES[c.limitKey];
    if (!(v < limit)) continue;
    out.push({
      code: c.code,
      severity: "caution",
      value: v,
      limit,
      limitKey: c.limitKey,
      by: limit - v,
      message:
        `${c.what} is ${fmt(v, 3)} mm (${fmt(mmToIn(v), 3)} in), below the minimum of ` +
        `${fmt(limit, 3)} mm by ${fmt(limit - v, 3)} mm. ${c.advice}`,
    });
  }
  return out;
}
