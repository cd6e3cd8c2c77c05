// The spec bench's model, shared by the browser (optimistic figures) and the server
// (the authority): a package's spec, how parts and measured values become calc's
// input, and how one bench action changes the spec.
import {
  computeSpec,
  type Caution,
  type FieldError,
  type SpecField,
  type SpecInput,
  type SpecResults,
  type Step,
} from "../../../calc";
import { SLOTS, SLOT_BY_KEY } from "../packages/slots";
import { closingConversion, type CalcLimits } from "../settings/limits";
import type { PackageStatus } from "../../../db/schema/packages";

export type PowerBasis = "target" | "estimate" | "measured";

/** The calc input a slot's part (or a measured value) supplies. */
export type MeasuredField =
  | "boreMm"
  | "strokeMm"
  | "pistonDomeCc"
  | "chamberCc"
  | "gasketBoreMm"
  | "gasketThicknessMm"
  | "intakeClosesAbdcDeg"
  | "rodLengthMm";

export interface SlotFill {
  partId: number | null;
  measured: Partial<Record<MeasuredField, number>>;
}

export interface BenchSpec {
  slots: Record<string, SlotFill>;
  /** Measured on the engine: piston crown below the deck at TDC, mm. */
  deckClearanceMm: number | null;
  revLimitRpm: number | null;
  powerHp: number | null;
  powerBasis: PowerBasis | null;
  cylinders: number;
}

/** A part as the bench needs it (prices only for roles that may see them). */
export interface BenchPart {
  id: number;
  partNumber: string;
  category: string;
  maker: string;
  name: string;
  tags: string[];
  stock: boolean;
  attributes: Record<string, string | number | boolean | null>;
  priceCents?: number | null;
  archived?: boolean;
}

/** Which calc inputs each slot's part gives, and under which attribute key. */
export const SLOT_FIELDS: Record<
  string,
  { field: MeasuredField; attr: string; label: string; unit: "mm" | "cc" | "deg" }[]
> = {
  cylinder: [{ field: "boreMm", attr: "boreMm", label: "Bore", unit: "mm" }],
  flywheel: [{ field: "strokeMm", attr: "strokeMm", label: "Stroke", unit: "mm" }],
  piston: [{ field: "pistonDomeCc", attr: "domeCc", label: "Dome (+) / dish (−)", unit: "cc" }],
  head: [{ field: "chamberCc", attr: "chamberCc", label: "Chamber", unit: "cc" }],
  gasket: [
    { field: "gasketBoreMm", attr: "boreMm", label: "Gasket bore", unit: "mm" },
    {
      field: "gasketThicknessMm",
      attr: "compressedThicknessMm",
      label: "Compressed thickness",
      unit: "mm",
    },
  ],
  cam: [
    {
      field: "intakeClosesAbdcDeg",
      attr: "intakeClosesAbdcDeg",
      label: "Intake closes (ABDC)",
      unit: "deg",
    },
  ],
  rod: [{ field: "rodLengthMm", attr: "lengthMm", label: "Rod length", unit: "mm" }],
};

export const MEASURED_FIELDS: MeasuredField[] = Object.values(SLOT_FIELDS).flatMap((fs) =>
  fs.map((f) => f.field),
);

export const FIELD_SLOT: Record<MeasuredField, string> = Object.fromEntries(
  Object.entries(SLOT_FIELDS).flatMap(([slot, fs]) => fs.map((f) => [f.field, slot])),
) as Record<MeasuredField, string>;

export const NUMBER_FIELDS = ["deckClearanceMm", "revLimitRpm", "powerHp", "powerBasis"] as const;
export type NumberField = (typeof NUMBER_FIELDS)[number];

export function emptySpec(): BenchSpec {
  return {
    slots: Object.fromEntries(SLOTS.map((s) => [s.key, { partId: null, measured: {} }])),
    deckClearanceMm: null,
    revLimitRpm: null,
    powerHp: null,
    powerBasis: null,
    cylinders: 2,
  };
}

/** Any stored or posted spec, with every slot present (unknown slots dropped). */
export function normaliseSpec(raw: unknown): BenchSpec {
  const base = emptySpec();
  if (!raw || typeof raw !== "object") return base;
  const r = raw as Partial<BenchSpec>;
  for (const s of SLOTS) {
    const fill = r.slots?.[s.key];
    if (!fill) continue;
    const measured: SlotFill["measured"] = {};
    for (const f of SLOT_FIELDS[s.key] ?? []) {
      const v = fill.measured?.[f.field];
      if (typeof v === "number" && Number.isFinite(v)) measured[f.field] = v;
    }
    base.slots[s.key] = { partId: typeof fill.partId === "number" ? fill.partId : null, measured };
  }
  const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);
  base.deckClearanceMm = num(r.deckClearanceMm);
  base.revLimitRpm = num(r.revLimitRpm);
  base.powerHp = num(r.powerHp);
  base.powerBasis =
    r.powerBasis === "target" || r.powerBasis === "estimate" || r.powerBasis === "measured"
      ? r.powerBasis
      : null;
  base.cylinders =
    typeof r.cylinders === "number" && Number.isInteger(r.cylinders) && r.cylinders > 0
      ? r.cylinders
      : 2;
  return base;
}

export interface ResolvedField {
  value: number | null;
  /** the part's catalog figure, when a part is in the slot */
  nominal: number | null;
  measured: boolean;
}

export type Resolved = Record<MeasuredField, ResolvedField>;

function attrNumber(part: BenchPart | undefined, key: string): number | null {
  const v = part?.attributes[key];
  return typeof v === "number" && Number.isFinite(v) ? v : null;
}

/** Each input's value: the measured one when typed in, else the part's nominal one. */
export function resolveFields(spec: BenchSpec, parts: ReadonlyMap<number, BenchPart>): Resolved {
  const out = {} as Resolved;
  for (const [slot, fields] of Object.entries(SLOT_FIELDS)) {
    const fill = spec.slots[slot];
    const part = fill?.partId != null ? parts.get(fill.partId) : undefined;
    for (const f of fields) {
      const nominal = attrNumber(part, f.attr);
      const m = fill?.measured[f.field];
      out[f.field] =
        m !== undefined
          ? { value: m, nominal, measured: true }
          : { value: nominal, nominal, measured: false };
    }
  }
  return out;
}

/**
 * calc's input for a spec. `limits` are the shop's caution limits (calc's defaults
 * without); with the spec's `parts` as well, the cam card's closing is converted to the
 * limits' lift basis (the card's `timingAtLiftMm`).
 */
export function toCalcInput(
  spec: BenchSpec,
  resolved: Resolved,
  limits?: CalcLimits,
  parts?: ReadonlyMap<number, BenchPart>,
): SpecInput {
  const input: SpecInput = {
    cylinders: spec.cylinders,
    deckClearanceMm: spec.deckClearanceMm,
    revLimitRpm: spec.revLimitRpm,
  };
  if (limits) {
    input.thresholds = limits.thresholds;
    input.fuelGrade = limits.fuelGrade;
    if (parts && resolved.intakeClosesAbdcDeg.value !== null) {
      const camId = spec.slots.cam?.partId;
      const cam = camId != null ? parts.get(camId) : undefined;
      const conv = closingConversion(limits, attrNumber(cam, "timingAtLiftMm"));
      input.intakeClosesAddDeg = conv.addDeg;
      input.intakeClosesBasis = conv.basis;
    }
  }
  for (const f of MEASURED_FIELDS) input[f] = resolved[f].value;
  return input;
}

const EMPTY_RESULTS: SpecResults = {
  displacementCc: null,
  displacementCi: null,
  sweptVolumeCc: null,
  clearanceVolumeCc: null,
  staticCr: null,
  dynamicCr: null,
  meanPistonSpeedMs: null,
  peakPistonSpeedMs: null,
  peakPistonSpeedCrankDeg: null,
  quenchMm: null,
  rodRatio: null,
  boreStrokeRatio: null,
  bmepKPa: null,
  dcrClosingDeg: null,
};

export interface BenchComputation {
  results: SpecResults;
  cautions: Caution[];
  missing: SpecField[];
  /** inputs calc refused (e.g. a gasket bore under the bore); figures needing them are left out */
  inputErrors: FieldError[];
}

function run(input: SpecInput, withSteps: boolean): BenchComputation & { steps: Step[] } {
  const work: Record<string, unknown> = { ...input };
  const inputErrors: FieldError[] = [];
  for (let i = 0; i < 6; i++) {
    const out = computeSpec(work as SpecInput, { steps: withSteps });
    if (out.ok)
      return {
        results: out.results,
        cautions: out.cautions,
        steps: out.steps,
        missing: out.missing,
        inputErrors,
      };
    let removed = false;
    for (const e of out.errors) {
      inputErrors.push(e);
      if (e.field in work && work[e.field] !== null) {
        work[e.field] = null;
        removed = true;
      }
    }
    if (!removed) break;
  }
  return { results: EMPTY_RESULTS, cautions: [], steps: [], missing: [], inputErrors };
}

/**
 * calc's figures for a spec. Parts that do not go together (a gasket bore under the
 * cylinder bore) are not refused here — the fit rules report them — so the inputs calc
 * rejects are set aside and every other figure is still computed. The worked steps are
 * not part of it: the browser builds them from the spec (`benchSteps`), so the server
 * neither builds, stores nor sends them.
 */
export function computeBench(input: SpecInput): BenchComputation {
  const { steps: _none, ...computation } = run(input, false);
  return computation;
}

/** The work shown for a spec: calc's steps for the same inputs `computeBench` used. */
export function benchSteps(input: SpecInput): Step[] {
  return run(input, true).steps;
}

/** A computation as stored, without the steps older revisions carried. */
export function storedComputation(raw: unknown): BenchComputation {
  const { steps: _old, ...computation } = raw as BenchComputation & { steps?: unknown };
  return computation;
}

export type RuleKind = "conflict" | "upgrade" | "caution";

/**
 * A finding as saved on a revision and as a bench answer names it: which version of
 * which rule fired, and why it could not be checked if it could not. The rule's name and
 * message live on that rule version (versions are never changed or deleted), so they are
 * joined when read instead of being copied into every revision.
 */
export interface FindingRef {
  ruleId: number;
  ruleVersion: number;
  kind: RuleKind;
  error?: string;
}

/** What the bench shows of one rule version. */
export interface RuleInfo {
  name: string;
  message: string;
  upgradeCategory: string | null;
  suggestedPartId: number | null;
}

/** A finding as the bench shows it; the JSON API adds the values the condition used. */
export interface BenchFinding extends FindingRef, Omit<RuleInfo, "name"> {
  ruleName: string;
  triggeredBy?: Record<string, unknown>;
}

export const ruleKey = (f: { ruleId: number; ruleVersion: number }) =>
  `${f.ruleId}@${f.ruleVersion}`;

export function toFindingRef(f: FindingRef): FindingRef {
  return f.error !== undefined
    ? { ruleId: f.ruleId, ruleVersion: f.ruleVersion, kind: f.kind, error: f.error }
    : { ruleId: f.ruleId, ruleVersion: f.ruleVersion, kind: f.kind };
}

export function withRuleInfo(ref: FindingRef, info: RuleInfo | undefined): BenchFinding {
  return {
    ...toFindingRef(ref),
    ruleName: info?.name ?? `Rule ${ref.ruleId}`,
    message:
      ref.error !== undefined ? `Rule could not be checked: ${ref.error}` : (info?.message ?? ""),
    upgradeCategory: info?.upgradeCategory ?? null,
    suggestedPartId: info?.suggestedPartId ?? null,
  };
}

export function ruleInfoOf(f: BenchFinding): RuleInfo {
  return {
    name: f.ruleName,
    message: f.message,
    upgradeCategory: f.upgradeCategory,
    suggestedPartId: f.suggestedPartId,
  };
}

/** One bench action, as posted by the bench (form fields) — parsed by bench-intent.ts. */
export type BenchIntent =
  | { intent: "set-part"; slot: string; partId: number }
  | { intent: "clear-slot"; slot: string }
  | { intent: "set-measured"; slot: string; field: MeasuredField; value: number }
  | { intent: "revert-measured"; slot: string; field: MeasuredField }
  | {
      intent: "set-number";
      field: "deckClearanceMm" | "revLimitRpm" | "powerHp";
      value: number | null;
    }
  | { intent: "set-basis"; value: PowerBasis | null };

/** The spec after one action (the input spec is left as it was). */
export function applyIntent(spec: BenchSpec, action: BenchIntent): BenchSpec {
  const next: BenchSpec = { ...spec, slots: { ...spec.slots } };
  const slotOf = (key: string): SlotFill => spec.slots[key] ?? { partId: null, measured: {} };
  switch (action.intent) {
    case "set-part":
      // a new part brings its own nominal figures; measurements of the old one no longer apply
      next.slots[action.slot] = { partId: action.partId, measured: {} };
      break;
    case "clear-slot":
      next.slots[action.slot] = { partId: null, measured: {} };
      break;
    case "set-measured": {
      const s = slotOf(action.slot);
      next.slots[action.slot] = { ...s, measured: { ...s.measured, [action.field]: action.value } };
      break;
    }
    case "revert-measured": {
      const s = slotOf(action.slot);
      const measured = { ...s.measured };
      delete measured[action.field];
      next.slots[action.slot] = { ...s, measured };
      break;
    }
    case "set-number":
      next[action.field] = action.value;
      break;
    case "set-basis":
      next.powerBasis = action.value;
      break;
  }
  return next;
}

export const FIELD_LABELS: Record<MeasuredField | NumberField, string> = {
  boreMm: "Bore",
  strokeMm: "Stroke",
  pistonDomeCc: "Dome / dish",
  chamberCc: "Chamber",
  gasketBoreMm: "Gasket bore",
  gasketThicknessMm: "Gasket thickness",
  intakeClosesAbdcDeg: "Intake closes",
  rodLengthMm: "Rod length",
  deckClearanceMm: "Deck clearance",
  revLimitRpm: "Rev limit",
  powerHp: "Power",
  powerBasis: "Power basis",
};

export interface SpecChange {
  key: string;
  label: string;
  before: string;
  after: string;
}

/**
 * Field-by-field differences between two specs, in bench order: each slot's part, each
 * measured value, and the package numbers.
 */
export function diffSpecs(
  a: BenchSpec,
  b: BenchSpec,
  partName: (id: number) => string,
): SpecChange[] {
  const out: SpecChange[] = [];
  const show = (v: number | string | null | undefined, unit = "") =>
    v === null || v === undefined ? "—" : `${v}${unit}`;
  for (const s of SLOTS) {
    const x = a.slots[s.key];
    const y = b.slots[s.key];
    if ((x?.partId ?? null) !== (y?.partId ?? null)) {
      out.push({
        key: `${s.key}.part`,
        label: s.label,
        before: x?.partId != null ? partName(x.partId) : "empty",
        after: y?.partId != null ? partName(y.partId) : "empty",
      });
    }
    for (const f of SLOT_FIELDS[s.key] ?? []) {
      const mx = x?.measured[f.field];
      const my = y?.measured[f.field];
      if (mx !== my) {
        const unit = f.unit === "deg" ? "°" : ` ${f.unit}`;
        out.push({
          key: `${s.key}.${f.field}`,
          label: `${SLOT_BY_KEY[s.key]?.label ?? s.key}: measured ${f.label.toLowerCase()}`,
          before: mx === undefined ? "nominal" : show(mx, unit),
          after: my === undefined ? "nominal" : show(my, unit),
        });
      }
    }
  }
  const units: Record<string, string> = {
    deckClearanceMm: " mm",
    revLimitRpm: " rpm",
    powerHp: " hp",
    powerBasis: "",
  };
  for (const f of NUMBER_FIELDS) {
    if (a[f] !== b[f])
      out.push({
        key: f,
        label: FIELD_LABELS[f],
        before: show(a[f], units[f]),
        after: show(b[f], units[f]),
      });
  }
  return out;
}

/** One line saying what an action did, for the revision list. */
export function describeIntent(action: BenchIntent, partName: (id: number) => string): string {
  const slotLabel = (k: string) => SLOT_BY_KEY[k]?.label ?? k;
  switch (action.intent) {
    case "set-part":
      return `${slotLabel(action.slot)}: ${partName(action.partId)}`;
    case "clear-slot":
      return `${slotLabel(action.slot)}: cleared`;
    case "set-measured":
      return `${slotLabel(action.slot)}: measured ${FIELD_LABELS[action.field].toLowerCase()} ${action.value}`;
    case "revert-measured":
      return `${slotLabel(action.slot)}: ${FIELD_LABELS[action.field].toLowerCase()} back to nominal`;
    case "set-number":
      return `${FIELD_LABELS[action.field]}: ${action.value ?? "cleared"}`;
    case "set-basis":
      return `Power basis: ${action.value ?? "cleared"}`;
  }
}

/** Which status may follow which. Cancelled packages can be reopened as drafts. */
export const STATUS_TRANSITIONS: Record<PackageStatus, PackageStatus[]> = {
  draft: ["quoted", "cancelled"],
  quoted: ["approved", "draft", "cancelled"],
  approved: ["in_build", "quoted", "cancelled"],
  in_build: ["on_dyno", "cancelled"],
  on_dyno: ["delivered", "in_build", "cancelled"],
  delivered: [],
  cancelled: ["draft"],
};

/** Statuses in which the bench may change the spec; later ones are locked to what was quoted or built. */
export const EDITABLE_STATUSES: PackageStatus[] = ["draft", "quoted"];
