// The shop's caution limits: what each one is, its default and where the default comes
// from. Shared by the owner's page (/settings/limits) and the bench's evaluation; the
// values the owner set are read by limits.server.ts.
import { DEFAULT_THRESHOLDS, type SourceBasis, type ThresholdInput } from "../../../calc";

export type GradeSlot = "grade1" | "grade2" | "grade3";
export const GRADE_SLOTS: readonly GradeSlot[] = ["grade1", "grade2", "grade3"];
export type DcrBasis = "seat" | "checking";

/** Every limit as the bench uses it. */
export interface ShopLimits {
  staticCrMax: number;
  meanPistonSpeedMaxMs: number;
  peakPistonSpeedMaxMs: number;
  quenchMinMm: number;
  quenchMaxMm: number;
  rodRatioMin: number;
  coilBindMarginMinMm: number;
  retainerToSealMinMm: number;
  pistonToValveIntakeMinMm: number;
  pistonToValveExhaustMinMm: number;
  bmepMaxKPa: number;
  grade1Name: string;
  grade1DcrMax: number;
  grade2Name: string;
  grade2DcrMax: number;
  grade3Name: string;
  grade3DcrMax: number;
  /** The grade the bench checks dynamic compression against. */
  benchGrade: GradeSlot;
  /** The basis the dynamic-compression limits are on. */
  dcrBasis: DcrBasis;
  /** Degrees added to a closing angle read at the checking lift to reach that basis. */
  dcrAddDeg: number;
  /** The checking lift the conversion is for, mm. */
  dcrCheckingLiftMm: number;
}

export type LimitKey = keyof ShopLimits;
type NumberKey = { [K in LimitKey]: ShopLimits[K] extends number ? K : never }[LimitKey];

export interface LimitDef {
  key: LimitKey;
  label: string;
  unit: string;
  group: "Piston speed" | "Compression and fuel" | "Chamber and rod" | "Valvetrain" | "Power";
  kind: "number" | "name" | "grade" | "basis";
  default: number | string;
  basis: SourceBasis;
  source: string;
  /** Bounds a number must keep (inclusive); the page says them. */
  min?: number;
  max?: number;
}

function fromCalc(
  key: NumberKey & keyof typeof DEFAULT_THRESHOLDS,
  label: string,
  group: LimitDef["group"],
  min: number,
  max: number,
): LimitDef {
  const d = DEFAULT_THRESHOLDS[key];
  return {
    key,
    label,
    unit: d.unit,
    group,
    kind: "number",
    default: Math.round(d.value * 1000) / 1000,
    basis: d.basis,
    source: d.source,
    min,
    max,
  };
}

const GRADE_SOURCE =
  "common practice for air-cooled big twins on the shop's lift basis; confirm with the tuner";

/** The limits, in the order the page shows them. */
export const LIMIT_DEFS: readonly LimitDef[] = [
  fromCalc("meanPistonSpeedMaxMs", "Mean piston speed, highest", "Piston speed", 10, 35),
  fromCalc("peakPistonSpeedMaxMs", "Peak piston speed, highest", "Piston speed", 15, 60),
  fromCalc("staticCrMax", "Static compression, highest", "Compression and fuel", 6, 16),
  ...GRADE_SLOTS.flatMap((g, i): LimitDef[] => [
    {
      key: `${g}Name`,
      label: `Fuel grade ${i + 1}: name`,
      unit: "",
      group: "Compression and fuel",
      kind: "name",
      default: ["pump 91", "pump 93", "race fuel"][i]!,
      basis: "common practice",
      source: "the grades the shop's riders buy",
    },
    {
      key: `${g}DcrMax`,
      label: `Fuel grade ${i + 1}: dynamic compression, highest`,
      unit: ":1",
      group: "Compression and fuel",
      kind: "number",
      default: [8.8, 9.2, 10.5][i]!,
      basis: i === 2 ? "from memory" : "common practice",
      source: i === 2 ? `from memory: depends on the race fuel; ${GRADE_SOURCE}` : GRADE_SOURCE,
      min: 5,
      max: 16,
    },
  ]),
  {
    key: "benchGrade",
    label: "Fuel grade the bench checks",
    unit: "",
    group: "Compression and fuel",
    kind: "grade",
    default: "grade2",
    basis: "common practice",
    source: "common practice: performance builds are tuned for the best pump fuel",
  },
  {
    key: "dcrBasis",
    label: "Lift basis of the dynamic-compression limits",
    unit: "",
    group: "Compression and fuel",
    kind: "basis",
    default: "seat",
    basis: "common practice",
    source: "common practice: dynamic compression is quoted on seat timing",
  },
  {
    key: "dcrAddDeg",
    label: "Degrees from the checking-lift closing angle to that basis",
    unit: "°",
    group: "Compression and fuel",
    kind: "number",
    default: 15,
    basis: "from memory",
    source: "from memory: a closing angle at 0.050 in is about 15° earlier than at the seat",
    min: 0,
    max: 40,
  },
  {
    key: "dcrCheckingLiftMm",
    label: "Checking lift that conversion is for",
    unit: "mm",
    group: "Compression and fuel",
    kind: "number",
    default: 1.27,
    basis: "common practice",
    source: "common practice: cam cards state timing at 0.050 in (1.27 mm) or 0.053 in",
    min: 0.1,
    max: 2.5,
  },
  fromCalc("quenchMinMm", "Quench, tightest", "Chamber and rod", 0, 3),
  fromCalc("quenchMaxMm", "Quench, widest", "Chamber and rod", 0.2, 5),
  fromCalc("rodRatioMin", "Rod ratio (rod length / stroke), lowest", "Chamber and rod", 1, 2.5),
  fromCalc("coilBindMarginMinMm", "Coil-bind margin, smallest", "Valvetrain", 0, 5),
  fromCalc("retainerToSealMinMm", "Retainer-to-seal, smallest", "Valvetrain", 0, 5),
  fromCalc("pistonToValveIntakeMinMm", "Piston-to-valve, intake, smallest", "Valvetrain", 0, 5),
  fromCalc("pistonToValveExhaustMinMm", "Piston-to-valve, exhaust, smallest", "Valvetrain", 0, 5),
  fromCalc("bmepMaxKPa", "Brake mean effective pressure, highest", "Power", 500, 2500),
];

export const LIMIT_BY_KEY: ReadonlyMap<LimitKey, LimitDef> = new Map(
  LIMIT_DEFS.map((d) => [d.key, d]),
);

export const DEFAULT_LIMITS: Readonly<ShopLimits> = Object.freeze(
  Object.fromEntries(LIMIT_DEFS.map((d) => [d.key, d.default])) as unknown as ShopLimits,
);

export const BASIS_LABELS: Record<DcrBasis, string> = {
  seat: "Seat timing",
  checking: "Checking-lift angle plus the shop's degrees",
};

/** The name of the grade the bench checks, and its limit. */
export function benchGradeOf(l: ShopLimits): { name: string; dcrMax: number } {
  return { name: l[`${l.benchGrade}Name`], dcrMax: l[`${l.benchGrade}DcrMax`] };
}

/** What calc's computeSpec takes from the shop's limits. */
export interface CalcLimits {
  thresholds: ThresholdInput;
  fuelGrade: string;
  dcrBasis: DcrBasis;
  dcrAddDeg: number;
  dcrCheckingLiftMm: number;
}

export function calcLimitsOf(l: ShopLimits): CalcLimits {
  const grade = benchGradeOf(l);
  return {
    thresholds: {
      staticCrMax: l.staticCrMax,
      dynamicCrMax: grade.dcrMax,
      meanPistonSpeedMaxMs: l.meanPistonSpeedMaxMs,
      peakPistonSpeedMaxMs: l.peakPistonSpeedMaxMs,
      quenchMinMm: l.quenchMinMm,
      quenchMaxMm: l.quenchMaxMm,
      rodRatioMin: l.rodRatioMin,
      bmepMaxKPa: l.bmepMaxKPa,
      coilBindMarginMinMm: l.coilBindMarginMinMm,
      retainerToSealMinMm: l.retainerToSealMinMm,
      pistonToValveIntakeMinMm: l.pistonToValveIntakeMinMm,
      pistonToValveExhaustMinMm: l.pistonToValveExhaustMinMm,
    },
    fuelGrade: grade.name,
    dcrBasis: l.dcrBasis,
    dcrAddDeg: l.dcrAddDeg,
    dcrCheckingLiftMm: l.dcrCheckingLiftMm,
  };
}

/** Cards timed at or below this lift state seat timing (common practice: 0.004–0.020 in). */
export const SEAT_TIMING_MAX_MM = 0.51;

const liftText = (mm: number) =>
  `${Math.round(mm * 1000) / 1000} mm (${Math.round((mm / 25.4) * 1000) / 1000} in)`;

/**
 * How a cam card's intake closing converts to the basis the shop's dynamic-compression
 * limits are on: the degrees to add and the words that say so. A card at a checking lift
 * gets the shop's degrees; a card in seat timing is used as it is. Two cams whose cards
 * state different lifts are so compared on the one basis.
 */
export function closingConversion(
  l: CalcLimits,
  cardLiftMm: number | null,
): { addDeg: number; basis: string } {
  if (cardLiftMm !== null && cardLiftMm <= SEAT_TIMING_MAX_MM)
    return {
      addDeg: 0,
      basis:
        l.dcrBasis === "seat"
          ? `seat timing, as the card states it at ${liftText(cardLiftMm)}`
          : `the card's seat timing at ${liftText(cardLiftMm)}, used as it is`,
    };
  const at =
    cardLiftMm === null
      ? "the card's closing (its lift not stated, taken as the checking lift)"
      : `the card's closing at ${liftText(cardLiftMm)}`;
  const off =
    cardLiftMm !== null && Math.abs(cardLiftMm - l.dcrCheckingLiftMm) > 0.1
      ? `; the shop's conversion is for ${liftText(l.dcrCheckingLiftMm)}`
      : "";
  const deg = `${l.dcrAddDeg}°`;
  return {
    addDeg: l.dcrAddDeg,
    basis:
      l.dcrBasis === "seat"
        ? `seat timing: ${at} + ${deg}${off}`
        : `the checking-lift angle + ${deg}: ${at} + ${deg}${off}`,
  };
}

export const DEFAULT_CALC_LIMITS: CalcLimits = calcLimitsOf(DEFAULT_LIMITS);

/** A stored value in the text form the change log keeps. */
export function limitText(def: LimitDef, v: number | string): string {
  return typeof v === "number" ? String(v) : v;
}
