/**
 * computeSpec: every figure of one engine package at once, with cautions and the work
 * shown step by step.
 */
import type { ErrorResult } from "./errors";
import { fmt } from "./format";
import { cylinderCcRaw, heightAboveBdcRaw, peakSpeedAngleRaw, pistonVelocityRaw } from "./geometry";
import type { ThresholdKey, Thresholds } from "./thresholds";
import { CC_PER_CI, mmToIn, msToFtMin } from "./units";
import {
  CLEARANCE_FIELDS,
  validateSpec,
  type CheckedSpec,
  type SpecField,
  type SpecInput,
} from "./validate";

/** An input as shown in a worked step: 9 significant figures, no floating-point tail. */
const fin = (x: number | null | undefined): string =>
  x === null || x === undefined ? "" : fmt(x, 9);

export interface SpecResults {
  /** Engine displacement, cc. */
  displacementCc: number | null;
  /** Engine displacement, cubic inches. */
  displacementCi: number | null;
  /** Swept volume of one cylinder, cc. */
  sweptVolumeCc: number | null;
  /** Clearance volume of one cylinder at TDC, cc. */
  clearanceVolumeCc: number | null;
  /** Static compression ratio, :1. */
  staticCr: number | null;
  /** Dynamic compression ratio, :1 (from the cam card's intake closing). */
  dynamicCr: number | null;
  /** Mean piston speed at the rev limit, m/s. */
  meanPistonSpeedMs: number | null;
  /** Peak piston speed at the rev limit, m/s. */
  peakPistonSpeedMs: number | null;
  /** Crank angle after TDC of peak piston speed, degrees. */
  peakPistonSpeedCrankDeg: number | null;
  /** Deck clearance + gasket thickness, mm. */
  quenchMm: number | null;
  /** Rod length / stroke (the trade's rod ratio, l/L). */
  rodRatio: number | null;
  /** Bore / stroke. */
  boreStrokeRatio: number | null;
  /** Intake closing the dynamic ratio used, ° after BDC: the card's plus the basis conversion. */
  dcrClosingDeg: number | null;
  /** Brake mean effective pressure the torque figure implies, kPa (four-stroke). */
  bmepKPa: number | null;
}

export type ResultKey = keyof SpecResults;

/** Which inputs each result needs. `cylinders` defaults to 2 and is never missing. */
export const RESULT_INPUTS: { readonly [K in ResultKey]: readonly SpecField[] } = {
  sweptVolumeCc: ["boreMm", "strokeMm"],
  displacementCc: ["boreMm", "strokeMm", "cylinders"],
  displacementCi: ["boreMm", "strokeMm", "cylinders"],
  boreStrokeRatio: ["boreMm", "strokeMm"],
  clearanceVolumeCc: CLEARANCE_FIELDS,
  staticCr: [...CLEARANCE_FIELDS, "strokeMm"],
  dynamicCr: [...CLEARANCE_FIELDS, "strokeMm", "rodLengthMm", "intakeClosesAbdcDeg"],
  quenchMm: ["deckClearanceMm", "gasketThicknessMm"],
  rodRatio: ["rodLengthMm", "strokeMm"],
  meanPistonSpeedMs: ["strokeMm", "revLimitRpm"],
  peakPistonSpeedMs: ["strokeMm", "rodLengthMm", "revLimitRpm"],
  peakPistonSpeedCrankDeg: ["strokeMm", "rodLengthMm"],
  bmepKPa: ["boreMm", "strokeMm", "cylinders", "torqueNm"],
  dcrClosingDeg: ["intakeClosesAbdcDeg"],
};

export type CautionCode =
  | "STATIC_CR_HIGH"
  | "DYNAMIC_CR_HIGH"
  | "MEAN_PISTON_SPEED_HIGH"
  | "PEAK_PISTON_SPEED_HIGH"
  | "QUENCH_TIGHT"
  | "QUENCH_WIDE"
  | "ROD_RATIO_LOW"
  | "BMEP_HIGH";

export interface Caution {
  code: CautionCode;
  severity: "caution";
  message: string;
  /** The computed figure. */
  value: number;
  /** The threshold it crossed. */
  limit: number;
  /** Which threshold that is. */
  limitKey: ThresholdKey;
  /** How far beyond the limit the figure is, in the figure's unit (always > 0). */
  by: number;
  /** The result the caution is about. */
  field: ResultKey;
}

export interface Step {
  id: string;
  label: string;
  /** The formula in symbols. */
  formula: string;
  /** The formula with this package's values, or what is needed to compute it. */
  substituted: string;
  /** null when the step could not be computed (inputs missing). */
  result: number | null;
  unit: string;
}

export interface SpecOk {
  ok: true;
  results: SpecResults;
  cautions: Caution[];
  /** The work shown, one step per figure (also for figures not computed, saying what they need). */
  steps: Step[];
  /** Input fields that are missing, in input order; results that need them are null. */
  missing: SpecField[];
}

export type SpecOutcome = SpecOk | ErrorResult;

export interface ComputeOptions {
  /**
   * Build the worked steps (default true). Pass false when only the figures and
   * cautions are needed, e.g. checking many saved packages at once; `steps` is then [].
   */
  steps?: boolean | undefined;
}

/** General safety text for screens and sheets that show computed figures. */
export const SAFETY_NOTE =
  "These figures are computed from the values entered. Limits for compression, piston speed and " +
  "clearances come from the parts makers' instructions; confirm any build with them and with a " +
  "qualified engine builder and tuner before it runs.";

const DEG = Math.PI / 180;

/** Text of a step that could not be computed: "not computed: needs boreMm, strokeMm". */
function pending(
  id: string,
  label: string,
  formula: string,
  unit: string,
  key: ResultKey,
  spec: Record<string, unknown>,
): Step {
  const fields = RESULT_INPUTS[key];
  let text = "not computed: needs ";
  let first = true;
  for (let i = 0; i < fields.length; i++) {
    const f = fields[i] as SpecField;
    if (f === "cylinders" || spec[f] !== null) continue;
    text += first ? f : ", " + f;
    first = false;
  }
  return { id, label, formula, substituted: text, result: null, unit };
}

function outOfRange(field: string): ErrorResult {
  return {
    ok: false,
    errors: [{ field, message: "is too large or too small for the figures to be computed" }],
  };
}

function ftMin(ms: number): string {
  return fmt(msToFtMin(ms), 4);
}

/** "by 0.42 m/s" — how far a figure is beyond its limit, in the figure's unit. */
function byText(by: number, unit: string): string {
  return `by ${fmt(by, 3)}${unit === ":1" || unit === "" ? "" : " " + unit}`;
}

function caution(
  code: CautionCode,
  field: ResultKey,
  value: number,
  limitKey: ThresholdKey,
  limit: number,
  message: string,
): Caution {
  return {
    code,
    severity: "caution",
    value,
    limit,
    limitKey,
    by: value > limit ? value - limit : limit - value,
    field,
    message,
  };
}

function cautionsFor(
  r: SpecResults,
  t: Thresholds,
  rpm: number | null,
  grade: string | null,
  basis: string | null,
): Caution[] {
  const out: Caution[] = [];
  if (r.staticCr !== null && r.staticCr > t.staticCrMax) {
    out.push(
      caution(
        "STATIC_CR_HIGH",
        "staticCr",
        r.staticCr,
        "staticCrMax",
        t.staticCrMax,
        `Static compression ${fmt(r.staticCr, 4)}:1 is above ${fmt(t.staticCrMax, 4)}:1, the limit set for pump fuel, ` +
          `${byText(r.staticCr - t.staticCrMax, ":1")}. ` +
          "Higher compression raises the octane the engine needs and the risk of detonation; " +
          "confirm with the piston maker's limits, the fuel the rider will use, and your tuner.",
      ),
    );
  }
  if (r.dynamicCr !== null && r.dynamicCr > t.dynamicCrMax) {
    const fuel = grade === null ? "pump fuel" : grade;
    const on = basis === null ? "" : ` (closing on ${basis})`;
    out.push(
      caution(
        "DYNAMIC_CR_HIGH",
        "dynamicCr",
        r.dynamicCr,
        "dynamicCrMax",
        t.dynamicCrMax,
        `Dynamic compression ${fmt(r.dynamicCr, 4)}:1${on} is above ${fmt(t.dynamicCrMax, 4)}:1, the limit set for ${fuel}, ` +
          `${byText(r.dynamicCr - t.dynamicCrMax, ":1")}. ` +
          "Check the intake closing figure against the cam card and its lift, and " +
          "confirm with the cam and piston makers' limits and your tuner.",
      ),
    );
  }
  const at = rpm === null ? "" : ` at ${fin(rpm)} rpm`;
  if (r.meanPistonSpeedMs !== null && r.meanPistonSpeedMs > t.meanPistonSpeedMaxMs) {
    const by = r.meanPistonSpeedMs - t.meanPistonSpeedMaxMs;
    out.push(
      caution(
        "MEAN_PISTON_SPEED_HIGH",
        "meanPistonSpeedMs",
        r.meanPistonSpeedMs,
        "meanPistonSpeedMaxMs",
        t.meanPistonSpeedMaxMs,
        `Mean piston speed${at} is ${fmt(r.meanPistonSpeedMs, 4)} m/s (${ftMin(r.meanPistonSpeedMs)} ft/min), ` +
          `above the limit of ${fmt(t.meanPistonSpeedMaxMs, 4)} m/s ${byText(by, "m/s")}. ` +
          "Confirm the rev limit with the piston, rod and crank makers' ratings.",
      ),
    );
  }
  if (r.peakPistonSpeedMs !== null && r.peakPistonSpeedMs > t.peakPistonSpeedMaxMs) {
    const by = r.peakPistonSpeedMs - t.peakPistonSpeedMaxMs;
    out.push(
      caution(
        "PEAK_PISTON_SPEED_HIGH",
        "peakPistonSpeedMs",
        r.peakPistonSpeedMs,
        "peakPistonSpeedMaxMs",
        t.peakPistonSpeedMaxMs,
        `Peak piston speed${at} is ${fmt(r.peakPistonSpeedMs, 4)} m/s (${ftMin(r.peakPistonSpeedMs)} ft/min), ` +
          `above the limit of ${fmt(t.peakPistonSpeedMaxMs, 4)} m/s ${byText(by, "m/s")}. ` +
          "Confirm the rev limit with the piston, rod and crank makers' ratings.",
      ),
    );
  }
  if (r.quenchMm !== null) {
    if (r.quenchMm < t.quenchMinMm) {
      out.push(
        caution(
          "QUENCH_TIGHT",
          "quenchMm",
          r.quenchMm,
          "quenchMinMm",
          t.quenchMinMm,
          `Quench ${fmt(r.quenchMm, 4)} mm (${fmt(mmToIn(r.quenchMm), 3)} in) is tighter than ${fmt(t.quenchMinMm, 4)} mm ` +
            `${byText(t.quenchMinMm - r.quenchMm, "mm")}: ` +
            "risk of piston-to-head contact at speed. Measure the deck and the compressed gasket, and " +
            "confirm with the piston maker's minimum clearance.",
        ),
      );
    } else if (r.quenchMm > t.quenchMaxMm) {
      out.push(
        caution(
          "QUENCH_WIDE",
          "quenchMm",
          r.quenchMm,
          "quenchMaxMm",
          t.quenchMaxMm,
          `Quench ${fmt(r.quenchMm, 4)} mm (${fmt(mmToIn(r.quenchMm), 3)} in) is wider than ${fmt(t.quenchMaxMm, 4)} mm ` +
            `${byText(r.quenchMm - t.quenchMaxMm, "mm")}: ` +
            "the squish band does little and detonation is more likely. Confirm with the piston and " +
            "head makers' recommendations and your tuner.",
        ),
      );
    }
  }
  if (r.rodRatio !== null && r.rodRatio < t.rodRatioMin) {
    out.push(
      caution(
        "ROD_RATIO_LOW",
        "rodRatio",
        r.rodRatio,
        "rodRatioMin",
        t.rodRatioMin,
        `Rod ratio ${fmt(r.rodRatio, 4)} (rod length / stroke) is below the minimum of ${fmt(t.rodRatioMin, 4)} ` +
          `${byText(t.rodRatioMin - r.rodRatio, "")}: the piston is pushed harder against the bore. ` +
          "Confirm the piston's skirt design and clearance with its maker.",
      ),
    );
  }
  if (r.bmepKPa !== null && r.bmepKPa > t.bmepMaxKPa) {
    out.push(
      caution(
        "BMEP_HIGH",
        "bmepKPa",
        r.bmepKPa,
        "bmepMaxKPa",
        t.bmepMaxKPa,
        `The torque figure implies a brake mean effective pressure of ${fmt(r.bmepKPa, 4)} kPa, ` +
          `above the ${fmt(t.bmepMaxKPa, 4)} kPa the shop expects such a build to reach ${byText(r.bmepKPa - t.bmepMaxKPa, "kPa")}. ` +
          "Check the target against dyno results of similar builds before promising it.",
      ),
    );
  }
  return out;
}

/**
 * Computes every figure the inputs allow. Never throws and never returns NaN: invalid
 * input gives `{ ok: false, errors }`; missing input gives null results, listed in
 * `missing`, with steps that say what they need.
 */
export function computeSpec(input: SpecInput, options?: ComputeOptions): SpecOutcome {
  try {
    return compute(input, options === undefined || options.steps !== false);
  } catch {
    return { ok: false, errors: [{ field: "spec", message: "could not be computed" }] };
  }
}

interface Work {
  s: CheckedSpec;
  r: SpecResults;
  gasketCc: number;
  deckCc: number;
  yIvc: number;
  omega: number;
}

function compute(input: SpecInput, withSteps: boolean): SpecOutcome {
  const v = validateSpec(input);
  if (!v.ok) return v;
  const s = v.spec;
  const B = s.boreMm;
  const L = s.strokeMm;
  const l = s.rodLengthMm;
  const rpm = s.revLimitRpm;

  let swept: number | null = null;
  let disp: number | null = null;
  let dispCi: number | null = null;
  let bs: number | null = null;
  if (B !== null && L !== null) {
    swept = cylinderCcRaw(B, L);
    disp = s.cylinders * swept;
    dispCi = disp / CC_PER_CI;
    bs = B / L;
    if (!(Number.isFinite(disp) && swept > 0 && Number.isFinite(bs) && bs > 0)) {
      return outOfRange("boreMm");
    }
  }

  let vc: number | null = null;
  let scr: number | null = null;
  let gasketCc = 0;
  let deckCc = 0;
  if (
    B !== null &&
    s.chamberCc !== null &&
    s.gasketBoreMm !== null &&
    s.gasketThicknessMm !== null &&
    s.deckClearanceMm !== null &&
    s.pistonDomeCc !== null
  ) {
    gasketCc = cylinderCcRaw(s.gasketBoreMm, s.gasketThicknessMm);
    deckCc = cylinderCcRaw(B, s.deckClearanceMm);
    vc = s.chamberCc + gasketCc + deckCc - s.pistonDomeCc;
    if (!(Number.isFinite(vc) && vc > 0)) return outOfRange("chamberCc");
    if (swept !== null) {
      scr = (swept + vc) / vc;
      if (!Number.isFinite(scr)) return outOfRange("chamberCc");
    }
  }

  let dcr: number | null = null;
  let yIvc = 0;
  if (
    scr !== null &&
    swept !== null &&
    vc !== null &&
    B !== null &&
    L !== null &&
    l !== null &&
    s.intakeClosesAbdcDeg !== null
  ) {
    const above = heightAboveBdcRaw(L / 2, l, s.intakeClosesAbdcDeg + s.intakeClosesAddDeg);
    yIvc = L - above;
    dcr = (swept + vc - cylinderCcRaw(B, above)) / vc;
    if (!Number.isFinite(dcr)) return outOfRange("rodLengthMm");
  }

  const quench =
    s.deckClearanceMm !== null && s.gasketThicknessMm !== null
      ? s.deckClearanceMm + s.gasketThicknessMm
      : null;
  if (quench !== null && !Number.isFinite(quench)) return outOfRange("gasketThicknessMm");

  let rr: number | null = null;
  let peakDeg: number | null = null;
  let peakTheta = 0;
  if (l !== null && L !== null) {
    rr = l / L;
    if (!(Number.isFinite(rr) && rr > 0)) return outOfRange("rodLengthMm");
    peakTheta = peakSpeedAngleRaw(L / 2 / l);
    peakDeg = peakTheta / DEG;
  }

  let mean: number | null = null;
  let peak: number | null = null;
  let omega = 0;
  if (L !== null && rpm !== null) {
    mean = (2 * L * rpm) / 60000;
    if (!Number.isFinite(mean)) return outOfRange("revLimitRpm");
    if (l !== null) {
      omega = (rpm * 2 * Math.PI) / 60;
      peak = (pistonVelocityRaw(L / 2, l, peakTheta) * omega) / 1000;
      if (!Number.isFinite(peak)) return outOfRange("revLimitRpm");
    }
  }

  let bmep: number | null = null;
  if (disp !== null && s.torqueNm !== null) {
    bmep = (4 * Math.PI * s.torqueNm) / (disp / 1000);
    if (!Number.isFinite(bmep)) return outOfRange("torqueNm");
  }

  const results: SpecResults = {
    displacementCc: disp,
    displacementCi: dispCi,
    sweptVolumeCc: swept,
    clearanceVolumeCc: vc,
    staticCr: scr,
    dynamicCr: dcr,
    meanPistonSpeedMs: mean,
    peakPistonSpeedMs: peak,
    peakPistonSpeedCrankDeg: peakDeg,
    quenchMm: quench,
    rodRatio: rr,
    boreStrokeRatio: bs,
    bmepKPa: bmep,
    dcrClosingDeg:
      s.intakeClosesAbdcDeg === null ? null : s.intakeClosesAbdcDeg + s.intakeClosesAddDeg,
  };
  const work: Work = { s, r: results, gasketCc, deckCc, yIvc, omega };
  return {
    ok: true,
    results,
    cautions: cautionsFor(results, s.thresholds, rpm, s.fuelGrade, s.intakeClosesBasis),
    steps: withSteps ? buildSteps(work) : [],
    missing: v.missing,
  };
}

const VC_FORMULA = "V_c = V_chamber + (π/4)·B_g²·t + (π/4)·B²·h_deck − V_dome";
const Y_FORMULA = "y = l + a − (a·cos θ + √(l² − a²·sin²θ)), a = L/2, θ = 180° + IVC";
// DCR is computed as (V_d + V_c − (π/4)·B²·(L − y))/V_c, the same value without cancellation near BDC.
const DCR_FORMULA = "DCR = (V_c + (π/4)·B²·y) / V_c";
const PEAK_ANGLE_FORMULA = "θ* where d²y/dθ² = 0 (0° < θ* < 90°)";
const PEAK_FORMULA = "S_p = ω · (a·sin θ* + a²·sin θ*·cos θ* / √(l² − a²·sin²θ*)), ω = 2πN/60";
const MEAN_FORMULA = "S̄_p = 2 · L · N";

/** The worked steps of one computeSpec call, in screen order. */
function buildSteps(w: Work): Step[] {
  const { s, r } = w;
  const rec = s as unknown as Record<string, unknown>;
  const steps: Step[] = [];
  const B = s.boreMm;
  const L = s.strokeMm;
  const l = s.rodLengthMm;
  const rpm = s.revLimitRpm;
  // Inputs are shown to 9 significant figures (a value converted from inches keeps no
  // floating-point tail); computed figures are rounded by fmt.
  const fB = fin(B);
  const fL = L === null ? "" : fin(L);
  const fl = l === null ? "" : fin(l);
  const fa = L === null ? "" : fin(L / 2);
  const fSwept = r.sweptVolumeCc === null ? "" : fmt(r.sweptVolumeCc);
  const fDeck = fin(s.deckClearanceMm);
  const fThick = fin(s.gasketThicknessMm);

  if (
    r.sweptVolumeCc !== null &&
    r.displacementCc !== null &&
    r.displacementCi !== null &&
    r.boreStrokeRatio !== null
  ) {
    steps.push(
      {
        id: "sweptVolume",
        label: "Swept volume, one cylinder",
        formula: "V_d = (π/4) · B² · L",
        substituted: `(π/4) × (${fB} mm)² × ${fL} mm ÷ 1000`,
        result: r.sweptVolumeCc,
        unit: "cc",
      },
      {
        id: "displacement",
        label: "Displacement",
        formula: "V = n · V_d",
        substituted: `${s.cylinders} × ${fSwept} cc`,
        result: r.displacementCc,
        unit: "cc",
      },
      {
        id: "displacementCi",
        label: "Displacement in cubic inches",
        formula: "V[ci] = V[cc] ÷ 16.387064",
        substituted: `${fmt(r.displacementCc)} ÷ 16.387064`,
        result: r.displacementCi,
        unit: "ci",
      },
      {
        id: "boreStrokeRatio",
        label: "Bore/stroke ratio",
        formula: "B / L",
        substituted: `${fB} mm ÷ ${fL} mm`,
        result: r.boreStrokeRatio,
        unit: "",
      },
    );
  } else {
    steps.push(
      pending(
        "sweptVolume",
        "Swept volume, one cylinder",
        "V_d = (π/4) · B² · L",
        "cc",
        "sweptVolumeCc",
        rec,
      ),
      pending("displacement", "Displacement", "V = n · V_d", "cc", "displacementCc", rec),
      pending(
        "displacementCi",
        "Displacement in cubic inches",
        "V[ci] = V[cc] ÷ 16.387064",
        "ci",
        "displacementCi",
        rec,
      ),
      pending("boreStrokeRatio", "Bore/stroke ratio", "B / L", "", "boreStrokeRatio", rec),
    );
  }

  const vc = r.clearanceVolumeCc;
  const fVc = vc === null ? "" : fmt(vc);
  if (vc !== null) {
    const fCh = fin(s.chamberCc);
    const fDome = fin(s.pistonDomeCc);
    steps.push({
      id: "clearanceVolume",
      label: "Clearance volume at TDC",
      formula: VC_FORMULA,
      substituted:
        `${fCh} cc + (π/4) × (${fin(s.gasketBoreMm)} mm)² × ${fThick} mm ÷ 1000` +
        ` + (π/4) × (${fB} mm)² × ${fDeck} mm ÷ 1000 − ${fDome} cc` +
        ` = ${fCh} + ${fmt(w.gasketCc)} + ${fmt(w.deckCc)} − ${fDome}`,
      result: vc,
      unit: "cc",
    });
  } else {
    steps.push(
      pending(
        "clearanceVolume",
        "Clearance volume at TDC",
        VC_FORMULA,
        "cc",
        "clearanceVolumeCc",
        rec,
      ),
    );
  }
  if (r.staticCr !== null && r.sweptVolumeCc !== null) {
    steps.push({
      id: "staticCr",
      label: "Static compression ratio",
      formula: "r_c = (V_d + V_c) / V_c",
      substituted: `(${fSwept} cc + ${fVc} cc) ÷ ${fVc} cc`,
      result: r.staticCr,
      unit: ":1",
    });
  } else {
    steps.push(
      pending(
        "staticCr",
        "Static compression ratio",
        "r_c = (V_d + V_c) / V_c",
        ":1",
        "staticCr",
        rec,
      ),
    );
  }

  if (r.dynamicCr !== null && L !== null && l !== null && s.intakeClosesAbdcDeg !== null) {
    const fY = fmt(w.yIvc);
    steps.push(
      {
        id: "pistonAtIvc",
        label: "Piston below TDC when the intake closes",
        formula: Y_FORMULA,
        substituted:
          s.intakeClosesAddDeg === 0 && s.intakeClosesBasis === null
            ? `a = ${fa} mm, l = ${fl} mm, θ = 180° + ${fin(s.intakeClosesAbdcDeg)}° = ${fin(180 + s.intakeClosesAbdcDeg)}°`
            : `a = ${fa} mm, l = ${fl} mm, θ = 180° + ${fin(s.intakeClosesAbdcDeg)}° ${s.intakeClosesAddDeg < 0 ? "−" : "+"} ${fin(Math.abs(s.intakeClosesAddDeg))}° = ${fin(180 + s.intakeClosesAbdcDeg + s.intakeClosesAddDeg)}° (${s.intakeClosesBasis ?? "card closing plus the shop's conversion"})`,
        result: w.yIvc,
        unit: "mm",
      },
      {
        id: "dynamicCr",
        label: "Dynamic compression ratio",
        formula: DCR_FORMULA,
        substituted: `(${fVc} cc + (π/4) × (${fB} mm)² × ${fY} mm ÷ 1000) ÷ ${fVc} cc`,
        result: r.dynamicCr,
        unit: ":1",
      },
    );
  } else {
    steps.push(
      pending(
        "pistonAtIvc",
        "Piston below TDC when the intake closes",
        Y_FORMULA,
        "mm",
        "dynamicCr",
        rec,
      ),
      pending("dynamicCr", "Dynamic compression ratio", DCR_FORMULA, ":1", "dynamicCr", rec),
    );
  }

  if (r.quenchMm !== null) {
    steps.push({
      id: "quench",
      label: "Quench",
      formula: "q = h_deck + t_gasket",
      substituted: `${fDeck} mm + ${fThick} mm`,
      result: r.quenchMm,
      unit: "mm",
    });
  } else {
    steps.push(pending("quench", "Quench", "q = h_deck + t_gasket", "mm", "quenchMm", rec));
  }

  if (r.rodRatio !== null && r.peakPistonSpeedCrankDeg !== null && L !== null && l !== null) {
    steps.push(
      {
        id: "rodRatio",
        label: "Rod ratio (rod length / stroke)",
        formula: "l / L",
        substituted: `${fl} mm ÷ ${fL} mm`,
        result: r.rodRatio,
        unit: "",
      },
      {
        id: "peakPistonSpeedCrankDeg",
        label: "Crank angle of peak piston speed",
        formula: PEAK_ANGLE_FORMULA,
        substituted: `a = ${fa} mm, l = ${fl} mm, a/l = ${fmt(L / 2 / l)}`,
        result: r.peakPistonSpeedCrankDeg,
        unit: "° after TDC",
      },
    );
  } else {
    steps.push(
      pending("rodRatio", "Rod ratio (rod length / stroke)", "l / L", "", "rodRatio", rec),
      pending(
        "peakPistonSpeedCrankDeg",
        "Crank angle of peak piston speed",
        PEAK_ANGLE_FORMULA,
        "° after TDC",
        "peakPistonSpeedCrankDeg",
        rec,
      ),
    );
  }

  if (r.meanPistonSpeedMs !== null && L !== null && rpm !== null) {
    steps.push({
      id: "meanPistonSpeed",
      label: "Mean piston speed at the rev limit",
      formula: MEAN_FORMULA,
      substituted: `2 × ${fin(L / 1000)} m × ${fin(rpm)} rpm ÷ 60`,
      result: r.meanPistonSpeedMs,
      unit: "m/s",
    });
  } else {
    steps.push(
      pending(
        "meanPistonSpeed",
        "Mean piston speed at the rev limit",
        MEAN_FORMULA,
        "m/s",
        "meanPistonSpeedMs",
        rec,
      ),
    );
  }
  if (
    r.peakPistonSpeedMs !== null &&
    r.peakPistonSpeedCrankDeg !== null &&
    L !== null &&
    l !== null &&
    rpm !== null
  ) {
    steps.push({
      id: "peakPistonSpeed",
      label: "Peak piston speed at the rev limit",
      formula: PEAK_FORMULA,
      substituted: `a = ${fa} mm, l = ${fl} mm, θ* = ${fmt(r.peakPistonSpeedCrankDeg)}°, ω = 2π × ${fin(rpm)} ÷ 60 = ${fmt(w.omega)} rad/s`,
      result: r.peakPistonSpeedMs,
      unit: "m/s",
    });
  } else {
    steps.push(
      pending(
        "peakPistonSpeed",
        "Peak piston speed at the rev limit",
        PEAK_FORMULA,
        "m/s",
        "peakPistonSpeedMs",
        rec,
      ),
    );
  }
  // only when a torque figure was given: BMEP is optional and never "missing"
  if (r.bmepKPa !== null && r.displacementCc !== null && s.torqueNm !== null) {
    steps.push({
      id: "bmep",
      label: "Brake mean effective pressure the torque implies",
      formula: "bmep = 2π · n_R · T / V, n_R = 2 (four-stroke)",
      substituted: `4π × ${fin(s.torqueNm)} N·m ÷ ${fmt(r.displacementCc / 1000)} L`,
      result: r.bmepKPa,
      unit: "kPa",
    });
  }
  return steps;
}
