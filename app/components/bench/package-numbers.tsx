// The package's own numbers on the bench: measured deck clearance, rev limit, and the
// power figure with its basis (what the fit rules' power thresholds read).
import { useId, useState } from "react";
import type { BenchSpec } from "~/lib/bench/spec";
import { fmtLine, inputValue, type Units } from "~/lib/bench/units";
import type { QueuedAction } from "~/lib/bench/queue";
import { inToMm } from "../../../calc";

type Field = "deckClearanceMm" | "revLimitRpm" | "powerHp";

/**
 * A typed package number checked before it is sent, so a refusal stands beside the box
 * in the box's own terms (rpm, hp), with what was typed kept. The server checks again.
 */
export function checkNumber(field: Field, text: string, units: Units): string | null {
  const t = text.trim().replace(/\u2212/g, "-");
  if (t === "") return null;
  if (field === "revLimitRpm") {
    const n = Number(t.replace(/,/g, ""));
    if (!/^-?[\d,]+(\.\d+)?$/.test(t) || !Number.isFinite(n))
      return "Enter the rev limit in rpm as a whole number, for example 5800.";
    if (n < 1000 || n > 12000) return "A rev limit is between 1,000 and 12,000 rpm.";
    return null;
  }
  if (field === "powerHp") {
    const n = Number(t.replace(/,/g, ""));
    if (!/^-?[\d,]*\.?\d+$/.test(t) || !Number.isFinite(n))
      return "Enter the power in horsepower, for example 125.";
    if (n < 1 || n > 1000) return "Power is between 1 and 1,000 hp.";
    return null;
  }
  const n = Number(t.replace(",", "."));
  if (!/^-?\d*[.,]?\d+$/.test(t) || !Number.isFinite(n))
    return units === "inch"
      ? "Enter the deck clearance in inches, for example 0.010."
      : "Enter the deck clearance in millimetres, for example 0.25.";
  return null;
}

export function PackageNumbers(props: {
  spec: BenchSpec;
  units: Units;
  errors: Record<string, string[]>;
  canEdit: boolean;
  submit: (a: QueuedAction) => void;
}) {
  const { spec, units } = props;
  const [local, setLocal] = useState<Partial<Record<Field, { text: string; error: string }>>>({});
  const send = (field: Field, text: string) => {
    const problem = checkNumber(field, text, units);
    if (problem) {
      setLocal((l) => ({ ...l, [field]: { text, error: problem } }));
      return;
    }
    setLocal((l) => ({ ...l, [field]: undefined }));
    const unit =
      field === "deckClearanceMm"
        ? units === "inch"
          ? "in"
          : "mm"
        : field === "revLimitRpm"
          ? "rpm"
          : "hp";
    const clean = text.trim().replace(/\u2212/g, "-");
    const n = Number(
      field === "deckClearanceMm" ? clean.replace(",", ".") : clean.replace(/,/g, ""),
    );
    const ok = text.trim() === "" || Number.isFinite(n);
    const value = text.trim() === "" ? null : unit === "in" ? inToMm(n) : n;
    props.submit({
      fields: {
        intent: "set-number",
        field,
        value: field === "deckClearanceMm" ? clean : String(n),
        unit,
      },
      intent: ok ? { intent: "set-number", field, value } : null,
      key: field,
    });
  };
  return (
    <section
      aria-label="Package numbers"
      className="grid grid-cols-1 gap-2 rounded border border-steel-200 bg-white p-2 text-sm sm:grid-cols-4"
    >
      <NumberInput
        label="Deck clearance (measured)"
        hint="+ below the deck"
        unit={units === "inch" ? "in" : "mm"}
        value={inputValue(spec.deckClearanceMm, "length", units)}
        shown={fmtLine(spec.deckClearanceMm, "length", units)}
        error={local.deckClearanceMm ? [local.deckClearanceMm.error] : props.errors.deckClearanceMm}
        typed={local.deckClearanceMm?.text}
        canEdit={props.canEdit}
        onSave={(t) => send("deckClearanceMm", t)}
        name="deckClearanceMm"
      />
      <NumberInput
        label="Rev limit"
        unit="rpm"
        value={spec.revLimitRpm == null ? "" : String(spec.revLimitRpm)}
        shown={fmtLine(spec.revLimitRpm, "rpm", units)}
        error={local.revLimitRpm ? [local.revLimitRpm.error] : props.errors.revLimitRpm}
        typed={local.revLimitRpm?.text}
        canEdit={props.canEdit}
        onSave={(t) => send("revLimitRpm", t)}
        name="revLimitRpm"
      />
      <NumberInput
        label="Power"
        unit="hp"
        value={spec.powerHp == null ? "" : String(spec.powerHp)}
        shown={fmtLine(spec.powerHp, "hp", units)}
        error={local.powerHp ? [local.powerHp.error] : props.errors.powerHp}
        typed={local.powerHp?.text}
        canEdit={props.canEdit}
        onSave={(t) => send("powerHp", t)}
        name="powerHp"
      />
      <div>
        <label htmlFor="power-basis" className="block text-xs text-steel-700">
          Power basis
        </label>
        {props.canEdit ? (
          <select
            id="power-basis"
            value={spec.powerBasis ?? ""}
            onChange={(e) =>
              props.submit({
                fields: { intent: "set-basis", value: e.target.value },
                intent: {
                  intent: "set-basis",
                  value: (e.target.value || null) as "target" | "estimate" | null,
                },
                key: "powerBasis",
              })
            }
            className="mt-0.5 w-full rounded border border-steel-300 px-1 py-1"
          >
            <option value="">—</option>
            <option value="target">Target</option>
            <option value="estimate">Estimate</option>
            {spec.powerBasis === "measured" ? (
              <option value="measured" disabled>
                Measured (dyno)
              </option>
            ) : null}
          </select>
        ) : (
          <p id="power-basis" className="font-semibold">
            {spec.powerBasis
              ? { target: "Target", estimate: "Estimate", measured: "Measured (dyno)" }[
                  spec.powerBasis
                ]
              : "—"}
          </p>
        )}
        <p className="mt-0.5 text-xs text-steel-700">Measured once a dyno run is logged.</p>
      </div>
    </section>
  );
}

function NumberInput(props: {
  label: string;
  hint?: string;
  unit: string;
  value: string;
  shown: string;
  error?: string[];
  /** what was typed and refused, kept in the box */
  typed?: string;
  canEdit: boolean;
  onSave: (text: string) => void;
  name: string;
}) {
  const id = useId();
  if (!props.canEdit) {
    return (
      <div>
        <p className="text-xs text-steel-700">{props.label}</p>
        <p className="num font-semibold">{props.shown}</p>
      </div>
    );
  }
  return (
    <form
      key={`${props.value}|${props.typed ?? ""}`}
      onSubmit={(e) => {
        e.preventDefault();
        props.onSave(String(new FormData(e.currentTarget).get(props.name) ?? ""));
      }}
    >
      <label htmlFor={id} className="block text-xs text-steel-700">
        {props.label} <span className="sr-only">in {props.unit}</span>
      </label>
      <div className="mt-0.5 flex items-center gap-1">
        <input
          id={id}
          name={props.name}
          defaultValue={props.typed ?? props.value}
          inputMode="decimal"
          aria-invalid={props.error ? true : undefined}
          aria-describedby={props.error ? `${id}-err` : undefined}
          onBlur={(e) => {
            if (e.currentTarget.value !== (props.typed ?? props.value))
              e.currentTarget.form?.requestSubmit();
          }}
          className="num w-full min-w-0 rounded border border-steel-300 px-1.5 py-1"
        />
        <span className="text-xs text-steel-700">{props.unit}</span>
      </div>
      {props.hint ? <p className="text-xs text-steel-700">{props.hint}</p> : null}
      {props.error ? (
        <p id={`${id}-err`} role="alert" className="text-xs text-red-text">
          {props.error.join(" ")}
        </p>
      ) : null}
    </form>
  );
}
