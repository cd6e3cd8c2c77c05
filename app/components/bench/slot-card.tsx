// One slot on the bench: a drop target for part cards, a pick-list of the catalog's parts
// for it (every slot can be filled without dragging), and the part's figures with a
// measured value typed over any of them.
import { useDroppable } from "@dnd-kit/core";
import { useId, useState } from "react";
import {
  SLOT_FIELDS,
  type BenchPart,
  type MeasuredField,
  type Resolved,
  type SlotFill,
} from "~/lib/bench/spec";
import { fmtLine, inputValue, type Units } from "~/lib/bench/units";
import type { SlotDef } from "~/lib/packages/slots";

export interface SlotActions {
  pick(slot: string, partId: number): void;
  clear(slot: string): void;
  measure(slot: string, field: MeasuredField, text: string): void;
  revert(slot: string, field: MeasuredField): void;
}

const QUANTITY = { mm: "length", cc: "smallVolume", deg: "angle" } as const;

export function SlotCard(props: {
  slot: SlotDef;
  fill: SlotFill;
  part: BenchPart | undefined;
  options: BenchPart[];
  fields: Resolved;
  units: Units;
  errors: Record<string, string[]>;
  canEdit: boolean;
  actions: SlotActions;
  dragCategory: string | null;
}) {
  const { slot, fill, part, options, units, canEdit, actions } = props;
  const { setNodeRef, isOver } = useDroppable({
    id: `slot-${slot.key}`,
    data: { slot: slot.key, category: slot.category },
    disabled: !canEdit,
  });
  const selectId = useId();
  const slotError = props.errors[slot.key];
  const fits = props.dragCategory === slot.category;
  const ring = isOver
    ? fits
      ? "ring-2 ring-teal"
      : "ring-2 ring-red"
    : fits
      ? "ring-2 ring-teal/40"
      : "";
  return (
    <section
      ref={setNodeRef}
      aria-label={`${slot.label} slot`}
      data-testid={`slot-${slot.key}`}
      className={`rounded border border-steel-200 bg-white p-2 text-sm shadow-sm ${ring}`}
    >
      <div className="flex items-baseline justify-between gap-2">
        <h3 className="font-semibold text-ink">{slot.label}</h3>
        {part && canEdit ? (
          <button
            type="button"
            onClick={() => actions.clear(slot.key)}
            className="text-xs text-steel-700 underline hover:text-ink"
          >
            Clear
          </button>
        ) : null}
      </div>
      <p className="mt-0.5 min-h-5 text-steel-700" data-testid={`slot-${slot.key}-part`}>
        {part ? (
          <>
            <span className="font-medium text-graphite">{part.name}</span>{" "}
            <span className="num text-xs">{part.partNumber}</span>
            {part.stock ? (
              <span className="ml-1 rounded bg-steel-100 px-1 text-xs">stock</span>
            ) : null}
          </>
        ) : (
          <span className="italic">
            {canEdit ? "Empty — drop a part here or pick one" : "Empty"}
          </span>
        )}
      </p>
      {canEdit ? (
        <div className="mt-1">
          <label htmlFor={selectId} className="sr-only">
            Pick a part for the {slot.label.toLowerCase()} slot
          </label>
          <select
            id={selectId}
            value={fill.partId ?? ""}
            onChange={(e) =>
              e.target.value
                ? actions.pick(slot.key, Number(e.target.value))
                : actions.clear(slot.key)
            }
            aria-invalid={slotError ? true : undefined}
            aria-describedby={slotError ? `${selectId}-err` : undefined}
            className="w-full rounded border border-steel-300 bg-white px-1.5 py-1 text-sm"
          >
            <option value="">— pick a part —</option>
            {options.map((o) => (
              <option key={o.id} value={o.id}>
                {o.partNumber} · {o.name}
              </option>
            ))}
          </select>
          {slotError ? (
            <p id={`${selectId}-err`} className="mt-1 text-xs text-red-text" role="alert">
              {slotError.join(" ")}
            </p>
          ) : null}
        </div>
      ) : null}
      {(SLOT_FIELDS[slot.key] ?? []).map((f) => (
        <MeasuredRow
          key={f.field}
          slotKey={slot.key}
          field={f.field}
          label={f.label}
          quantity={QUANTITY[f.unit]}
          resolved={props.fields[f.field]}
          units={units}
          error={props.errors[`${slot.key}.${f.field}`]}
          canEdit={canEdit}
          actions={actions}
        />
      ))}
    </section>
  );
}

function MeasuredRow(props: {
  slotKey: string;
  field: MeasuredField;
  label: string;
  quantity: "length" | "smallVolume" | "angle";
  resolved: Resolved[MeasuredField];
  units: Units;
  error: string[] | undefined;
  canEdit: boolean;
  actions: SlotActions;
}) {
  const { resolved: r, units, quantity: q } = props;
  const [editing, setEditing] = useState(false);
  // what the user last typed: a refused value stays in the box beside its reason
  const [attempt, setAttempt] = useState<string | null>(null);
  const id = useId();
  const showEditor = editing || Boolean(props.error);
  const unit = q === "length" ? (units === "inch" ? "in" : "mm") : q === "angle" ? "°" : "cc";
  return (
    <div className="mt-1 border-t border-steel-100 pt-1" data-testid={`field-${props.field}`}>
      <div className="flex flex-wrap items-baseline gap-x-2">
        <span className="text-steel-700">{props.label}</span>
        <span className="num font-semibold text-ink">{fmtLine(r.value, q, units)}</span>
        {r.measured ? (
          <span className="rounded bg-teal/10 px-1 text-xs font-semibold text-teal-text">
            measured · nominal {fmtLine(r.nominal, q, units)}
          </span>
        ) : null}
        {props.canEdit && !showEditor ? (
          <button
            type="button"
            className="ml-auto text-xs text-teal-text underline"
            onClick={() => setEditing(true)}
          >
            {r.measured ? "Change" : "Enter measured"}
          </button>
        ) : null}
        {props.canEdit && r.measured ? (
          <button
            type="button"
            className="text-xs text-steel-700 underline"
            onClick={() => props.actions.revert(props.slotKey, props.field)}
          >
            Back to nominal
          </button>
        ) : null}
      </div>
      {props.canEdit && showEditor ? (
        <form
          className="mt-1 flex items-center gap-1"
          onSubmit={(e) => {
            e.preventDefault();
            const text = String(new FormData(e.currentTarget).get("value") ?? "");
            setAttempt(text);
            props.actions.measure(props.slotKey, props.field, text);
            setEditing(false);
          }}
        >
          <label htmlFor={id} className="sr-only">
            Measured {props.label.toLowerCase()} in {unit}
          </label>
          <input
            id={id}
            name="value"
            inputMode="decimal"
            defaultValue={props.error && attempt !== null ? attempt : inputValue(r.value, q, units)}
            aria-invalid={props.error ? true : undefined}
            aria-describedby={props.error ? `${id}-err` : undefined}
            className="num w-24 rounded border border-steel-300 px-1.5 py-0.5"
            autoFocus={editing}
          />
          <span className="text-xs text-steel-700">{unit}</span>
          <button
            type="submit"
            className="rounded bg-teal-dark px-2 py-0.5 text-xs font-semibold text-white hover:bg-ink"
          >
            Save
          </button>
          <button
            type="button"
            className="text-xs text-steel-700 underline"
            onClick={() => setEditing(false)}
          >
            Cancel
          </button>
        </form>
      ) : null}
      {props.error ? (
        <p id={`${id}-err`} className="mt-0.5 text-xs text-red-text" role="alert">
          {props.error.join(" ")}
        </p>
      ) : null}
    </div>
  );
}
