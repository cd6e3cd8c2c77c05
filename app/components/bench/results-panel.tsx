// The bench's figures, in the user's units, with calc's cautions, the fit rules'
// findings (conflicts, then upgrades with the suggested part one click away, then
// cautions), the work shown, and the compression-target solver.
import { useMemo, useState } from "react";
import {
  DCR_NOTE,
  solveChamberCcForRatio,
  solveDomeCcForRatio,
  solveGasketThicknessForRatio,
  type SpecInput,
  type SpecResults,
} from "../../../calc";
import {
  benchSteps,
  FIELD_LABELS,
  type BenchComputation,
  type BenchFinding,
  type BenchPart,
  type Resolved,
} from "~/lib/bench/spec";
import { fmtLine, show, type Quantity, type Units } from "~/lib/bench/units";
import { formatNumber, tidySigns } from "~/lib/format";
import { SLOTS } from "~/lib/packages/slots";

const ROWS: { key: keyof SpecResults; label: string; q: Quantity | "ci" | "cc" | "plain" }[] = [
  { key: "displacementCi", label: "Displacement", q: "ci" },
  { key: "displacementCc", label: "Displacement", q: "cc" },
  { key: "staticCr", label: "Static compression", q: "ratio" },
  { key: "dynamicCr", label: "Dynamic compression", q: "ratio" },
  { key: "meanPistonSpeedMs", label: "Mean piston speed", q: "speed" },
  { key: "peakPistonSpeedMs", label: "Peak piston speed", q: "speed" },
  { key: "quenchMm", label: "Quench", q: "length" },
  { key: "rodRatio", label: "Rod ratio", q: "plain" },
  { key: "boreStrokeRatio", label: "Bore/stroke", q: "plain" },
];

function cell(v: number | null, q: (typeof ROWS)[number]["q"], units: Units) {
  // both displacements stay on the panel: ci and cc are the trade's two names for it
  if (q === "ci") return { text: v === null ? "—" : formatNumber(v, 1), unit: "ci" };
  if (q === "cc") return { text: v === null ? "—" : formatNumber(v, 0), unit: "cc" };
  return show(v, q, units);
}

export function ResultsPanel(props: {
  computation: BenchComputation;
  /** calc's input for the figures shown, from which the work shown is built here */
  input: SpecInput;
  findings: BenchFinding[];
  findingsStale: boolean;
  units: Units;
  onUnits: (u: Units) => void;
  parts: ReadonlyMap<number, BenchPart>;
  fields: Resolved;
  deckClearanceMm: number | null;
  revLimitRpm: number | null;
  canEdit: boolean;
  onUseSuggested: (slot: string, partId: number) => void;
  onUseSolved: (
    slot: string,
    field: "pistonDomeCc" | "gasketThicknessMm" | "chamberCc",
    value: number,
  ) => void;
}) {
  const { computation: c, units } = props;
  const order = { conflict: 0, upgrade: 1, caution: 2 } as const;
  // rules that could not be checked are not passes: they get their own list, apart from what the rules found
  const findings = props.findings
    .filter((f) => !f.error)
    .sort((a, b) => order[a.kind] - order[b.kind]);
  const unchecked = props.findings.filter((f) => f.error);
  // a value set aside as a conflict is there, just wrong: it is not "still needed"
  const refused = new Set(c.inputErrors.map((e) => e.field));
  const missing = c.missing.filter((m) => !refused.has(m));
  return (
    <section aria-labelledby="results-h" className="flex flex-col gap-3">
      <div className="flex items-center justify-between">
        <h2
          id="results-h"
          className="text-sm font-semibold uppercase tracking-wider text-steel-700"
        >
          Results
        </h2>
        <div
          role="group"
          aria-label="Units"
          className="flex overflow-hidden rounded border border-steel-300 text-xs"
        >
          {(["inch", "metric"] as const).map((u) => (
            <button
              key={u}
              type="button"
              aria-pressed={units === u}
              onClick={() => props.onUnits(u)}
              className={`px-2 py-1 font-semibold ${units === u ? "bg-ink text-white" : "bg-white text-graphite hover:bg-steel-100"}`}
            >
              {u === "inch" ? "Inch" : "Metric"}
            </button>
          ))}
        </div>
      </div>
      <dl className="grid grid-cols-2 gap-1.5" data-testid="results">
        {ROWS.map((r) => {
          const v = cell(c.results[r.key], r.q, units);
          return (
            <div
              key={r.key}
              className="rounded border border-steel-200 bg-white px-2 py-1.5"
              data-testid={`result-${r.key}`}
            >
              <dt className="text-xs text-steel-700">{r.label}</dt>
              <dd className="num text-lg font-semibold text-ink">
                {v.text}
                {v.unit && v.text !== "—" ? (
                  <span className="ml-1 text-xs font-normal text-steel-700">{v.unit}</span>
                ) : null}
              </dd>
            </div>
          );
        })}
      </dl>
      {props.revLimitRpm ? (
        <p className="text-xs text-steel-700">
          Piston speeds at the rev limit, {props.revLimitRpm} rpm.
        </p>
      ) : (
        <p className="text-xs text-steel-700">Set a rev limit to see piston speeds.</p>
      )}
      {missing.length > 0 ? (
        <p className="text-xs text-steel-700">
          Still needed for every figure: {missing.map(fieldLabel).join(", ")}.
        </p>
      ) : null}
      {c.inputErrors.length > 0 ? (
        <ul
          className="rounded border border-red bg-red/5 p-2 text-sm text-red-text"
          data-testid="input-errors"
        >
          {c.inputErrors.map((e, i) => (
            <li key={i}>
              <span className="font-semibold">Conflict: </span>
              {inputErrorSentence(e, props.fields, units)}
            </li>
          ))}
        </ul>
      ) : null}

      <div aria-live="polite" data-testid="findings">
        <h3 className="text-sm font-semibold text-ink">
          Findings{" "}
          {props.findingsStale ? (
            <span className="font-normal text-steel-700">· checking…</span>
          ) : null}
        </h3>
        {findings.length === 0 && c.cautions.length === 0 ? (
          <p className="text-sm text-steel-700">No fit rule or limit is tripped.</p>
        ) : null}
        <ul className="mt-1 flex flex-col gap-1.5">
          {findings.map((f) => (
            <FindingItem
              key={`${f.ruleId}-${f.ruleVersion}`}
              f={f}
              parts={props.parts}
              canEdit={props.canEdit}
              onUse={props.onUseSuggested}
            />
          ))}
          {c.cautions.map((k) => (
            <li
              key={k.code}
              className="rounded border-l-4 border-amber bg-white p-2 text-sm"
              data-testid="caution"
            >
              <p className="text-xs font-semibold uppercase text-amber-text">Caution · limit</p>
              <p>{k.message}</p>
            </li>
          ))}
        </ul>
        {unchecked.length > 0 ? (
          <div
            className="mt-3 rounded border border-dashed border-steel-500 bg-steel-50 p-2"
            data-testid="unchecked"
          >
            <h4 className="text-xs font-semibold uppercase tracking-wide text-steel-700">
              Could not be checked · {unchecked.length}
            </h4>
            <p className="text-xs text-steel-700">
              These rules need a figure or a part this package does not have yet. Not checked is not
              a pass: fill it in, or check by hand.
            </p>
            <ul className="mt-1 flex flex-col gap-1">
              {unchecked.map((f) => (
                <li
                  key={`${f.ruleId}-${f.ruleVersion}`}
                  className="text-sm"
                  data-testid="finding-unchecked"
                >
                  <span className="font-semibold text-graphite">{f.ruleName}</span>{" "}
                  <span className="text-steel-700">— {plainRuleError(f.error!)}</span>
                </li>
              ))}
            </ul>
          </div>
        ) : null}
      </div>

      <Solver
        units={units}
        fields={props.fields}
        deckClearanceMm={props.deckClearanceMm}
        canEdit={props.canEdit}
        onUse={props.onUseSolved}
      />

      <WorkShown input={props.input} units={units} />
      <p className="text-xs text-steel-700" data-testid="bench-disclaimer">
        Figures are for planning. Torque values and limits come from the parts maker's instructions;
        compression against fuel is the tuner's call; brakes, axles and suspension are checked by a
        qualified technician.
      </p>
    </section>
  );
}

// what a worked step's SI unit reads as in the user's system
const STEP_QUANTITY: Record<string, Quantity> = { mm: "length", "m/s": "speed" };

function stepResult(value: number, unit: string, units: Units): string {
  const q = STEP_QUANTITY[unit];
  const si = `${Number(value.toPrecision(6))} ${unit}`.trim();
  if (!q || units === "metric") return si;
  return `${si} (${fmtLine(value, q, units)})`;
}

function WorkShown({ input, units }: { input: SpecInput; units: Units }) {
  const [open, setOpen] = useState(false);
  // built only while open: the server sends figures, not their worked steps
  const steps = useMemo(() => (open ? benchSteps(input) : []), [open, input]);
  return (
    <details
      className="rounded border border-steel-200 bg-white p-2 text-sm"
      onToggle={(e) => setOpen(e.currentTarget.open)}
    >
      <summary className="cursor-pointer font-semibold text-ink">Show the work</summary>
      <ol className="mt-2 flex flex-col gap-2" data-testid="work-steps">
        {steps.map((s) => (
          <li key={s.id}>
            <p className="font-medium">{s.label}</p>
            <p className="num font-mono text-xs text-steel-700">{s.formula}</p>
            <p className="num font-mono text-xs">
              {tidySigns(s.substituted)}
              {s.result !== null ? ` = ${stepResult(s.result, s.unit, units)}` : ""}
            </p>
          </li>
        ))}
      </ol>
      <p className="mt-2 text-xs text-steel-700">
        The work is written in millimetres and cubic centimetres, as the formulas are
        {units === "inch" ? "; each result is also given in inches" : ""}.
      </p>
      <p className="mt-2 text-xs text-steel-700">{DCR_NOTE}</p>
    </details>
  );
}

function FindingItem({
  f,
  parts,
  canEdit,
  onUse,
}: {
  f: BenchFinding;
  parts: ReadonlyMap<number, BenchPart>;
  canEdit: boolean;
  onUse: (slot: string, id: number) => void;
}) {
  const style = {
    conflict: "border-red text-red-text",
    upgrade: "border-amber text-amber-text",
    caution: "border-steel-500 text-steel-700",
  }[f.kind];
  const slot = f.upgradeCategory ? SLOTS.find((s) => s.category === f.upgradeCategory) : undefined;
  const suggested = f.suggestedPartId != null ? parts.get(f.suggestedPartId) : undefined;
  return (
    <li
      className={`rounded border-l-4 bg-white p-2 text-sm ${style.split(" ")[0]}`}
      data-testid={`finding-${f.kind}`}
    >
      <p className={`text-xs font-semibold uppercase ${style.split(" ")[1]}`}>
        {f.kind === "conflict" ? "Conflict" : f.kind === "upgrade" ? "Upgrade needed" : "Caution"} ·{" "}
        {f.ruleName}
        <span className="font-normal normal-case"> (rule v{f.ruleVersion})</span>
      </p>
      <p className="text-graphite">{f.message}</p>
      {f.kind === "upgrade" && f.upgradeCategory ? (
        <p className="mt-1 text-xs text-steel-700">
          Category: {slot?.label ?? f.upgradeCategory}
          {suggested ? ` · suggested: ${suggested.name} (${suggested.partNumber})` : ""}
        </p>
      ) : null}
      {canEdit && slot && f.suggestedPartId != null ? (
        <button
          type="button"
          onClick={() => onUse(slot.key, f.suggestedPartId!)}
          className="mt-1 rounded bg-teal-dark px-2 py-0.5 text-xs font-semibold text-white hover:bg-ink"
        >
          Use suggested part
        </button>
      ) : null}
    </li>
  );
}

const SOLVE = {
  pistonDomeCc: { label: "Dome / dish", slot: "piston", unit: "cc", fn: solveDomeCcForRatio },
  gasketThicknessMm: {
    label: "Gasket thickness",
    slot: "gasket",
    unit: "mm",
    fn: solveGasketThicknessForRatio,
  },
  chamberCc: { label: "Chamber", slot: "head", unit: "cc", fn: solveChamberCcForRatio },
} as const;

function Solver(props: {
  units: Units;
  fields: Resolved;
  deckClearanceMm: number | null;
  canEdit: boolean;
  onUse: (slot: string, field: keyof typeof SOLVE, value: number) => void;
}) {
  const [field, setField] = useState<keyof typeof SOLVE>("pistonDomeCc");
  const [target, setTarget] = useState("10.0");
  const f = props.fields;
  const input = {
    boreMm: f.boreMm.value,
    strokeMm: f.strokeMm.value,
    chamberCc: f.chamberCc.value,
    gasketBoreMm: f.gasketBoreMm.value,
    gasketThicknessMm: f.gasketThicknessMm.value,
    deckClearanceMm: props.deckClearanceMm,
    pistonDomeCc: f.pistonDomeCc.value,
  };
  const t = Number(target);
  const answer = SOLVE[field].fn(t, { ...input, [field]: undefined });
  return (
    <div className="rounded border border-steel-200 bg-white p-2 text-sm" data-testid="solver">
      <p className="font-semibold text-ink">Solve for a compression target</p>
      <div className="mt-1 flex flex-wrap items-center gap-1">
        <label htmlFor="solve-field" className="text-steel-700">
          What
        </label>
        <select
          id="solve-field"
          value={field}
          onChange={(e) => setField(e.target.value as keyof typeof SOLVE)}
          className="rounded border border-steel-300 px-1 py-0.5"
        >
          {Object.entries(SOLVE).map(([k, v]) => (
            <option key={k} value={k}>
              {v.label}
            </option>
          ))}
        </select>
        <label htmlFor="solve-target" className="text-steel-700">
          gives
        </label>
        <input
          id="solve-target"
          inputMode="decimal"
          value={target}
          onChange={(e) => setTarget(e.target.value)}
          className="num w-16 rounded border border-steel-300 px-1 py-0.5"
        />
        <span className="text-steel-700">:1</span>
      </div>
      {answer.ok ? (
        <p className="mt-1" data-testid="solver-answer">
          <span className="num font-semibold">
            {field === "gasketThicknessMm"
              ? fmtLine(answer.value, "length", props.units)
              : fmtLine(answer.value, "smallVolume", props.units)}
          </span>
          {field === "pistonDomeCc" ? (
            <span className="text-steel-700"> ({answer.value >= 0 ? "dome" : "dish"})</span>
          ) : null}
          {props.canEdit ? (
            <button
              type="button"
              onClick={() => props.onUse(SOLVE[field].slot, field, Number(answer.value.toFixed(3)))}
              className="ml-2 rounded bg-teal-dark px-2 py-0.5 text-xs font-semibold text-white hover:bg-ink"
            >
              Use as measured value
            </button>
          ) : null}
        </p>
      ) : (
        <p className="mt-1 text-xs text-steel-700" data-testid="solver-refusal">
          {solverRefusal(answer.errors, SOLVE[field].label, target)}
        </p>
      )}
    </div>
  );
}

const CALC_LABELS: Record<string, string> = { ...FIELD_LABELS, cylinders: "Cylinders" };

/** A calc field's name as the bench shows it ("gasketBoreMm" → "Gasket bore"). */
function fieldLabel(field: string): string {
  return CALC_LABELS[field] ?? field;
}

// the rules' own names for a package's numbers, as the bench shows them
const RULE_NUMBER_LABELS: Record<string, string> = {
  power_hp: "power (hp)",
  power_basis: "power basis",
  rev_limit_rpm: "rev limit",
  riser_in: "riser height (in)",
  cr_static: "static compression",
  cr_dynamic: "dynamic compression",
  piston_speed_mean_ms: "mean piston speed",
  piston_speed_peak_ms: "peak piston speed",
  quench_mm: "quench",
  deck_mm: "deck clearance",
  bore_mm: "bore",
  stroke_mm: "stroke",
};

/** "riser_in has no value in this package" → "needs riser height (in), which this package does not have yet". */
function plainRuleError(error: string): string {
  const m = /^([a-z_.]+) has no value in this package$/.exec(error);
  if (!m) return error;
  return `needs ${RULE_NUMBER_LABELS[m[1]!] ?? m[1]!.replace(/_/g, " ")}, which this package does not have yet`;
}

/** A refused solve as a builder would say it. */
function solverRefusal(
  errors: readonly { field: string; message: string }[],
  solving: string,
  target: string,
): string {
  const missing = errors.filter((e) => e.message === "is required").map((e) => fieldLabel(e.field));
  const said: string[] = [];
  if (errors.some((e) => e.field === "target" && e.message.startsWith("must be")))
    said.push("Type a target ratio above 1, for example 10.5.");
  else if (errors.some((e) => e.field === "target"))
    said.push(
      `No ${solving.toLowerCase()} can give ${target}:1 on this engine; try a target nearer today's ratio.`,
    );
  if (missing.length > 0)
    said.push(
      `To solve for the ${solving.toLowerCase()}, first fill in: ${missing.join(", ").toLowerCase()}.`,
    );
  for (const e of errors) {
    if (e.field === "target" || e.message === "is required") continue;
    if (/^no gasket thickness/.test(e.message))
      said.push(
        `No gasket is thin enough for ${target}:1 with these parts. A smaller chamber or a bigger dome would get there.`,
      );
    else if (/piston crown reach the head/.test(e.message))
      said.push(
        `The gasket ${target}:1 needs is so thin the piston would touch the head. Choose a smaller chamber or a bigger dome.`,
      );
    else if (/^no chamber reaches/.test(e.message))
      said.push(
        `No chamber is small enough for ${target}:1 with these parts. A dome or a thinner gasket would get there.`,
      );
    else if (e.field === "pistonDomeCc" && /no finite answer/.test(e.message))
      said.push(`No dome or dish gives ${target}:1 with these parts.`);
    else if (e.field === "gasketBoreMm")
      said.push(
        "The gasket's bore is smaller than the cylinder bore: fit a gasket made for this bore first.",
      );
    else said.push(`${fieldLabel(e.field)} ${e.message}.`);
  }
  return said.join(" ");
}

/** calc's refusal of a typed or catalog value, as a sentence with the values in the user's units. */
function inputErrorSentence(
  e: { field: string; message: string },
  f: Resolved,
  units: Units,
): string {
  if (e.field === "gasketBoreMm" && /smaller than the cylinder bore/.test(e.message))
    return (
      `the head gasket's bore (${fmtLine(f.gasketBoreMm.value, "length", units)}) is smaller than ` +
      `the cylinder bore (${fmtLine(f.boreMm.value, "length", units)}), so its edge would stand ` +
      "into the bore. Fit a gasket made for this bore. Static and dynamic compression wait for it; " +
      "the other figures are computed."
    );
  if (e.field === "rodLengthMm")
    return "the rod is shorter than half the stroke, which cannot turn a crank. Check the rod and the flywheel.";
  if (e.field === "deckClearanceMm")
    return "the piston crown would reach the head: deck clearance plus gasket thickness must be more than zero.";
  if (e.field === "pistonDomeCc")
    return "the dome fills the whole chamber, gasket and deck volume, leaving no room at the top of the stroke.";
  return `${fieldLabel(e.field)} ${e.message}; the figures that need it are left out.`;
}
